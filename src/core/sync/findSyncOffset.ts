/**
 * Find the clock offset between a video and its voltage log: offsetS = video time − log time of
 * the same instant (DESIGN.md, "Synchronising video and voltage log").
 *
 * Method. The beam intensity of frame k is modelled as I_k ≈ a + b·sin²(π/2 · V(t_k − offset)²/V_π²)
 * (crossed polarisers, b > 0), with a, b and V_π unknown. For each trial offset the log is
 * interpolated linearly at the frames' log times; frames outside the log are ignored for that
 * trial, and a trial counts only when at least max(20, 50 % of the most frames any offset can place
 * inside the log) usable frames remain. For 24 V_π guesses, log-spaced from 0.3× to 3× the log's
 * largest |V|, a and b are solved by linear least squares in closed form and the score is the best
 * R² (createModulationScorer). Offsets lie on a grid (step = half the median frame interval, or
 * the median log interval when that is coarser) over every offset with a useful overlap (within
 * the search range when one is given). Up to 600 grid offsets are all scored; beyond that every
 * n-th one is, and the grid is then filled in around the six best local maxima by halving the
 * stride (so ~2000 frames against a fast log still take a fraction of a second). The best offset
 * is refined by golden-section search between its grid neighbours (tolerance 1/20 frame), with
 * V_π refined by golden-section search (in ln V_π, ±1 guess step) at each trial offset.
 *
 * Reported: the offset and its score (R², dimensionless); `sharpnessS`, the mean distance either
 * side at which the score has dropped by 0.01 (s; a warning when wider than 15 frames); `offsetStdErrS`, a 1-σ estimate from the
 * curvature of R² at the optimum, assuming independent frame residuals (optimistic when residuals
 * are correlated); `runnerUp`, the best other distinct local maximum (more than 2 frame intervals
 * away, separated from the optimum by a dip of at least 0.01); `ambiguous` when the runner-up
 * scores within 0.02 of the best (a periodic drive); the coarse curve (≤ 400 points, maximum per
 * bin) for the report's plot; `vpiGuessV`, the refined V_π at the optimum (V), a start for the fit.
 *
 * Throws KerrError BAD_ARGUMENT for malformed arrays (lengths, unsorted times, non-finite values);
 * NOT_IDENTIFIABLE when the log's voltage never exceeds 50 V (a liquid cell needs kilovolts:
 * common practice), when it holds a single level, when fewer than 20 frames are usable, or when
 * no offset gives a positive slope b; NO_OVERLAP when no offset leaves a useful overlap.
 *
 * @example findSyncOffset({ frameTimesS, intensity, logTimeS, logVoltageV })
 *   → { offsetS: 0.9, score: 0.998, sharpnessS: 0.05, ambiguous: false, vpiGuessV: 11200, ... }
 */
import { KerrError, invalid } from '../../errors.js';
import { goldenSectionMax } from './goldenSectionMax.js';
import { createModulationScorer } from './modulationScorer.js';

export interface SyncInput {
  /** Video presentation time of each frame, s, non-decreasing (variable frame rate allowed). */
  frameTimesS: Float64Array;
  /** Measured beam intensity per frame, linear units; NaN frames are ignored. */
  intensity: Float64Array;
  /** Log sample times, s, strictly increasing. */
  logTimeS: Float64Array;
  logVoltageV: Float64Array;
  /** Offsets to consider, s (video time − log time); default every offset with a useful overlap. */
  searchRangeS?: [number, number];
  /** 1 = use the frame, 0 = ignore it (sparks, clipped frames); default all usable. */
  usable?: Uint8Array;
}

export interface SyncPeak {
  offsetS: number;
  score: number;
}

export interface SyncResult {
  offsetS: number;
  /** R² of the best model at the optimum, 0–1. */
  score: number;
  sharpnessS: number | null;
  offsetStdErrS: number | null;
  ambiguous: boolean;
  runnerUp: SyncPeak | null;
  curve: { offsetS: number[]; score: number[] };
  vpiGuessV: number;
  /** Usable frames inside the log at the optimum. */
  framesUsed: number;
  /** The overlap a trial offset needed, frames. */
  minOverlapFrames: number;
  coarseStepS: number;
  /** Whether the golden-section refinement reached its tolerance within its iteration cap. */
  converged: boolean;
  warnings: string[];
}

