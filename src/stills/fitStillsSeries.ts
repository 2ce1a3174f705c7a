/**
 * The Kerr fit of a photo series: hands the measured (dark-subtracted, exposure-normalised)
 * intensities and their voltages to the fit analyze uses (src/core/fit/fitKerrCurve.ts, model
 * I = I_floor + I_amp·sin²(2θ)·sin²(π/2·(V/V_π)² + δ_static/2), several V_π starts, Huber
 * weights unless `robust` is false, amplitude held at `openLevel` when given), after leaving out
 * photos that cannot be trusted, and adds the floor fraction.
 *
 * Rule for bad photos (skip and count, never drop silently): a photo with a reason in
 * `preExcluded` (e.g. "unreadable") keeps it; one with more than CLIPPED_FRACTION_LIMIT (1 %)
 * of the beam region clipped is left out as "clipped"; one whose intensity or voltage is not
 * finite as "not-finite".
 * Floor fraction I_floor/I_amp from core/figures/floorFraction (the one formula for video and
 * photos). Pure.
 * @throws KerrError BAD_ARGUMENT when fewer than MIN_PHOTOS (6) usable photos at MIN_VOLTAGES (4)
 *   different voltages remain; whatever fitKerrCurve throws (FIT_FAILED when no start converges).
 * @example fitStillsSeries({ voltageV, intensity, clippedFraction, effectiveLengthM: 0.05, gapM: 0.005, polariserAngleDeg: 45 }).fit.kerrConstant
 */
import { KerrError } from '../errors.js';
import type { Quantity } from '../quantity.js';
import { fitKerrCurve, type KerrCurveFit, type KerrCurveInput } from '../core/fit/fitKerrCurve.js';
import { CLIPPED_FRACTION_LIMIT } from '../core/figures/clippedFractionLimit.js';
import { floorFraction } from '../core/figures/floorFraction.js';

export const MIN_PHOTOS = 6;
export const MIN_VOLTAGES = 4;

export interface StillsFitInput {
  voltageV: Float64Array;
  intensity: Float64Array;
  clippedFraction: Float64Array;
  effectiveLengthM: number;
  gapM: number;
  polariserAngleDeg: number;
  /** Known modulation amplitude I_amp (same units as intensity), e.g. from an "open" photo. */
  openLevel?: number;
  /** Known zero-field retardance of the cell windows, rad (default 0). */
  staticRetardanceRad?: number;
  /** Huber weighting (default true, as in analyze). */
  robust?: boolean;
  /** Per photo, a reason decided before the fit (e.g. "unreadable"), or null. */
  preExcluded?: ReadonlyArray<string | null>;
}

export interface StillsFit {
  fit: KerrCurveFit;
  /** 1 = used in the fit, per photo. */
  used: Uint8Array;
  /** Photo indices handed to the fit, in order (fit.outliers and fit.weights follow this order). */
  usedIndex: number[];
  /** Per photo: null when used, else the reason ("clipped", "unreadable", "not-finite"). */
  excludedReason: Array<string | null>;
  excluded: Record<string, number>;
  /** Model value per photo (NaN where the voltage is not finite). */
  model: Float64Array;
  floorFraction: Quantity;
  /** The input the fit ran on (the photos used, in usedIndex order), for refits of the uncertainty budget. */
  curveInput: KerrCurveInput;
}

/**
 * Which photos the fit may use, decided once before it: a reason given in `preExcluded` stays;
 * otherwise "not-finite" (intensity or voltage) or "clipped" (more than CLIPPED_FRACTION_LIMIT of
 * the beam region). Counted by reason. Pure.
 */
export function photoExclusions(input: Pick<StillsFitInput, 'voltageV' | 'intensity' | 'clippedFraction' | 'preExcluded'>): Pick<StillsFit, 'used' | 'usedIndex' | 'excludedReason' | 'excluded'> {
  const n = input.voltageV.length;
  const used = new Uint8Array(n);
  const excludedReason: Array<string | null> = [];
  const excluded: Record<string, number> = {};
  const usedIndex: number[] = [];
  for (let i = 0; i < n; i++) {
    let reason: string | null = input.preExcluded?.[i] ?? null;
    if (reason === null) {
      if (!Number.isFinite(input.intensity[i]!) || !Number.isFinite(input.voltageV[i]!)) reason = 'not-finite';
      else if (input.clippedFraction[i]! > CLIPPED_FRACTION_LIMIT) reason = 'clipped';
    }
    excludedReason.push(reason);
    if (reason === null) {
      used[i] = 1;
      usedIndex.push(i);
    } else excluded[reason] = (excluded[reason] ?? 0) + 1;
  }
  return { used, usedIndex, excludedReason, excluded };
}

/**
 * Refuses a series the fit cannot use: fewer than MIN_PHOTOS usable photos or fewer than
 * MIN_VOLTAGES different |V| among them (checked before the fit, and before a beam is looked for).
 * @throws KerrError BAD_ARGUMENT naming the counts and what was left out.
 */
export function checkEnoughPhotos(voltageV: ArrayLike<number>, usedIndex: readonly number[], excluded: Record<string, number>): void {
  const distinct = new Set(usedIndex.map((i) => Math.abs(voltageV[i]!))).size;
  if (usedIndex.length < MIN_PHOTOS || distinct < MIN_VOLTAGES) {
    const left = Object.entries(excluded).map(([k, v]) => `${v} ${k}`).join(', ');
    throw new KerrError('BAD_ARGUMENT', `the Kerr fit needs at least ${MIN_PHOTOS} usable photos at ${MIN_VOLTAGES} or more different voltages; this series has ${usedIndex.length} usable photo(s) at ${distinct} voltage(s)${left ? ` (left out: ${left})` : ''}`, {
      hint: 'Take more photos across the sweep, from zero to as close to the half-wave voltage as the cell safely allows',
    });
  }
}

export function fitStillsSeries(input: StillsFitInput): StillsFit {
  const n = input.voltageV.length;
  const { used, usedIndex, excludedReason, excluded } = photoExclusions(input);
  checkEnoughPhotos(input.voltageV, usedIndex, excluded);
  const curveInput: KerrCurveInput = {
    voltageV: Float64Array.from(usedIndex, (i) => input.voltageV[i]!),
    intensity: Float64Array.from(usedIndex, (i) => input.intensity[i]!),
    effectiveLengthM: input.effectiveLengthM,
    gapM: input.gapM,
    polariserAngleDeg: input.polariserAngleDeg,
    robust: input.robust !== false,
  };
  if (input.openLevel !== undefined) curveInput.openLevel = input.openLevel;
  if (input.staticRetardanceRad !== undefined) curveInput.staticRetardanceRad = input.staticRetardanceRad;
  const fit = fitKerrCurve(curveInput);
  const model = new Float64Array(n);
  for (let i = 0; i < n; i++) model[i] = Number.isFinite(input.voltageV[i]!) ? fit.predict(input.voltageV[i]!) : NaN;
  return { fit, used, usedIndex, excludedReason, excluded, model, floorFraction: floorFraction(fit.floorLevel, fit.amplitude), curveInput };
}
