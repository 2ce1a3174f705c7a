/**
 * How much the least-squares standard errors of a fit must grow because neighbouring frames share
 * their errors (compression, log interpolation, slow flicker): the residuals are correlated in
 * time, so the frames are fewer independent measurements than their count.
 *
 * Method (per parameter j). To first order the estimate's error is a sum over frames,
 *   θ̂_j − θ_j ≈ Σ_t x_t,  x_t = (A⁻¹·w_t·r_t·g_t)_j,  A = Σ_t w_t·g_t·g_tᵀ,
 * with g_t the model gradient, r_t the residual and w_t the weight of frame t (in time order).
 * Independent frames give Var = Σ x_t²; correlated frames give the long-run variance
 *   LRV = Σ_t Σ_s E[x_t·x_s],
 * estimated by a heteroscedasticity-and-autocorrelation-consistent (HAC) estimator with AR(1)
 * prewhitening: ρ̂ from the lag-1 regression of x on itself, e_t = x_t − ρ̂·x_{t−1}, a Bartlett-
 * kernel sum of e's autocovariances with Andrews' plug-in bandwidth, recoloured by 1/(1 − ρ̂)²
 * (Newey & West, Econometrica 55, 703 (1987); Andrews, Econometrica 59, 817 (1991); Andrews &
 * Monahan, Econometrica 60, 953 (1992)). The ratio LRV/Σx² is n/n_eff, the number of frames per
 * independent one; for AR(1) residuals it tends to (1 + ρ)/(1 − ρ), the classic
 * n_eff = n·(1 − ρ)/(1 + ρ). Unlike that lag-1 formula, the sum also catches correlation that
 * decays more slowly than AR(1) and is specific to the parameter (frames that carry no
 * information about V_π, at zero field, do not count).
 *
 * Returned: per parameter the inflation factor √max(1, LRV/Σx²) (never below 1: an anticorrelated
 * series is not trusted to shrink an error) and n_eff = n·Σx²/LRV. ρ̂ is capped at 0.97 so that
 * the recolouring stays finite (a cap reported through `capped`).
 * Pure; throws nothing (a singular A gives inflation 1 and n_eff = n with `singular` set).
 * @example correlatedErrorInflation(gradRows, residuals, weights, 3).inflation → [1.1, 2.9, 3.0]
 */
export interface ErrorInflation {
  /** Factor on each parameter's standard error, ≥ 1. */
  inflation: number[];
  /** Effective number of independent frames per parameter. */
  effectiveFrames: number[];
  /** Lag-1 prewhitening coefficient per parameter. */
  lagOne: number[];
  /** Bartlett bandwidth used per parameter, frames. */
  bandwidth: number[];
  capped: boolean;
  singular: boolean;
}

const RHO_CAP = 0.97;

export function correlatedErrorInflation(gradientRows: Float64Array, residuals: Float64Array, weights: Float64Array, nParams: number): ErrorInflation {
  const n = residuals.length;
  const p = nParams;
  const identity = (singular: boolean): ErrorInflation => ({
    inflation: new Array<number>(p).fill(1), effectiveFrames: new Array<number>(p).fill(n), lagOne: new Array<number>(p).fill(0), bandwidth: new Array<number>(p).fill(0), capped: false, singular,
  });
  if (n < 8) return identity(false);
  const a = new Float64Array(p * p);
  for (let t = 0; t < n; t++) {
    const w = weights[t]!;
    for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) a[i * p + j] += w * gradientRows[t * p + i]! * gradientRows[t * p + j]!;
  }
  const inv = invertSmall(a, p);
  if (!inv) return identity(true);
  const out = identity(false);
  const x = new Float64Array(n);
  for (let j = 0; j < p; j++) {
    for (let t = 0; t < n; t++) {
      let s = 0;
      for (let k = 0; k < p; k++) s += inv[j * p + k]! * gradientRows[t * p + k]!;
      x[t] = s * weights[t]! * residuals[t]!;
    }
    let sum2 = 0;
    for (let t = 0; t < n; t++) sum2 += x[t]! * x[t]!;
    if (!(sum2 > 0)) continue;
    const { lrv, rho, bandwidth, capped } = prewhitenedLongRunVariance(x);
    const ratio = lrv / sum2;
    out.inflation[j] = Math.sqrt(Math.max(1, ratio));
    out.effectiveFrames[j] = ratio > 0 ? Math.min(n, n / ratio) : n;
    out.lagOne[j] = rho;
    out.bandwidth[j] = bandwidth;
    out.capped ||= capped;
  }
  return out;
}

