/**
 * The setup meters of the live view: each turns a few live numbers into a value, a verdict
 * (good / fair / poor / unknown) and one plain sentence saying whether the run will measure well,
 * with the anchor of the matching section of docs/recording-a-run.md. Pure: numbers in, meters out.
 *
 * Thresholds (our choices, "common practice" where marked; docs/live.md lists them):
 * - extinction, with an open level: closed/open ≤ 1/1000 good, ≤ 1/100 fair (crossed polarisers of
 *   ordinary film reach 1/1000 or better: common practice); without one, the floor above the
 *   beam's surround (linear light, 1 = full scale) ≤ 0.002 good, ≤ 0.01 fair;
 * - clipping: fraction of beam pixels at the clip code, worst frame of the last seconds: 0 good,
 *   ≤ 1 % fair (the fit leaves clipped frames' light wrong);
 * - exposure drift of the reference region: |slope| of a straight line over the last minute, in %
 *   of its mean per minute, ≤ 0.5 good, ≤ 2 fair; needs 10 s of data;
 * - frame rate: delivered frames per second over the last 5 s and frames missing from the
 *   timestamps (a gap longer than 1.5 median intervals counts round(gap/interval) − 1 frames);
 *   none missing in the last minute good, ≤ 1 % fair;
 * - voltage log: rows arriving (a row in the last 5 s good, 5–20 s fair, older or none poor).
 */
import { fitLine } from '../core/fit/lineFit.js';
import { median } from '../core/fit/robustScale.js';
import { formatNumber } from '../quantity.js';

export type Verdict = 'good' | 'fair' | 'poor' | 'unknown';

export interface Meter {
  id: 'extinction' | 'clipping' | 'exposure' | 'frames' | 'log';
  title: string;
  /** The number as text, with its unit. */
  value: string;
  verdict: Verdict;
  /** One sentence: will the run measure well, and what to do if not. */
  advice: string;
  /** Anchor in docs/recording-a-run.md. */
  guideSection: string;
}

export interface ExtinctionInput {
  /** Closed level: a low percentile of the beam's mean light minus the dark level, linear. */
  closedLevel: number;
  /** Open level captured with the button (beam minus dark, linear), or null. */
  openLevel: number | null;
  /** Closed beam light above its local surround, linear. */
  floorAboveSurround: number;
}

export function extinctionMeter(x: ExtinctionInput): Meter {
  const base = { id: 'extinction' as const, title: 'Extinction', guideSection: 'cross-polarisers' };
  if (x.openLevel !== null && x.openLevel > 0 && Number.isFinite(x.closedLevel)) {
    const ratio = Math.max(0, x.closedLevel) / x.openLevel;
    const verdict: Verdict = ratio <= 1e-3 ? 'good' : ratio <= 1e-2 ? 'fair' : 'poor';
    const shown = ratio > 0 ? `1 : ${formatNumber(1 / ratio)}` : 'below noise';
    const advice = verdict === 'good'
      ? 'Closed over open is small: the polarisers are well crossed.'
      : verdict === 'fair'
        ? 'Some light leaks with the field off: turn the analyser slowly for the darkest spot.'
        : 'Much light leaks with the field off: the polarisers are not crossed; turn the analyser until the spot is darkest.';
    return { ...base, value: `closed/open ${shown}`, verdict, advice };
  }
  if (!Number.isFinite(x.floorAboveSurround)) {
    return { ...base, value: 'no beam yet', verdict: 'unknown', advice: 'Waiting for a beam region: it is found when the spot changes, or drag one on the picture.' };
  }
  const f = x.floorAboveSurround;
  const verdict: Verdict = f <= 0.002 ? 'good' : f <= 0.01 ? 'fair' : 'poor';
  const advice = verdict === 'good'
    ? 'The closed beam is barely brighter than its surround: well crossed. Capture the open level for a ratio.'
    : verdict === 'fair'
      ? 'The closed beam is a little brighter than its surround: check the crossing, then capture the open level.'
      : 'The closed beam is much brighter than its surround: the polarisers are not crossed, or the field is on.';
  return { ...base, value: `floor above surround ${formatNumber(f, 2)}`, verdict, advice };
}

/** `fraction`: the largest fraction of clipped beam pixels in any recent frame (0–1), NaN without a beam. */
export function clippingMeter(fraction: number): Meter {
  const base = { id: 'clipping' as const, title: 'Clipped pixels in the beam', guideSection: 'avoid-clipping' };
  if (!Number.isFinite(fraction)) return { ...base, value: 'no beam yet', verdict: 'unknown', advice: 'Waiting for a beam region.' };
  const verdict: Verdict = fraction <= 0 ? 'good' : fraction <= 0.01 ? 'fair' : 'poor';
  const advice = verdict === 'good'
    ? 'No pixel of the beam reaches the top of the range.'
    : verdict === 'fair'
      ? 'A few beam pixels reach the top of the range: lower the exposure or the laser power a little.'
      : 'The beam is clipped: the bright part of the sweep will read too low. Lower the exposure or the laser power.';
  return { ...base, value: `${formatNumber(100 * fraction, 2)} %`, verdict, advice };
}

/**
 * Drift of the reference region: straight line through (time, level) over the window given,
 * slope as % of the mean level per minute. Returns NaN when fewer than 10 s or 10 points.
 */
