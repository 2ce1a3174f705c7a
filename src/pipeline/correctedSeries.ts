/**
 * The beam intensity analyze fits: I_t = (beam_t − background_t) / g_t, with g_t the exposure gain
 * from the reference region (minus the dark region when one is given; 1 without a reference),
 * and the same per colour channel for --channels rgb. A reference that is never brighter than the
 * dark level gives no gains: all gains stay 1 and a warning says why.
 * @example correctedSeries(clip, { referenceRoi }).intensity[f]
 */
import { isKerrError } from '../errors.js';
import { exposureGains } from '../measure/exposure.js';
import type { RunWarning } from '../result/schema.js';
import type { ClipMeasurement } from './measureClip.js';

export interface CorrectedSeries {
  /** Dark-subtracted, exposure-normalised beam intensity per frame (linear units). */
  intensity: Float64Array;
  /** Exposure gain per frame (1 without a reference region; non-finite: no reference light). */
  gain: Float64Array;
  /** True when the gains come from a reference region. */
  gainFromReference: boolean;
  channelIntensity?: { r: Float64Array; g: Float64Array; b: Float64Array };
  warnings: RunWarning[];
}

export function correctedSeries(clip: ClipMeasurement, o: { referenceRoi?: unknown; channels?: 'rgb' }): CorrectedSeries {
  const n = clip.nFrames;
  const warnings: RunWarning[] = [];
  let gain: Float64Array = new Float64Array(n).fill(1);
  let gainFromReference = false;
  if (o.referenceRoi !== undefined) {
    try {
      gain = exposureGains(clip.referenceLuma!, clip.darkLuma).gains;
      gainFromReference = true;
    } catch (err) {
      if (!isKerrError(err)) throw err;
      warnings.push({ code: 'reference-dark', message: 'the reference region is never brighter than the dark level, so exposure could not be corrected from it; put it on a lit grey card', guideSection: 'lock-exposure' });
    }
  }
  const bg = clip.haveSurround ? clip.background : null;
  const intensity = Float64Array.from(clip.beam.luma, (v, f) => (v - (bg ? bg.luma[f]! : 0)) / gain[f]!);
  let channelIntensity: CorrectedSeries['channelIntensity'];
  if (o.channels === 'rgb') {
    const channel = (k: 'r' | 'g' | 'b'): Float64Array => Float64Array.from(clip.beam[k], (v, f) => (v - clip.background[k][f]!) / gain[f]!);
    channelIntensity = { r: channel('r'), g: channel('g'), b: channel('b') };
  }
  return { intensity, gain, gainFromReference, ...(channelIntensity ? { channelIntensity } : {}), warnings };
}
