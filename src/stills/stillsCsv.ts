/**
 * stills.csv, written beside trace.csv by `kerrtrace stills`: what each photo was before the
 * corrections, so the intensity in trace.csv can be checked by hand (docs/stills.md). One row per
 * photo, in the order of trace.csv (join on `frame`). Columns:
 *   frame, file, voltage_V,
 *   roi_linear, dark_linear, reference_linear  mean linear Rec. 709 luminance of each region
 *                                               (1 = full-scale white), before dark subtraction
 *                                               and exposure normalisation; empty without that
 *                                               region or for an unreadable photo,
 *   exposure_relative                           exposure against the first readable photo,
 *   clipped_fraction                            share of the beam region's pixels clipped,
 *   transfer, bit_depth                         how the photo was linearised,
 *   surround_linear                             the local surround under the beam from the two
 *                                               rings around it (no dark region given); empty
 *                                               otherwise.
 * trace.csv's intensity = (roi_linear − background) / exposure_relative, where the background is
 * dark_linear, else surround_linear, else 0. Pure.
 * @example stillsCsv(series).split('\n')[0] // "frame,file,voltage_V,roi_linear,..."
 */
import type { StillsSeries } from './readStillsSeries.js';

const fmt = (x: number | undefined | null, digits = 7): string => (x === undefined || x === null || !Number.isFinite(x) ? '' : Number(x.toPrecision(digits)).toString());
const quoted = (s: string): string => (/[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

export const STILLS_CSV_COLUMNS = ['frame', 'file', 'voltage_V', 'roi_linear', 'dark_linear', 'reference_linear', 'exposure_relative', 'clipped_fraction', 'transfer', 'bit_depth', 'surround_linear'];

export function stillsCsv(series: StillsSeries): string {
  const lines = [STILLS_CSV_COLUMNS.join(',')];
  series.files.forEach((file, i) => {
    lines.push([
      i, quoted(file), fmt(series.voltageV[i], 9), fmt(series.roiLinear[i]), fmt(series.darkLinear?.[i]), fmt(series.referenceLinear?.[i]),
      fmt(series.exposureRelative[i]), fmt(series.clippedFraction[i], 4), series.transfers[i]!, series.bitDepths[i] ?? '', fmt(series.surroundLinear?.[i]),
    ].join(','));
  });
  return `${lines.join('\n')}\n`;
}
