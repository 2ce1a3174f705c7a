/**
 * The Kerr fit: intensity against voltage through crossed polarisers.
 *
 * Model (dark already subtracted):
 *   I(V) = I_floor + I_amp·sin²(2θ)·sin²(δ/2),  δ = π·(V/V_π)² + δ_static
 * which is the Jones-calculus transmission of a retarder between crossed polarisers with
 * δ = 2π·B·L_eff·V²/d² (so V_π = d/√(2·B·L_eff)). The fit is parametrised by V_π, which is
 * better conditioned than B; B and its standard error follow by propagation:
 *   B = d²/(2·L_eff·V_π²),  σ_B/B = 2·σ_Vπ/V_π.
 *
 * Several V_π starts (log-spaced, plus any caller hint) keep the fit off wrong branches of sin²;
 * a start that hits its iteration limit is continued from where it stopped, every start is kept
 * in `startResults`, and the best by residual (see betterStart) is refined with Huber weights
 * (iteratively reweighted; with `robust: false` the effective-variance weights are kept and only
 * the Huber down-weighting is off; a refinement that leaves the start's data, see
 * ROBUST_DRIFT_LIMIT, is redone without the interpolation weights or dropped). When the
 * amplitude is known from an open measurement it is held fixed, which removes the amplitude/V_π
 * trade-off of low sweeps. Identifiability is judged from the fit itself: the amplitude–V_π
 * correlation and B's relative standard error. Standard errors are widened for residuals
 * correlated between frames (core/uncertainty/correlatedErrorInflation: per parameter, HAC).
 *
 * Pure: no I/O. Throws KerrError FIT_FAILED when no start converges, NOT_IDENTIFIABLE callers
 * decide (the result carries `identifiable`).
 */
import { KerrError } from '../../errors.js';
import { modulationTerm, modulationTermSlopeHalfWave, polariserAngleFactor } from '../physics/modulationTerm.js';
import { quantity, type Quantity } from '../../quantity.js';
import { levenbergMarquardt, type CurveModel, type LmResult } from './levenbergMarquardt.js';
import { fitRobust } from './robustFit.js';
import { correlatedErrorInflation } from '../uncertainty/correlatedErrorInflation.js';

/** Largest factor by which the Huber refinement may raise the median absolute residual of the best start (our choice). */
export const ROBUST_DRIFT_LIMIT = 3;

function medianAbsResidual(model: CurveModel, p: Float64Array, v: Float64Array, y: Float64Array): number {
  const r = Float64Array.from(v, (x, i) => Math.abs(y[i]! - model.value(p, x)));
  r.sort();
  const m = r.length >> 1;
  return r.length % 2 ? r[m]! : (r[m - 1]! + r[m]!) / 2;
}

export interface KerrCurveInput {
  voltageV: Float64Array;
  intensity: Float64Array;
  effectiveLengthM: number;
  gapM: number;
  polariserAngleDeg: number;
  staticRetardanceRad?: number;
  /** Known modulation amplitude I_amp (same units as intensity), e.g. from an open measurement. */
  openLevel?: number;
  /** Extra V_π start guesses (V), e.g. from the sync search. */
  halfWaveGuessesV?: number[];
  /** Start only from `halfWaveGuessesV` (a refit near a known solution), not from the log-spaced grid. */
  onlyGivenStarts?: boolean;
  robust?: boolean;
  /** Standard uncertainty of each point's voltage (V); adds (dI/dV·σ_V)² to that point's variance. */
  voltageSigmaV?: Float64Array;
}

