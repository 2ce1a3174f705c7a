/**
 * Binary searches over a sorted time array (s), as used by the synchronisation search:
 * - `lowerBound(t)`: the first index with times[index] ≥ t (times.length when none);
 * - `upperBound(t)`: the first index with times[index] > t;
 * - `segmentIndex(t)`: the index j of the segment [times[j], times[j+1]] holding t, clamped to
 *   the first and last segment (times must hold at least 2 entries, strictly increasing).
 * Times must be non-decreasing. O(log n) each; never mutates the array.
 * @example lowerBound(Float64Array.of(0, 1, 1, 2), 1) // 1; upperBound(…, 1) // 3; segmentIndex(Float64Array.of(0, 1, 2), 1.5) // 1
 */
export function lowerBound(timeS: Float64Array, t: number): number {
  let lo = 0;
  let hi = timeS.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (timeS[mid] < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

export function upperBound(timeS: Float64Array, t: number): number {
  let lo = 0;
  let hi = timeS.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (timeS[mid] <= t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

export function segmentIndex(timeS: Float64Array, t: number): number {
  let lo = 0;
  let hi = timeS.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >>> 1;
    if (timeS[mid] <= t) lo = mid;
    else hi = mid;
  }
  return lo;
}
