import { invalid } from '../../errors.js';
import { applyQrTranspose, householderQr } from '../linalg/householderQr.js';
import { dampedTriangularSolve } from '../linalg/dampedTriangularSolve.js';
import { normalMatrixInverse } from '../linalg/normalMatrixInverse.js';
import { numericGradient } from './numericGradient.js';

/** A model y = f(params, x) with one scalar predictor. */
export interface CurveModel {
  nParams: number;
  value(params: Float64Array, x: number): number;
  /** Optional analytic gradient d value / d param_j into out[j]; numeric central differences otherwise. */
  gradient?(params: Float64Array, x: number, out: Float64Array): void;
}

export interface LmOptions {
  /** Cap on Jacobian evaluations (outer iterations). Default 500. */
  maxIterations?: number;
  /** Stop when the scaled step ‖D·Δp‖ ≤ xtol·‖D·p‖. Default 1e-12. */
  xtol?: number;
  /** Stop when actual and predicted relative RSS reductions are both ≤ ftol. Default 1e-14. */
  ftol?: number;
  /** Stop when the largest cosine between the residual vector and a Jacobian column is ≤ gtol. Default 1e-15. */
  gtol?: number;
  /** Per-point weights w_i ≥ 0 (1/σ_i² for known errors). Points with w_i = 0 are left out entirely. */
  weights?: Float64Array;
  /** Per-parameter lower bounds (use -Infinity for none). */
  lower?: ArrayLike<number>;
  /** Per-parameter upper bounds (use Infinity for none). */
  upper?: ArrayLike<number>;
}

export type LmReason = 'xtol' | 'ftol' | 'gtol' | 'max-iterations' | 'singular' | 'non-finite';

export interface LmResult {
  params: Float64Array;
  stdErr: Float64Array;
  /** p×p row-major, (JᵀWJ)⁻¹·RSS/(n−p). NaN when the Jacobian is rank-deficient at the result. */
  covariance: Float64Array;
  correlation(i: number, j: number): number;
  /** Weighted residual sum of squares Σ w_i·(y_i − f(x_i))². */
  rss: number;
  /** √(RSS/dof). */
  residualStdDev: number;
  /** Points with positive weight minus parameters. */
  dof: number;
  /** Jacobian evaluations (outer iterations) used. */
  iterations: number;
  /** Model evaluations over all points (residual vectors computed, Jacobians excluded). */
  evaluations: number;
  converged: boolean;
  reason: LmReason;
}

const DEFAULT_MAX_ITERATIONS = 500;
const DEFAULT_XTOL = 1e-12;
const DEFAULT_FTOL = 1e-14;
const DEFAULT_GTOL = 1e-15;
/** Marquardt's damping relative to the Moré-scaled diagonal at the start. */
const INITIAL_LAMBDA = 1e-3;
/** A trial step is accepted when the actual RSS reduction is at least this fraction of the predicted one. */
const ACCEPT_RATIO = 1e-4;
/** "Delayed gratification" damping update: λ ÷ 3 after an accepted step, λ × 2 after a rejected one. */
const LAMBDA_DOWN = 3;
const LAMBDA_UP = 2;
/** Cap on rejected trial steps within one outer iteration (λ can grow by 2^60 ≈ 1e18 in one iteration). */
const MAX_TRIALS_PER_ITERATION = 60;

