/**
 * regions.png of a stills run: the regions drawn on one photo of the series, so the user can see
 * that the beam (given or found automatically), the background (dark region, or the two surround
 * rings whose local surround was subtracted, drawn as the annulus from the inner edge of ring A to
 * the outer edge of ring B) and the reference region sit where they should. The photo shown is the
 * used photo with the highest measured intensity (the beam is brightest there), orientation
 * applied, reduced to at most MAX_OVERLAY_WIDTH_PX wide; the drawing is renderRegionOverlay's
 * (same colours, dashes and legend as analyze's regions.png).
 * Edge module: reads the photo with sharp. Throws KerrError BAD_ARGUMENT when the photo cannot be
 * decoded (the caller may skip the picture then).
 * @example const png = await stillsRegionOverlay('run1', series, trace.map((r) => r.used));
 */
import { join } from 'node:path';
import sharp from 'sharp';
import { KerrError } from '../errors.js';
import { renderRegionOverlay, type OverlayRegion } from '../maps/renderRegionOverlay.js';
import type { StillsSeries } from './readStillsSeries.js';

export const MAX_OVERLAY_WIDTH_PX = 1280;

/** The used photo with the highest intensity (first readable photo when none is used). */
export function overlayPhotoIndex(intensity: Float64Array, used: readonly boolean[]): number {
  let best = -1;
  for (let i = 0; i < intensity.length; i++) {
    if (!used[i] || !Number.isFinite(intensity[i]!)) continue;
    if (best < 0 || intensity[i]! > intensity[best]!) best = i;
  }
  if (best >= 0) return best;
  const readable = Array.from(intensity).findIndex(Number.isFinite);
  return readable >= 0 ? readable : 0;
}

/** The regions to draw for a series. */
export function stillsOverlayRegions(series: StillsSeries): OverlayRegion[] {
  const regions: OverlayRegion[] = [{ kind: 'beam', label: series.beamAuto ? 'beam (found)' : 'beam', rect: series.roi }];
  if (series.darkRoi) regions.push({ kind: 'dark', label: 'dark', rect: series.darkRoi });
  if (series.surround) regions.push({ kind: 'surround', label: 'surround', rect: series.surround.b1, innerRect: series.surround.a0 });
  if (series.referenceRoi) regions.push({ kind: 'reference', label: 'reference', rect: series.referenceRoi });
  return regions;
}

export async function stillsRegionOverlay(folder: string, series: StillsSeries, used: readonly boolean[]): Promise<Buffer> {
  const index = overlayPhotoIndex(series.intensity, used);
  const file = series.files[index]!;
  let photoPng: Buffer;
  try {
    photoPng = await sharp(join(folder, file), { ignoreIcc: true })
      .autoOrient()
      .resize({ width: Math.min(series.width, MAX_OVERLAY_WIDTH_PX), withoutEnlargement: true })
      .toColourspace('srgb')
      .png()
      .toBuffer();
  } catch (e) {
    throw new KerrError('BAD_ARGUMENT', `${file} could not be decoded to draw the regions on (${e instanceof Error ? e.message : String(e)})`, { path: join(folder, file), hint: 'Re-export the photo as JPEG, PNG or TIFF' });
  }
  const volts = series.voltageV[index]!;
  return renderRegionOverlay(photoPng, stillsOverlayRegions(series), {
    sourceWidth: series.width,
    sourceHeight: series.height,
    caption: `photo ${index + 1} of ${series.files.length}: ${file} at ${Math.abs(volts) >= 1000 ? `${Number((volts / 1000).toPrecision(4))} kV` : `${Number(volts.toPrecision(4))} V`}`,
  });
}
