/**
 * Up/down disagreement of the Kerr constant. An impure liquid conducts; space charge builds up
 * while the field rises and screens it while it falls, so the apparent Kerr constant differs
 * between rising and falling |V| (common practice; see docs/references.md, facts of the
 * trade). The usable frames are split by the sign of d|V|/dt:
 *
 *   rate_t = (|V(t+2)| − |V(t−2)|) / (t_{+2} − t_{−2})     (central difference over ±2 frames)
 *   rising when rate_t >  h,  falling when rate_t < −h,  held otherwise,
 *   h = `holdFraction` (default 0.1) × the 90th percentile of |rate| over the usable frames,
 *
 * and each branch is fitted by the caller's Kerr fitter (`fitBranch`; the pipeline passes the
 * full Kerr fit with the amplitude held at the full-run value, V_π free). Then
 *
 *   ΔB = B_up − B_down,  σ_ΔB = √(σ_up² + σ_down²),  z = ΔB/σ_ΔB,
 *   flagged when |z| > 3 and |ΔB| > 1 % of the mean of B_up and B_down.
 *
 * The branch errors come from the fits and ignore correlated residuals, so z is optimistic for a
 * slowly drifting run; the 1 % floor keeps tiny but "significant" differences from being flagged.
 * A branch needs at least `minFrames` (default 10) frames and must reach half the run's highest
 * |V|; otherwise `result` is null and `note` says why. A fit that throws also gives a note.
 * Units: V, s, m/V². Pure (the fitter must be too); throws KerrError INTERNAL for arrays of
 * different length.
 * @example hysteresis({ voltageV, intensity, include, timesS, fitBranch }).result?.flagged → false
 */
import { KerrError, isKerrError } from '../../errors.js';
import { quantity, type Quantity } from '../../quantity.js';

export interface BranchFit {
  kerrConstant: Quantity;
  halfWaveVoltage: Quantity;
}

export type BranchFitter = (voltageV: Float64Array, intensity: Float64Array) => BranchFit;

export interface HysteresisInput {
  /** Voltage per frame, V (NaN where unknown). */
  voltageV: Float64Array;
  intensity: Float64Array;
  /** 1 = frame may be used. */
  include: Uint8Array;
  timesS: Float64Array;
  fitBranch: BranchFitter;
  holdFraction?: number;
  minFrames?: number;
  zLimit?: number;
  minRelDifference?: number;
}

export interface HysteresisFigures {
  up: Quantity;
  down: Quantity;
  difference: Quantity;
  zScore: number;
  flagged: boolean;
}

export interface Hysteresis {
  result: HysteresisFigures | null;
  note?: string;
  framesUp: number;
  framesDown: number;
  framesHeld: number;
  halfWaveUp?: Quantity;
  halfWaveDown?: Quantity;
}

export function hysteresis(input: HysteresisInput): Hysteresis {
  const { voltageV, intensity, include, timesS, fitBranch } = input;
  const n = voltageV.length;
  if (intensity.length !== n || include.length !== n || timesS.length !== n) {
    throw new KerrError('INTERNAL', 'voltage, intensity, include and time series must have one entry per frame');
  }
  const holdFraction = input.holdFraction ?? 0.1;
  const minFrames = input.minFrames ?? 10;
  const zLimit = input.zLimit ?? 3;
  const minRel = input.minRelDifference ?? 0.01;

  const rate = new Float64Array(n).fill(NaN);
  for (let f = 0; f < n; f++) {
    const a = Math.max(0, f - 2);
    const b = Math.min(n - 1, f + 2);
    const dt = timesS[b]! - timesS[a]!;
    if (b > a && dt > 0 && Number.isFinite(voltageV[a]!) && Number.isFinite(voltageV[b]!)) {
      rate[f] = (Math.abs(voltageV[b]!) - Math.abs(voltageV[a]!)) / dt;
    }
  }
  const rates: number[] = [];
  let vMaxAll = 0;
  for (let f = 0; f < n; f++) {
    if (!include[f] || !Number.isFinite(rate[f]!) || !Number.isFinite(voltageV[f]!) || !Number.isFinite(intensity[f]!)) continue;
    rates.push(Math.abs(rate[f]!));
    vMaxAll = Math.max(vMaxAll, Math.abs(voltageV[f]!));
  }
  const empty: Hysteresis = { result: null, framesUp: 0, framesDown: 0, framesHeld: 0 };
  if (rates.length < 2 * minFrames) return { ...empty, note: `only ${rates.length} usable frames with a known voltage` };
  rates.sort((x, y) => x - y);
  const hold = holdFraction * rates[Math.min(rates.length - 1, Math.floor(0.9 * (rates.length - 1)))]!;
  if (!(hold > 0)) return { ...empty, framesHeld: rates.length, note: 'the voltage does not change over the usable frames' };

  const up: number[] = [];
  const down: number[] = [];
  let held = 0;
  for (let f = 0; f < n; f++) {
    if (!include[f] || !Number.isFinite(rate[f]!) || !Number.isFinite(voltageV[f]!) || !Number.isFinite(intensity[f]!)) continue;
    if (rate[f]! > hold) up.push(f);
    else if (rate[f]! < -hold) down.push(f);
    else held++;
  }
  const counts = { framesUp: up.length, framesDown: down.length, framesHeld: held };
  const reach = (frames: number[]) => frames.reduce((m, f) => Math.max(m, Math.abs(voltageV[f]!)), 0);
  for (const [name, frames] of [['rising', up], ['falling', down]] as const) {
    if (frames.length < minFrames) return { result: null, ...counts, note: `only ${frames.length} frame${frames.length === 1 ? '' : 's'} on ${name} voltage; record both an up- and a down-sweep` };
    if (reach(frames) < 0.5 * vMaxAll) return { result: null, ...counts, note: `the ${name} part of the sweep reaches only ${((100 * reach(frames)) / vMaxAll).toFixed(0)}% of the highest voltage` };
  }
  let fitUp: BranchFit;
  let fitDown: BranchFit;
  try {
    fitUp = fitBranch(Float64Array.from(up, (f) => voltageV[f]!), Float64Array.from(up, (f) => intensity[f]!));
    fitDown = fitBranch(Float64Array.from(down, (f) => voltageV[f]!), Float64Array.from(down, (f) => intensity[f]!));
  } catch (err) {
    if (!isKerrError(err)) throw err;
    return { result: null, ...counts, note: `a branch fit failed: ${err.message}` };
  }
  const bUp = fitUp.kerrConstant;
  const bDown = fitDown.kerrConstant;
  const diff = bUp.value - bDown.value;
  const diffErr = Math.hypot(bUp.stdErr ?? NaN, bDown.stdErr ?? NaN);
  const z = diffErr > 0 ? diff / diffErr : NaN;
  const mean = (bUp.value + bDown.value) / 2;
  const flagged = Math.abs(z) > zLimit && Math.abs(diff) > minRel * Math.abs(mean);
  return {
    result: { up: bUp, down: bDown, difference: quantity(diff, diffErr, bUp.unit ?? 'm/V^2'), zScore: z, flagged },
    ...counts,
    halfWaveUp: fitUp.halfWaveVoltage,
    halfWaveDown: fitDown.halfWaveVoltage,
  };
}
