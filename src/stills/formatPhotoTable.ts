/**
 * The per-photo table `kerrtrace stills` prints above the run summary: file, voltage, measured
 * intensity (linear units, dark-subtracted, exposure-normalised), relative exposure, clipped share
 * of the beam region, and whether the fit used the photo (or why not). Pure: returns text.
 * @example formatPhotoTable(series, trace) // "file        voltage  intensity  exposure  clipped  fit\n..."
 */
import { formatNumber } from '../quantity.js';
import type { TraceRow } from '../result/schema.js';
import type { StillsSeries } from './readStillsSeries.js';

export function formatPhotoTable(series: StillsSeries, trace: readonly TraceRow[]): string {
  const header = ['file', 'voltage', 'intensity', 'exposure', 'clipped', 'fit'];
  const dash = (x: number, text: string): string => (Number.isFinite(x) ? text : '-');
  const rows = series.files.map((file, i) => {
    const row = trace[i];
    return [
      file,
      `${formatNumber(series.voltageV[i]!, 4)} V`,
      dash(series.intensity[i]!, formatNumber(series.intensity[i]!, 4)),
      dash(series.exposureRelative[i]!, `${formatNumber(series.exposureRelative[i]!, 3)}x`),
      dash(series.clippedFraction[i]!, `${formatNumber(series.clippedFraction[i]! * 100, 2)}%`),
      row === undefined ? '' : row.used ? 'used' : `left out (${row.excludedReason ?? 'unknown'})`,
    ];
  });
  const table = [header, ...rows];
  const widths = header.map((_, c) => Math.max(...table.map((r) => r[c]!.length)));
  return `${table.map((r) => r.map((cell, c) => cell.padEnd(widths[c]!)).join('  ').trimEnd()).join('\n')}\n`;
}