/**
 * Weighted nonlinear least squares by the Levenberg–Marquardt method: minimise
 * RSS(p) = Σ_i w_i·(y_i − f(p, x_i))².
 *
 * Each iteration takes the Jacobian J (analytic from `model.gradient`, else central differences),
 * factors J·P = Q·R by pivoted Householder QR, and for the current damping λ solves
 * min ‖J·Δ + e‖² + λ·‖D·Δ‖² with Givens rotations on R (never forming JᵀJ, so ill-conditioned
 * problems stay accurate). D holds Moré's scaling: the largest column norms of J seen so far
 * (Moré, "The Levenberg–Marquardt algorithm: implementation and theory", LNM 630, 1978). A trial
 * is accepted when ρ = actual/predicted RSS reduction > 1e-4; then λ ← λ/3, otherwise λ ← 2λ (the
 * "delayed gratification" update of Transtrum & Sethna, "Improvements to the Levenberg–Marquardt
 * algorithm for nonlinear least-squares minimization", arXiv:1201.5885, 2012; with it all 16 NIST
 * StRD sets reach the certified values from both starts, where Nielsen's ρ-based update missed
 * BoxBOD start 1).
 * Stops on xtol, ftol or gtol (the tests of MINPACK-1, Moré, Garbow & Hillstrom, ANL-80-74, 1980)
 * or on the iteration cap. Long curved valleys are slow: NIST Bennett5 takes about 250–320
 * iterations.
 *
 * Bounds, when given, are enforced by an active set with projection: the start is clamped into
 * [lower, upper]; each iteration holds a parameter that sits on a bound while the descent direction
 * points outward, solves the damped step for the others, clamps the trial point into the box and
 * uses the predicted reduction of the clamped step (a projected Levenberg–Marquardt, in the spirit of
 * Kanzow, Yamashita & Fukushima, J. Comput. Appl. Math. 172, 2004). A parameter that ends on a bound
 * keeps the unconstrained covariance formula (its standard error is then only indicative).
 *
 * Result: covariance = (JᵀWJ)⁻¹·RSS/(n − p) at the final parameters (Bates & Watts, "Nonlinear
 * Regression Analysis and Its Applications", 1988, §2.3); stdErr = √diag. Reason 'singular' when the
 * Jacobian there has numerical rank < p (the data do not determine every parameter; stdErr NaN);
 * 'non-finite' when the model gives NaN/±Infinity at the start or in a Jacobian.
 * The caller's arrays are never modified. Units are those of x, y and the parameters.
 *
 * Throws KerrError (BAD_ARGUMENT) on mismatched lengths, non-finite data at points with positive
 * weight, negative weights, bad bounds or options; (NOT_IDENTIFIABLE) with fewer points than
 * parameters.
 *
 * @example
 * // y = a·exp(−b·x) through (0, 2), (1, 2e^−1), (2, 2e^−2) from (1, 1): params ≈ [2, 1], rss ≈ 0
 * levenbergMarquardt({ nParams: 2, value: (p, x) => p[0]! * Math.exp(-p[1]! * x) },
 *   [0, 1, 2], [2, 2 * Math.exp(-1), 2 * Math.exp(-2)], [1, 1]);
 */
