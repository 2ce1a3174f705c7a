/**
 * The CSV that `kerrtrace trace` writes: one row per frame, columns documented in
 * docs/trace-csv.md:
 *   time_s, frame,
 *   roiN_luma, roiN_r, roiN_g, roiN_b, roiN_clipped_fraction   (N = 1, 2, ... per --roi; linear,
 *       dark-subtracted when a dark region is given, divided by the gain when a reference is given)
 *   dark_luma, dark_r, dark_g, dark_b, dark_clipped_fraction    (with --dark-roi; raw)
 *   reference_luma, ..., reference_clipped_fraction, gain       (with --reference-roi; raw, gain)
 * Numbers: time in seconds with 6 decimals, linear values to 7 significant digits, fractions to 6
 * decimals; an empty field where a value does not exist (e.g. no gain for a frame whose reference
 * was black). Comma-separated, '.' decimal point, LF line ends, header row first.
 *
 * @example regionTraceCsv(await traceVideo('run1.mp4', { regions: [roi] })).split('\n')[0]
 *   // 'time_s,frame,roi1_luma,roi1_r,roi1_g,roi1_b,roi1_clipped_fraction'
 */
import type { RegionSeries, TraceResult } from './trace.js';

const linear = (x: number): string => (Number.isFinite(x) ? Number(x.toPrecision(7)).toString() : '');
const fraction = (x: number): string => (Number.isFinite(x) ? Number(x.toFixed(6)).toString() : '');
const seconds = (x: number): string => (Number.isFinite(x) ? Number(x.toFixed(6)).toString() : '');

function seriesColumns(prefix: string): string[] {
  return [`${prefix}_luma`, `${prefix}_r`, `${prefix}_g`, `${prefix}_b`, `${prefix}_clipped_fraction`];
}

function seriesCells(s: RegionSeries, i: number): string[] {
  return [linear(s.luma[i]!), linear(s.r[i]!), linear(s.g[i]!), linear(s.b[i]!), fraction(s.clippedFraction[i]!)];
}

/** Column names in order. */
export function regionTraceColumns(trace: Pick<TraceResult, 'corrected' | 'dark' | 'reference'>): string[] {
  const columns = ['time_s', 'frame'];
  trace.corrected.forEach((_s, k) => columns.push(...seriesColumns(`roi${k + 1}`)));
  if (trace.dark) columns.push(...seriesColumns('dark'));
  if (trace.reference) columns.push(...seriesColumns('reference'), 'gain');
  return columns;
}

export function regionTraceCsv(trace: TraceResult): string {
  const lines: string[] = [regionTraceColumns(trace).join(',')];
  for (let i = 0; i < trace.frames; i++) {
    const cells = [seconds(trace.timeS[i]!), String(i)];
    for (const s of trace.corrected) cells.push(...seriesCells(s, i));
    if (trace.dark) cells.push(...seriesCells(trace.dark, i));
    if (trace.reference) cells.push(...seriesCells(trace.reference, i), linear(trace.gains ? trace.gains.gains[i]! : NaN));
    lines.push(cells.join(','));
  }
  return `${lines.join('\n')}\n`;
}