export interface KerrCurveFit {
  floorLevel: Quantity;
  amplitude: Quantity;
  halfWaveVoltage: Quantity; // V
  kerrConstant: Quantity; // m/V^2
  ampVpiCorrelation: number;
  relStdErrB: number;
  identifiable: boolean;
  maxVoltageOverHalfWave: number;
  converged: boolean;
  iterations: number;
  reason: string;
  residualRms: number;
  degreesOfFreedom: number;
  starts: number;
  /** Huber weights of the final fit (1 = full weight) and outlier flags, per input point. */
  weights: Float64Array;
  outliers: Uint8Array;
  /** Residual over its expected standard deviation (effective-variance weighting), per input point. */
  standardizedResiduals: Float64Array;
  /** Lag-1 autocorrelation of the standardised residuals, and the factor applied to V_π's standard error for correlated residuals. */
  residualAutocorrelation: number;
  errorInflation: number;
  /** Effective number of independent frames for V_π (n/n_eff is the variance inflation). */
  effectiveFrames: number;
  /** Every start's final residual sum of squares, convergence and V_π, in start order. */
  startResults: FitStart[];
  /** Standard deviation of the intensity noise alone (same units as intensity). */
  intensityNoise: number;
  /** Evaluate the fitted model at a voltage. */
  predict(voltageV: number): number;
}

export interface FitStart {
  rss: number;
  converged: boolean;
  reason: string;
  halfWaveV: number;
}


/**
 * Whether start result a beats b. Same status: the lower residual. A start that did not converge
 * (even after refining) beats a converged one only with a residual lower by more than
 * UNCONVERGED_MARGIN (1 %): a clearly better fit is not dropped for its status, while a ridge that
 * creeps towards a bound (a sweep too low to fix V_π) does not replace a converged minimum.
 */
const UNCONVERGED_MARGIN = 0.01;
function betterStart(a: LmResult, b: LmResult): boolean {
  if (a.converged === b.converged) return a.rss < b.rss;
  return a.converged ? a.rss <= b.rss * (1 + UNCONVERGED_MARGIN) : a.rss < b.rss * (1 - UNCONVERGED_MARGIN);
}

/**
 * I = floor + amp·T(V) with T the modulation term (sin²(2θ) factor and static retardance folded
 * in, physics/modulationTerm.ts), parameters [floor, amp, vpi] or [floor, vpi].
 */
function makeModel(angleFactor: number, staticRad: number, fixedAmp: number | null): CurveModel {
  if (fixedAmp === null) {
    return {
      nParams: 3,
      value(p, v) {
        return p[0]! + modulationTerm(v, p[2]!, p[1]! * angleFactor, staticRad);
      },
      gradient(p, v, out) {
        out[0] = 1;
        out[1] = modulationTerm(v, p[2]!, angleFactor, staticRad);
        out[2] = modulationTermSlopeHalfWave(v, p[2]!, p[1]! * angleFactor, staticRad);
      },
    };
  }
  return {
    nParams: 2,
    value(p, v) {
      return p[0]! + modulationTerm(v, p[1]!, fixedAmp * angleFactor, staticRad);
    },
    gradient(p, v, out) {
      out[0] = 1;
      out[1] = modulationTermSlopeHalfWave(v, p[1]!, fixedAmp * angleFactor, staticRad);
    },
  };
}

/** Closed-form least squares of y = a + b·x: returns [a, b] (b may be negative). */
function lineFit(x: Float64Array, y: Float64Array): [number, number] {
  let sx = 0, sy = 0, sxx = 0, sxy = 0;
  const n = x.length;
  for (let i = 0; i < n; i++) {
    sx += x[i]!; sy += y[i]!; sxx += x[i]! * x[i]!; sxy += x[i]! * y[i]!;
  }
  const den = n * sxx - sx * sx;
  if (den === 0) return [sy / n, 0];
  const b = (n * sxy - sx * sy) / den;
  return [(sy - b * sx) / n, b];
}

/**
 * The intensity-noise variance s0² that makes the median of r_i²/(s0² + e_i) equal to 0.455, the
 * median of a χ² variable with one degree of freedom (a robust, outlier-proof scale), by bisection.
 */
