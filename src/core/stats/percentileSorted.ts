/**
 * The q-quantile (0 ≤ q ≤ 1) of an ascending sample by linear interpolation between order
 * statistics (Hyndman & Fan definition 7, the default of R and NumPy). NaN for an empty sample.
 * @example percentileSorted(Float64Array.of(1, 2, 3, 4), 0.5) → 2.5
 */
export function percentileSorted(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const pos = q * (n - 1);
  const lo = Math.floor(pos);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo]! + (sorted[hi]! - sorted[lo]!) * (pos - lo);
}
