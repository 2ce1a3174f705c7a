/**
 * percentileSorted(sorted, qHigh) − percentileSorted(sorted, qLow) of an unsorted sample (Hyndman &
 * Fan definition 7, as percentileSorted) without sorting it: the four order statistics needed are
 * found by selection (Hoare's quickselect, median-of-three pivots), O(n) on average instead of
 * O(n log n). The result is the same double as sorting and calling percentileSorted twice, because
 * the same order statistics enter the same formula. A sample holding NaN or −0 (where selection and
 * Float64Array#sort could order values differently) is sorted instead, as is one where selection
 * keeps failing to split.
 *
 * Reorders `values` in place (a scratch copy). 0 ≤ qLow ≤ qHigh ≤ 1. NaN for an empty sample.
 * @example percentileSpread(Float64Array.of(5, 1, 4, 2, 3), 0.05, 0.95) → 4.8 − 1.2 = 3.6
 */
import { percentileSorted } from './percentileSorted.js';

export function percentileSpread(values: Float64Array, qLow: number, qHigh: number): number {
  const n = values.length;
  if (n === 0) return NaN;
  for (let i = 0; i < n; i++) {
    const v = values[i]!;
    if (v !== v || (v === 0 && 1 / v < 0)) return sortedSpread(values, qLow, qHigh);
  }
  const posLow = qLow * (n - 1), posHigh = qHigh * (n - 1);
  const loLow = Math.floor(posLow), loHigh = Math.floor(posHigh);
  // values[loLow] in place, smaller ones before it, larger or equal after it
  if (!select(values, loLow, 0, n - 1)) return sortedSpread(values, qLow, qHigh);
  const aLow = values[loLow]!;
  const bLow = loLow + 1 < n ? minOf(values, loLow + 1, n - 1) : aLow;
  let aHigh = aLow;
  if (loHigh > loLow) {
    if (!select(values, loHigh, loLow + 1, n - 1)) return sortedSpread(values, qLow, qHigh);
    aHigh = values[loHigh]!;
  }
  const bHigh = loHigh + 1 < n ? minOf(values, loHigh + 1, n - 1) : aHigh;
  const high = aHigh + (bHigh - aHigh) * (posHigh - loHigh);
  const low = aLow + (bLow - aLow) * (posLow - loLow);
  return high - low;
}

function sortedSpread(values: Float64Array, qLow: number, qHigh: number): number {
  values.sort();
  return percentileSorted(values, qHigh) - percentileSorted(values, qLow);
}

function minOf(a: Float64Array, from: number, to: number): number {
  let m = a[from]!;
  for (let i = from + 1; i <= to; i++) if (a[i]! < m) m = a[i]!;
  return m;
}

/** Puts the k-th smallest of a[left..right] at a[k], with a[left..k−1] ≤ a[k] ≤ a[k+1..right]; false if it gave up. */
function select(a: Float64Array, k: number, left: number, right: number): boolean {
  for (let rounds = 0; right > left; rounds++) {
    if (rounds > 64) return false;
    // median of three as the pivot
    const mid = (left + right) >> 1;
    if (a[mid]! < a[left]!) swap(a, mid, left);
    if (a[right]! < a[left]!) swap(a, right, left);
    if (a[right]! < a[mid]!) swap(a, right, mid);
    const pivot = a[mid]!;
    let i = left, j = right;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) { swap(a, i, j); i++; j--; }
    }
    // now a[left..j] ≤ pivot ≤ a[i..right], and a[j+1..i−1] = pivot
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else return true;
  }
  return true;
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i]!;
  a[i] = a[j]!;
  a[j] = t;
}
