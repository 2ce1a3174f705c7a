import { invalid } from '../../errors.js';
import { normalMatrixInverse } from '../linalg/normalMatrixInverse.js';
import { levenbergMarquardt, type CurveModel, type LmOptions, type LmResult } from './levenbergMarquardt.js';
import { numericGradient } from './numericGradient.js';
import { robustScale } from './robustScale.js';

export interface RobustOptions extends LmOptions {
  /** Huber tuning constant in robust standard deviations. Default 1.345 (95 % efficiency at the normal). */
  huberK?: number;
  /** Cap on reweighting rounds after the first plain fit. Default 50. */
  maxReweights?: number;
  /** A point is flagged as an outlier when |r_i| > outlierSigmas·s. Default 4. */
  outlierSigmas?: number;
  /**
   * Rounds stop when every parameter moves by less than reweightTol·(|p_j| + stdErr_j), or when no
   * Huber weight changed by more than 1e-6 in the round. Default 1e-8.
   */
  reweightTol?: number;
}

export interface RobustResult extends LmResult {
  /** Huber weights in [0, 1], one per input point (0 where the caller's weight was 0). */
  weights: Float64Array;
  /** 1 where |r_i| > outlierSigmas·robustScale (a spike, spark or particle), else 0. */
  outliers: Uint8Array;
  outlierCount: number;
  /** MAD-based scale s of the (caller-weighted) residuals at the final parameters. */
  robustScale: number;
  /** Reweighting rounds run (each one LM fit), not counting the first plain fit. */
  reweights: number;
  /** True when the parameters settled before maxReweights ran out. */
  reweightsConverged: boolean;
}

const DEFAULT_HUBER_K = 1.345;
const DEFAULT_MAX_REWEIGHTS = 50;
const DEFAULT_OUTLIER_SIGMAS = 4;
const DEFAULT_REWEIGHT_TOL = 1e-8;
/** Rounds also stop when no Huber weight changed by more than this (weights settled). */
const WEIGHT_TOL = 1e-6;

/**
 * Robust nonlinear least squares: Huber M-estimation by iteratively reweighted Levenberg–Marquardt.
 *
 * Round 0 is the plain (caller-weighted) fit. Each further round takes the residuals
 * r_i = √w_i·(y_i − f(x_i)), their robust scale s = 1.4826·MAD (see `robustScale`), and the Huber
 * weights u_i = min(1, k·s/|r_i|) with k = 1.345, then refits from the current parameters with
 * weights w_i·u_i. Rounds stop when every parameter moves by less than reweightTol·(|p_j| + σ_j) or
 * no weight changes by more than 1e-6 (both mean the weights have settled), or after maxReweights.
 * Convergence is linear (each round shrinks the remaining error by a roughly constant factor). Huber's loss is quadratic within k·s and linear beyond, so a spike pulls the
 * fit with a bounded force (Huber, "Robust estimation of a location parameter", Ann. Math. Stat.
 * 1964; k = 1.345 gives 95 % efficiency for normal errors: Holland & Welsch, Comm. Stat. 1977;
 * IRLS with MAD rescaling as in Venables & Ripley, "Modern Applied Statistics with S", §6.5).
 *
 * The returned covariance and stdErr are Huber's asymptotic covariance of the M-estimate (see
 * `huberCovariance` below); rss, residualStdDev and the convergence fields are those of the final
 * weighted LM fit (weights w·u). Points with |r_i| > outlierSigmas·s (default 4)
 * are flagged in `outliers` and counted; they stay in the fit with their small Huber weight.
 * If s = 0 (more than half the points fitted exactly) reweighting stops: weights stay 1.
 *
 * Throws like `levenbergMarquardt`, and KerrError (BAD_ARGUMENT) for a non-positive huberK or
 * outlierSigmas or a negative maxReweights. The caller's arrays are never modified.
 *
 * @example
 * // a line y = 2x with one spike: fitRobust(line, x, yWithSpike, [1]).params[0] ≈ 2, outlierCount 1
 */
