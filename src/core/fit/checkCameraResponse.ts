/**
 * The camera-response check of a run: does the footage's linearised intensity follow the light, or
 * does the camera's curve depart from the one assumed (its tags, or a profile)?
 *
 * One-parameter departure: the true light is a power of the linearised intensity,
 *   I_true ∝ I_lin^γ,  so  I_lin = K·(φ + u(V))^(1/γ),  u(V) = sin²(2θ)·sin²(π/2·(V/V_π)² + δ_s/2),
 * with K a scale (amplitude^(1/γ) times the camera's own scale), φ = I_floor/I_amp the floor in
 * units of the amplitude, and γ = 1 when the assumed curve is right. A power law commutes with the
 * average over the beam's pixels (mean of (G_p·L)^κ = L^κ·mean(G_p^κ)), so the region mean keeps the
 * form; the light of the surround, which is subtracted, is neglected (a small bias of γ when the
 * surround is bright). K, φ, γ and V_π are fitted jointly by Levenberg–Marquardt from the main fit's
 * solution, on the frames the main fit kept (its Huber outliers left out). The shape of sin² over a
 * sweep near or past V_π is what separates γ from V_π; below that, an open level (analyser parallel:
 * I_lin,open = K·(φ + 1)^(1/γ)) ties the scale, and enters as one more point weighted like ten frames
 * (it is a median of many frames; common practice, stated). Without either the check is skipped.
 *
 * Reported: γ ± σ_γ (σ from the fit covariance, inflated by the main fit's factor for correlated
 * residuals), B at the fitted γ against B at γ = 1 (the main fit), and the standard uncertainty of
 * B from the response: the check's γ combined with the prior γ = 1 ± 0.02 (posteriorResponseTerm),
 * the root-mean-square shift an uncorrected response departure would leave (a GUM Type B term,
 * JCGM 100:2008 §4.3 and F.2.4.5). `departs` when |γ − 1| > 2σ_γ and |γ − 1| > 0.02
 * (about a 0.5 % change of slope per decade of light: below that, compression and noise make a
 * departure meaningless in practice; our choice).
 *
 * Pure. Throws nothing: a failed or unidentifiable check comes back with `checked: false` and the
 * reason.
 * @example checkCameraResponse({ voltageV, intensity, used, fit: { floor: 0.01, amplitude: 0.5, halfWaveVoltageV: 9000 },
 *   polariserAngleDeg: 45, effectiveLengthM: 0.05, gapM: 0.005, kerrConstant: 2.4e-12, errorInflation: 1.5 })
 */
import { levenbergMarquardt, type CurveModel } from './levenbergMarquardt.js';
import { modulationTerm, polariserAngleFactor } from '../physics/modulationTerm.js';

export interface ResponseCheckInput {
  voltageV: Float64Array;
  intensity: Float64Array;
  /** 1 for the points the main fit kept (not an outlier), 0 otherwise. */
  used: Uint8Array;
  /** The main fit's solution (γ = 1). */
  fit: { floor: number; amplitude: number; halfWaveVoltageV: number };
  polariserAngleDeg: number;
  staticRetardanceRad?: number;
  openLevel?: number;
  effectiveLengthM: number;
  gapM: number;
  /** B of the main fit, m/V². */
  kerrConstant: number;
  /** The main fit's factor for correlated residuals (≥ 1). */
  errorInflation: number;
}

export interface ResponseCheck {
  checked: boolean;
  /** Why the check was skipped or failed (null when it ran). */
  reason: string | null;
  /** Exponent γ of I_true ∝ I_lin^γ and its standard error (NaN when not checked). */
  gamma: { value: number; stdErr: number };
  /** B at the fitted γ, m/V², with its standard error. */
  kerrConstantAtGamma: { value: number; stdErr: number; unit: 'm/V^2' };
  /** B_γ/B_1 − 1. */
  relativeShiftB: number;
  /** Standard uncertainty of B from the camera response, m/V² (0 when not checked: nothing known). */
  standardUncertainty: { value: number; unit: 'm/V^2' };
  /** |γ − 1| > 2σ and > 0.02. */
  departs: boolean;
  /**
   * Root-mean-square error in γ of leaving the response at γ = 1, under what is known of γ
   * (posteriorGammaError; the prior u₀ when the check did not run): the floor fraction's
   * camera-response term is built from it (core/figures/floorFraction).
   */
  gammaUncertainty: number;
}

/** x of the open-level point: a finite marker no voltage reaches (the least-squares code wants finite x). */
const OPEN_POINT = Number.MAX_VALUE;
const OPEN_WEIGHT = 10;

function skipped(reason: string): ResponseCheck {
  return {
    checked: false, reason,
    gamma: { value: NaN, stdErr: NaN },
    kerrConstantAtGamma: { value: NaN, stdErr: NaN, unit: 'm/V^2' },
    relativeShiftB: NaN,
    standardUncertainty: { value: 0, unit: 'm/V^2' },
    departs: false,
    gammaUncertainty: PRIOR_GAMMA_STD_ERR,
  };
}

