/**
 * Checks the arrays given to findSyncOffset before any work: one intensity and one usable flag per
 * frame, at least 2 frames with finite, non-decreasing times (s) spanning some time, one voltage
 * (V) per log time, at least 2 log samples with finite, strictly increasing times, finite
 * voltages, and a search range [from, to] (s) with from < to when given.
 *
 * Throws KerrError BAD_ARGUMENT (through `invalid`) naming the array and the first bad entry.
 * @example validateSyncInput({ frameTimesS, intensity, logTimeS, logVoltageV }) // returns nothing or throws
 */
import { invalid } from '../../errors.js';
import type { SyncInput } from './findSyncOffset.js';

export function validateSyncInput(input: SyncInput): void {
  const { frameTimesS, intensity, usable } = input;
  if (intensity.length !== frameTimesS.length) {
    throw invalid(`${frameTimesS.length} intensities (one per frame time)`, 'findSyncOffset(intensity)', `${intensity.length}`);
  }
  if (usable !== undefined && usable.length !== frameTimesS.length) {
    throw invalid(`${frameTimesS.length} usable flags (one per frame)`, 'findSyncOffset(usable)', `${usable.length}`);
  }
  if (frameTimesS.length < 2) throw invalid('at least 2 frames', 'findSyncOffset(frameTimesS)', frameTimesS.length);
  for (let k = 0; k < frameTimesS.length; k++) {
    if (!Number.isFinite(frameTimesS[k]) || (k > 0 && frameTimesS[k] < frameTimesS[k - 1])) {
      throw invalid('finite, non-decreasing frame times', 'findSyncOffset(frameTimesS)', `${frameTimesS[k]} at frame ${k}`);
    }
  }
  if (!(frameTimesS[frameTimesS.length - 1] > frameTimesS[0])) {
    throw invalid('frame times spanning some time', 'findSyncOffset(frameTimesS)', 'equal times');
  }
  validateLogAndRange(input);
}

function validateLogAndRange(input: SyncInput): void {
  const { logTimeS, logVoltageV, searchRangeS } = input;
  if (logVoltageV.length !== logTimeS.length) {
    throw invalid(`${logTimeS.length} log voltages (one per log time)`, 'findSyncOffset(logVoltageV)', `${logVoltageV.length}`);
  }
  if (logTimeS.length < 2) throw invalid('at least 2 log samples', 'findSyncOffset(logTimeS)', logTimeS.length);
  for (let i = 0; i < logTimeS.length; i++) {
    if (!Number.isFinite(logTimeS[i]) || (i > 0 && !(logTimeS[i] > logTimeS[i - 1]))) {
      throw invalid('finite, strictly increasing log times', 'findSyncOffset(logTimeS)', `${logTimeS[i]} at sample ${i}`);
    }
    if (!Number.isFinite(logVoltageV[i])) throw invalid('finite log voltages', 'findSyncOffset(logVoltageV)', `${logVoltageV[i]} at sample ${i}`);
  }
  if (searchRangeS !== undefined && !(Number.isFinite(searchRangeS[0]) && Number.isFinite(searchRangeS[1]) && searchRangeS[0] < searchRangeS[1])) {
    throw invalid('a search range [from, to] in s with from < to', 'findSyncOffset(searchRangeS)', `[${searchRangeS.join(', ')}]`);
  }
}
