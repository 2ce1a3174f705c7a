/**
 * The Kerr fit of a photo series: hands the measured (dark-subtracted, exposure-normalised)
 * intensities and their voltages to the shared fit (src/pipeline/fitKerrCurve.ts, model
 * I = I_floor + I_amp·sin²(2θ)·sin²(π/2·(V/V_π)²)), after leaving out photos that cannot be
 * trusted, and adds the floor fraction.
 *
 * Rule for bad photos (skip and count, never drop silently): a photo with more than
 * CLIPPED_WARNING_FRACTION (1 %) of the beam region clipped is left out as "clipped"; a photo
 * whose intensity or voltage is not finite as "not-finite".
 * Needs at least MIN_PHOTOS (6) usable photos at MIN_VOLTAGES (4) different voltages; with fewer
 * the result has `fit: null` and says why (the measured series is still useful).
 * Floor fraction I_floor/I_amp with first-order error propagation that ignores the floor–amplitude
 * covariance (stated in docs/stills.md). Pure.
 * @throws whatever fitKerrCurve throws other than FIT_FAILED (which becomes `fit: null` + reason).
 * @example fitStillsSeries({ voltageV, intensity, clippedFraction, effectiveLengthM: 0.05, gapM: 0.005, polariserAngleDeg: 45 }).fit?.kerrConstant
 */
import { isKerrError } from '../errors.js';
import { quantity, type Quantity } from '../quantity.js';
import { fitKerrCurve, type KerrCurveFit } from '../core/fit/fitKerrCurve.js';
import { CLIPPED_WARNING_FRACTION } from './clippedLimit.js';

export const MIN_PHOTOS = 6;
export const MIN_VOLTAGES = 4;

export interface StillsFitInput {
  voltageV: Float64Array;
  intensity: Float64Array;
  clippedFraction: Float64Array;
  effectiveLengthM: number;
  gapM: number;
  polariserAngleDeg: number;
  /** Known modulation amplitude (same units as intensity), e.g. from an "open" photo. */
  openLevel?: number;
}

export interface StillsFit {
  fit: KerrCurveFit | null;
  /** Why there is no fit, when fit is null. */
  noFitReason: string | null;
  /** 1 = used in the fit, per photo. */
  used: Uint8Array;
  /** Per photo: null when used, else the reason ("clipped", "not-finite"). */
  excludedReason: Array<string | null>;
  excluded: Record<string, number>;
  /** Model value per photo (NaN without a fit). */
  model: Float64Array;
  floorFraction: Quantity | null;
}

export function fitStillsSeries(input: StillsFitInput): StillsFit {
  const n = input.voltageV.length;
  const used = new Uint8Array(n);
  const excludedReason: Array<string | null> = [];
  const excluded: Record<string, number> = {};
  const keep: number[] = [];
  for (let i = 0; i < n; i++) {
    let reason: string | null = null;
    if (!Number.isFinite(input.intensity[i]!) || !Number.isFinite(input.voltageV[i]!)) reason = 'not-finite';
    else if (input.clippedFraction[i]! > CLIPPED_WARNING_FRACTION) reason = 'clipped';
    excludedReason.push(reason);
    if (reason === null) {
      used[i] = 1;
      keep.push(i);
    } else excluded[reason] = (excluded[reason] ?? 0) + 1;
  }
  const model = new Float64Array(n).fill(NaN);
  const distinct = new Set(keep.map((i) => Math.abs(input.voltageV[i]!))).size;
  const none = (reason: string): StillsFit => ({ fit: null, noFitReason: reason, used, excludedReason, excluded, model, floorFraction: null });
  if (keep.length < MIN_PHOTOS || distinct < MIN_VOLTAGES) {
    return none(`the Kerr fit needs at least ${MIN_PHOTOS} usable photos at ${MIN_VOLTAGES} or more different voltages; this series has ${keep.length} usable photo(s) at ${distinct} voltage(s)`);
  }
  let fit: KerrCurveFit;
  try {
    const curveInput: Parameters<typeof fitKerrCurve>[0] = {
      voltageV: Float64Array.from(keep, (i) => input.voltageV[i]!),
      intensity: Float64Array.from(keep, (i) => input.intensity[i]!),
      effectiveLengthM: input.effectiveLengthM,
      gapM: input.gapM,
      polariserAngleDeg: input.polariserAngleDeg,
    };
    if (input.openLevel !== undefined) curveInput.openLevel = input.openLevel;
    fit = fitKerrCurve(curveInput);
  } catch (e) {
    if (isKerrError(e) && e.code === 'FIT_FAILED') return none(`the Kerr fit failed: ${e.message}`);
    throw e;
  }
  for (let i = 0; i < n; i++) model[i] = fit.predict(input.voltageV[i]!);
  const floor = fit.floorLevel;
  const amp = fit.amplitude;
  let floorFraction: Quantity | null = null;
  if (amp.value > 0) {
    const ratio = floor.value / amp.value;
    // σ² = (σ_floor/amp)² + (floor·σ_amp/amp²)²
    const err = Math.hypot((floor.stdErr ?? 0) / amp.value, (floor.value * (amp.stdErr ?? 0)) / (amp.value * amp.value));
    floorFraction = quantity(ratio, floor.stdErr !== undefined || amp.stdErr !== undefined ? err : undefined);
  }
  return { fit, noFitReason: null, used, excludedReason, excluded, model, floorFraction };
}
