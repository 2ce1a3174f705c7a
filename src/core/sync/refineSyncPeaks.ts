/**
 * The fine pass of the synchronisation search: the best coarse offset and up to three other
 * distinct local maxima of the coarse curve are refined by golden-section search between their
 * coarse neighbours (tolerance `refineToleranceFrames` frame intervals), each trial offset scoring
 * R² with V_π refined by golden-section search in ln V_π (±1 guess step around the coarse guess,
 * with Math.sin). A refined other peak may overtake the coarse best.
 *
 * "Other distinct local maxima": coarse points with R² > 0 not below either neighbour, more than
 * `peakSeparationFrames` frame intervals from the best, separated from it by a dip of at least
 * `peakProminence` (R²). The runner-up is the best refined other peak still more than that
 * separation from the winner.
 *
 * Returns the winner (offset s, R², V_π ratio to the log's largest |V|, whether its refinement
 * converged), the runner-up or null, and the fine score around the winner for the peak-shape
 * figures.
 * @example refineSyncPeaks(scorer, ratios, coarse, bestIndex, window, settings).best.offsetS // 0.453
 */
import { goldenSectionMax } from './goldenSectionMax.js';
import type { CoarseCurve } from './coarseSyncSearch.js';
import type { ModulationScorer } from './modulationScorer.js';
import type { SyncPeak } from './findSyncOffset.js';

export interface RefinedPeak {
  offsetS: number;
  score: number;
  /** V_π / largest |V| of the log at the refined offset. */
  ratio: number;
  guess: number;
  converged: boolean;
}

export interface SearchWindow {
  lo: number;
  hi: number;
  stepS: number;
  frameIntervalS: number;
}

export interface PeakSettings {
  vpiGuesses: number;
  vpiRatioLow: number;
  vpiRatioHigh: number;
  peakSeparationFrames: number;
  peakProminence: number;
  refineToleranceFrames: number;
}

export interface RefinedPeaks {
  best: RefinedPeak;
  runnerUp: SyncPeak | null;
  /** R² at an offset (s) with V_π refined around the winner's guess; −∞ outside the window or overlap. */
  fineAtBest: (offsetS: number) => number;
}

export function refineSyncPeaks(scorer: ModulationScorer, ratios: Float64Array, coarse: CoarseCurve, bestIndex: number, window: SearchWindow, settings: PeakSettings): RefinedPeaks {
  const fine = fineScore(scorer, ratios, window, settings);
  const steps = coarse.offsetS.length;
  const refine = (index: number): RefinedPeak => {
    const guess = coarse.guess[index];
    const centre = coarse.offsetS[index];
    const from = index > 0 ? coarse.offsetS[index - 1] : centre - window.stepS;
    const to = index < steps - 1 ? coarse.offsetS[index + 1] : centre + window.stepS;
    const r = goldenSectionMax((o) => fine(o, guess).score, Math.max(window.lo, from), Math.min(window.hi, to), settings.refineToleranceFrames * window.frameIntervalS);
    const at = fine(r.x, guess);
    return { offsetS: r.x, score: at.score, ratio: at.ratio, guess, converged: r.converged };
  };
  const separationS = settings.peakSeparationFrames * window.frameIntervalS;
  const candidates = otherMaxima(coarse, bestIndex, separationS, settings.peakProminence);
  // Refine the best and the top three others; a refined other may overtake the coarse best.
  const peaks: RefinedPeak[] = [refine(bestIndex), ...candidates.slice(0, 3).map(refine)];
  peaks.sort((p, q) => q.score - p.score);
  const best = peaks[0];
  let runnerUp: SyncPeak | null = null;
  for (const p of peaks.slice(1)) {
    if (Math.abs(p.offsetS - best.offsetS) > separationS && (runnerUp === null || p.score > runnerUp.score)) {
      runnerUp = { offsetS: p.offsetS, score: p.score };
    }
  }
  return { best, runnerUp, fineAtBest: (o) => fine(o, best.guess).score };
}

/** R² at a trial offset with V_π refined by golden-section search in ln V_π (±1 guess step) around a grid guess. */
function fineScore(scorer: ModulationScorer, ratios: Float64Array, window: SearchWindow, settings: PeakSettings): (offsetS: number, guess: number) => { score: number; ratio: number } {
  const logRatioStep = Math.log(settings.vpiRatioHigh / settings.vpiRatioLow) / (settings.vpiGuesses - 1);
  return (offsetS, guess) => {
    if (offsetS < window.lo || offsetS > window.hi || scorer.gather(offsetS) === 0) return { score: Number.NEGATIVE_INFINITY, ratio: ratios[guess] };
    const centre = Math.log(ratios[guess]);
    const r = goldenSectionMax((x) => scorer.score(Math.exp(x)), centre - logRatioStep, centre + logRatioStep, 1e-4);
    return { score: r.value, ratio: Math.exp(r.x) };
  };
}

/** Indices of the other distinct local maxima of the coarse curve, best first. */
function otherMaxima(coarse: CoarseCurve, bestIndex: number, separationS: number, prominence: number): number[] {
  const { offsetS, score } = coarse;
  const steps = score.length;
  const candidates: number[] = [];
  for (let i = 0; i < steps; i++) {
    const s = score[i];
    if (!(s > 0) || i === bestIndex) continue;
    const left = i > 0 ? score[i - 1] : Number.NaN;
    const right = i < steps - 1 ? score[i + 1] : Number.NaN;
    if (!(s >= left || Number.isNaN(left)) || !(s >= right || Number.isNaN(right))) continue;
    if (Math.abs(offsetS[i] - offsetS[bestIndex]) <= separationS) continue;
    let dip = Number.POSITIVE_INFINITY;
    for (let j = Math.min(i, bestIndex) + 1; j < Math.max(i, bestIndex); j++) {
      dip = Math.min(dip, Number.isNaN(score[j]) ? 0 : score[j]);
    }
    if (dip <= s - prominence) candidates.push(i);
  }
  candidates.sort((p, q) => score[q] - score[p]);
  return candidates;
}
