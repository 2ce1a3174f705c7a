/**
 * The classic linearised reduction as a cross-check of the Kerr fit, done the way analyze does it
 * (src/pipeline/analyze.ts): on the first branch (|V| < fitted V_π, Huber outliers left out) the
 * normalised transmission T = (I − I_floor)/(I_amp·sin²(2θ)) gives δ = 2·arcsin√T, and V² against
 * δ is a straight line whose slope gives B (linearisedKerr). The two values of B are compared by
 *   z = (B_lin − B_fit) / √(σ_fit² + σ_lin²);
 * they agree when |z| < 3. A warning ("linearised-disagrees") is returned when |z| ≥ 3, the two
 * differ by more than 2 % and the fit is identifiable (drift, hysteresis or a wrong floor).
 * Fewer than 5 first-branch points, or a reduction that cannot be made, give `linearised: null`.
 * Pure.
 * @example linearisedCrossCheck({ voltageV, intensity, outliers: fit.outliers, fit, polariserAngleDeg: 45, gapM: 0.005, effectiveLengthM: 0.05 }).linearised?.agreesWithFit // true
 */
import type { KerrCurveFit } from '../core/fit/fitKerrCurve.js';
import { linearisedKerr } from '../core/fit/linearisedKerr.js';
import type { RunResult, RunWarning } from '../result/schema.js';

export interface LinearisedCrossCheckInput {
  /** The points handed to the fit, in the fit's order. */
  voltageV: Float64Array;
  intensity: Float64Array;
  /** The fit's outlier flags, same order. */
  outliers: Uint8Array;
  fit: KerrCurveFit;
  polariserAngleDeg: number;
  gapM: number;
  effectiveLengthM: number;
}

/** First-branch points below which the reduction is not attempted (as in analyze). */
export const MIN_LINEARISED_POINTS = 5;

export function linearisedCrossCheck(input: LinearisedCrossCheckInput): { linearised: RunResult['linearised']; warning: RunWarning | null } {
  const { fit } = input;
  const angleFactor = Math.sin((2 * input.polariserAngleDeg * Math.PI) / 180) ** 2;
  const transmission: number[] = [];
  const voltages: number[] = [];
  for (let k = 0; k < input.voltageV.length; k++) {
    if (input.outliers[k]) continue;
    if (Math.abs(input.voltageV[k]!) >= fit.halfWaveVoltage.value) continue;
    transmission.push((input.intensity[k]! - fit.floorLevel.value) / (fit.amplitude.value * angleFactor));
    voltages.push(input.voltageV[k]!);
  }
  if (transmission.length < MIN_LINEARISED_POINTS) return { linearised: null, warning: null };
  let lin;
  try {
    lin = linearisedKerr({ voltageV: Float64Array.from(voltages), transmission: Float64Array.from(transmission), gapM: input.gapM, lengthM: input.effectiveLengthM });
  } catch {
    return { linearised: null, warning: null }; // too few points inside 0.02 < T < 0.98, or one voltage only
  }
  const bFit = fit.kerrConstant;
  const bLin = lin.kerrConstant;
  const z = (bLin.value - bFit.value) / Math.hypot(bFit.stdErr ?? 0, bLin.stdErr ?? 0);
  const linearised = { kerrConstant: bLin, points: lin.points, agreesWithFit: Math.abs(z) < 3, zScore: z };
  const warning: RunWarning | null = Math.abs(z) >= 3 && Math.abs(bLin.value / bFit.value - 1) > 0.02 && fit.identifiable
    ? { code: 'linearised-disagrees', message: `the linearised reduction gives B = ${bLin.value.toExponential(3)} m/V^2, ${Math.abs(z).toFixed(1)} standard errors from the fit; check for drift, hysteresis or a wrong floor` }
    : null;
  return { linearised, warning };
}
