/**
 * Running median of a per-frame series over the frames that count, a model of the series that
 * keeps its steps and ramps and drops short excursions:
 *
 *   M_t = median{ x_s : s included, |k(s) − k(t)| ≤ h }
 *
 * where k(·) numbers the included frames in time order (excluded frames are skipped, not
 * bridged with values). A median over 2h + 1 samples passes a step unchanged and removes any
 * excursion lasting h samples or fewer (Tukey 1977, "Exploratory Data Analysis", ch. 7: running
 * medians), which is what a particle passage or a spark looks like against a stepped or ramped
 * drive. Near the ends the window is cut short (fewer samples, still centred where it can be).
 *
 * Units: those of `values`. Returns NaN for frames not included. Pure; never mutates its inputs.
 * Throws KerrError INTERNAL for series of different length or a negative half-width.
 * @example runningMedian(Float64Array.of(1, 1, 9, 1, 1), Uint8Array.of(1, 1, 1, 1, 1), 1) → [1, 1, 1, 1, 1]
 */
import { KerrError } from '../../errors.js';

export function runningMedian(values: Float64Array, include: Uint8Array, halfWindow: number): Float64Array {
  if (include.length !== values.length) throw new KerrError('INTERNAL', 'values and include series must have one entry per frame');
  if (!(halfWindow >= 0) || !Number.isInteger(halfWindow)) throw new KerrError('INTERNAL', `running-median half-width must be a whole number ≥ 0, got ${halfWindow}`);
  const idx: number[] = [];
  for (let f = 0; f < values.length; f++) if (include[f] && Number.isFinite(values[f]!)) idx.push(f);
  const out = new Float64Array(values.length).fill(NaN);
  const window: number[] = [];
  for (let k = 0; k < idx.length; k++) {
    window.length = 0;
    for (let j = Math.max(0, k - halfWindow); j <= Math.min(idx.length - 1, k + halfWindow); j++) window.push(values[idx[j]!]!);
    window.sort((a, b) => a - b);
    const mid = window.length >> 1;
    out[idx[k]!] = window.length % 2 === 1 ? window[mid]! : (window[mid - 1]! + window[mid]!) / 2;
  }
  return out;
}
