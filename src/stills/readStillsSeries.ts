/**
 * Reads a folder of photos taken at known voltages into a measured series for the Kerr fit:
 * per photo the voltage, the beam region's mean linear luminance with the background under the
 * beam subtracted and the exposure normalised, the clipped fraction, the relative exposure and
 * (when every photo carries one) the EXIF capture time.
 *
 * Steps (settings and cheap checks first, pixels last):
 * 1. list the photos (JPEG/PNG/TIFF; HEIC refused with a conversion hint) — listStillPhotos;
 * 2. voltages from the CSV or the file names, unit check — seriesVoltages;
 * 3. sizes (EXIF orientation applied) must agree; bit depth 8 or 16; regions inside the frame;
 * 4. EXIF exposure time, ISO, f-number and capture time (exifr) — photoFile, captureTimesS;
 * 5. decode each photo once with sharp, linearise (default sRGB for 8-bit images and 16-bit PNG,
 *    linear for 16-bit TIFF; `transfer` or a camera profile overrides), and measure the regions
 *    (regionPlan: beam, dark region or surround rings, reference) and, without a beam region, the
 *    block grid of the photo (photoBlockGrid);
 * 6. relative exposure — seriesExposure (EXIF, else reference region, else none with a warning);
 * 7. without `roi`: the beam found as the area that varies most across the photos, with its
 *    surround rings (findPhotoRegions, as analyze finds them), warned as "auto-region";
 * 8. intensity = (beam − background) / relative exposure (linear units, 1 = full-scale white of the
 *    first readable photo's exposure); the background is the dark region's level when one is given,
 *    else the local surround from two rings around the beam (core/regions/localSurround, as analyze;
 *    "no-surround" warned when there is no room for them);
 * 9. the open photo, when given, measured the same way — measureOpenPhoto.
 * Clipping: a pixel with any channel at or above `clipLevel` of full scale (default 250/255)
 * counts as clipped; photos with more than CLIPPED_FRACTION_LIMIT of the beam region clipped are
 * named in a warning. Rule for bad photos (skip and count, never drop silently): a photo that
 * cannot be decoded stays in the series with NaN values, its reason in `unreadable`, and a warning
 * names it; when no photo can be read the whole series is refused.
 *
 * Edge module: reads files. Throws KerrError with one line and a hint for: no photos, HEIC,
 * photos of different sizes, unsupported bit depth, a CSV naming missing files, a file given two
 * voltages, names without a voltage, regions outside the frame or on each other (BAD_REGION), no
 * beam found (BAD_REGION), no readable photo, and (BAD_ARGUMENT with path --open-photo) an open
 * photo that is missing, unreadable, of another size, clipped, without the EXIF the series uses,
 * not brighter than its background, or one of the series' photos.
 * @example const s = await readStillsSeries('run1', { roi: { x: 100, y: 80, w: 40, h: 40 } }); s.intensity
 */
import { access } from 'node:fs/promises';
import { basename, dirname, join, resolve } from 'node:path';
import { KerrError } from '../errors.js';
import type { Rect, ResponseTable, TransferName } from '../media/types.js';
import type { RunWarning } from '../result/schema.js';
import { validateRect } from '../measure/rect.js';
import { checkRegionsApart } from '../core/gates/checkRegionsApart.js';
import { surroundRings } from '../core/regions/surroundRings.js';
import type { SurroundGeometry } from '../core/regions/localSurround.js';
import { CLIPPED_FRACTION_LIMIT } from '../core/figures/clippedFractionLimit.js';
import { listStillPhotos } from './listStillPhotos.js';
import { seriesVoltages } from './seriesVoltages.js';
import { captureTimesS } from './captureTimes.js';
import { codeToLinearLut } from './codeToLinearLut.js';
import { defaultTransfer, measurePhoto, messageOf, photoInfo, readPhotoExif, type PhotoExif, type PhotoInfo } from './photoFile.js';
import { gridStepFor, type PhotoBlockGrid } from './photoBlockGrid.js';
import { findPhotoRegions } from './findPhotoRegions.js';
import { planLevels, regionPlan, surroundLevel, MIN_RING_PIXELS, type RegionPlan } from './regionPlan.js';
import { seriesExposure, percent } from './seriesExposure.js';
import { measureOpenPhoto, type OpenPhoto } from './measureOpenPhoto.js';
import { listNames } from './listNames.js';
import { checkEnoughPhotos } from './fitStillsSeries.js';
import { surroundWeights } from '../core/regions/localSurround.js';