export function fitRobust(
  model: CurveModel,
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  start: ArrayLike<number>,
  options: RobustOptions = {},
): RobustResult {
  const huberK = options.huberK ?? DEFAULT_HUBER_K;
  const maxReweights = options.maxReweights ?? DEFAULT_MAX_REWEIGHTS;
  const outlierSigmas = options.outlierSigmas ?? DEFAULT_OUTLIER_SIGMAS;
  const reweightTol = options.reweightTol ?? DEFAULT_REWEIGHT_TOL;
  if (!(huberK > 0) || !Number.isFinite(huberK)) throw invalid('a positive Huber constant', 'huberK', huberK);
  if (!Number.isInteger(maxReweights) || maxReweights < 0) throw invalid('a whole number ≥ 0', 'maxReweights', maxReweights);
  if (!(outlierSigmas > 0)) throw invalid('a positive number of robust sigmas', 'outlierSigmas', outlierSigmas);
  if (!(reweightTol >= 0) || !Number.isFinite(reweightTol)) throw invalid('a finite tolerance ≥ 0', 'reweightTol', reweightTol);

  const n = x.length;
  const baseWeights = options.weights;
  const lmOptions: LmOptions = { ...options };
  const huber = new Float64Array(n);
  for (let i = 0; i < n; i++) huber[i] = baseWeights === undefined || baseWeights[i]! > 0 ? 1 : 0;
  const previousHuber = Float64Array.from(huber);
  const combined = new Float64Array(n);
  const residuals = new Float64Array(n);

  let result = levenbergMarquardt(model, x, y, start, lmOptions);
  let scale = scaledResiduals(model, result.params, x, y, baseWeights, residuals);
  let reweights = 0;
  let settled = maxReweights === 0;
  while (reweights < maxReweights && result.reason !== 'non-finite') {
    if (!(scale > 0)) {
      settled = true; // an exact fit of most points: nothing to downweight against
      break;
    }
    for (let i = 0; i < n; i++) {
      const base = baseWeights === undefined ? 1 : baseWeights[i]!;
      if (base === 0) {
        huber[i] = 0;
        combined[i] = 0;
        continue;
      }
      const size = Math.abs(residuals[i]!) / scale;
      huber[i] = size <= huberK ? 1 : huberK / size;
      combined[i] = base * huber[i]!;
    }
    reweights++;
    let weightChange = 0;
    for (let i = 0; i < n; i++) {
      weightChange = Math.max(weightChange, Math.abs(huber[i]! - previousHuber[i]!));
      previousHuber[i] = huber[i]!;
    }
    const previous = result;
    result = levenbergMarquardt(model, x, y, previous.params, { ...lmOptions, weights: combined });
    scale = scaledResiduals(model, result.params, x, y, baseWeights, residuals);
    let moved = false;
    for (let j = 0; j < model.nParams; j++) {
      const sigma = Number.isFinite(result.stdErr[j]!) ? result.stdErr[j]! : 0;
      if (Math.abs(result.params[j]! - previous.params[j]!) > reweightTol * (Math.abs(result.params[j]!) + sigma)) moved = true;
    }
    if (!moved || weightChange <= WEIGHT_TOL) {
      settled = true;
      break;
    }
  }

  const outliers = new Uint8Array(n);
  let outlierCount = 0;
  if (scale > 0) {
    for (let i = 0; i < n; i++) {
      if (baseWeightOf(baseWeights, i) > 0 && Math.abs(residuals[i]!) > outlierSigmas * scale) {
        outliers[i] = 1;
        outlierCount++;
      }
    }
  }
  const { covariance, stdErr } = huberCovariance(model, result, x, baseWeights, residuals, scale, huberK);
  return {
    ...result,
    covariance,
    stdErr,
    correlation: (i: number, j: number): number =>
      covariance[i * model.nParams + j]! / Math.sqrt(covariance[i * model.nParams + i]! * covariance[j * model.nParams + j]!),
    weights: huber,
    outliers,
    outlierCount,
    robustScale: scale,
    reweights,
    reweightsConverged: settled,
  };
}