/** Long-run variance Σ_t Σ_s x_t·x_s of a zero-mean series, AR(1)-prewhitened Bartlett HAC. */
function prewhitenedLongRunVariance(x: Float64Array): { lrv: number; rho: number; bandwidth: number; capped: boolean } {
  const n = x.length;
  let num = 0, den = 0;
  for (let t = 1; t < n; t++) { num += x[t]! * x[t - 1]!; den += x[t - 1]! * x[t - 1]!; }
  let rho = den > 0 ? num / den : 0;
  const capped = Math.abs(rho) > RHO_CAP;
  rho = Math.max(-RHO_CAP, Math.min(RHO_CAP, rho));
  const e = new Float64Array(n - 1);
  for (let t = 1; t < n; t++) e[t - 1] = x[t]! - rho * x[t - 1]!;
  // Andrews' AR(1) plug-in bandwidth for the Bartlett kernel, on the prewhitened series.
  let en = 0, ed = 0;
  for (let t = 1; t < e.length; t++) { en += e[t]! * e[t - 1]!; ed += e[t - 1]! * e[t - 1]!; }
  const r = Math.max(-RHO_CAP, Math.min(RHO_CAP, ed > 0 ? en / ed : 0));
  const alpha = (4 * r * r) / ((1 - r) ** 2 * (1 + r) ** 2);
  const bandwidth = Math.min(Math.floor(e.length / 4), Math.max(1, Math.ceil(1.1447 * Math.cbrt(alpha * e.length))));
  let lrvE = 0;
  for (let t = 0; t < e.length; t++) lrvE += e[t]! * e[t]!;
  for (let l = 1; l <= bandwidth; l++) {
    let g = 0;
    for (let t = l; t < e.length; t++) g += e[t]! * e[t - l]!;
    lrvE += 2 * (1 - l / (bandwidth + 1)) * g;
  }
  // n/(n−1) restores the frame lost to the lag; recolour by 1/(1 − ρ)².
  const lrv = (Math.max(lrvE, 0) * n) / (n - 1) / (1 - rho) ** 2;
  return { lrv, rho, bandwidth, capped };
}

/** Inverse of a small symmetric positive-definite matrix by Gauss–Jordan with pivoting; null when singular. */
function invertSmall(m: Float64Array, p: number): Float64Array | null {
  const a = Float64Array.from(m);
  const inv = new Float64Array(p * p);
  for (let i = 0; i < p; i++) inv[i * p + i] = 1;
  let scale = 0;
  for (let i = 0; i < p; i++) scale = Math.max(scale, Math.abs(a[i * p + i]!));
  for (let c = 0; c < p; c++) {
    let piv = c;
    for (let r = c + 1; r < p; r++) if (Math.abs(a[r * p + c]!) > Math.abs(a[piv * p + c]!)) piv = r;
    if (!(Math.abs(a[piv * p + c]!) > 1e-14 * scale)) return null;
    if (piv !== c) for (let k = 0; k < p; k++) {
      [a[c * p + k], a[piv * p + k]] = [a[piv * p + k]!, a[c * p + k]!];
      [inv[c * p + k], inv[piv * p + k]] = [inv[piv * p + k]!, inv[c * p + k]!];
    }
    const d = a[c * p + c]!;
    for (let k = 0; k < p; k++) { a[c * p + k] = a[c * p + k]! / d; inv[c * p + k] = inv[c * p + k]! / d; }
    for (let r = 0; r < p; r++) {
      if (r === c) continue;
      const f = a[r * p + c]!;
      if (f === 0) continue;
      for (let k = 0; k < p; k++) { a[r * p + k] = a[r * p + k]! - f * a[c * p + k]!; inv[r * p + k] = inv[r * p + k]! - f * inv[c * p + k]!; }
    }
  }
  return inv;
}
