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
 * Code layout: validateSyncInput, usableSyncFrames and checkDriveModulates check the input;
 * syncOffsetGrid lays out the trial offsets; coarseSyncSearch scores them (createModulationScorer);
 * refineSyncPeaks refines the best and the runner-up; syncPeakShape measures the peak's width and
 * curvature. Findings come back as data (`syncWarnings`: code, message, facts; see syncWarning).
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
import { KerrError } from '../../errors.js';
import { checkDriveModulates } from './checkDriveModulates.js';
import { coarseSyncSearch, type CoarseCurve } from './coarseSyncSearch.js';
import { decimateCurve } from './decimateCurve.js';
import { medianStep } from './medianStep.js';
import { createModulationScorer } from './modulationScorer.js';
import { refineSyncPeaks, type RefinedPeak } from './refineSyncPeaks.js';
import { syncOffsetGrid, type OffsetGrid } from './syncOffsetGrid.js';
import { syncPeakShape } from './syncPeakShape.js';
import { roundTo } from './roundTo.js';
import type { SyncWarning } from './syncWarning.js';
import { usableSyncFrames } from './usableSyncFrames.js';
import { validateSyncInput } from './validateSyncInput.js';

export type { SyncWarning, SyncWarningCode } from './syncWarning.js';

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
  /** The findings as data (code, plain-words message, facts); sort by `code`, never by the text. */
  syncWarnings: SyncWarning[];
  /** The same findings' messages, in the same order (kept for callers that only print them). */
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
  const { frameTimesS, logTimeS, logVoltageV, searchRangeS } = input;
  validateSyncInput(input);
  const frames = usableSyncFrames(frameTimesS, input.intensity, input.usable, S.minOverlapFrames);
  checkDriveModulates(logVoltageV, S.minDriveV, S.singleLevelFraction);
  const frameIntervalS = medianStep(frameTimesS);
  const { grid, scorer } = syncOffsetGrid(
    { frameT: frames.timeS, frameTimesS, logTimeS, searchRangeS, frameIntervalS, logIntervalS: medianStep(logTimeS), settings: S },
    (required) => createModulationScorer(frames.timeS, frames.intensity, logTimeS, logVoltageV, required),
  );
  const ratios = new Float64Array(S.vpiGuesses);
  for (let g = 0; g < S.vpiGuesses; g++) {
    ratios[g] = S.vpiRatioLow * Math.pow(S.vpiRatioHigh / S.vpiRatioLow, g / (S.vpiGuesses - 1));
  }
  const coarse = coarseSyncSearch(scorer, ratios, grid, S.maxCoarseOffsets, S.zoomPeaks);
  const bestIndex = bestCoarseIndex(coarse, grid);
  const window = { lo: grid.lo, hi: grid.hi, stepS: grid.stepS, frameIntervalS };
  const { best, runnerUp, fineAtBest } = refineSyncPeaks(scorer, ratios, coarse, bestIndex, window, S);
  const framesUsed = scorer.gather(best.offsetS);
  const ambiguous = runnerUp !== null && runnerUp.score >= best.score - S.ambiguityMargin;
  const shape = syncPeakShape(fineAtBest, best.offsetS, best.score, framesUsed, frameIntervalS, grid.hi - grid.lo, S.sharpnessDrop);
  const syncWarnings = [...grid.warnings, ...peakWarnings(best, ambiguous ? runnerUp : null, grid, shape.sharpnessS, frameIntervalS)];
  return {
    offsetS: best.offsetS,
    score: best.score,
    sharpnessS: shape.sharpnessS,
    offsetStdErrS: shape.offsetStdErrS,
    ambiguous,
    runnerUp,
    curve: decimateCurve(coarse.offsetS, coarse.score, S.maxCurvePoints),
    vpiGuessV: best.ratio * scorer.maxAbsVoltageV,
    framesUsed,
    minOverlapFrames: grid.required,
    coarseStepS: grid.stepS,
    converged: best.converged,
    syncWarnings,
    warnings: syncWarnings.map((w) => w.message),
  };
}

/** Index of the highest finite coarse score; NO_OVERLAP when none, NOT_IDENTIFIABLE when it is not positive. */
function bestCoarseIndex(coarse: CoarseCurve, grid: OffsetGrid): number {
  let bestIndex = -1;
  for (let i = 0; i < coarse.score.length; i++) {
    if (Number.isFinite(coarse.score[i]) && (bestIndex < 0 || coarse.score[i] > coarse.score[bestIndex])) bestIndex = i;
  }
  if (bestIndex < 0) throw grid.noShiftError();
  if (!(coarse.score[bestIndex] > 0)) {
    throw new KerrError('NOT_IDENTIFIABLE', 'the beam intensity does not rise with the modelled Kerr transmission at any offset, so the video cannot be synchronised with the log', {
      path: 'sync',
      hint: 'check that the region covers the beam, that the polarisers are crossed and that the log belongs to this video, or give the offset',
      inputs: ['syncOffset'],
    });
  }
  return bestIndex;
}

/** The findings about the chosen peak, in the order: ambiguous, at the edge, not converged, broad. */
function peakWarnings(best: RefinedPeak, rival: SyncPeak | null, grid: OffsetGrid, sharpnessS: number | null, frameIntervalS: number): SyncWarning[] {
  const out: SyncWarning[] = [];
  const { lo, hi, stepS } = grid;
  if (rival !== null) {
    out.push({
      code: 'sync-ambiguous',
      message: `sync: offsets ${roundTo(best.offsetS, 4)} s (R² ${roundTo(best.score, 4)}) and ${roundTo(rival.offsetS, 4)} s (R² ${roundTo(rival.score, 4)}) fit almost equally well because the drive repeats itself; record one distinct ramp or step, or give the offset`,
      facts: { offsetS: best.offsetS, score: best.score, otherOffsetS: rival.offsetS, otherScore: rival.score },
    });
  }
  if (best.offsetS - lo < stepS || hi - best.offsetS < stepS) {
    out.push({
      code: 'sync-at-edge',
      message: `sync: the best offset ${roundTo(best.offsetS, 4)} s lies at the edge of the offsets searched (${roundTo(lo, 4)}–${roundTo(hi, 4)} s); widen the search range or check the log`,
      facts: { offsetS: best.offsetS, fromS: lo, toS: hi },
    });
  }
  if (!best.converged) {
    out.push({ code: 'sync-not-converged', message: 'sync: the offset refinement stopped at its iteration cap before reaching 1/20 frame', facts: { toleranceFrames: S.refineToleranceFrames } });
  }
  if (sharpnessS === null || sharpnessS > S.broadPeakFrames * frameIntervalS) {
    out.push({
      code: 'sync-broad-peak',
      message: `sync: the best offset is poorly defined (R² changes by less than ${S.sharpnessDrop} within ${sharpnessS === null ? 'the whole range' : `±${roundTo(sharpnessS, 3)} s`}); the video shows no sharp change of the drive, so check the offset or give it`,
      facts: { sharpnessS, scoreDrop: S.sharpnessDrop, broadPeakS: S.broadPeakFrames * frameIntervalS },
    });
  }
  return out;
}
