import type { Quantity } from '../../quantity.js';
import { LINEARISED_Z_LIMIT, type LinearisedCrossCheck } from './linearisedCrossCheck.js';

/** Relative difference of the two values of B below which a large z is not worth a warning. */
export const LINEARISED_MIN_RELATIVE_DIFFERENCE = 0.02;

/**
 * The warning text for a linearised cross-check that disagrees with the full fit, or null.
 * It is worth a warning only when all three hold: |z| ≥ 3 (see linearisedCrossCheck), the two
 * values of B differ by more than 2 % (|B_lin/B_fit − 1| > 0.02, so a very precise run does not
 * warn about a difference nobody would act on), and the fit is identifiable (otherwise B_fit
 * carries no meaning of its own). Typical causes: drift of the light or exposure, hysteresis
 * (space charge), or a wrong floor. The caller files it under the code "linearised-disagrees".
 * Pure; never throws.
 * @example linearisedDisagreement({ kerrConstant: { value: 2.64e-12, stdErr: 1e-14 }, points: 6, agreesWithFit: false, zScore: 12 },
 *   { value: 2.4e-12, stdErr: 1.5e-14 }, true)
 * // → 'the linearised reduction gives B = 2.640e-12 m/V^2, 12.0 standard errors from the fit; ...'
 */
export function linearisedDisagreement(check: LinearisedCrossCheck | null, fitKerrConstant: Quantity, identifiable: boolean): string | null {
  if (check === null || !identifiable) return null;
  const bLin = check.kerrConstant.value;
  if (!(Math.abs(check.zScore) >= LINEARISED_Z_LIMIT)) return null;
  if (!(Math.abs(bLin / fitKerrConstant.value - 1) > LINEARISED_MIN_RELATIVE_DIFFERENCE)) return null;
  return `the linearised reduction gives B = ${bLin.toExponential(3)} m/V^2, ${Math.abs(check.zScore).toFixed(1)} standard errors from the fit; check for drift, hysteresis or a wrong floor`;
}