export function driftPercentPerMinute(timesS: ArrayLike<number>, levels: ArrayLike<number>): number {
  const x: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < timesS.length; i++) {
    if (Number.isFinite(timesS[i]!) && Number.isFinite(levels[i]!)) { x.push(timesS[i]!); y.push(levels[i]!); }
  }
  if (x.length < 10 || x[x.length - 1]! - x[0]! < 10) return Number.NaN;
  const mean = y.reduce((a, b) => a + b, 0) / y.length;
  if (!(Math.abs(mean) > 0)) return Number.NaN;
  const line = fitLine(x, y);
  return (100 * line.slope * 60) / mean;
}

/** `percentPerMinute` from driftPercentPerMinute; `hasReference` false when no reference region is set. */
export function exposureMeter(percentPerMinute: number, hasReference: boolean): Meter {
  const base = { id: 'exposure' as const, title: 'Exposure stability (reference region)', guideSection: 'lock-exposure' };
  if (!hasReference) {
    return { ...base, value: 'no reference region', verdict: 'unknown', advice: 'Drag a reference region over a steady grey card (Reference mode) or give --reference-roi, to see whether the exposure holds.' };
  }
  if (!Number.isFinite(percentPerMinute)) return { ...base, value: 'measuring…', verdict: 'unknown', advice: 'Needs about 10 s of frames.' };
  const a = Math.abs(percentPerMinute);
  const verdict: Verdict = a <= 0.5 ? 'good' : a <= 2 ? 'fair' : 'poor';
  const advice = verdict === 'good'
    ? 'The reference holds steady: exposure is locked.'
    : verdict === 'fair'
      ? 'The reference drifts slowly: lock exposure and white balance if you can; analyze can correct slow drift from this region.'
      : 'The exposure is changing: lock exposure, focus and white balance before recording.';
  return { ...base, value: `${percentPerMinute >= 0 ? '+' : ''}${formatNumber(percentPerMinute, 2)} %/min`, verdict, advice };
}

export interface FrameTiming {
  /** Frames per second delivered over the window. */
  deliveredFps: number;
  /** Median interval between frames, s. */
  medianIntervalS: number;
  /** Frames missing from the timestamps in the window. */
  missing: number;
  frames: number;
}

/** Delivered rate and frames missing from a window of frame times (s, increasing). */
export function frameTiming(timesS: ArrayLike<number>): FrameTiming {
  const n = timesS.length;
  if (n < 3) return { deliveredFps: Number.NaN, medianIntervalS: Number.NaN, missing: 0, frames: n };
  const steps = new Float64Array(n - 1);
  for (let i = 1; i < n; i++) steps[i - 1] = timesS[i]! - timesS[i - 1]!;
  const med = median(steps);
  let missing = 0;
  if (med > 0) for (const s of steps) if (s > 1.5 * med) missing += Math.round(s / med) - 1;
  const span = timesS[n - 1]! - timesS[0]!;
  return { deliveredFps: span > 0 ? (n - 1) / span : Number.NaN, medianIntervalS: med, missing, frames: n };
}

/**
 * `recent`: timing of the last 5 s; `minute`: timing of the last minute; `nominalFps`: what the
 * source says (null when unknown); `totalMissing`: frames missing since the start.
 */
export function framesMeter(recent: FrameTiming, minute: FrameTiming, nominalFps: number | null, totalMissing: number): Meter {
  const base = { id: 'frames' as const, title: 'Frame rate and dropped frames', guideSection: 'frame-rate' };
  if (!Number.isFinite(recent.deliveredFps)) return { ...base, value: 'waiting for frames', verdict: 'unknown', advice: 'No frames yet from the source.' };
  const share = minute.frames > 0 ? minute.missing / (minute.frames + minute.missing) : 0;
  const slow = nominalFps !== null && recent.deliveredFps < 0.9 * nominalFps;
  const verdict: Verdict = minute.missing === 0 && !slow ? 'good' : share <= 0.01 ? 'fair' : 'poor';
  const nominal = nominalFps !== null ? ` of ${formatNumber(nominalFps)}` : '';
  const advice = verdict === 'good'
    ? 'Every frame arrives on time.'
    : verdict === 'fair'
      ? 'A few frames go missing: close other programs, lower the resolution, or use a shorter USB cable.'
      : 'Many frames go missing: lower the resolution or frame rate, or light the scene better so the camera does not lengthen its exposure.';
  return { ...base, value: `${formatNumber(recent.deliveredFps)} fps${nominal}, ${totalMissing} dropped`, verdict, advice };
}

/** `rows`: samples read so far; `ageS`: seconds since the last new row arrived (Infinity when none); `followed`: a log is followed. */
export function logMeter(followed: boolean, rows: number, ageS: number, problem: string | null): Meter {
  const base = { id: 'log' as const, title: 'Voltage log', guideSection: 'voltage-log' };
  if (!followed) return { ...base, value: 'not followed', verdict: 'unknown', advice: 'Give --volts FILE to follow the logger\'s CSV and see the Kerr fit live.' };
  if (problem !== null) return { ...base, value: 'cannot read', verdict: 'poor', advice: problem };
  if (rows === 0) return { ...base, value: 'no rows yet', verdict: 'poor', advice: 'The log has no data rows yet: is the logger running and writing to this file?' };
  const verdict: Verdict = ageS <= 5 ? 'good' : ageS <= 20 ? 'fair' : 'poor';
  const advice = verdict === 'good'
    ? 'New rows keep arriving.'
    : 'No new row for a while: check that the logger is still running.';
  return { ...base, value: `${rows} rows, last ${Number.isFinite(ageS) ? formatNumber(ageS, 2) : '–'} s ago`, verdict, advice };
}
