/**
 * Particle events: short positive spikes of the beam intensity above the fitted Kerr model, as
 * made by a dust particle or bubble drifting through the beam and scattering light past the
 * analyser. Per frame, on the frames that may be judged (`candidate`):
 *
 *   r_t = I_t − M_t                                 (residual of the Kerr fit, M the model)
 *   b_t = median{ r_s : 0 < |s − t| ≤ w }            (slow misfit and drift; w ≈ `halfWindowS`)
 *   d_t = r_t − b_t
 *   σ_t = max(√(a + b·M_t), ¼·1.4826·MAD(d))      (noise model; MAD: Hampel 1974)
 *   u_t = T · max{ |ΔM_s − ΔM_t| : |s − t| ≤ S },  ΔM_s = M_{s+1} − M_s   (timing allowance)
 *   z_t = (d_t − u_t) / σ_t
 *
 * A frame is flagged when z_t > `zLimit` (default 5). Flagged frames separated by at most
 * `maxGapFrames` unflagged frames (default 1) form one event; the event's size is its largest z.
 * Rate = events / judged span in minutes, with a Poisson standard error √max(N, 1)/span (the
 * "1" keeps a run without events from claiming a zero error).
 *
 * Why u_t: the model follows the voltage log, interpolated linearly between its samples. Where
 * the voltage changes its rate within one log interval (a step with a fast rise, the turn of a
 * sweep), the true voltage between samples is not known and the model can be a frame or two
 * early or late; the edge of a step then leaves a residual of about one frame's model change.
 * u_t allows T frames (`timingToleranceFrames`, default 2) of that, measured by how much the
 * model's frame-to-frame change varies within S frames (one log interval, `logIntervalS`, at
 * least 2 frames). On steady ramps and holds ΔM hardly varies and u_t ≈ 0, so a particle is seen
 * at full sensitivity there.
 * Why σ_t follows the brightness: camera noise grows with it (shot noise: variance ∝ I); one
 * global scale, set by the many dark frames, would make every bright frame of a sweep look like a
 * spike. The noise model σ² = a + b·M is fitted to robust scales of frame-to-frame differences of
 * d (which cancel slow misfit) in brightness bins, so neighbouring particles or a step in the same
 * stretch of time do not inflate it, as a running local scale would. A quarter of the global scale
 * is the floor for perfectly quiet stretches.
 *
 * Units: intensity and model in the same linear units; times in s; rate per minute.
 * Never mutates its inputs. Throws KerrError INTERNAL for arrays of different length.
 * @example
 *   detectParticleEvents({ intensity, model, candidate, timesS }).events.length → 3
 */
import { KerrError } from '../../errors.js';
import { quantity, type Quantity } from '../../quantity.js';
import { median, robustScale } from '../fit/robustScale.js';

export interface ParticleEventsInput {
  intensity: Float64Array;
  /** Model intensity per frame (NaN where unknown). */
  model: Float64Array;
  /** 1 = frame may be judged (voltage known, not a spark, not clipped). */
  candidate: Uint8Array;
  timesS: Float64Array;
  zLimit?: number;
  /** Half-width of the running median, s (default 1 s). */
  halfWindowS?: number;
  maxGapFrames?: number;
  /** Frames of model timing error allowed where the voltage bends (default 2). */
  timingToleranceFrames?: number;
  /** Typical interval between voltage-log samples, s (sets S; default: 2 frames). */
  logIntervalS?: number;
}

export interface ParticleEvent {
  firstFrame: number;
  lastFrame: number;
  peakFrame: number;
  peakTimeS: number;
  /** Largest robust z of the event. */
  size: number;
}

export interface ParticleDetection {
  events: ParticleEvent[];
  /** 1 for every frame inside a flagged run. */
  flags: Uint8Array;
  /** Robust standard deviation of the detrended residual over the whole run, linear units. */
  scale: number;
  /** Time span of the judged frames, s. */
  spanS: number;
  ratePerMinute: Quantity;
}

/**
 * σ² = a + b·level from frame-to-frame differences: Var(d_k − d_{k−1}) = 2σ² for independent
 * noise; robust scales per brightness bin (up to 8 bins of equal count), then a least-squares
 * line through (level, σ²) with a, b ≥ 0. Falls back to the global scale with few points.
 */
