/**
 * How uncertain the interpolated voltage is at each query time. Two parts, added in quadrature:
 * the logger's random noise σ_noise, and the interpolation error where the signal bends between
 * samples (a step faster than the logging interval, a ramp corner). The bend at sample k is
 * measured in time, not sample index: the divided second difference
 *   c_k = 2·[(v_{k+1} − v_k)/h_k − (v_k − v_{k−1})/h_{k−1}]/(h_k + h_{k−1})   (V/s², an estimate of v'')
 * times the squared mean interval h̄_k² = ((h_k + h_{k−1})/2)² gives the bend in volts, which on an
 * even log is the plain second difference Δ²v. Its excess over what noise alone gives (3·√6·σ_noise),
 * halved, is the scale of the error across the bend; for the interval [t_k, t_{k+1}] holding the
 * query it is scaled by (h_k/h̄)² (a chord's error grows with the square of its length), using the
 * larger of the two bracketing samples:
 *   σ_i² = σ_noise² + (½·max_j(max(0, |c_j|·h̄_j² − 3√6·σ_noise)·(h_k/h̄_j)²))²,  j ∈ {k, k+1}
 * So a frame between two samples far apart keeps a large uncertainty (and a small weight in the
 * fit) instead of the weight of a frame between close samples.
 * Pure; NaN for queries outside the log. Sample times must increase strictly.
 * @example interpolationUncertaintyV(Float64Array.of(0, 1, 2), Float64Array.of(0, 1, 2), [0.5], 0.1) → [0.1]
 */
export function interpolationUncertaintyV(timeS: Float64Array, valueV: Float64Array, queryS: ArrayLike<number>, noiseV: number): Float64Array {
  const n = timeS.length;
  const m = queryS.length;
  const out = new Float64Array(m);
  const bend = new Float64Array(n);
  const meanH = new Float64Array(n).fill(1);
  const noiseLevel = 3 * Math.sqrt(6) * noiseV;
  for (let k = 1; k < n - 1; k++) {
    const h0 = timeS[k]! - timeS[k - 1]!;
    const h1 = timeS[k + 1]! - timeS[k]!;
    const c = (2 * ((valueV[k + 1]! - valueV[k]!) / h1 - (valueV[k]! - valueV[k - 1]!) / h0)) / (h0 + h1);
    const hb = (h0 + h1) / 2;
    meanH[k] = hb;
    bend[k] = Math.max(0, Math.abs(c) * hb * hb - noiseLevel) / 2;
  }
  let k = 0;
  for (let i = 0; i < m; i++) {
    const q = queryS[i]!;
    if (!(q >= timeS[0]! && q <= timeS[n - 1]!)) {
      out[i] = NaN;
      continue;
    }
    if (q < timeS[k]!) k = 0;
    while (k < n - 2 && timeS[k + 1]! < q) k++;
    const hk = n > 1 ? timeS[Math.min(n - 1, k + 1)]! - timeS[k]! : 0;
    let b = 0;
    for (const j of [k, Math.min(n - 1, k + 1)]) if (bend[j]! > 0) b = Math.max(b, bend[j]! * (hk / meanH[j]!) ** 2);
    out[i] = Math.sqrt(noiseV * noiseV + b * b);
  }
  return out;
}
