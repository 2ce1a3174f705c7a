/**
 * Merges consecutive voltage-log samples with equal times into one: the voltage, current and
 * temperature are averaged over the rows that have a finite value (NaN when none), the line kept
 * is the first row's. `duplicateTimes` counts the rows merged into an earlier one. The arrays come
 * back trimmed to the merged count. Never mutates its input.
 * @example times [0, 0, 1] with voltages [10, 20, 30] → times [0, 1], voltages [15, 30], duplicateTimes 1
 */
import type { RawLogSamples } from './readLogRows.js';

export interface MergedLogSamples {
  timeS: Float64Array;
  voltageV: Float64Array;
  currentA: Float64Array | null;
  temperatureC: Float64Array | null;
  /** 1-based line of each merged sample's first row. */
  lineOf: Int32Array;
  rows: number;
  duplicateTimes: number;
}

export function mergeEqualTimes(raw: RawLogSamples): MergedLogSamples {
  const { count } = raw;
  const timeS = new Float64Array(count);
  const voltageV = new Float64Array(count);
  const currentA = raw.currentA !== null ? new Float64Array(count) : null;
  const temperatureC = raw.temperatureC !== null ? new Float64Array(count) : null;
  const lineOf = new Int32Array(count);
  let rows = 0;
  let duplicateTimes = 0;
  for (let start = 0; start < count; ) {
    let end = start + 1;
    while (end < count && raw.timeS[end] === raw.timeS[start]) end++;
    timeS[rows] = raw.timeS[start];
    lineOf[rows] = raw.lineOf[start];
    voltageV[rows] = meanOf(raw.voltageV, start, end);
    if (currentA !== null) currentA[rows] = meanOf(raw.currentA!, start, end);
    if (temperatureC !== null) temperatureC[rows] = meanOf(raw.temperatureC!, start, end);
    duplicateTimes += end - start - 1;
    rows++;
    start = end;
  }
  const shrink = (a: Float64Array | null): Float64Array | null => (a === null ? null : a.slice(0, rows));
  return { timeS: shrink(timeS)!, voltageV: shrink(voltageV)!, currentA: shrink(currentA), temperatureC: shrink(temperatureC), lineOf: lineOf.slice(0, rows), rows, duplicateTimes };
}

/** Mean of a[start..end) over the finite entries; NaN when none. */
function meanOf(a: Float64Array, start: number, end: number): number {
  if (end - start === 1) return a[start];
  let sum = 0;
  let n = 0;
  for (let i = start; i < end; i++) {
    if (Number.isFinite(a[i])) {
      sum += a[i];
      n++;
    }
  }
  return n > 0 ? sum / n : Number.NaN;
}