function intensityVariance(resid: Float64Array, extra: Float64Array): number {
  const n = resid.length;
  const r2 = Float64Array.from(resid, (r) => r * r);
  const ratio = new Float64Array(n);
  const medianRatio = (s0sq: number): number => {
    for (let i = 0; i < n; i++) ratio[i] = r2[i]! / (s0sq + extra[i]! + 1e-300);
    ratio.sort();
    return ratio[n >> 1]!;
  };
  let hi = Math.max(1e-30, Float64Array.from(r2).sort()[n >> 1]! / 0.455);
  let lo = 0;
  if (medianRatio(1e-30) <= 0.455) return Math.max(1e-30, hi * 1e-6);
  for (let k = 0; k < 60; k++) {
    const mid = (lo + hi) / 2;
    if (medianRatio(mid) > 0.455) lo = mid;
    else hi = mid;
  }
  return Math.max(hi, 1e-30);
}

/** Lag-1 autocorrelation coefficient of a series (0 for fewer than 3 points). */
function lagOneCorrelation(x: Float64Array): number {
  const n = x.length;
  if (n < 3) return 0;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i]!;
  mean /= n;
  let num = 0, den = 0;
  for (let i = 0; i < n; i++) {
    const d = x[i]! - mean;
    den += d * d;
    if (i > 0) num += d * (x[i - 1]! - mean);
  }
  return den > 0 ? Math.min(0.99, num / den) : 0;
}

