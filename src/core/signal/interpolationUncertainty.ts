/**
 * How uncertain a linearly interpolated voltage is at each query time. Two parts, added in
 * quadrature: the logger's random noise σ_noise, and the interpolation error where the signal
 * bends between samples (a step faster than the logging interval, a ramp corner). The second is
 * estimated from the second differences Δ²v at the two samples bracketing the query: their excess
 * over what noise alone gives (3·√6·σ_noise), halved, is the scale of the error of a straight
 * line drawn across the bend.
 *   σ_i² = σ_noise² + (½·max(0, max(|Δ²v_k|, |Δ²v_{k+1}|) − 3√6·σ_noise))²
 * Pure; NaN for queries outside the log. Sample times must increase strictly.
 */
export function interpolationUncertaintyV(timeS: Float64Array, valueV: Float64Array, queryS: ArrayLike<number>, noiseV: number): Float64Array {
  const n = timeS.length;
  const m = queryS.length;
  const out = new Float64Array(m);
  const bend = new Float64Array(n);
  const noiseLevel = 3 * Math.sqrt(6) * noiseV;
  for (let k = 1; k < n - 1; k++) {
    const d2 = Math.abs(valueV[k + 1]! - 2 * valueV[k]! + valueV[k - 1]!);
    bend[k] = Math.max(0, d2 - noiseLevel) / 2;
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
    const b = Math.max(bend[k]!, bend[Math.min(n - 1, k + 1)]!);
    out[i] = Math.sqrt(noiseV * noiseV + b * b);
  }
  return out;
}
