/**
 * The sync of a run and the voltage at each frame: the offset (given, or found by findSyncOffset
 * on the frames not left out before the sync), the log read at t_frame − offset (monotone cubic
 * where the log is smooth, straight lines at steps, nothing across dropouts: interpolateLog), its
 * interpolation uncertainty, and the exclusions only the sync can decide: "log-gap" (the frame
 * falls in a gap of the log, never bridged) and "outside-log".
 * Throws KerrError NO_OVERLAP when fewer than 10 frames meet the log.
 */
import { KerrError } from '../errors.js';
import { findSyncOffset } from '../core/sync/findSyncOffset.js';
import { interpolateAt } from '../core/signal/interpolate.js';
import { interpolateLog, GAP_FACTOR, medianInterval } from '../core/signal/interpolateLog.js';
import { voltageNoiseV } from '../core/signal/voltageNoise.js';
import { interpolationUncertaintyV } from '../core/signal/interpolationUncertainty.js';
import type { VoltageLog } from '../io/voltageLog.js';
import type { RunResult, RunWarning } from '../result/schema.js';

export interface SyncedRun {
  offsetS: number;
  offsetStdErrS: number | undefined;
  sync: RunResult['sync'];
  /** The sync's guess of V_π (a start for the fit), when it searched. */
  vpiHint: number | undefined;
  /** Voltage at each frame (NaN where the log cannot tell). */
  voltage: Float64Array;
  /** Standard uncertainty of each frame's voltage from the interpolation, V. */
  voltageSigmaV: Float64Array;
  /** The log's voltage at given log times, by the same rule as `voltage`. */
  voltageAt: (logTimesS: Float64Array) => Float64Array;
  /** The log's steps among the frames read and its median interval, s (their edge timing: syncOffsetUncertainty). */
  logSteps: { intervalS: number; count: number };
  /** Exclusions after the sync: the pre-sync list with log-gap and outside-log added. */
  excluded: (string | null)[];
  warnings: RunWarning[];
}

export interface SyncInput {
  times: Float64Array;
  intensity: Float64Array;
  log: VoltageLog;
  excluded: readonly (string | null)[];
  offsetS?: number;
}

function findOffset(i: SyncInput, warnings: RunWarning[]): Pick<SyncedRun, 'offsetS' | 'offsetStdErrS' | 'sync' | 'vpiHint'> {
  if (i.offsetS !== undefined) {
    return { offsetS: i.offsetS, offsetStdErrS: undefined, vpiHint: undefined, sync: { manual: true, offsetS: i.offsetS, sharpnessS: null, ambiguous: false, curve: { offsetS: [], score: [] } } };
  }
  const usable = Uint8Array.from(i.excluded, (e) => (e ? 0 : 1));
  const s = findSyncOffset({ frameTimesS: i.times, intensity: i.intensity, logTimeS: i.log.timeS, logVoltageV: i.log.voltageV, usable });
  // the search's findings come as data with their own codes (no reading of the message text)
  for (const w of s.syncWarnings) warnings.push({ code: w.code, message: w.message, guideSection: 'sync' });
  return {
    offsetS: s.offsetS, offsetStdErrS: s.offsetStdErrS ?? undefined, vpiHint: s.vpiGuessV,
    sync: { manual: false, offsetS: s.offsetS, sharpnessS: s.sharpnessS ?? null, ambiguous: s.ambiguous, curve: s.curve },
  };
}

export function syncRun(i: SyncInput): SyncedRun {
  const { times, log } = i;
  const n = times.length;
  const warnings: RunWarning[] = [];
  const found = findOffset(i, warnings);
  const query = Float64Array.from(times, (t) => t - found.offsetS);
  const logNoiseV = voltageNoiseV(log.voltageV);
  const voltageAt = (q: Float64Array): Float64Array => (log.rows >= 2 ? interpolateLog(log.timeS, log.voltageV, q, logNoiseV).valueV : interpolateAt(log.timeS, log.voltageV, q));
  const reading = log.rows >= 2 ? interpolateLog(log.timeS, log.voltageV, query, logNoiseV) : { valueV: interpolateAt(log.timeS, log.voltageV, query), gap: new Uint8Array(n), linear: new Uint8Array(n), stepCount: 0 };
  const voltage = reading.valueV;
  const excluded = i.excluded.slice();
  let inLog = 0, inGaps = 0;
  for (let f = 0; f < n; f++) {
    if (reading.gap[f]) { if (!excluded[f]) { excluded[f] = 'log-gap'; inGaps++; } } else if (!Number.isFinite(voltage[f]!)) { if (!excluded[f]) excluded[f] = 'outside-log'; } else inLog++;
  }
  if (inGaps > 0) warnings.push({ code: 'log-gap', message: `${inGaps} frames fall in gaps of the voltage log (intervals longer than ${GAP_FACTOR}× the median sample interval) and were left out rather than bridged`, guideSection: 'voltage-log' });
  if (inLog < 10) {
    throw new KerrError('NO_OVERLAP', `the voltage log (${log.timeS[0]!.toFixed(2)}–${log.timeS[log.rows - 1]!.toFixed(2)} s) and the video (${times[0]!.toFixed(2)}–${times[n - 1]!.toFixed(2)} s) overlap in only ${inLog} frame${inLog === 1 ? '' : 's'} with offset ${found.offsetS.toFixed(3)} s`, { path: '--volts', hint: 'Check that the log belongs to this video, or give the right --offset-s' });
  }
  const voltageSigmaV = interpolationUncertaintyV(log.timeS, log.voltageV, query, logNoiseV);
  const logSteps = { intervalS: log.rows >= 3 ? medianInterval(log.timeS) : 0, count: reading.stepCount };
  return { ...found, voltage, voltageSigmaV, voltageAt, logSteps, excluded, warnings };
}