function baseWeightOf(baseWeights: Float64Array | undefined, i: number): number {
  return baseWeights === undefined ? 1 : baseWeights[i]!;
}

/** r_i = √w_i·(y_i − f(x_i)) (NaN where w_i = 0) into `out`; returns their MAD scale. */
function scaledResiduals(
  model: CurveModel,
  params: Float64Array,
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  baseWeights: Float64Array | undefined,
  out: Float64Array,
): number {
  const at = Float64Array.from(params);
  for (let i = 0; i < x.length; i++) {
    const w = baseWeights === undefined ? 1 : baseWeights[i]!;
    out[i] = w > 0 ? Math.sqrt(w) * (y[i]! - model.value(at, x[i]!)) : Number.NaN;
  }
  return robustScale(out);
}

/**
 * Huber's asymptotic covariance of an M-estimate (Huber & Ronchetti, "Robust Statistics", 2nd ed.,
 * 2009, §7.6; the same formula as MASS::rlm, Venables & Ripley §6.5; from memory):
 *
 *   Cov = κ² · [Σψ(u_i)²/(n − p)] / [(Σψ′(u_i)/n)²] · s² · (JᵀW₀J)⁻¹,
 *   κ = 1 + (p/n)·Var(ψ′)/mean(ψ′)²,   u_i = r_i/s,   ψ(u) = max(−k, min(k, u)),
 *
 * with J the model Jacobian weighted only by the caller's weights W₀. Without outliers it reduces
 * to the least-squares covariance RSS/(n − p)·(JᵀJ)⁻¹. Falls back to the LM covariance when s is
 * not positive or the Jacobian is not usable.
 */
function huberCovariance(
  model: CurveModel,
  result: LmResult,
  x: ArrayLike<number>,
  baseWeights: Float64Array | undefined,
  residuals: Float64Array,
  scale: number,
  huberK: number,
): { covariance: Float64Array; stdErr: Float64Array } {
  const p = model.nParams;
  const fallback = { covariance: result.covariance, stdErr: result.stdErr };
  if (!(scale > 0)) return fallback;
  let n = 0;
  for (let i = 0; i < x.length; i++) if (baseWeightOf(baseWeights, i) > 0) n++;
  if (n <= p) return fallback;
  const at = Float64Array.from(result.params);
  const grad = new Float64Array(p);
  const jac = new Float64Array(n * p);
  let sumPsi2 = 0;
  let sumDpsi = 0;
  for (let i = 0, row = 0; i < x.length; i++) {
    const w = baseWeightOf(baseWeights, i);
    if (!(w > 0)) continue;
    const u = residuals[i]! / scale;
    const psi = Math.max(-huberK, Math.min(huberK, u));
    sumPsi2 += psi * psi;
    if (Math.abs(u) <= huberK) sumDpsi += 1;
    grad.fill(0);
    if (model.gradient) model.gradient(at, x[i]!, grad);
    else numericGradient(model.value, at, x[i]!, grad);
    const sw = Math.sqrt(w);
    for (let j = 0; j < p; j++) jac[row + j * n] = sw * grad[j]!;
    row++;
  }
  const meanDpsi = sumDpsi / n;
  if (!(meanDpsi > 0) || jac.some((v) => !Number.isFinite(v))) return fallback;
  const kappa = 1 + ((p / n) * (meanDpsi - meanDpsi * meanDpsi)) / (meanDpsi * meanDpsi);
  const factor = ((kappa * kappa * (sumPsi2 / (n - p))) / (meanDpsi * meanDpsi)) * scale * scale;
  const { inverse, rank } = normalMatrixInverse(jac, n, p);
  if (rank < p) return fallback;
  const covariance = inverse.map((v) => v * factor);
  const stdErr = new Float64Array(p);
  for (let j = 0; j < p; j++) stdErr[j] = Math.sqrt(covariance[j * p + j]!);
  return { covariance, stdErr };
}