export type { OpenPhoto } from './measureOpenPhoto.js';
export { EXPOSURE_SPREAD_WARNING } from './seriesExposure.js';

export interface StillsOptions {
  /** CSV mapping file → voltage; without it the voltages come from the file names. */
  voltsPath?: string;
  /** Beam region; default: found automatically (the area that varies most across the photos). */
  roi?: Rect;
  darkRoi?: Rect;
  /** A region of constant true brightness (grey card) to track exposure when EXIF is missing. */
  referenceRoi?: Rect;
  /** Overrides the per-file default transfer. */
  transfer?: TransferName;
  /** A measured camera response (camera profile) used instead of any transfer curve. */
  response?: ResponseTable;
  /** Clipping threshold as a fraction of full scale; default 250/255. */
  clipLevel?: number;
  /**
   * A photo with the analyser parallel and no field (same camera position; any exposure that the
   * series' exposure basis can relate to the first photo): measured like the series to give the
   * open level.
   */
  openPhotoPath?: string;
  /** Called after each photo is decoded (done, total). */
  onProgress?: (done: number, total: number) => void;
}

export interface StillsSeries {
  voltageV: Float64Array;
  /** (beam − background) / exposureRelative, linear units; NaN for an unreadable photo. */
  intensity: Float64Array;
  files: string[];
  clippedFraction: Float64Array;
  /** Against the first readable photo; NaN for an unreadable photo. */
  exposureRelative: Float64Array;
  warnings: RunWarning[];
  width: number;
  height: number;
  // Extras for reports and checks.
  notes: string[];
  /** The beam region, given or found. */
  roi: Rect;
  /** True when the beam region was found automatically (no roi given). */
  beamAuto: boolean;
  darkRoi: Rect | null;
  /** The rings whose local surround was subtracted (no dark region given); null otherwise. */
  surround: SurroundGeometry | null;
  referenceRoi: Rect | null;
  /** Mean linear luminance of the beam region before background subtraction and exposure normalisation. */
  roiLinear: Float64Array;
  darkLinear: Float64Array | null;
  /** Local surround level under the beam per photo (before exposure normalisation), when subtracted. */
  surroundLinear: Float64Array | null;
  referenceLinear: Float64Array | null;
  exposureBasis: 'exif' | 'reference' | 'none';
  /** EXIF factors used for the exposure ("exposure time", "ISO", "f-number"); empty unless basis is exif. */
  exposureFactors: string[];
  voltageSource: 'csv' | 'file-names';
  transfers: TransferName[];
  /** 8 or 16 per photo; null for an unreadable photo. */
  bitDepths: Array<number | null>;
  /** Per photo: null when it was read, else why it could not be. */
  unreadable: Array<string | null>;
  /** EXIF capture time per photo, s after the earliest photo; null unless every photo has one (captureTimesS). */
  captureTimeS: Float64Array | null;
  /** Files in the folder that were not used, with the reason. */
  leftOut: Array<{ file: string; reason: string }>;
  /** The open photo, when one was given: its intensity on the series' scale is the open level. */
  openPhoto: OpenPhoto | null;
}

type Warn = (code: string, message: string, guideSection?: string) => void;