export function levenbergMarquardt(
  model: CurveModel,
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  start: ArrayLike<number>,
  options: LmOptions = {},
): LmResult {
  const p = model.nParams;
  if (!Number.isInteger(p) || p < 1) throw invalid('a positive whole number of parameters', 'model.nParams', p);
  if (start.length !== p) throw invalid(`a start vector of ${p} values`, 'start', `${start.length} values`);
  if (x.length !== y.length) throw invalid(`as many y values as x values (${x.length})`, 'y', `${y.length} values`);
  const maxIterations = options.maxIterations ?? DEFAULT_MAX_ITERATIONS;
  if (!Number.isInteger(maxIterations) || maxIterations < 1) throw invalid('a positive whole number', 'maxIterations', maxIterations);
  const xtol = checkTolerance(options.xtol ?? DEFAULT_XTOL, 'xtol');
  const ftol = checkTolerance(options.ftol ?? DEFAULT_FTOL, 'ftol');
  const gtol = checkTolerance(options.gtol ?? DEFAULT_GTOL, 'gtol');
  const lower = boundVector(options.lower, p, 'lower', -Infinity);
  const upper = boundVector(options.upper, p, 'upper', Infinity);
  for (let j = 0; j < p; j++) {
    if (!Number.isFinite(start[j]!)) throw invalid('finite start values', `start[${j}]`, start[j]);
    if (lower[j]! > upper[j]!) throw invalid(`lower[${j}] ≤ upper[${j}]`, `lower[${j}]`, `${lower[j]} > ${upper[j]}`);
  }

  // Active points (weight > 0), compacted; sqrtW folds the weights into residuals and Jacobian.
  const weights = options.weights;
  if (weights !== undefined && weights.length !== x.length) {
    throw invalid(`${x.length} weights (one per point)`, 'weights', `${weights.length} values`);
  }
  let m = 0;
  for (let i = 0; i < x.length; i++) {
    const w = weights === undefined ? 1 : weights[i]!;
    if (!(w >= 0) || !Number.isFinite(w)) throw invalid('finite weights ≥ 0', `weights[${i}]`, w);
    if (w > 0) m++;
  }
  if (m < p) {
    throw invalid(`at least ${p} points with positive weight (one per parameter)`, 'data', `${m} points`,
      'Record more points, or fit fewer parameters', 'NOT_IDENTIFIABLE');
  }
  const xs = new Float64Array(m);
  const ys = new Float64Array(m);
  const sqrtW = new Float64Array(m);
  for (let i = 0, k = 0; i < x.length; i++) {
    const w = weights === undefined ? 1 : weights[i]!;
    if (w === 0) continue;
    if (!Number.isFinite(x[i]!) || !Number.isFinite(y[i]!)) {
      throw invalid('finite x and y at every point with positive weight', `data[${i}]`, `(${x[i]}, ${y[i]})`,
        'Give such points weight 0 or remove them before fitting');
    }
    xs[k] = x[i]!;
    ys[k] = y[i]!;
    sqrtW[k] = Math.sqrt(w);
    k++;
  }

  // Work buffers, allocated once per call.
  const params = new Float64Array(p);
  for (let j = 0; j < p; j++) params[j] = clamp(start[j]!, lower[j]!, upper[j]!);
  const trial = new Float64Array(p);
  const freeStep = new Float64Array(p);
  const free = new Int32Array(p);
  const freeDiag = new Float64Array(p);
  const diag = new Float64Array(p);
  const colNorm = new Float64Array(p);
  const qrScratch = new Float64Array(p);
  const rdiag = new Float64Array(p);
  const pivot = new Int32Array(p);
  const solveWork = new Float64Array(p * p + 2 * p);
  const grad = new Float64Array(p);
  const jac = new Float64Array(m * p);
  let resid = new Float64Array(m);
  let residTrial = new Float64Array(m);
  const qtr = new Float64Array(m);
  let evaluations = 0;

  /** e_i = √w_i·(f_i − y_i) into `out`; returns Σ e_i² (NaN if any is non-finite). */
  const residuals = (at: Float64Array, out: Float64Array): number => {
    evaluations++;
    let sum = 0;
    let comp = 0; // Kahan compensation
    for (let i = 0; i < m; i++) {
      const e = sqrtW[i]! * (model.value(at, xs[i]!) - ys[i]!);
      out[i] = e;
      const term = e * e - comp;
      const next = sum + term;
      comp = next - sum - term;
      sum = next;
    }
    return Number.isFinite(sum) ? sum : Number.NaN;
  };
  /** J_ij = √w_i·∂f(x_i)/∂p_j, column-major; false if any entry is non-finite. */
  const jacobian = (at: Float64Array, out: Float64Array): boolean => {
    let finite = true;
    for (let i = 0; i < m; i++) {
      grad.fill(0);
      if (model.gradient) model.gradient(at, xs[i]!, grad);
      else numericGradient(model.value, at, xs[i]!, grad);
      for (let j = 0; j < p; j++) {
        const v = sqrtW[i]! * grad[j]!;
        if (!Number.isFinite(v)) finite = false;
        out[i + j * m] = v;
      }
    }
    return finite;
  };

  let rss = residuals(params, resid);
  let iterations = 0;
  let reason: LmReason = 'max-iterations';
  let converged = false;
  if (Number.isNaN(rss)) {
    reason = 'non-finite';
  } else {
    let lambda = INITIAL_LAMBDA;
    outer: while (iterations < maxIterations) {
      iterations++;
      if (!jacobian(params, jac)) {
        reason = 'non-finite';
        break;
      }
      const residNorm = Math.sqrt(rss);
      if (residNorm === 0) {
        reason = 'gtol';
        converged = true;
        break;
      }
      // Moré scaling from every column; then the active set: a parameter sitting on a bound whose
      // descent direction −∂RSS/∂p_j points out of the box is held this iteration.
      let nFree = 0;
      for (let j = 0; j < p; j++) {
        const norm = columnNorm(jac, m, j);
        colNorm[j] = norm;
        diag[j] = iterations === 1 ? (norm > 0 ? norm : 1) : Math.max(diag[j]!, norm);
        let held = false;
        if (params[j]! <= lower[j]! || params[j]! >= upper[j]!) {
          let slope = 0; // (Jᵀe)_j = ½·∂RSS/∂p_j
          for (let i = 0; i < m; i++) slope += jac[i + j * m]! * resid[i]!;
          held = (params[j]! <= lower[j]! && slope > 0) || (params[j]! >= upper[j]! && slope < 0);
        }
        if (!held) {
          if (nFree !== j) jac.copyWithin(nFree * m, j * m, (j + 1) * m);
          free[nFree] = j;
          freeDiag[nFree] = diag[j]!;
          nFree++;
        }
      }
      if (nFree === 0) {
        reason = 'gtol'; // every parameter is held on a bound by the gradient: a constrained optimum
        converged = true;
        break;
      }
      householderQr(jac, m, nFree, rdiag, pivot, qrScratch);
      qtr.set(resid);
      applyQrTranspose(jac, m, nFree, qtr);

      // gtol: largest |cos| between e and a free column of J; Jᵀe = P·Rᵀ·(Qᵀe)_(0..nFree−1).
      let gnorm = 0;
      for (let k = 0; k < nFree; k++) {
        const norm = colNorm[free[pivot[k]!]!]!;
        if (norm === 0) continue;
        let sum = rdiag[k]! * qtr[k]!;
        for (let i = 0; i < k; i++) sum += jac[i + k * m]! * qtr[i]!;
        gnorm = Math.max(gnorm, Math.abs(sum / (norm * residNorm)));
      }
      if (gnorm <= gtol) {
        reason = 'gtol';
        converged = true;
        break;
      }

      for (let attempt = 0; ; attempt++) {
        if (attempt >= MAX_TRIALS_PER_ITERATION) {
          reason = 'max-iterations';
          break outer;
        }
        dampedTriangularSolve(jac, m, nFree, rdiag, pivot, qtr, freeDiag, lambda, freeStep, solveWork);
        trial.set(params);
        let stepNorm2 = 0;
        let xNorm2 = 0;
        for (let k = 0; k < nFree; k++) {
          const j = free[k]!;
          trial[j] = clamp(params[j]! + freeStep[k]!, lower[j]!, upper[j]!);
          freeStep[k] = trial[j]! - params[j]!;
          stepNorm2 += (diag[j]! * freeStep[k]!) ** 2;
        }
        for (let j = 0; j < p; j++) xNorm2 += (diag[j]! * params[j]!) ** 2;
        const stepNorm = Math.sqrt(stepNorm2);
        const xNorm = Math.sqrt(xNorm2);
        if (stepNorm === 0) {
          // Nothing can move (every free direction is clamped, or the step underflowed).
          reason = 'xtol';
          converged = true;
          break outer;
        }
        // Predicted reduction of the linear model, ‖e‖² − ‖e + J·Δ‖² = −(2·qtrᵀ(R·z) + ‖R·z‖²), z = Pᵀ·Δ.
        let dot = 0;
        let rzNorm2 = 0;
        for (let k = 0; k < nFree; k++) {
          let sum = rdiag[k]! * freeStep[pivot[k]!]!;
          for (let l = k + 1; l < nFree; l++) sum += jac[k + l * m]! * freeStep[pivot[l]!]!;
          dot += qtr[k]! * sum;
          rzNorm2 += sum * sum;
        }
        const predicted = -(2 * dot + rzNorm2);
        const rssTrial = residuals(trial, residTrial);
        const actual = rss - rssTrial;
        const ratio = Number.isFinite(rssTrial) && predicted > 0 ? actual / predicted : -1;
        const relActual = actual / rss;
        const relPredicted = predicted / rss;
        const accepted = ratio > ACCEPT_RATIO;
        if (accepted) {
          params.set(trial);
          const swap = resid;
          resid = residTrial;
          residTrial = swap;
          rss = rssTrial;
          lambda /= LAMBDA_DOWN;
        } else {
          lambda *= LAMBDA_UP;
        }
        if (Number.isFinite(rssTrial) && Math.abs(relActual) <= ftol && relPredicted <= ftol && ratio <= 2) {
          reason = 'ftol';
          converged = true;
          break outer;
        }
        if (stepNorm <= xtol * xNorm) {
          reason = 'xtol';
          converged = true;
          break outer;
        }
        if (accepted) break;
        if (!Number.isFinite(lambda)) {
          reason = 'max-iterations';
          break outer;
        }
      }
    }
  }

  // Covariance at the final parameters from a fresh Jacobian.
  const dof = m - p;
  const variance = dof > 0 ? rss / dof : Number.NaN;
  const covariance = new Float64Array(p * p).fill(Number.NaN);
  const stdErr = new Float64Array(p).fill(Number.NaN);
  if (reason !== 'non-finite') {
    if (!jacobian(params, jac)) {
      reason = 'non-finite';
      converged = false;
    } else {
      const { inverse, rank } = normalMatrixInverse(jac, m, p);
      if (rank < p) {
        if (converged) reason = 'singular';
        converged = false;
      } else {
        for (let k = 0; k < p * p; k++) covariance[k] = inverse[k]! * variance;
        for (let j = 0; j < p; j++) stdErr[j] = Math.sqrt(covariance[j * p + j]!);
      }
    }
  }
  return {
    params,
    stdErr,
    covariance,
    correlation: (i: number, j: number): number =>
      covariance[i * p + j]! / Math.sqrt(covariance[i * p + i]! * covariance[j * p + j]!),
    rss,
    residualStdDev: Math.sqrt(variance),
    dof,
    iterations,
    evaluations,
    converged,
    reason,
  };
}

