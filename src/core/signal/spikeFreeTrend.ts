/**
 * A model of a per-frame series without its short upward spikes, that needs no physical model:
 * the larger of two robust smoothers over ±h included frames,
 *
 *   A_t = running median (runningMedian: keeps steps exactly, cuts the top off smooth peaks)
 *   B_t = robust local quadratic (robustLocalQuadratic: keeps smooth peaks, rounds steps off)
 *   trend_t = max(A_t, B_t)
 *
 * At a peak of a sweep B is right and A too low; next to a step one of them is right and the
 * other too high or right; so the larger is never too low where either is right, and a frame must
 * stand above both to count as a spike: conservative, it never makes a spike out of a peak or a
 * step. Its cost: on a steep ramp a spike raises the median by up to half its length in ranks, so
 * a short spike on a steep ramp can hide (docs/analyze.md, "Particles").
 * Used by analyze to find particle passages before any fit (src/pipeline/frameExclusions.ts).
 *
 * Units: those of `values`; times in s. NaN for frames not included. Pure; never mutates its
 * inputs. Throws KerrError INTERNAL for series of different length.
 * @example spikeFreeTrend(intensity, candidate, timesS, 15)[t]
 */
import { KerrError } from '../../errors.js';
import { runningMedian } from './runningMedian.js';
import { robustLocalQuadratic } from './robustLocalQuadratic.js';

export function spikeFreeTrend(values: Float64Array, include: Uint8Array, timesS: Float64Array, halfWindow: number): Float64Array {
  if (include.length !== values.length || timesS.length !== values.length) throw new KerrError('INTERNAL', 'values, include and time series must have one entry per frame');
  const a = runningMedian(values, include, halfWindow);
  const b = robustLocalQuadratic(values, include, timesS, halfWindow);
  const out = Float64Array.from(a, (m, f) => (Number.isFinite(m) && Number.isFinite(b[f]!) ? Math.max(m, b[f]!) : NaN));
  return out;
}