export function fitKerrCurve(input: KerrCurveInput): KerrCurveFit {
  const { voltageV, intensity, effectiveLengthM, gapM } = input;
  const n = voltageV.length;
  if (n !== intensity.length) throw new KerrError('INTERNAL', 'voltage and intensity series differ in length');
  const angleFactor = polariserAngleFactor(input.polariserAngleDeg);
  if (angleFactor < 1e-6) {
    throw new KerrError('BAD_ARGUMENT', `a polariser angle of ${input.polariserAngleDeg}° to the field gives no modulation`, {
      path: 'polariserAngle',
      hint: 'Set the polariser at 45° to the field (the usual arrangement) or give the angle you used',
      inputs: ['polariserAngle'],
    });
  }
  const staticRad = input.staticRetardanceRad ?? 0;
  const fixedAmp = input.openLevel !== undefined ? input.openLevel : null;
  const nParams = fixedAmp === null ? 3 : 2;
  if (n <= nParams + 2) {
    throw new KerrError('FIT_FAILED', `only ${n} usable frames for the Kerr fit`, {
      hint: 'Check that the voltage log overlaps the video and that the beam region is right',
    });
  }
  let vMax = 0;
  for (let i = 0; i < n; i++) vMax = Math.max(vMax, Math.abs(voltageV[i]!));
  if (!(vMax > 0)) {
    throw new KerrError('NOT_IDENTIFIABLE', 'the voltage never leaves zero in the frames used', {
      hint: 'Record a sweep that reaches a good fraction of the half-wave voltage',
    });
  }
  const model = makeModel(angleFactor, staticRad, fixedAmp);

  // Start guesses for V_π: log-spaced from 0.35·Vmax to 6·Vmax, plus hints.
  const guesses: number[] = [];
  const given = (input.halfWaveGuessesV ?? []).filter((g) => Number.isFinite(g) && g > 0);
  if (!(input.onlyGivenStarts && given.length > 0)) for (let k = 0; k < 10; k++) guesses.push(vMax * 0.35 * Math.pow(6 / 0.35, k / 9));
  guesses.push(...given);

  const upper = fixedAmp === null ? [Infinity, Infinity, 60 * vMax] : [Infinity, 60 * vMax];
  const lower = fixedAmp === null ? [-Infinity, 0, 0.05 * vMax] : [-Infinity, 0.05 * vMax];

  const basis = new Float64Array(n);
  let best: { res: LmResult; start: number[] } | null = null;
  const startResults: FitStart[] = [];
  for (const vpi of guesses) {
    for (let i = 0; i < n; i++) {
      basis[i] = modulationTerm(voltageV[i]!, vpi, angleFactor, staticRad);
    }
    let start: number[];
    if (fixedAmp === null) {
      const [a, b] = lineFit(basis, intensity);
      start = [a, Math.max(b, 1e-9), vpi];
    } else {
      let r = 0;
      for (let i = 0; i < n; i++) r += intensity[i]! - fixedAmp * basis[i]!;
      start = [r / n, vpi];
    }
    let res = levenbergMarquardt(model, voltageV, intensity, start, { lower, upper, maxIterations: 200 });
    // A start that ran out of iterations is refined further from where it stopped, never dropped
    // for a converged start with a worse residual.
    for (let more = 0; more < 3 && res.reason === 'max-iterations' && Number.isFinite(res.rss); more++) {
      res = levenbergMarquardt(model, voltageV, intensity, Array.from(res.params), { lower, upper, maxIterations: 400 });
    }
    if (!Number.isFinite(res.rss)) continue;
    startResults.push({ rss: res.rss, converged: res.converged, reason: res.reason, halfWaveV: res.params[nParams - 1]! });
    if (best === null || betterStart(res, best.res)) {
      best = { res, start: Array.from(res.params) };
    }
  }
  if (best === null) {
    throw new KerrError('FIT_FAILED', 'the Kerr fit did not converge from any start', {
      hint: 'Check the beam region and the voltage log; see docs/recording-a-run.md',
      inputs: ['beamRegion'],
    });
  }

  // Effective-variance weights: var_i = s0² + (dI/dV_i·σ_V)² (errors in the voltage become
  // intensity errors through the curve's slope; Orear, Am. J. Phys. 50, 912 (1982)).
  const sigmaV = input.voltageSigmaV;
  if (sigmaV && sigmaV.length !== n) throw new KerrError('INTERNAL', 'voltage uncertainty series differs in length');
  let slope2: Float64Array = new Float64Array(n);
  const p0 = Float64Array.from(best.start);
  const resid0 = new Float64Array(n);
  /** (dI/dV_i·σ_V,i)² at parameters q (central difference). */
  const voltageTerm = (q: Float64Array): Float64Array => {
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const v = voltageV[i]!;
      const h = Math.max(1e-6 * vMax, 1e-3 * Math.abs(v));
      const dIdV = (model.value(q, v + h) - model.value(q, v - h)) / (2 * h);
      const sv = sigmaV ? sigmaV[i]! : 0;
      out[i] = dIdV * dIdV * sv * sv;
    }
    return out;
  };
  slope2 = voltageTerm(p0);
  for (let i = 0; i < n; i++) resid0[i] = intensity[i]! - model.value(p0, voltageV[i]!);
  const s0sq = intensityVariance(resid0, slope2);
  const baseWeights = new Float64Array(n);
  for (let i = 0; i < n; i++) baseWeights[i] = s0sq / (s0sq + slope2[i]!);

  let final: LmResult = best.res;
  let weights: Float64Array = new Float64Array(n).fill(1);
  let outliers: Uint8Array = new Uint8Array(n);
  if (input.robust !== false) {
    // The Huber refinement must stay on the data the best start describes: when it raises the
    // median absolute residual more than ROBUST_DRIFT_LIMIT-fold (the interpolation weights can
    // leave too few frames to pin a branch, e.g. a coarse log on a smooth drive), it is redone
    // without those weights, and failing that the start's own least-squares solution is kept.
    const startMedian = medianAbsResidual(model, p0, voltageV, intensity);
    const stays = (r: LmResult): boolean => Number.isFinite(r.rss) && medianAbsResidual(model, r.params, voltageV, intensity) <= ROBUST_DRIFT_LIMIT * startMedian + 1e-15;
    let robust = fitRobust(model, voltageV, intensity, best.start, { lower, upper, maxIterations: 200, weights: baseWeights });
    if (!stays(robust)) {
      robust = fitRobust(model, voltageV, intensity, best.start, { lower, upper, maxIterations: 200 });
      if (stays(robust)) baseWeights.fill(1);
    }
    if (stays(robust)) {
      final = robust;
      weights = robust.weights;
      outliers = robust.outliers;
    }
  } else {
    // Plain least squares still weights each frame by 1/var_i (the voltage term stays in the
    // variance); only the Huber down-weighting is switched off.
    // The slope depends on the parameters, so the weights are refreshed at each new solution
    // (a few rounds, as in Orear's iteration) and the variances below are taken at the final one.
    if (sigmaV) {
      for (let round = 0; round < 3; round++) {
        const weighted = levenbergMarquardt(model, voltageV, intensity, Array.from(final.params), { lower, upper, maxIterations: 200, weights: baseWeights });
        if (!Number.isFinite(weighted.rss)) break;
        final = weighted;
        slope2 = voltageTerm(Float64Array.from(final.params));
        for (let i = 0; i < n; i++) baseWeights[i] = s0sq / (s0sq + slope2[i]!);
      }
    }
  }

  const p = final.params;
  // residual RMS over all points (unweighted) and standardised residuals
  let ss = 0;
  const standardizedResiduals = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const r = intensity[i]! - model.value(p, voltageV[i]!);
    ss += r * r;
    standardizedResiduals[i] = r / Math.sqrt(s0sq + slope2[i]!);
  }
  // Neighbouring frames share errors (compression, log interpolation, slow flicker), so the
  // residuals are correlated in time and the least-squares errors too small: each parameter's
  // error grows by √(n/n_eff), n_eff its effective number of independent frames (HAC estimate,
  // see correlatedErrorInflation). Frames are in time order here (the caller keeps them so).
  const rho = lagOneCorrelation(standardizedResiduals);
  const grad = new Float64Array(n * nParams);
  const row = new Float64Array(nParams);
  const fitWeights = new Float64Array(n);
  const residuals = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (model.gradient) model.gradient(p, voltageV[i]!, row);
    grad.set(row, i * nParams);
    fitWeights[i] = baseWeights[i]! * (input.robust !== false ? weights[i]! : 1);
    residuals[i] = intensity[i]! - model.value(p, voltageV[i]!);
  }
  const correlated = correlatedErrorInflation(grad, residuals, fitWeights, nParams);
  const stdErrStatistical = Float64Array.from(final.stdErr, (e, j) => e * correlated.inflation[j]!);
  const stdErr = stdErrStatistical;
  const inflation = correlated.inflation[nParams - 1]!;
  const vpiIdx = nParams - 1;
  const vpi = p[vpiIdx]!;
  const vpiErr = stdErr[vpiIdx]!;
  const b = (gapM * gapM) / (2 * effectiveLengthM * vpi * vpi);
  const relStdErrB = (2 * vpiErr) / vpi;
  const corr = fixedAmp === null ? final.correlation(1, 2) : 0;
  const atBound = vpi >= 0.999 * 60 * vMax;
  const identifiable = !atBound && Number.isFinite(relStdErrB) && relStdErrB < 0.25 && !(Math.abs(corr) > 0.98 && relStdErrB > 0.05);

  const floorLevel = quantity(p[0]!, stdErr[0], 'linear');
  const amplitude = fixedAmp === null ? quantity(p[1]!, stdErr[1], 'linear') : quantity(fixedAmp, undefined, 'linear');
  return {
    floorLevel,
    amplitude,
    halfWaveVoltage: quantity(vpi, vpiErr, 'V'),
    kerrConstant: quantity(b, b * relStdErrB, 'm/V^2'),
    ampVpiCorrelation: corr,
    relStdErrB,
    identifiable,
    maxVoltageOverHalfWave: vMax / vpi,
    converged: final.converged,
    iterations: final.iterations,
    reason: final.reason,
    residualRms: Math.sqrt(ss / n),
    degreesOfFreedom: final.dof,
    starts: guesses.length,
    weights,
    outliers,
    standardizedResiduals,
    residualAutocorrelation: rho,
    errorInflation: inflation,
    effectiveFrames: correlated.effectiveFrames[nParams - 1]!,
    startResults,
    intensityNoise: Math.sqrt(s0sq),
    predict: (v: number) => model.value(p, v),
  };
}
