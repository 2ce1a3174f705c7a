/**
 * The frames the synchronisation search may use, compacted: those flagged usable (all when no
 * flags are given) with a finite intensity, as times (s) and intensities (linear units) in frame
 * order. Never mutates its inputs.
 *
 * Throws KerrError NOT_IDENTIFIABLE when fewer than `minFrames` frames are usable, or when the
 * intensity is the same in every usable frame (to 1e-9 of its size): nothing to synchronise.
 * @example usableSyncFrames(times, intensity, undefined, 20) → { timeS, intensity }
 */
import { KerrError } from '../../errors.js';
import { roundTo } from './roundTo.js';

export interface SyncFrames {
  timeS: Float64Array;
  intensity: Float64Array;
}

export function usableSyncFrames(frameTimesS: Float64Array, intensity: Float64Array, usable: Uint8Array | undefined, minFrames: number): SyncFrames {
  const keep: number[] = [];
  for (let k = 0; k < frameTimesS.length; k++) {
    if ((usable === undefined || usable[k] !== 0) && Number.isFinite(intensity[k])) keep.push(k);
  }
  if (keep.length < minFrames) {
    throw new KerrError('NOT_IDENTIFIABLE', `only ${keep.length} usable frame${keep.length === 1 ? '' : 's'} to synchronise the video with the log; at least ${minFrames} are needed`, {
      path: 'sync',
      hint: 'use a longer clip, or fewer excluded frames, or give the offset',
      inputs: ['syncOffset'],
    });
  }
  const timeS = Float64Array.from(keep, (k) => frameTimesS[k]);
  const frameI = Float64Array.from(keep, (k) => intensity[k]);
  let lowestI = Number.POSITIVE_INFINITY;
  let highestI = Number.NEGATIVE_INFINITY;
  for (let k = 0; k < frameI.length; k++) {
    lowestI = Math.min(lowestI, frameI[k]);
    highestI = Math.max(highestI, frameI[k]);
  }
  if (!(highestI - lowestI > 1e-9 * Math.max(Math.abs(highestI), Math.abs(lowestI)))) {
    throw new KerrError('NOT_IDENTIFIABLE', `the beam intensity is the same (${roundTo(highestI, 4)}) in every usable frame, so the video cannot be synchronised with the log`, {
      path: 'sync',
      hint: 'check that the region covers the beam and that the camera did not clip it, or give the offset',
      inputs: ['syncOffset'],
    });
  }
  return { timeS, intensity: frameI };
}
