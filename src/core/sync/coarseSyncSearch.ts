/**
 * The coarse pass of the synchronisation search: R² (best over the tabulated V_π guesses) at grid
 * offsets lo + j·step. When the grid has at most `maxCoarseOffsets` points all are scored;
 * otherwise every stride-th one (stride = ⌈(n − 1)/(maxCoarseOffsets − 1)⌉) and the last, then
 * the grid is filled in around the `zoomPeaks` best local maxima by halving the stride down to the
 * grid step (±2 spans at each level, ±2 grid points at the end). Offsets where fewer than the
 * required frames fall inside the log score NaN.
 *
 * Returns the scored offsets in grid order: offset (s), score (R², NaN when not scorable) and the
 * index of the best V_π guess. Never mutates its inputs (the scorer keeps its own gathered frames).
 * @example coarseSyncSearch(scorer, ratios, { lo: 0, stepS: 0.05, gridCount: 400 }, 600, 6).offsetS.length // 400
 */
import type { ModulationScorer } from './modulationScorer.js';

export interface CoarseCurve {
  offsetS: Float64Array;
  /** R², dimensionless; NaN where no trial could be scored. */
  score: Float64Array;
  /** Index of the best V_π ratio at each offset. */
  guess: Int32Array;
}

interface Trial {
  score: number;
  guess: number;
}

export function coarseSyncSearch(
  scorer: ModulationScorer,
  ratios: Float64Array,
  grid: { lo: number; stepS: number; gridCount: number },
  maxCoarseOffsets: number,
  zoomPeaks: number,
): CoarseCurve {
  const { lo, stepS, gridCount } = grid;
  const evaluated = new Map<number, Trial>();
  const evaluate = (j: number): void => {
    if (j < 0 || j >= gridCount || evaluated.has(j)) return;
    if (scorer.gather(lo + j * stepS) === 0) {
      evaluated.set(j, { score: Number.NaN, guess: 0 });
      return;
    }
    const { score, index } = scorer.scoreGrid(ratios);
    evaluated.set(j, { score, guess: index });
  };
  const stride = Math.max(1, Math.ceil((gridCount - 1) / (maxCoarseOffsets - 1)));
  for (let j = 0; j < gridCount; j += stride) evaluate(j);
  evaluate(gridCount - 1);
  if (stride > 1) zoomAroundMaxima(evaluated, evaluate, stride, zoomPeaks);
  const order = [...evaluated.keys()].sort((p, q) => p - q);
  return {
    offsetS: Float64Array.from(order, (j) => lo + j * stepS),
    score: Float64Array.from(order, (j) => evaluated.get(j)!.score),
    guess: Int32Array.from(order, (j) => evaluated.get(j)!.guess),
  };
}

/** Fill in the grid around the best local maxima of the strided pass, halving the stride each time. */
function zoomAroundMaxima(evaluated: Map<number, Trial>, evaluate: (j: number) => void, stride: number, zoomPeaks: number): void {
  const strided = [...evaluated.keys()].sort((p, q) => p - q);
  const scoreOf = (j: number): number => evaluated.get(j)?.score ?? Number.NaN;
  const maxima = strided.filter((j, i) => {
    const here = scoreOf(j);
    const left = i > 0 ? scoreOf(strided[i - 1]) : Number.NEGATIVE_INFINITY;
    const right = i < strided.length - 1 ? scoreOf(strided[i + 1]) : Number.NEGATIVE_INFINITY;
    return here > 0 && !(left > here) && !(right > here);
  });
  maxima.sort((p, q) => scoreOf(q) - scoreOf(p));
  for (const start of maxima.slice(0, zoomPeaks)) {
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
