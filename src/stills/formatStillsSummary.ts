/**
 * The human summary `kerrtrace stills` prints: where the series came from, one line per photo,
 * the Kerr fit's figures with uncertainties (or, when B cannot be told apart from brightness,
 * a plain statement instead of a number), warnings and notes. Pure: returns text.
 * @example formatStillsSummary(series, fit, { folder: 'run1', effectiveLengthM: 0.05, gapM: 0.005, polariserAngleDeg: 45 })
 */
import { formatNumber, formatQuantity } from '../quantity.js';
import type { StillsSeries } from './readStillsSeries.js';
import type { StillsFit } from './fitStillsSeries.js';

export interface StillsContext {
  folder: string;
  effectiveLengthM: number;
  gapM: number;
  polariserAngleDeg: number;
}

export function formatStillsSummary(series: StillsSeries, fit: StillsFit | null, ctx: StillsContext): string {
  const out: string[] = [];
  const source = series.voltageSource === 'csv' ? 'voltages from the CSV' : 'voltages from the file names';
  out.push(`${series.files.length} photo(s) from ${ctx.folder}, ${series.width}x${series.height}, ${source}; exposure basis: ${series.exposureBasis}`);
  out.push(`beam region ${series.roi.x},${series.roi.y},${series.roi.w},${series.roi.h}${series.roiIsWholeFrame ? ' (whole photo)' : ''}`);
  out.push('');
  const header = ['file', 'voltage', 'intensity', 'exposure', 'clipped', 'fit'];
  const rows = series.files.map((file, i) => [
    file,
    `${formatNumber(series.voltageV[i]!, 4)} V`,
    formatNumber(series.intensity[i]!, 4),
    `${formatNumber(series.exposureRelative[i]!, 3)}x`,
    `${formatNumber(series.clippedFraction[i]! * 100, 2)}%`,
    fit === null ? '' : fit.used[i] ? 'used' : `left out (${fit.excludedReason[i]})`,
  ]);
  const table = [header, ...rows];
  const widths = header.map((_, c) => Math.max(...table.map((r) => r[c]!.length)));
  for (const r of table) out.push(r.map((cell, c) => cell.padEnd(widths[c]!)).join('  ').trimEnd());
  out.push('');
  if (fit !== null && fit.fit !== null) {
    const f = fit.fit;
    out.push(`Kerr fit (polariser at ${ctx.polariserAngleDeg}° to the field, effective length ${formatNumber(ctx.effectiveLengthM * 1e3, 4)} mm, gap ${formatNumber(ctx.gapM * 1e3, 4)} mm):`);
    if (f.identifiable) {
      out.push(`  Kerr constant B     ${formatQuantity(f.kerrConstant)}`);
      out.push(`  half-wave voltage   ${formatQuantity(f.halfWaveVoltage)}`);
    } else {
      out.push('  B could not be separated from brightness: the sweep does not reach far enough towards the half-wave voltage');
      out.push(`  (highest voltage ≈ ${formatNumber(f.maxVoltageOverHalfWave, 2)} of the fitted V_pi). Add photos at higher voltage, or measure the open level (analyser parallel).`);
    }
    out.push(`  floor level         ${formatQuantity(f.floorLevel)}`);
    out.push(`  amplitude           ${formatQuantity(f.amplitude)}`);
    if (fit.floorFraction) out.push(`  floor fraction      ${formatQuantity(fit.floorFraction)}`);
    out.push(`  fit: ${f.converged ? 'converged' : 'did not converge'} (${f.reason}), ${f.iterations} iterations, ${f.starts} starts, residual RMS ${formatNumber(f.residualRms, 3)}, ${f.degreesOfFreedom} degrees of freedom`);
    const left = Object.entries(fit.excluded).map(([k, v]) => `${v} ${k}`);
    if (left.length > 0) out.push(`  photos left out of the fit: ${left.join(', ')}`);
  } else if (fit !== null) {
    out.push(`No Kerr fit: ${fit.noFitReason}.`);
  }
  if (series.warnings.length > 0) {
    out.push('', 'Warnings:');
    for (const w of series.warnings) out.push(`  ! ${w}`);
  }
  if (series.notes.length > 0) {
    out.push('', 'Notes:');
    for (const n of series.notes) out.push(`  - ${n}`);
  }
  return `${out.join('\n')}\n`;
}
