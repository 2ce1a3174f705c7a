/**
 * A model of a per-frame series without its short upward spikes, that needs no physical model,
 * from robust trends over ±h included frames (k numbers them in time order):
 *
 *   A_t = running median over k(t) ± h (runningMedian: keeps steps and holds exactly)
 *   Q_t = robust local quadratic over k(t) ± h (robustLocalQuadratic: keeps smooth peaks and
 *         valleys, which a median cuts off; a spike well under half the window gets no weight)
 *   L_t, R_t = robust lines through the h frames before and after t, extrapolated to t, with the
 *         repeated-median slope med_i med_{j≠i} (x_j − x_i)/(time_j − time_i) (Siegel 1982,
 *         Biometrika 69:242; breakdown 50 %) and level med_j (x_j − slope·(time_j − time_t))
 *   trend_t = max(A_t, Q_t)                  in general
 *           = max(A_t, Q_t, L_t, R_t)        at a sharp turn: L and R slope opposite ways, each
 *                                            at least half as steep as the other
 *
 * Why the largest: at a step the median is right and the quadratic, rounding it off, lies at or
 * below it on the high side; at a smooth peak the quadratic is right and the median too low; at
 * the sharp turn of a triangular sweep both round the corner off and the side lines reach it. So
 * the model is never too low where one of its parts is right, and a frame must stand above all of
 * them to count as a spike: conservative, no peak, turn or step becomes a spike. Its cost: on a
 * steep ramp a spike raises the running median by up to half its length in ranks, so a short spike
 * there can hide (docs/scatter.md, particleEventRate).
 * Used by analyze to find particle passages before any fit (src/pipeline/frameExclusions.ts).
 *
 * Units: those of `values`; times in s. NaN for frames not included. Pure; never mutates its
 * inputs. Throws KerrError INTERNAL for series of different length.
 * @example spikeFreeTrend(intensity, candidate, timesS, 15)[t]
 */
import { KerrError } from '../../errors.js';
import { robustLocalQuadratic } from './robustLocalQuadratic.js';
import { runningMedian } from './runningMedian.js';

function medianOf(a: number[]): number {
  a.sort((x, y) => x - y);
  const m = a.length >> 1;
  return a.length % 2 ? a[m]! : (a[m - 1]! + a[m]!) / 2;
}

/** Robust line through the frames idx[from..to] (inclusive): its level at time t0 and slope; null with < 3. */
function sideLine(values: Float64Array, timesS: Float64Array, idx: number[], from: number, to: number, t0: number): { level: number; slope: number } | null {
  if (to - from + 1 < 3) return null;
  const perPoint: number[] = [];
  const slopes: number[] = [];
  for (let i = from; i <= to; i++) {
    slopes.length = 0;
    for (let j = from; j <= to; j++) {
      const dt = timesS[idx[j]!]! - timesS[idx[i]!]!;
      if (j !== i && dt !== 0) slopes.push((values[idx[j]!]! - values[idx[i]!]!) / dt);
    }
    if (slopes.length > 0) perPoint.push(medianOf(slopes));
  }
  if (perPoint.length === 0) return null;
  const slope = medianOf(perPoint);
  const levels: number[] = [];
  for (let j = from; j <= to; j++) levels.push(values[idx[j]!]! - slope * (timesS[idx[j]!]! - t0));
  return { level: medianOf(levels), slope };
}

/** A sharp turn of the series: the two sides slope opposite ways, each at least half as steep as the other. */
function isTurn(leftSlope: number, rightSlope: number): boolean {
  if (!(leftSlope * rightSlope < 0)) return false;
  const a = Math.abs(leftSlope), b = Math.abs(rightSlope);
  return Math.min(a, b) >= 0.5 * Math.max(a, b);
}

export function spikeFreeTrend(values: Float64Array, include: Uint8Array, timesS: Float64Array, halfWindow: number): Float64Array {
  if (include.length !== values.length || timesS.length !== values.length) throw new KerrError('INTERNAL', 'values, include and time series must have one entry per frame');
  const median = runningMedian(values, include, halfWindow);
  const quadratic = robustLocalQuadratic(values, include, timesS, halfWindow);
  const idx: number[] = [];
  for (let f = 0; f < values.length; f++) if (Number.isFinite(quadratic[f]!) && Number.isFinite(median[f]!)) idx.push(f);
  const out = new Float64Array(values.length).fill(NaN);
  for (let k = 0; k < idx.length; k++) {
    const f = idx[k]!;
    let m = Math.max(median[f]!, quadratic[f]!);
    const left = sideLine(values, timesS, idx, Math.max(0, k - halfWindow), k - 1, timesS[f]!);
    const right = sideLine(values, timesS, idx, k + 1, Math.min(idx.length - 1, k + halfWindow), timesS[f]!);
    if (left && right && isTurn(left.slope, right.slope)) m = Math.max(m, left.level, right.level);
    out[f] = m;
  }
  return out;
}
