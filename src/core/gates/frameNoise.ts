/**
 * The frame-to-frame noise of a measured series, from its second differences: for white noise of
 * standard deviation σ on a locally smooth signal, Δ²I_k = I_{k+1} − 2·I_k + I_{k−1} has standard
 * deviation σ·√6, and a robust scale (1.4826·MAD) ignores the few large values at steps, sparks
 * and particles. Used to judge the fit's residual RMS: a model that describes the data leaves
 * residuals of about this size (somewhat more where compression makes neighbouring frames share
 * errors, which differences do not see); a log from another recording, a wrong branch or a
 * wrong sync leave far more.
 * Pure. Returns NaN for fewer than 5 frames. Units: those of the series.
 * @example frameNoise(Float64Array.from([0, 1, 2, 3, 4, 5])) → 0
 */
export function frameNoise(series: ArrayLike<number>): number {
  const n = series.length;
  if (n < 5) return NaN;
  const d2: number[] = [];
  for (let k = 1; k < n - 1; k++) {
    const v = series[k + 1]! - 2 * series[k]! + series[k - 1]!;
    if (Number.isFinite(v)) d2.push(v);
  }
  if (d2.length < 3) return NaN;
  d2.sort((a, b) => a - b);
  const med = d2[d2.length >> 1]!;
  const dev = d2.map((x) => Math.abs(x - med)).sort((a, b) => a - b);
  return (1.4826 * dev[dev.length >> 1]!) / Math.sqrt(6);
}
