/**
 * The grid of trial offsets (s, video time − log time) for the synchronisation search.
 *
 * Overlap rule: a trial offset counts when at least `required` = max(minOverlapFrames,
 * ⌈minOverlapFraction · most⌉) usable frames fall inside the log, `most` being the most usable
 * frames any shift can place inside the log's span. The range runs from "last log sample on the
 * first frame" to "first log sample on the last frame", cut to `searchRangeS` when given. Step:
 * half the median frame interval, or the median log interval when coarser; when the range would
 * need more than `maxGridOffsets` points the step is widened to fit (with a `sync-coarse-grid`
 * warning). Finally the range is shrunk to the first and last grid offsets with a useful overlap.
 *
 * Throws KerrError NO_OVERLAP (message naming both spans, details with them) when no shift leaves
 * the overlap, inside the search range when one is given.
 * @example syncOffsetGrid({ ... }) → { lo: -9.6, hi: 19.9, stepS: 0.1, gridCount: 296, required: 299, warnings: [] }
 */
import { KerrError } from '../../errors.js';
import type { ModulationScorer } from './modulationScorer.js';
import { roundTo } from './roundTo.js';
import type { SyncWarning } from './syncWarning.js';

export interface OffsetGridInput {
  /** Usable frame times, s, non-decreasing. */
  frameT: Float64Array;
  /** All frame times, s (for the spans named in errors). */
  frameTimesS: Float64Array;
  logTimeS: Float64Array;
  searchRangeS: [number, number] | undefined;
  frameIntervalS: number;
  logIntervalS: number;
  settings: { minOverlapFraction: number; minOverlapFrames: number; maxGridOffsets: number };
}

export interface OffsetGrid {
  /** First and last grid offsets, s. */
  lo: number;
  hi: number;
  stepS: number;
  gridCount: number;
  /** Usable frames a trial offset needs inside the log. */
  required: number;
  warnings: SyncWarning[];
  /** The NO_OVERLAP error for "no shift leaves the overlap" (also thrown later when no trial scores). */
  noShiftError(): KerrError;
}

/** Usable frames a trial offset needs: max(minOverlapFrames, ⌈fraction · most frames any shift puts inside the log⌉). */
export function requiredOverlap(frameT: Float64Array, logSpanS: number, settings: OffsetGridInput['settings']): { mostInside: number; required: number } {
  let mostInside = 0;
  for (let i = 0, j = 0; j < frameT.length; j++) {
    while (frameT[j] - frameT[i] > logSpanS) i++;
    mostInside = Math.max(mostInside, j - i + 1);
  }
  return { mostInside, required: Math.max(settings.minOverlapFrames, Math.ceil(settings.minOverlapFraction * mostInside)) };
}

/** NO_OVERLAP naming the log's and the video's spans and why no shift works. */
function noOverlapError(input: OffsetGridInput, required: number, why: string): KerrError {
  const { frameTimesS, logTimeS } = input;
  const logStartS = logTimeS[0];
  const logEndS = logTimeS[logTimeS.length - 1];
  const videoStartS = frameTimesS[0];
  const videoEndS = frameTimesS[frameTimesS.length - 1];
  return new KerrError('NO_OVERLAP', `the log covers ${roundTo(logStartS, 6)}–${roundTo(logEndS, 6)} s and the video ${roundTo(videoStartS, 6)}–${roundTo(videoEndS, 6)} s, but ${why}`, {
    path: 'sync',
    hint: 'check you picked the log that matches this video, or give the offset',
    inputs: ['syncOffset'],
    details: { logStartS, logEndS, videoStartS, videoEndS, requiredFrames: required },
  });
}

export function syncOffsetGrid(input: OffsetGridInput, createScorer: (required: number) => ModulationScorer): { grid: OffsetGrid; scorer: ModulationScorer } {
  const { frameT, logTimeS, searchRangeS, settings } = input;
  const logStartS = logTimeS[0];
  const logEndS = logTimeS[logTimeS.length - 1];
  const { mostInside, required } = requiredOverlap(frameT, logEndS - logStartS, settings);
  if (mostInside < settings.minOverlapFrames) {
    throw noOverlapError(input, required, `no shift places ${settings.minOverlapFrames} usable frames inside the log (at most ${mostInside})`);
  }
  const rangeText = searchRangeS !== undefined ? ` within the search range ${searchRangeS[0]}–${searchRangeS[1]} s` : '';
  const noShiftError = (): KerrError =>
    noOverlapError(input, required, `no shift${rangeText} leaves ${required} usable frames (${Math.round(100 * settings.minOverlapFraction)} % overlap)`);
  let lo = frameT[0] - logEndS;
  let hi = frameT[frameT.length - 1] - logStartS;
  if (searchRangeS !== undefined) {
    lo = Math.max(lo, searchRangeS[0]);
    hi = Math.min(hi, searchRangeS[1]);
  }
  if (!(hi >= lo)) throw noShiftError();
  const scorer = createScorer(required);
  const grid = shrinkToOverlap({ lo, hi, required, noShiftError, warnings: [] }, input, scorer);
  return { grid, scorer };
}

/** Lay the grid over [lo, hi] and cut it to the offsets with a useful overlap (two binary searches each). */
function shrinkToOverlap(
  start: { lo: number; hi: number; required: number; noShiftError: () => KerrError; warnings: SyncWarning[] },
  input: OffsetGridInput,
  scorer: ModulationScorer,
): OffsetGrid {
  const { settings } = input;
  let { lo, hi } = start;
  const warnings = start.warnings;
  let stepS = Math.max(input.frameIntervalS / 2, input.logIntervalS);
  let gridCount = Math.floor((hi - lo) / stepS) + 1;
  if (gridCount > settings.maxGridOffsets) {
    stepS = (hi - lo) / (settings.maxGridOffsets - 1);
    gridCount = settings.maxGridOffsets;
    warnings.push({
      code: 'sync-coarse-grid',
      message: `sync: the offset range ${roundTo(lo, 4)}–${roundTo(hi, 4)} s is long; it was searched at a ${roundTo(stepS, 3)} s step, coarser than the frames, so narrow it with a search range if the result looks wrong`,
      facts: { fromS: lo, toS: hi, stepS },
    });
  }
  let firstValid = -1;
  let lastValid = -1;
  for (let j = 0; j < gridCount; j++) {
    if (scorer.overlapFrames(lo + j * stepS) >= start.required) {
      if (firstValid < 0) firstValid = j;
      lastValid = j;
    }
  }
  if (firstValid < 0) throw start.noShiftError();
  lo += firstValid * stepS;
  hi = lo + (lastValid - firstValid) * stepS;
  gridCount = lastValid - firstValid + 1;
  return { lo, hi, stepS, gridCount, required: start.required, warnings, noShiftError: start.noShiftError };
}