export async function readStillsSeries(folder: string, opts: StillsOptions = {}): Promise<StillsSeries> {
  const warnings: RunWarning[] = [];
  const warn: Warn = (code, message, guideSection) => { warnings.push(guideSection ? { code, message, guideSection } : { code, message }); };
  const notes: string[] = [];
  const listing = await listStillPhotos(folder);
  if (listing.skipped.length > 0) notes.push(`${listing.skipped.length} image file(s) not read: ${listNames(listing.skipped.map((s) => `${s.file} (${s.reason})`), 2)}`);
  const volts = await seriesVoltages(listing, opts.voltsPath);
  warnings.push(...volts.warnings);
  notes.push(...volts.notes);
  const photos = volts.photos;
  await checkOpenPhotoPath(opts.openPhotoPath, folder, photos);
  const sizes = await readSizes(folder, photos, warn);
  const { width, height } = sizes;
  for (const [r, option] of [[opts.roi, '--roi'], [opts.darkRoi, '--dark-roi'], [opts.referenceRoi, '--reference-roi']] as const) if (r) validateRect(r, width, height, option);
  const apart = { ...(opts.darkRoi ? { dark: opts.darkRoi } : {}), ...(opts.referenceRoi ? { reference: opts.referenceRoi } : {}) };
  if (opts.roi) checkRegionsApart({ beam: opts.roi, beamOption: '--roi', ...apart }); // before any pixel is read
  const exif: PhotoExif[] = [];
  for (const p of photos) exif.push(await readPhotoExif(join(folder, p)));
  const captureTimeS = captureTimesS(exif);
  checkCaptureOrder(captureTimeS, photos, warn);

  const transfers = sizes.infos.map((info, i) => opts.transfer ?? defaultTransfer(volts.formats[i]!, info?.maxCode ?? 255));
  if (opts.transfer === undefined && transfers.some((t, i) => t === 'linear' && sizes.infos[i] !== null)) {
    notes.push('16-bit TIFF photos were read as linear (no transfer curve); give --transfer srgb if your converter wrote gamma-encoded TIFF');
  }
  const given = regionPlan({ beam: opts.roi ?? null, dark: opts.darkRoi ?? null, surround: opts.roi ? surroundRings(opts.roi, width, height) : null, reference: opts.referenceRoi ?? null });
  const pixels = await measureSeries(folder, photos, sizes, transfers, given.plan, opts);
  const readable = reportUnreadable(photos, sizes.unreadable, folder, warn);
  const exposure = seriesExposure({ exif, readable, referenceLinear: pixels.reference, darkLinear: pixels.dark, photos });
  warnings.push(...exposure.warnings);
  notes.push(...exposure.notes);

  const beam = opts.roi ? fromPlan(pixels, given) : fromGrids(pixels, volts.voltageV, exposure.exposureRelative, opts.darkRoi ?? null, width, height, warn);
  if (!beam.surround && !opts.darkRoi) warn('no-surround', 'the beam region leaves no room for a surround ring, so the floor includes any background light; give --dark-roi', 'camera-still');
  if (!opts.roi) checkRegionsApart({ beam: beam.roi, beamOption: 'found automatically', ...apart });
  const n = photos.length;
  const background = pixels.dark ?? beam.surroundLinear;
  const intensity = Float64Array.from({ length: n }, (_, i) => (beam.roiLinear[i]! - (background ? background[i]! : 0)) / exposure.exposureRelative[i]!);
  const clippedPhotos = photos.filter((_, i) => beam.clipped[i]! > CLIPPED_FRACTION_LIMIT);
  if (clippedPhotos.length > 0) {
    warn('clipping', `${clippedPhotos.length} photo(s) have more than ${percent(CLIPPED_FRACTION_LIMIT)} of the beam region clipped (${listNames(clippedPhotos)}): their intensity reads low and they were left out of the fit; lower the exposure or add an ND filter`, 'avoid-clipping');
  }
  let openPhoto: OpenPhoto | null = null;
  if (opts.openPhotoPath !== undefined) {
    const first = readable[0]!;
    const { plan } = regionPlan({ beam: beam.roi, dark: opts.darkRoi ?? null, surround: beam.surround, reference: opts.referenceRoi ?? null });
    const open = await measureOpenPhoto({
      path: opts.openPhotoPath, width, height, plan, ...(opts.transfer ? { transfer: opts.transfer } : {}), ...(opts.response ? { response: opts.response } : {}),
      clipLevel: opts.clipLevel ?? 250 / 255, basis: exposure.basis, firstExif: exif[first]!,
      firstReference: pixels.reference ? pixels.reference[first]! - (pixels.dark ? pixels.dark[first]! : 0) : NaN,
    });
    warnings.push(...open.warnings);
    notes.push(...open.notes);
    openPhoto = open.photo;
  }
  const usedTransfers = [...new Set(readable.map((i) => transfers[i]!))];
  if (usedTransfers.length > 1) warn('mixed-transfer', `the photos were linearised with different transfer curves (${usedTransfers.join(', ')}); give --transfer to use one for all`);

  return {
    voltageV: Float64Array.from(volts.voltageV), intensity, files: photos, clippedFraction: beam.clipped, exposureRelative: exposure.exposureRelative,
    warnings, width, height, notes, roi: beam.roi, beamAuto: !opts.roi, darkRoi: opts.darkRoi ?? null, surround: opts.darkRoi ? null : beam.surround,
    referenceRoi: opts.referenceRoi ?? null, roiLinear: beam.roiLinear, darkLinear: pixels.dark, surroundLinear: opts.darkRoi ? null : beam.surroundLinear,
    referenceLinear: pixels.reference, exposureBasis: exposure.basis, exposureFactors: exposure.factors, voltageSource: volts.voltageSource,
    transfers, bitDepths: sizes.bitDepths, unreadable: sizes.unreadable, captureTimeS, leftOut: [...listing.skipped, ...volts.leftOut], openPhoto,
  };
}

