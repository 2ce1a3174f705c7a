import { KerrError, invalid } from '../../errors.js';
import { levenbergMarquardt, type CurveModel, type LmOptions, type LmResult } from './levenbergMarquardt.js';

export interface MultiStartTrial<R extends LmResult> {
  /** Index into the starts given. */
  index: number;
  start: Float64Array;
  result: R;
}

export interface MultiStartResult<R extends LmResult> {
  /** The converged trial of lowest RSS; if none converged, the finite trial of lowest RSS. */
  best: R;
  bestIndex: number;
  /** True when `best` converged; false means every start failed and `best` is only the least bad. */
  converged: boolean;
  /** How many trials converged. */
  convergedCount: number;
  /** Every start tried, in the order given, with its result. */
  tried: MultiStartTrial<R>[];
}

/**
 * Runs Levenberg–Marquardt from several starting points and keeps the best: the converged result
 * with the smallest weighted RSS (ties keep the earlier start). Nonlinear least squares can have
 * several local minima (for a Kerr sweep, transmission sin²(δ/2) folds back past the half-wave
 * voltage, so a start on the wrong branch settles on a wrong V_π); trying starts spread over the
 * plausible range and comparing RSS is the standard guard (common practice; see e.g. Bates & Watts,
 * "Nonlinear Regression Analysis and Its Applications", 1988, §3.2 on starting values).
 *
 * Every trial is reported in `tried`, so a caller can see how many starts agreed.
 * Throws KerrError (BAD_ARGUMENT) with no starts; (FIT_FAILED) when no trial has a finite RSS;
 * and whatever `levenbergMarquardt` throws for bad data.
 *
 * @example
 * // V_π guesses 5, 10, 20 kV: multiStart(kerrModel, volts, counts, [[0, 1, 5e3], [0, 1, 1e4], [0, 1, 2e4]])
 */
export function multiStart(
  model: CurveModel,
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  starts: ReadonlyArray<ArrayLike<number>>,
  options: LmOptions = {},
): MultiStartResult<LmResult> {
  return multiStartWith(starts, (start) => levenbergMarquardt(model, x, y, start, options));
}

/**
 * The same selection around any fitter that returns an LmResult (e.g. `fitRobust`):
 * `fitFrom(start, index)` is called once per start, in order.
 */
export function multiStartWith<R extends LmResult>(
  starts: ReadonlyArray<ArrayLike<number>>,
  fitFrom: (start: Float64Array, index: number) => R,
): MultiStartResult<R> {
  if (starts.length === 0) throw invalid('at least one start vector', 'starts', 'none');
  const tried: MultiStartTrial<R>[] = [];
  let bestConverged = -1;
  let bestAny = -1;
  let convergedCount = 0;
  for (let index = 0; index < starts.length; index++) {
    const start = Float64Array.from(starts[index]!);
    const result = fitFrom(Float64Array.from(start), index);
    tried.push({ index, start, result });
    if (!Number.isFinite(result.rss)) continue;
    if (bestAny < 0 || result.rss < tried[bestAny]!.result.rss) bestAny = index;
    if (result.converged) {
      convergedCount++;
      if (bestConverged < 0 || result.rss < tried[bestConverged]!.result.rss) bestConverged = index;
    }
  }
  const bestIndex = bestConverged >= 0 ? bestConverged : bestAny;
  if (bestIndex < 0) {
    throw new KerrError('FIT_FAILED', `the fit gave no finite result from any of ${starts.length} starts`, {
      hint: 'Check that the model can be evaluated at the starting values and that the data are finite',
      details: { reasons: tried.map((t) => t.result.reason) },
    });
  }
  return { best: tried[bestIndex]!.result, bestIndex, converged: bestConverged >= 0, convergedCount, tried };
}
