/**
 * Unit sanity of a voltage log against its video, before any fitting (issue 12: a `time` column in
 * milliseconds read as seconds, voltages ×10⁹). Refuses:
 * - a time column without a stated unit whose span is more than 50× the video's length while its
 *   median sample interval is 1 or more (a 10 Hz log in ms has intervals of 100): it holds
 *   milliseconds; name the column `time_ms`;
 * - voltages above 1 MV, or a peak field |V|max/d above 100 kV/mm (thirty times the breakdown of
 *   air, beyond any liquid): the unit is wrong (mV read as V?) or the gap is.
 * Thresholds are this tool's choices, far from any real bench. Pure; throws KerrError BAD_CSV
 * naming the file.
 * @example checkLogUnits({ timeS, voltageV, timeColumn: 'time', videoDurationS: 10, gapM: 0.004, file: 'v.csv' })
 */
import { KerrError } from '../../errors.js';

export interface LogUnitInput {
  timeS: Float64Array;
  voltageV: Float64Array;
  /** The time column's header as written (a unit in it counts as stated). */
  timeColumn: string;
  videoDurationS: number;
  gapM: number;
  file: string;
}

const MAX_VOLTAGE_V = 1e6;
const MAX_FIELD_V_PER_M = 1e8;

export function checkLogUnits(i: LogUnitInput): void {
  const n = i.timeS.length;
  const unitStated = /ms|_s\b|\(s\)|\[s\]|\/\s*s|sec|min|us|µs|stamp/i.test(i.timeColumn) || /_s$/i.test(i.timeColumn.trim());
  if (n >= 3 && !unitStated && i.videoDurationS > 0) {
    const span = i.timeS[n - 1]! - i.timeS[0]!;
    const d: number[] = [];
    for (let k = 1; k < n; k++) d.push(i.timeS[k]! - i.timeS[k - 1]!);
    d.sort((a, b) => a - b);
    const median = d[d.length >> 1]!;
    if (span > 50 * i.videoDurationS && median >= 1) {
      throw new KerrError('BAD_CSV', `the time column "${i.timeColumn}" of ${i.file} spans ${span.toFixed(0)} units with samples ${median} apart, but the video lasts ${i.videoDurationS.toFixed(1)} s: it looks like milliseconds`, { path: i.file, hint: 'Name the column time_ms (or convert it to seconds)' });
    }
  }
  let vMax = 0;
  for (const v of i.voltageV) if (Number.isFinite(v)) vMax = Math.max(vMax, Math.abs(v));
  if (vMax > MAX_VOLTAGE_V || vMax / i.gapM > MAX_FIELD_V_PER_M) {
    throw new KerrError('BAD_CSV', `the voltage log ${i.file} reaches ${vMax.toExponential(2)} V, a field of ${(vMax / i.gapM / 1e6).toExponential(2)} kV/mm across the gap: no liquid holds that`, { path: i.file, hint: 'Check the voltage unit (name the column voltage_kV or voltage_mV) and the electrode gap', inputs: ['gap'] });
  }
}
