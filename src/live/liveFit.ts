/**
 * The running Kerr fit of the live view: from the recent beam intensities (frame times on the live
 * clock) and the followed voltage log (log clock), find the clock offset with the project's sync
 * search (core/sync/findSyncOffset), read each frame's voltage from the log at its shifted time
 * (core/signal/interpolate), and fit I(V) = I_floor + I_amp·sin²(2θ)·sin²(π/2·(V/V_π)²) with
 * core/fit/fitKerrCurve, which gives V_π and B = d²/(2·L·V_π²) with their standard errors.
 * Same model, same code as analyze; only the data are the frames still held in the live rings.
 *
 * Pure. Never throws for data that cannot support a fit yet (too few frames, no drive, no overlap,
 * no convergence): it returns `status: 'waiting'` with the reason in one sentence.
 * Units: s, V, m; intensity in the linear units of the meters; B in m/V².
 */
import { isKerrError } from '../errors.js';
import type { Quantity } from '../quantity.js';
import { findSyncOffset } from '../core/sync/findSyncOffset.js';
import { fitKerrCurve } from '../core/fit/fitKerrCurve.js';
import { interpolateAt } from '../core/signal/interpolate.js';

export interface LiveFitInput {
  frameTimesS: Float64Array;
  intensity: Float64Array;
  /** 1 = use the frame (0: open-level capture, clipped frames...). Default all. */
  usable?: Uint8Array;
  logTimeS: Float64Array;
  logVoltageV: Float64Array;
  gapM: number;
  effectiveLengthM: number;
  polariserAngleDeg?: number;
  /** Points returned for the plot (evenly thinned), default 400. */
  maxPlotPoints?: number;
}

export interface LiveFitReady {
  status: 'ok';
  offsetS: number;
  syncScore: number;
  syncAmbiguous: boolean;
  kerrConstant: Quantity;
  halfWaveVoltage: Quantity;
  relStdErrB: number;
  identifiable: boolean;
  maxVoltageOverHalfWave: number;
  points: number;
  plot: { voltageV: number[]; intensity: number[] };
  curve: { voltageV: number[]; intensity: number[] };
}

export interface LiveFitWaiting {
  status: 'waiting';
  reason: string;
}

export type LiveFitResult = LiveFitReady | LiveFitWaiting;

const MIN_FRAMES = 30;

export function liveFit(input: LiveFitInput): LiveFitResult {
  const { frameTimesS, intensity, logTimeS, logVoltageV } = input;
  if (logTimeS.length < 5) return { status: 'waiting', reason: 'waiting for the voltage log (fewer than 5 rows so far)' };
  if (frameTimesS.length < MIN_FRAMES) return { status: 'waiting', reason: 'waiting for frames with a beam region' };
  let sync;
  try {
    sync = findSyncOffset({ frameTimesS, intensity, logTimeS, logVoltageV, ...(input.usable ? { usable: input.usable } : {}) });
  } catch (err) {
    if (isKerrError(err)) return { status: 'waiting', reason: `sync: ${err.message}` };
    throw err;
  }
  const first = logTimeS[0]!;
  const last = logTimeS[logTimeS.length - 1]!;
  const v: number[] = [];
  const y: number[] = [];
  const query: number[] = [];
  for (let k = 0; k < frameTimesS.length; k++) {
    const t = frameTimesS[k]! - sync.offsetS;
    if (t < first || t > last || !Number.isFinite(intensity[k]!) || (input.usable && input.usable[k] === 0)) continue;
    query.push(t);
    y.push(intensity[k]!);
  }
  if (query.length < MIN_FRAMES) return { status: 'waiting', reason: `only ${query.length} frames overlap the log so far` };
  const volts = interpolateAt(logTimeS, logVoltageV, query);
  for (const x of volts) v.push(x);
  let fit;
  try {
    fit = fitKerrCurve({
      voltageV: Float64Array.from(v),
      intensity: Float64Array.from(y),
      effectiveLengthM: input.effectiveLengthM,
      gapM: input.gapM,
      polariserAngleDeg: input.polariserAngleDeg ?? 45,
      halfWaveGuessesV: [sync.vpiGuessV],
    });
  } catch (err) {
    if (isKerrError(err)) return { status: 'waiting', reason: `fit: ${err.message}` };
    throw err;
  }
  const maxPlot = input.maxPlotPoints ?? 400;
  const stride = Math.max(1, Math.ceil(v.length / maxPlot));
  const plot = { voltageV: [] as number[], intensity: [] as number[] };
  for (let i = 0; i < v.length; i += stride) { plot.voltageV.push(v[i]!); plot.intensity.push(y[i]!); }
  let vMin = Infinity, vMax = -Infinity;
  for (const x of v) { vMin = Math.min(vMin, x); vMax = Math.max(vMax, x); }
  const curve = { voltageV: [] as number[], intensity: [] as number[] };
  for (let i = 0; i <= 60; i++) {
    const x = vMin + ((vMax - vMin) * i) / 60;
    curve.voltageV.push(x);
    curve.intensity.push(fit.predict(x));
  }
  return {
    status: 'ok',
    offsetS: sync.offsetS,
    syncScore: sync.score,
    syncAmbiguous: sync.ambiguous,
    kerrConstant: fit.kerrConstant,
    halfWaveVoltage: fit.halfWaveVoltage,
    relStdErrB: fit.relStdErrB,
    identifiable: fit.identifiable,
    maxVoltageOverHalfWave: fit.maxVoltageOverHalfWave,
    points: v.length,
    plot,
    curve,
  };
}
