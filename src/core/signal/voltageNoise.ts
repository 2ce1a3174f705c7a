/**
 * Random noise of a sampled signal from its second differences:
 * for white noise of standard deviation σ on a locally linear signal, Δ²v_k = v_{k+1} − 2v_k + v_{k−1}
 * has standard deviation σ·√6. A robust scale (1.4826·MAD) of Δ²v ignores the few large values at
 * steps and ramp corners, so σ ≈ 1.4826·median|Δ²v − median Δ²v| / √6.
 * Assumes roughly even sampling (irregular sampling only widens the estimate a little on ramps).
 * Pure. Returns 0 for fewer than 5 samples.
 * @example voltageNoiseV(Float64Array.from([0, 10, 20, 30, 40])) → 0
 */
export function voltageNoiseV(voltageV: ArrayLike<number>): number {
  const n = voltageV.length;
  if (n < 5) return 0;
  const d2 = new Float64Array(n - 2);
  for (let k = 1; k < n - 1; k++) d2[k - 1] = voltageV[k + 1]! - 2 * voltageV[k]! + voltageV[k - 1]!;
  const sorted = Float64Array.from(d2).sort();
  const med = sorted[sorted.length >> 1]!;
  const dev = Float64Array.from(d2, (x) => Math.abs(x - med)).sort();
  return (1.4826 * dev[dev.length >> 1]!) / Math.sqrt(6);
}