/**
 * Prior standard uncertainty of γ for footage whose own check cannot run (our choice): the robust
 * spread (1.4826·median |γ − 1|) of γ fitted by the check in the coverage study's valid runs where
 * it ran, 0.017 over 35 runs of tag-honouring H.264 at CRF 16–34, rounded up (docs/uncertainty.md,
 * "camera-response term without a check").
 */
export const PRIOR_GAMMA_STD_ERR = 0.02;

/**
 * A check whose γ̂ lies more than this many combined standard deviations √(σ² + u₀²) from 1
 * contradicts the prior (a prior-predictive check at about 3σ, common practice), and the prior is
 * then left out of the camera-response term.
 */
export const PRIOR_CONFLICT_Z = 3;

/**
 * The camera-response term from a check that ran. Without a departure, the check's γ̂ ± σ is
 * combined with the prior γ = 1 ± u₀ (u₀ = PRIOR_GAMMA_STD_ERR) as two Gaussian measurements
 * (inverse-variance weights, the usual Bayesian update of a Type B state of knowledge, GUM
 * Supplement 1 §6), and the term is the root-mean-square error that leaving B at γ = 1 makes under
 * what is then known of γ:
 *   λ = (1/σ²)/(1/σ² + 1/u₀²),  γ_p − 1 = λ·(γ̂ − 1),  u_p² = λ·σ²,
 *   u(B) = |s|·√((γ_p − 1)² + u_p²),  s = dB/dγ along the joint fit (its covariance).
 * A weak check (σ ≫ u₀) tends to the prior term |s|·u₀, as for a run without a check; a sharp one to
 * |s|·√((γ̂ − 1)² + σ²). When the check contradicts the prior (a prior-data conflict:
 * |γ̂ − 1| > PRIOR_CONFLICT_Z·√(σ² + u₀²), e.g. a phone curve its tags do not describe) the prior,
 * made from footage that follows its tags, is left out and the shift is taken as refitted (a large
 * departure is not linear in γ): u(B) = √((B_γ − B₁)² + s²σ²).
 */
export function posteriorResponseTerm(c: { gamma: number; gammaErr: number; slope: number; shift: number }): number {
  const p = posteriorGamma(c);
  if (p.conflict) return Math.sqrt(c.shift * c.shift + c.slope * c.slope * c.gammaErr * c.gammaErr);
  return Math.abs(c.slope) * p.rmsError;
}

/**
 * What is known of γ after the check (posteriorResponseTerm's update): whether the check
 * contradicts the prior, and the root-mean-square error of taking γ = 1,
 * √((γ_p − 1)² + u_p²), or √((γ̂ − 1)² + σ²) on a conflict (the check alone).
 */
export function posteriorGamma(c: { gamma: number; gammaErr: number }): { conflict: boolean; rmsError: number } {
  const sigma2 = c.gammaErr * c.gammaErr;
  const u02 = PRIOR_GAMMA_STD_ERR * PRIOR_GAMMA_STD_ERR;
  const d = c.gamma - 1;
  if (Math.abs(d) > PRIOR_CONFLICT_Z * Math.sqrt(sigma2 + u02)) return { conflict: true, rmsError: Math.sqrt(d * d + sigma2) };
  const lambda = (1 / sigma2) / (1 / sigma2 + 1 / u02);
  const offset = lambda * d;
  return { conflict: false, rmsError: Math.sqrt(offset * offset + lambda * sigma2) };
}

/**
 * B's sensitivity to the response exponent when the check cannot run: refit K, φ and V_π with γ held
 * at 1 + u and 1 − u (u = PRIOR_GAMMA_STD_ERR), u(B) = |B₊ − B₋|/2 (GUM §5.1.3, a central
 * difference for the sensitivity coefficient times u(γ)). null when either refit fails.
 */
function priorSensitivity(input: ResponseCheckInput, x: Float64Array, y: Float64Array, angleFactor: number, staticRad: number): number | null {
  if (x.length < 20) return null;
  const vpi0 = input.fit.halfWaveVoltageV;
  const phi0 = Math.max(1e-4, input.fit.floor / input.fit.amplitude);
  const at = (gamma: number): number => {
    const kappa = 1 / gamma;
    const model: CurveModel = {
      nParams: 3,
      value(p, v) {
        const base = p[1]! + modulationTerm(v, p[2]!, angleFactor, staticRad);
        return p[0]! * Math.pow(base > 1e-12 ? base : 1e-12, kappa);
      },
    };
    try {
      const res = levenbergMarquardt(model, x, y, [input.fit.amplitude, phi0, vpi0], {
        lower: [0, 1e-6, 0.5 * vpi0], upper: [Infinity, 10, 2 * vpi0], maxIterations: 300,
      });
      if (!Number.isFinite(res.rss)) return NaN;
      const vpi = res.params[2]!;
      return (input.gapM * input.gapM) / (2 * input.effectiveLengthM * vpi * vpi);
    } catch {
      return NaN;
    }
  };
  const plus = at(1 + PRIOR_GAMMA_STD_ERR);
  const minus = at(1 - PRIOR_GAMMA_STD_ERR);
  const u = Math.abs(plus - minus) / 2;
  return Number.isFinite(u) ? u : null;
}