/** The open photo's cheap checks, before any pixel is read. */
async function checkOpenPhotoPath(path: string | undefined, folder: string, photos: readonly string[]): Promise<void> {
  if (path === undefined) return;
  try {
    await access(path);
  } catch {
    throw new KerrError('FILE_NOT_FOUND', `the open photo ${path} does not exist`, { path: '--open-photo', hint: 'Give the photo taken with the analyser parallel and no field' });
  }
  if (resolve(dirname(path)) === resolve(folder) && photos.includes(basename(path))) {
    throw new KerrError('BAD_ARGUMENT', `the open photo ${basename(path)} is also one of the series' photos`, { path: '--open-photo', hint: 'Move the open photo out of the folder (or leave it out of the --volts CSV), so it is not fitted as a point of the sweep' });
  }
}

interface Sizes {
  infos: Array<PhotoInfo | null>;
  unreadable: Array<string | null>;
  bitDepths: Array<number | null>;
  width: number;
  height: number;
}

/** Sizes and depths; a photo that cannot be read is skipped and counted; sizes must agree. */
async function readSizes(folder: string, photos: readonly string[], warn: Warn): Promise<Sizes> {
  const unreadable: Array<string | null> = photos.map(() => null);
  const infos: Array<PhotoInfo | null> = [];
  for (let i = 0; i < photos.length; i++) {
    const info = await photoInfo(join(folder, photos[i]!), photos[i]!);
    if (typeof info === 'string') unreadable[i] = info;
    infos.push(typeof info === 'string' ? null : info);
  }
  const first = infos.findIndex((info) => info !== null);
  if (first < 0) throw noneReadable(photos, unreadable, folder);
  const { width, height } = infos[first]!;
  infos.forEach((info, i) => {
    if (info !== null && (info.width !== width || info.height !== height)) {
      throw new KerrError('BAD_ARGUMENT', `the photos differ in size: ${photos[first]} is ${width}x${height} but ${photos[i]} is ${info.width}x${info.height}`, {
        path: join(folder, photos[i]!),
        hint: 'Take the whole series from one camera position at one size and orientation (or crop all photos identically)',
      });
    }
  });
  const bitDepths = infos.map((info) => (info === null ? null : info.maxCode === 65535 ? 16 : 8));
  if (new Set(bitDepths.filter((d) => d !== null)).size > 1) warn('mixed-bit-depth', 'the series mixes 8-bit and 16-bit photos; check that they were all processed the same way');
  return { infos, unreadable, bitDepths, width, height };
}

function checkCaptureOrder(captureTimeS: Float64Array | null, photos: readonly string[], warn: Warn): void {
  if (captureTimeS === null) return;
  for (let i = 1; i < photos.length; i++) {
    if (captureTimeS[i]! < captureTimeS[i - 1]!) {
      warn('capture-order', `the EXIF capture times do not follow the order of the file names (${photos[i]} was taken before ${photos[i - 1]}); the photos are used in name order, check that the names are right`);
      return;
    }
  }
}

interface SeriesPixels {
  /** Per photo, the levels of the plan's regions (NaN where absent or unreadable). */
  beam: Float64Array;
  beamClipped: Float64Array;
  surround: Float64Array;
  dark: Float64Array | null;
  reference: Float64Array | null;
  /** Block grid per photo, only when the beam is to be found. */
  grids: Array<PhotoBlockGrid | null>;
}

/** Decodes every readable photo once: the plan's rectangles at full resolution, and the block grid when no beam is given. */
async function measureSeries(folder: string, photos: readonly string[], sizes: Sizes, transfers: readonly TransferName[], plan: RegionPlan, opts: StillsOptions): Promise<SeriesPixels> {
  const n = photos.length;
  const nan = (): Float64Array => new Float64Array(n).fill(NaN);
  const out: SeriesPixels = { beam: nan(), beamClipped: nan(), surround: nan(), dark: plan.dark !== null ? nan() : null, reference: plan.reference !== null ? nan() : null, grids: photos.map(() => null) };
  const gridStep = plan.beam === null ? gridStepFor(sizes.width) : null;
  const clipLevel = opts.clipLevel ?? 250 / 255;
  const luts = new Map<string, Float64Array>();
  for (let i = 0; i < n; i++) {
    const info = sizes.infos[i];
    if (info) {
      const key = `${opts.response ? 'profile' : transfers[i]}/${info.maxCode}`;
      const lut = luts.get(key) ?? codeToLinearLut(transfers[i]!, info.maxCode, opts.response);
      luts.set(key, lut);
      try {
        const measured = await measurePhoto(join(folder, photos[i]!), info.maxCode, lut, plan.rects, Math.round(clipLevel * info.maxCode), gridStep);
        const levels = planLevels(plan, measured.regions);
        out.beam[i] = levels.beam;
        out.beamClipped[i] = levels.beamClipped;
        out.surround[i] = levels.surround;
        if (out.dark) out.dark[i] = levels.dark;
        if (out.reference) out.reference[i] = levels.reference;
        out.grids[i] = measured.grid;
      } catch (e) {
        sizes.unreadable[i] = messageOf(e);
        sizes.bitDepths[i] = null;
      }
    }
    opts.onProgress?.(i + 1, n);
  }
  return out;
}