/** Tuning constants of the search, with the reasons given in the doc comment above. */
export const SYNC_SETTINGS = {
  minOverlapFraction: 0.5,
  minOverlapFrames: 20,
  vpiGuesses: 24,
  vpiRatioLow: 0.3,
  vpiRatioHigh: 3,
  ambiguityMargin: 0.02,
  peakSeparationFrames: 2,
  peakProminence: 0.01,
  sharpnessDrop: 0.01,
  broadPeakFrames: 15,
  maxCoarseOffsets: 600,
  maxGridOffsets: 1_000_000,
  zoomPeaks: 6,
  maxCurvePoints: 400,
  minDriveV: 50,
  singleLevelFraction: 0.1,
  refineToleranceFrames: 1 / 20,
} as const;

const S = SYNC_SETTINGS;

export function findSyncOffset(input: SyncInput): SyncResult {
  const { frameTimesS, intensity, logTimeS, logVoltageV, searchRangeS, usable } = input;
  validate(input);
  const warnings: string[] = [];

  // Usable frames, compacted.
  const keep: number[] = [];
  for (let k = 0; k < frameTimesS.length; k++) {
    if ((usable === undefined || usable[k] !== 0) && Number.isFinite(intensity[k])) keep.push(k);
  }
  if (keep.length < S.minOverlapFrames) {
    throw new KerrError('NOT_IDENTIFIABLE', `only ${keep.length} usable frame${keep.length === 1 ? '' : 's'} to synchronise the video with the log; at least ${S.minOverlapFrames} are needed`, {
      path: 'sync',
      hint: 'use a longer clip, or fewer excluded frames, or give --offset-s',
    });
  }
  const frameT = Float64Array.from(keep, (k) => frameTimesS[k]);
  const frameI = Float64Array.from(keep, (k) => intensity[k]);
  const usableCount = keep.length;
  let lowestI = Number.POSITIVE_INFINITY;
  let highestI = Number.NEGATIVE_INFINITY;
  for (let k = 0; k < usableCount; k++) {
    lowestI = Math.min(lowestI, frameI[k]);
    highestI = Math.max(highestI, frameI[k]);
  }
  if (!(highestI - lowestI > 1e-9 * Math.max(Math.abs(highestI), Math.abs(lowestI)))) {
    throw new KerrError('NOT_IDENTIFIABLE', `the beam intensity is the same (${round(highestI, 4)}) in every usable frame, so the video cannot be synchronised with the log`, {
      path: 'sync',
      hint: 'check that the region covers the beam and that the camera did not clip it, or give --offset-s',
    });
  }

  // The drive must change: not near zero, not a single level.
  const logCount = logTimeS.length;
  const logStartS = logTimeS[0];
  const logEndS = logTimeS[logCount - 1];
  let maxAbsV = 0;
  for (let i = 0; i < logCount; i++) maxAbsV = Math.max(maxAbsV, Math.abs(logVoltageV[i]));
  if (maxAbsV < S.minDriveV) {
    throw new KerrError('NOT_IDENTIFIABLE', `the log's voltage never exceeds ${round(maxAbsV, 3)} V, too little to modulate a Kerr cell, so the video cannot be synchronised with it`, {
      path: 'log',
      hint: 'check that the voltage column is the supply output and that its unit is in the header (a log in kV needs a name like voltage_kV)',
    });
  }
  const squares = Float64Array.from(logVoltageV, (v) => v * v).sort();
  const lowSq = squares[Math.floor(0.02 * (logCount - 1))];
  const highSq = squares[Math.ceil(0.98 * (logCount - 1))];
  if (highSq - lowSq < S.singleLevelFraction * highSq) {
    throw new KerrError('NOT_IDENTIFIABLE', `the log holds a single voltage level (about ${round(Math.sqrt(highSq), 3)} V), so the video cannot be synchronised with it`, {
      path: 'log',
      hint: 'record a ramp or steps while filming, or give --offset-s',
    });
  }

  const frameIntervalS = medianStep(frameTimesS);
  const logIntervalS = medianStep(logTimeS);

  // Overlap rule: at least max(20, 50 % of the most usable frames any offset puts inside the log).
  const logSpanS = logEndS - logStartS;
  let mostInside = 0;
  for (let i = 0, j = 0; j < usableCount; j++) {
    while (frameT[j] - frameT[i] > logSpanS) i++;
    mostInside = Math.max(mostInside, j - i + 1);
  }
  const required = Math.max(S.minOverlapFrames, Math.ceil(S.minOverlapFraction * mostInside));
  const spans = `the log covers ${round(logStartS, 6)}–${round(logEndS, 6)} s and the video ${round(frameTimesS[0], 6)}–${round(frameTimesS[frameTimesS.length - 1], 6)} s`;
  const noOverlap = (why: string): KerrError =>
    new KerrError('NO_OVERLAP', `${spans}, but ${why}`, {
      path: 'sync',
      hint: 'check you picked the log that matches this video, or give --offset-s',
      details: { logStartS, logEndS, videoStartS: frameTimesS[0], videoEndS: frameTimesS[frameTimesS.length - 1], requiredFrames: required },
    });
  if (mostInside < S.minOverlapFrames) throw noOverlap(`no shift places ${S.minOverlapFrames} usable frames inside the log (at most ${mostInside})`);

  let lo = frameT[0] - logEndS;
  let hi = frameT[usableCount - 1] - logStartS;
  if (searchRangeS !== undefined) {
    lo = Math.max(lo, searchRangeS[0]);
    hi = Math.min(hi, searchRangeS[1]);
  }
  const rangeText = searchRangeS !== undefined ? ` within the search range ${searchRangeS[0]}–${searchRangeS[1]} s` : '';
  if (!(hi >= lo)) throw noOverlap(`no shift${rangeText} leaves ${required} usable frames (${Math.round(100 * S.minOverlapFraction)} % overlap)`);

  const scorer = createModulationScorer(frameT, frameI, logTimeS, logVoltageV, required);
  const ratios = new Float64Array(S.vpiGuesses);
  for (let g = 0; g < S.vpiGuesses; g++) {
    ratios[g] = S.vpiRatioLow * Math.pow(S.vpiRatioHigh / S.vpiRatioLow, g / (S.vpiGuesses - 1));
  }

  // The offset grid: step = half a frame, or the log interval when coarser. Shrink [lo, hi] to the
  // offsets with a useful overlap (overlap counts are two binary searches each).
  let stepS = Math.max(frameIntervalS / 2, logIntervalS);
  let gridCount = Math.floor((hi - lo) / stepS) + 1;
  if (gridCount > S.maxGridOffsets) {
    stepS = (hi - lo) / (S.maxGridOffsets - 1);
    gridCount = S.maxGridOffsets;
    warnings.push(`sync: the offset range ${round(lo, 4)}–${round(hi, 4)} s is long; it was searched at a ${round(stepS, 3)} s step, coarser than the frames, so narrow it with a search range if the result looks wrong`);
  }
  let firstValid = -1;
  let lastValid = -1;
  for (let j = 0; j < gridCount; j++) {
    if (scorer.overlapFrames(lo + j * stepS) >= required) {
      if (firstValid < 0) firstValid = j;
      lastValid = j;
    }
  }
  if (firstValid < 0) throw noOverlap(`no shift${rangeText} leaves ${required} usable frames (${Math.round(100 * S.minOverlapFraction)} % overlap)`);
  lo += firstValid * stepS;
  hi = lo + (lastValid - firstValid) * stepS;
  gridCount = lastValid - firstValid + 1;

  // Coarse pass: every grid offset when there are at most `maxCoarseOffsets`; otherwise every
  // stride-th one, then zoom (halving the stride) around the best local maxima down to the grid step.
  const evaluated = new Map<number, { score: number; guess: number }>();
  const evaluate = (j: number): void => {
    if (j < 0 || j >= gridCount || evaluated.has(j)) return;
    if (scorer.gather(lo + j * stepS) === 0) {
      evaluated.set(j, { score: Number.NaN, guess: 0 });
      return;
    }
    const { score, index } = scorer.scoreGrid(ratios);
    evaluated.set(j, { score, guess: index });
  };
  const stride = Math.max(1, Math.ceil((gridCount - 1) / (S.maxCoarseOffsets - 1)));
  for (let j = 0; j < gridCount; j += stride) evaluate(j);
  evaluate(gridCount - 1);
  if (stride > 1) {
    const strided = [...evaluated.keys()].sort((p, q) => p - q);
    const scoreOf = (j: number): number => evaluated.get(j)?.score ?? Number.NaN;
    const maxima = strided.filter((j, i) => {
      const here = scoreOf(j);
      const left = i > 0 ? scoreOf(strided[i - 1]) : Number.NEGATIVE_INFINITY;
      const right = i < strided.length - 1 ? scoreOf(strided[i + 1]) : Number.NEGATIVE_INFINITY;
      return here > 0 && !(left > here) && !(right > here);
    });
    maxima.sort((p, q) => scoreOf(q) - scoreOf(p));
    for (const start of maxima.slice(0, S.zoomPeaks)) {
      let centre = start;
      for (let span = stride; span > 1; ) {
        const next = Math.ceil(span / 2);
        for (let j = centre - 2 * span; j <= centre + 2 * span; j += next) evaluate(j);
        for (let j = centre - 2 * span; j <= centre + 2 * span; j += next) if (scoreOf(j) > scoreOf(centre)) centre = j;
        span = next === span ? 1 : next;
      }
      for (let j = centre - 2; j <= centre + 2; j++) evaluate(j);
    }
  }
  const order = [...evaluated.keys()].sort((p, q) => p - q);
  const steps = order.length;
  const coarseOffset = Float64Array.from(order, (j) => lo + j * stepS);
  const coarseScore = Float64Array.from(order, (j) => evaluated.get(j)!.score);
  const coarseGuess = Int32Array.from(order, (j) => evaluated.get(j)!.guess);
  let bestIndex = -1;
  for (let i = 0; i < steps; i++) {
    if (Number.isFinite(coarseScore[i]) && (bestIndex < 0 || coarseScore[i] > coarseScore[bestIndex])) bestIndex = i;
  }
  if (bestIndex < 0) throw noOverlap(`no shift${rangeText} leaves ${required} usable frames (${Math.round(100 * S.minOverlapFraction)} % overlap)`);
  if (!(coarseScore[bestIndex] > 0)) {
    throw new KerrError('NOT_IDENTIFIABLE', 'the beam intensity does not rise with the modelled Kerr transmission at any offset, so the video cannot be synchronised with the log', {
      path: 'sync',
      hint: 'check that the region covers the beam, that the polarisers are crossed and that the log belongs to this video, or give --offset-s',
    });
  }

  // Fine score: V_π refined by golden-section search (in ln V_π) around a grid guess.
  const logRatioStep = Math.log(S.vpiRatioHigh / S.vpiRatioLow) / (S.vpiGuesses - 1);
  const fine = (offsetS: number, guess: number): { score: number; ratio: number } => {
    if (offsetS < lo || offsetS > hi || scorer.gather(offsetS) === 0) return { score: Number.NEGATIVE_INFINITY, ratio: ratios[guess] };
    const centre = Math.log(ratios[guess]);
    const r = goldenSectionMax((x) => scorer.score(Math.exp(x)), centre - logRatioStep, centre + logRatioStep, 1e-4);
    return { score: r.value, ratio: Math.exp(r.x) };
  };
  interface Peak {
    offsetS: number;
    score: number;
    ratio: number;
    guess: number;
    converged: boolean;
  }
  const refine = (index: number): Peak => {
    const guess = coarseGuess[index];
    const centre = coarseOffset[index];
    const from = index > 0 ? coarseOffset[index - 1] : centre - stepS;
    const to = index < steps - 1 ? coarseOffset[index + 1] : centre + stepS;
    const r = goldenSectionMax((o) => fine(o, guess).score, Math.max(lo, from), Math.min(hi, to), S.refineToleranceFrames * frameIntervalS);
    const at = fine(r.x, guess);
    return { offsetS: r.x, score: at.score, ratio: at.ratio, guess, converged: r.converged };
  };

  // Other distinct local maxima of the coarse curve: more than `peakSeparationFrames` away from the
  // best, with a dip of at least `peakProminence` between them.
  const separationS = S.peakSeparationFrames * frameIntervalS;
  const candidates: number[] = [];
  for (let i = 0; i < steps; i++) {
    const s = coarseScore[i];
    if (!(s > 0) || i === bestIndex) continue;
    const left = i > 0 ? coarseScore[i - 1] : Number.NaN;
    const right = i < steps - 1 ? coarseScore[i + 1] : Number.NaN;
    if (!(s >= left || Number.isNaN(left)) || !(s >= right || Number.isNaN(right))) continue;
    if (Math.abs(coarseOffset[i] - coarseOffset[bestIndex]) <= separationS) continue;
    let dip = Number.POSITIVE_INFINITY;
    for (let j = Math.min(i, bestIndex) + 1; j < Math.max(i, bestIndex); j++) {
      dip = Math.min(dip, Number.isNaN(coarseScore[j]) ? 0 : coarseScore[j]);
    }
    if (dip <= s - S.peakProminence) candidates.push(i);
  }
  candidates.sort((p, q) => coarseScore[q] - coarseScore[p]);
  // Refine the best and the top three others; a refined other may overtake the coarse best.
  const peaks: Peak[] = [refine(bestIndex), ...candidates.slice(0, 3).map(refine)];
  peaks.sort((p, q) => q.score - p.score);
  const best = peaks[0];
  let runnerUp: SyncPeak | null = null;
  for (const p of peaks.slice(1)) {
    if (Math.abs(p.offsetS - best.offsetS) > separationS && (runnerUp === null || p.score > runnerUp.score)) {
      runnerUp = { offsetS: p.offsetS, score: p.score };
    }
  }
  const fineAtBest = (o: number): number => fine(o, best.guess).score;
  const framesUsed = scorer.gather(best.offsetS);
  const ambiguous = runnerUp !== null && runnerUp.score >= best.score - S.ambiguityMargin;
  if (ambiguous) {
    warnings.push(`sync: offsets ${round(best.offsetS, 4)} s (R² ${round(best.score, 4)}) and ${round(runnerUp!.offsetS, 4)} s (R² ${round(runnerUp!.score, 4)}) fit almost equally well because the drive repeats itself; record one distinct ramp or step, or give the offset`);
  }
  if (best.offsetS - lo < stepS || hi - best.offsetS < stepS) {
    warnings.push(`sync: the best offset ${round(best.offsetS, 4)} s lies at the edge of the offsets searched (${round(lo, 4)}–${round(hi, 4)} s); widen the search range or check the log`);
  }
  if (!best.converged) warnings.push('sync: the offset refinement stopped at its iteration cap before reaching 1/20 frame');

  // Sharpness: distance either side at which the score has dropped by `sharpnessDrop`.
  const widths: number[] = [];
  for (const side of [-1, 1]) {
    let inner = 0;
    for (let d = frameIntervalS / 8; d <= hi - lo + frameIntervalS; d *= 2) {
      if (fineAtBest(best.offsetS + side * d) <= best.score - S.sharpnessDrop) {
        let outer = d;
        for (let it = 0; it < 12; it++) {
          const mid = (inner + outer) / 2;
          if (fineAtBest(best.offsetS + side * mid) <= best.score - S.sharpnessDrop) outer = mid;
          else inner = mid;
        }
        widths.push((inner + outer) / 2);
        break;
      }
      inner = d;
    }
  }
  const sharpnessS = widths.length > 0 ? widths.reduce((a, b) => a + b, 0) / widths.length : null;
  if (sharpnessS === null || sharpnessS > S.broadPeakFrames * frameIntervalS) {
    warnings.push(`sync: the best offset is poorly defined (R² changes by less than ${S.sharpnessDrop} within ${sharpnessS === null ? 'the whole range' : `±${round(sharpnessS, 3)} s`}); the video shows no sharp change of the drive, so check the offset or give it`);
  }

  // 1-σ from the curvature of R²: ΔRSS = σ² ⇔ ΔR² = (1 − R²)/(n − 4) (a, b, V_π, offset).
  const h = frameIntervalS / 2;
  const curvature = (fineAtBest(best.offsetS - h) - 2 * best.score + fineAtBest(best.offsetS + h)) / (h * h);
  const offsetStdErrS = curvature < 0 && framesUsed > 4 ? Math.sqrt((2 * Math.max(1 - best.score, 0)) / (framesUsed - 4) / -curvature) : null;

  return {
    offsetS: best.offsetS,
    score: best.score,
    sharpnessS,
    offsetStdErrS,
    ambiguous,
    runnerUp,
    curve: decimateCurve(coarseOffset, coarseScore, S.maxCurvePoints),
    vpiGuessV: best.ratio * scorer.maxAbsVoltageV,
    framesUsed,
    minOverlapFrames: required,
    coarseStepS: stepS,
    converged: best.converged,
    warnings,
  };
}

