/**
 * Linear interpolation of a sampled signal at query times: for t_i ≤ q ≤ t_{i+1},
 * y(q) = y_i + (y_{i+1} − y_i)·(q − t_i)/(t_{i+1} − t_i). NaN outside [t_0, t_{n−1}] and for NaN
 * queries (no extrapolation). Source: textbook piecewise-linear interpolation.
 *
 * Cost: O(n + m) when the queries are sorted (frame times are), a binary search per query
 * otherwise. Units are the caller's (times in s, values in V for a voltage log).
 *
 * Throws KerrError BAD_ARGUMENT when the sample arrays differ in length, are empty, when the
 * sample times are not strictly increasing, or when `out` is shorter than the queries.
 * Never mutates its inputs; writes into `out` when given (and returns it).
 *
 * @example interpolateAt(Float64Array.of(0, 1), Float64Array.of(0, 10), [0.25, 2]) → [2.5, NaN]
 */
import { invalid } from '../../errors.js';

export function interpolateAt(
  timeS: Float64Array,
  valueV: Float64Array,
  queryS: ArrayLike<number>,
  out?: Float64Array,
): Float64Array {
  const n = timeS.length;
  const m = queryS.length;
  if (n === 0) throw invalid('at least one sample', 'interpolateAt(timeS)', 'an empty array');
  if (valueV.length !== n) throw invalid(`${n} values (one per sample time)`, 'interpolateAt(valueV)', `${valueV.length} values`);
  for (let i = 1; i < n; i++) {
    if (!(timeS[i] > timeS[i - 1])) {
      throw invalid('strictly increasing sample times', 'interpolateAt(timeS)', `${timeS[i]} after ${timeS[i - 1]} at index ${i}`);
    }
  }
  const result = out ?? new Float64Array(m);
  if (result.length < m) throw invalid(`an output array of at least ${m} entries`, 'interpolateAt(out)', `${result.length} entries`);

  const first = timeS[0];
  const last = timeS[n - 1];
  let sorted = true;
  for (let k = 1; k < m && sorted; k++) if (queryS[k] < queryS[k - 1]) sorted = false;

  let i = 0; // segment index for the sorted walk: timeS[i] ≤ q < timeS[i+1]
  for (let k = 0; k < m; k++) {
    const q = queryS[k];
    if (!(q >= first && q <= last)) {
      result[k] = Number.NaN;
      continue;
    }
    if (n === 1 || q === last) {
      result[k] = valueV[n - 1];
      continue;
    }
    if (sorted) {
      while (timeS[i + 1] <= q) i++;
    } else {
      let lo = 0;
      let hi = n - 1; // invariant: timeS[lo] ≤ q < timeS[hi]
      while (hi - lo > 1) {
        const mid = (lo + hi) >>> 1;
        if (timeS[mid] <= q) lo = mid;
        else hi = mid;
      }
      i = lo;
    }
    const t0 = timeS[i];
    const fraction = (q - t0) / (timeS[i + 1] - t0);
    result[k] = valueV[i] + (valueV[i + 1] - valueV[i]) * fraction;
  }
  return result;
}
