/**
 * Dark subtraction and exposure correction of region series.
 *
 * Camera model (docs/DESIGN.md): I(t) = g(t)·[I_dark + I_floor + I_amp·T] + noise, g the exposure
 * gain that phones change by themselves. A reference region whose true brightness is constant
 * (a grey card) measures g up to a constant: gain_t = ref_t / median(ref), with ref the reference
 * region's value minus the dark region's when one is measured (a black-level offset is not scaled
 * by exposure). The corrected value is (roi_t − dark_t) / gain_t. The median makes the gain 1 for
 * a typical frame, so corrected values stay in the camera's linear units.
 *
 * Rule for bad samples: a frame whose reference value is not finite or not positive gets gain NaN
 * and is counted in `invalidFrames`; the median is taken over the valid frames only.
 * Units: linear light (same units in and out); gains are dimensionless.
 * @throws KerrError BAD_REGION when no frame has a positive reference value (the reference
 *   region is black or missing).
 * @example exposureGains([0.2, 0.22, 0.18]).gains // [1, 1.1, 0.9]
 * @example correctExposure(0.5, 0.1, 2) // 0.2
 */
import { KerrError } from '../errors.js';
import { median } from '../core/fit/robustScale.js';

export interface ExposureGains {
  /** gain per frame (NaN where the reference was unusable). */
  gains: Float64Array;
  /** median of the (dark-subtracted) reference over the valid frames, linear units. */
  medianReference: number;
  /** frames with an unusable reference value. */
  invalidFrames: number;
  /** smallest and largest valid gain (how far the exposure wandered). */
  minGain: number;
  maxGain: number;
}

/** Median of a sample, NaNs ignored (the shared implementation; re-exported for callers of this module). */
export { median } from '../core/fit/robustScale.js';

export function exposureGains(reference: ArrayLike<number>, dark?: ArrayLike<number>): ExposureGains {
  const n = reference.length;
  if (dark !== undefined && dark.length !== n) {
    throw new KerrError('INTERNAL', `exposureGains: ${n} reference values but ${dark.length} dark values`);
  }
  const net = new Float64Array(n);
  const valid: number[] = [];
  for (let i = 0; i < n; i++) {
    const value = reference[i]! - (dark === undefined ? 0 : dark[i]!);
    net[i] = value;
    if (Number.isFinite(value) && value > 0) valid.push(value);
  }
  if (valid.length === 0) {
    throw new KerrError('BAD_REGION', 'the reference region is never brighter than the dark level, so it cannot track exposure', {
      path: '--reference-roi',
      hint: 'Put the reference region on a lit grey card or wall that stays in view, or leave --reference-roi out and lock the exposure',
    });
  }
  const medianReference = median(valid);
  const gains = new Float64Array(n);
  let invalidFrames = 0, minGain = Infinity, maxGain = -Infinity;
  for (let i = 0; i < n; i++) {
    const value = net[i]!;
    if (Number.isFinite(value) && value > 0) {
      const gain = value / medianReference;
      gains[i] = gain;
      if (gain < minGain) minGain = gain;
      if (gain > maxGain) maxGain = gain;
    } else {
      gains[i] = NaN;
      invalidFrames++;
    }
  }
  return { gains, medianReference, invalidFrames, minGain, maxGain };
}

/** (value − dark) / gain for one sample. */
export function correctExposure(value: number, dark: number, gain: number): number {
  return (value - dark) / gain;
}

/**
 * (values − dark) / gains for a series, into a new array; `dark` and `gains` may be left out
 * (no dark region: 0; no reference region: gain 1).
 */
export function correctSeries(values: ArrayLike<number>, dark?: ArrayLike<number>, gains?: ArrayLike<number>): Float64Array {
  const out = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) {
    out[i] = correctExposure(values[i]!, dark === undefined ? 0 : dark[i]!, gains === undefined ? 1 : gains[i]!);
  }
  return out;
}