function validate(input: SyncInput): void {
  const { frameTimesS, intensity, logTimeS, logVoltageV, searchRangeS, usable } = input;
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

/** Median of the positive successive differences (s). */
function medianStep(timeS: Float64Array): number {
  const steps: number[] = [];
  for (let i = 1; i < timeS.length; i++) {
    const d = timeS[i] - timeS[i - 1];
    if (d > 0) steps.push(d);
  }
  steps.sort((a, b) => a - b);
  return steps[Math.floor(steps.length / 2)];
}

/** At most `maxPoints` points of the valid coarse curve: the highest point of each bin. */
function decimateCurve(offsetS: Float64Array, score: Float64Array, maxPoints: number): { offsetS: number[]; score: number[] } {
  const valid: number[] = [];
  for (let i = 0; i < score.length; i++) if (Number.isFinite(score[i])) valid.push(i);
  const out = { offsetS: [] as number[], score: [] as number[] };
  const bins = Math.min(maxPoints, valid.length);
  for (let b = 0; b < bins; b++) {
    const from = Math.floor((b * valid.length) / bins);
    const to = Math.floor(((b + 1) * valid.length) / bins);
    let pick = valid[from];
    for (let j = from + 1; j < to; j++) if (score[valid[j]] > score[pick]) pick = valid[j];
    out.offsetS.push(offsetS[pick]);
    out.score.push(score[pick]);
  }
  return out;
}

function round(x: number, digits: number): number {
  return Number(x.toPrecision(digits));
}
