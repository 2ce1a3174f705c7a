/**
 * stills.csv: one row per photo used or left out by the fit (documented in docs/stills.md).
 * Columns: file, voltage_V, intensity (dark-subtracted, exposure-normalised, linear),
 * roi_linear, dark_linear, reference_linear (mean linear Rec. 709 luminance of each region before
 * corrections; empty without that region), exposure_relative, clipped_fraction, transfer,
 * used (1/0), excluded_reason, model, residual (empty without a fit). Pure.
 * @example stillsCsv(series, fit).split('\n')[0] // "file,voltage_V,intensity,..."
 */
import type { StillsSeries } from './readStillsSeries.js';
import type { StillsFit } from './fitStillsSeries.js';

const fmt = (x: number | undefined | null, digits = 7): string => (x === undefined || x === null || !Number.isFinite(x) ? '' : Number(x.toPrecision(digits)).toString());
const quoted = (s: string): string => (/[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

export const STILLS_CSV_COLUMNS = ['file', 'voltage_V', 'intensity', 'roi_linear', 'dark_linear', 'reference_linear', 'exposure_relative', 'clipped_fraction', 'transfer', 'used', 'excluded_reason', 'model', 'residual'];

export function stillsCsv(series: StillsSeries, fit: StillsFit | null): string {
  const lines = [STILLS_CSV_COLUMNS.join(',')];
  series.files.forEach((file, i) => {
    const model = fit?.model[i];
    const residual = model !== undefined && Number.isFinite(model) ? series.intensity[i]! - model : null;
    lines.push([
      quoted(file), fmt(series.voltageV[i], 9), fmt(series.intensity[i]), fmt(series.roiLinear[i]), fmt(series.darkLinear?.[i]), fmt(series.referenceLinear?.[i]),
      fmt(series.exposureRelative[i]), fmt(series.clippedFraction[i], 4), series.transfers[i]!, fit ? fit.used[i] : '', fit?.excludedReason[i] ?? '',
      fmt(model), fmt(residual),
    ].join(','));
  });
  return `${lines.join('\n')}\n`;
}