/** Indices of the readable photos; warns about the others; refuses a series with none. */
function reportUnreadable(photos: readonly string[], unreadable: Array<string | null>, folder: string, warn: Warn): number[] {
  const readable: number[] = [];
  for (let i = 0; i < photos.length; i++) if (unreadable[i] === null) readable.push(i);
  if (readable.length === 0) throw noneReadable(photos, unreadable, folder);
  const names = photos.filter((_, i) => unreadable[i] !== null);
  if (names.length > 0) {
    const firstBad = unreadable.findIndex((u) => u !== null);
    warn('unreadable', names.length === 1
      ? `${photos[firstBad]} could not be read and was left out (${unreadable[firstBad]}); re-export it as JPEG, PNG or TIFF`
      : `${names.length} photos could not be read and were left out: ${listNames(names)} (${photos[firstBad]}: ${unreadable[firstBad]}); re-export them as JPEG, PNG or TIFF`);
  }
  return readable;
}

interface BeamSeries {
  roi: Rect;
  roiLinear: Float64Array;
  clipped: Float64Array;
  /** The rings used for the surround, null when there was no room (or a dark region is given). */
  surround: SurroundGeometry | null;
  surroundLinear: Float64Array | null;
}

/** The given beam: its levels and surround straight from the full-resolution measurement. */
function fromPlan(pixels: SeriesPixels, given: ReturnType<typeof regionPlan>): BeamSeries {
  const rings = given.plan.rings;
  return { roi: given.plan.rects[given.plan.beam!]!, roiLinear: pixels.beam, clipped: pixels.beamClipped, surround: rings ? rings.geometry : null, surroundLinear: rings ? pixels.surround : null };
}

/** The beam found on the block grids (findPhotoRegions), with its surround unless a dark region is given; warns "auto-region". */
function fromGrids(pixels: SeriesPixels, voltageV: readonly number[], exposureRelative: Float64Array, dark: Rect | null, width: number, height: number, warn: Warn): BeamSeries {
  const usable = Uint8Array.from(pixels.grids, (g) => (g ? 1 : 0));
  // Too few photos for a fit: say so before looking for a beam in them.
  const readable = Array.from(usable, (u, i) => (u ? i : -1)).filter((i) => i >= 0);
  checkEnoughPhotos(voltageV, readable, usable.length > readable.length ? { unreadable: usable.length - readable.length } : {});
  const found = findPhotoRegions(pixels.grids, exposureRelative, usable);
  const b = found.beam;
  warn('auto-region', `the beam region was found automatically at x=${b.x}, y=${b.y}, ${b.w}×${b.h} px (of ${width}×${height}); check it on regions.png or give --roi`);
  const weights = surroundWeights(found.geometry);
  const room = !dark && weights.ringACount >= MIN_RING_PIXELS;
  const [, a0, a1, b1] = found.means;
  const surroundLinear = room ? Float64Array.from(a0, (_, i) => surroundLevel(weights.coefficients, a0[i]!, a1[i]!, b1[i]!)) : null;
  return { roi: b, roiLinear: found.means[0], clipped: found.beamClipped, surround: room ? found.geometry : null, surroundLinear };
}

function noneReadable(photos: readonly string[], unreadable: ReadonlyArray<string | null>, folder: string): KerrError {
  return new KerrError('BAD_ARGUMENT', `none of the ${photos.length} photo(s) in ${folder} could be read (${photos[0]}: ${unreadable[0] ?? 'unknown reason'})`, {
    path: join(folder, photos[0]!),
    hint: 'Re-export the photos as JPEG, PNG or TIFF',
  });
}

