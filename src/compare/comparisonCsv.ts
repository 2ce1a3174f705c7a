/**
 * comparison.csv: one row per figure per run, SI values, with the change from the previous run.
 * Columns: figure, unit, run, value, std_err, change, change_std_err, relative_change,
 * relative_change_std_err, z_score, verdict. Empty cells where a value does not exist.
 * Quoting follows RFC 4180; text cells starting with = + - @ (or tab/CR) get a leading
 * apostrophe so spreadsheets do not run them as formulas (OWASP "CSV injection" advice).
 * Pure; never throws.
 * @example comparisonCsv(c).split('\n')[0] === 'figure,unit,run,value,std_err,change,change_std_err,relative_change,relative_change_std_err,z_score,verdict'
 */
import type { Comparison } from './comparison.js';

export const COMPARISON_CSV_HEADER = ['figure', 'unit', 'run', 'value', 'std_err', 'change', 'change_std_err', 'relative_change', 'relative_change_std_err', 'z_score', 'verdict'];

export function comparisonCsv(c: Comparison): string {
  const lines = [COMPARISON_CSV_HEADER.join(',')];
  for (const f of c.figures) {
    f.values.forEach((q, i) => {
      const ch = i > 0 ? c.changes.find((x) => x.key === f.key && x.toRun === i) : undefined;
      const withheld = f.withheld[i] ?? false;
      lines.push([
        text(f.key), text(f.unit), text(c.runs[i]!.label),
        num(withheld ? null : q?.value), num(withheld ? null : q?.stdErr),
        num(ch?.change?.value), num(ch?.change?.stdErr), num(ch?.relativeChange?.value), num(ch?.relativeChange?.stdErr), num(ch?.zScore),
        text(withheld ? 'not-separable' : ch?.verdict ?? ''),
      ].join(','));
    });
  }
  return `${lines.join('\n')}\n`;
}

function num(x: number | null | undefined): string {
  return x === null || x === undefined || !Number.isFinite(x) ? '' : String(x);
}

function text(s: string): string {
  const guarded = /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
  return /[",\n\r]/.test(guarded) ? `"${guarded.replace(/"/g, '""')}"` : guarded;
}