function brightnessNoiseModel(d: Float64Array, level: Float64Array, globalScale: number): { a: number; b: number } {
  const m = d.length;
  const fallback = { a: globalScale * globalScale, b: 0 };
  if (m < 40) return fallback;
  const pairs: { level: number; diff: number }[] = [];
  for (let k = 1; k < m; k++) pairs.push({ level: (level[k]! + level[k - 1]!) / 2, diff: d[k]! - d[k - 1]! });
  pairs.sort((p, q) => p.level - q.level);
  const bins = Math.min(8, Math.floor(pairs.length / 20));
  if (bins < 2) return fallback;
  const xs: number[] = [];
  const ys: number[] = [];
  for (let b = 0; b < bins; b++) {
    const part = pairs.slice(Math.floor((b * pairs.length) / bins), Math.floor(((b + 1) * pairs.length) / bins));
    const sigma = robustScale(Float64Array.from(part, (p) => p.diff)) / Math.SQRT2;
    xs.push(part.reduce((acc, p) => acc + p.level, 0) / part.length);
    ys.push(sigma * sigma);
  }
  const n = xs.length;
  const mx = xs.reduce((a, x) => a + x, 0) / n;
  const my = ys.reduce((a, y) => a + y, 0) / n;
  let sxy = 0, sxx = 0;
  for (let i = 0; i < n; i++) { sxy += (xs[i]! - mx) * (ys[i]! - my); sxx += (xs[i]! - mx) ** 2; }
  const b = sxx > 0 ? Math.max(0, sxy / sxx) : 0;
  const a = Math.max(0, my - b * mx);
  return a + b * mx > 0 ? { a, b } : fallback;
}

export function detectParticleEvents(input: ParticleEventsInput): ParticleDetection {
  const { intensity, model, candidate, timesS } = input;
  const n = intensity.length;
  if (model.length !== n || candidate.length !== n || timesS.length !== n) {
    throw new KerrError('INTERNAL', 'intensity, model, candidate and time series must have one entry per frame');
  }
  const zLimit = input.zLimit ?? 5;
  const maxGap = input.maxGapFrames ?? 1;
  const idx: number[] = [];
  for (let f = 0; f < n; f++) {
    if (candidate[f] && Number.isFinite(model[f]!) && Number.isFinite(intensity[f]!)) idx.push(f);
  }
  const flags = new Uint8Array(n);
  const m = idx.length;
  if (m < 5) return { events: [], flags, scale: NaN, spanS: 0, ratePerMinute: quantity(NaN, undefined, '1/min') };

  const dts = new Float64Array(m - 1);
  for (let k = 1; k < m; k++) dts[k - 1] = timesS[idx[k]!]! - timesS[idx[k - 1]!]!;
  const frameS = median(dts) > 0 ? median(dts) : 1 / 30;
  const w = Math.max(5, Math.round((input.halfWindowS ?? 1) / frameS));

  // Timing allowance from the variation of the model's frame-to-frame change.
  const tolerance = Math.max(0, input.timingToleranceFrames ?? 2);
  const span = Math.max(2, Math.ceil((input.logIntervalS ?? 0) / frameS));
  const step = new Float64Array(n).fill(NaN);
  for (let f = 0; f + 1 < n; f++) step[f] = model[f + 1]! - model[f]!;
  const allowance = (f: number): number => {
    const here = Number.isFinite(step[f]!) ? step[f]! : f > 0 ? step[f - 1]! : NaN;
    if (!Number.isFinite(here)) return 0;
    let most = 0;
    for (let s = Math.max(0, f - span); s <= Math.min(n - 2, f + span); s++) {
      const v = step[s]!;
      if (Number.isFinite(v) && Math.abs(v - here) > most) most = Math.abs(v - here);
    }
    return tolerance * most;
  };

  const residual = Float64Array.from(idx, (f) => intensity[f]! - model[f]!);
  const detrended = new Float64Array(m);
  const around: number[] = [];
  for (let k = 0; k < m; k++) {
    around.length = 0;
    for (let j = Math.max(0, k - w); j <= Math.min(m - 1, k + w); j++) if (j !== k) around.push(residual[j]!);
    detrended[k] = residual[k]! - median(around);
  }
  const scale = robustScale(detrended);
  const floorScale = Math.max(0.25 * scale, 1e-9);
  const noise = brightnessNoiseModel(detrended, Float64Array.from(idx, (f) => model[f]!), scale);

  const events: ParticleEvent[] = [];
  let open: ParticleEvent | null = null;
  for (let k = 0; k < m; k++) {
    if (!(detrended[k]! > zLimit * floorScale)) continue; // cheap pre-check before the local scale
    const f = idx[k]!;
    const local = Math.max(Math.sqrt(Math.max(0, noise.a + noise.b * model[f]!)), floorScale);
    const z = (detrended[k]! - allowance(f)) / local;
    if (!(z > zLimit)) continue;
    if (open && f - open.lastFrame <= maxGap + 1) {
      open.lastFrame = f;
      if (z > open.size) { open.size = z; open.peakFrame = f; open.peakTimeS = timesS[f]!; }
    } else {
      open = { firstFrame: f, lastFrame: f, peakFrame: f, peakTimeS: timesS[f]!, size: z };
      events.push(open);
    }
  }
  for (const e of events) for (let f = e.firstFrame; f <= e.lastFrame; f++) flags[f] = 1;

  const spanS = timesS[idx[m - 1]!]! - timesS[idx[0]!]! + frameS;
  const minutes = spanS / 60;
  const ratePerMinute = minutes > 0
    ? quantity(events.length / minutes, Math.sqrt(Math.max(events.length, 1)) / minutes, '1/min')
    : quantity(NaN, undefined, '1/min');
  return { events, flags, scale, spanS, ratePerMinute };
}