export function checkCameraResponse(input: ResponseCheckInput): ResponseCheck {
  const { voltageV, intensity, used, fit } = input;
  const angleFactor = polariserAngleFactor(input.polariserAngleDeg);
  const staticRad = input.staticRetardanceRad ?? 0;
  if (!(fit.amplitude > 0) || !(fit.halfWaveVoltageV > 0)) return skipped('the main fit has no positive amplitude');
  let vMax = 0;
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < voltageV.length; i++) {
    if (!used[i] || !Number.isFinite(voltageV[i]!) || !Number.isFinite(intensity[i]!)) continue;
    xs.push(voltageV[i]!);
    ys.push(intensity[i]!);
    vMax = Math.max(vMax, Math.abs(voltageV[i]!));
  }
  const reach = vMax / fit.halfWaveVoltageV;
  const haveOpen = input.openLevel !== undefined && input.openLevel > 0;
  if (reach < 0.8 && !haveOpen) {
    const reason = `the sweep reaches ${(reach * 100).toFixed(0)} % of the half-wave voltage and no open level is known, so the response cannot be told from the half-wave voltage`;
    const prior = priorSensitivity(input, Float64Array.from(xs), Float64Array.from(ys), angleFactor, staticRad);
    if (prior === null) return skipped(`${reason}; B could not be refitted at γ = 1 ± ${PRIOR_GAMMA_STD_ERR}`);
    return {
      ...skipped(`${reason}: the camera-response term is B's sensitivity to γ = 1 ± ${PRIOR_GAMMA_STD_ERR} (prior)`),
      gamma: { value: 1, stdErr: PRIOR_GAMMA_STD_ERR },
      standardUncertainty: { value: prior, unit: 'm/V^2' },
    };
  }
  if (xs.length < 20) return skipped('fewer than 20 usable frames');
  const weights = new Float64Array(xs.length + (haveOpen ? 1 : 0)).fill(1);
  if (haveOpen) {
    xs.push(OPEN_POINT);
    ys.push(input.openLevel!);
    weights[weights.length - 1] = OPEN_WEIGHT;
  }
  const x = Float64Array.from(xs);
  const y = Float64Array.from(ys);

  // p = [K, φ, κ = 1/γ, V_π]
  const model: CurveModel = {
    nParams: 4,
    value(p, v) {
      let u: number;
      if (v === OPEN_POINT) u = 1;
      else {
        u = modulationTerm(v, p[3]!, angleFactor, staticRad);
      }
      const base = p[1]! + u;
      return p[0]! * Math.pow(base > 1e-12 ? base : 1e-12, p[2]!);
    },
  };
  const vpi0 = fit.halfWaveVoltageV;
  const phi0 = Math.max(1e-4, fit.floor / fit.amplitude);
  const start = [fit.amplitude, phi0, 1, vpi0];
  let res: ReturnType<typeof levenbergMarquardt>;
  try {
    res = levenbergMarquardt(model, x, y, start, {
      lower: [0, 1e-6, 0.25, 0.5 * vpi0],
      upper: [Infinity, 10, 4, 2 * vpi0],
      weights,
      maxIterations: 300,
    });
  } catch (e) {
    return skipped(`the joint fit of response and half-wave voltage could not run (${e instanceof Error ? e.message : String(e)})`);
  }
  if (!Number.isFinite(res.rss) || !(res.stdErr[2]! > 0) || !(res.stdErr[3]! > 0)) {
    return skipped(`the joint fit of response and half-wave voltage did not settle (${res.reason})`);
  }
  const inflation = Math.max(1, input.errorInflation);
  const kappa = res.params[2]!;
  const kappaErr = res.stdErr[2]! * inflation;
  const gamma = 1 / kappa;
  const gammaErr = kappaErr / (kappa * kappa);
  const vpi = res.params[3]!;
  const vpiErr = res.stdErr[3]! * inflation;
  const bGamma = (input.gapM * input.gapM) / (2 * input.effectiveLengthM * vpi * vpi);
  const bGammaErr = bGamma * 2 * (vpiErr / vpi);
  const departs = Math.abs(gamma - 1) > 2 * gammaErr && Math.abs(gamma - 1) > 0.02;
  // s = dB/dγ along the joint fit, cov(B, γ)/var(γ) = (2B/V_π)·κ²·cov(V_π, κ)/var(κ)
  const slope = (2 * bGamma / vpi) * kappa * kappa * res.covariance[3 * 4 + 2]! / res.covariance[2 * 4 + 2]!;
  const term = posteriorResponseTerm({ gamma, gammaErr, slope, shift: bGamma - input.kerrConstant });
  return {
    checked: true,
    reason: null,
    gamma: { value: gamma, stdErr: gammaErr },
    kerrConstantAtGamma: { value: bGamma, stdErr: bGammaErr, unit: 'm/V^2' },
    relativeShiftB: bGamma / input.kerrConstant - 1,
    standardUncertainty: { value: term, unit: 'm/V^2' },
    departs,
    gammaUncertainty: posteriorGamma({ gamma, gammaErr }).rmsError,
  };
}