function clamp(v: number, lo: number, hi: number): number {
  return v < lo ? lo : v > hi ? hi : v;
}

function checkTolerance(value: number, name: string): number {
  if (!(value >= 0) || !Number.isFinite(value)) throw invalid('a finite tolerance ≥ 0', name, value);
  return value;
}

function boundVector(bound: ArrayLike<number> | undefined, p: number, name: string, fallback: number): Float64Array {
  const out = new Float64Array(p).fill(fallback);
  if (bound === undefined) return out;
  if (bound.length !== p) throw invalid(`${p} bounds (one per parameter)`, name, `${bound.length} values`);
  for (let j = 0; j < p; j++) {
    if (Number.isNaN(bound[j]!)) throw invalid('a number or ±Infinity', `${name}[${j}]`, bound[j]);
    out[j] = bound[j]!;
  }
  return out;
}

function columnNorm(a: Float64Array, rows: number, j: number): number {
  const off = j * rows;
  let scale = 0;
  for (let i = 0; i < rows; i++) scale = Math.max(scale, Math.abs(a[off + i]!));
  if (scale === 0) return 0;
  let sum = 0;
  for (let i = 0; i < rows; i++) {
    const v = a[off + i]! / scale;
    sum += v * v;
  }
  return scale * Math.sqrt(sum);
}
