import { describe, expect, it } from 'vitest';
import type { CurveModel } from '../../../src/core/fit/levenbergMarquardt.js';
import { multiStart, multiStartWith } from '../../../src/core/fit/multiStart.js';
import { fitRobust } from '../../../src/core/fit/robustFit.js';
import { KerrError } from '../../../src/errors.js';
import { kerrSweep, kerrSweepModel } from './kerrCurve.js';
import { seededNormal } from '../../helpers/random.js';

// A sweep to 1.8·V_π: the transmission rises, peaks at V_π, falls and rises again, so single
// starts can settle on wrong branches (DESIGN.md, "Identifiability"). Scenario of our own.
const truth = [5, 100, 10000];
const volts = Array.from({ length: 300 }, (_, i) => (18000 * i) / 299);
const bounds = { lower: [-Infinity, 0, 1000], upper: [Infinity, Infinity, 60000] };
const halfWaveGuesses = [4000, 6000, 8000, 10000, 13000, 16000, 20000, 30000];
const starts = halfWaveGuesses.map((v) => [0, 80, v]);

describe('multiStart', () => {
  it('keeps the converged start of lowest RSS, which is the true branch, and reports every start', () => {
    const { x, y } = kerrSweep(truth, volts, seededNormal(21));
    const result = multiStart(kerrSweepModel, x, y, starts, bounds);
    expect(result.tried).toHaveLength(starts.length);
    expect(result.converged).toBe(true);
    expect(result.best.params[2]!).toBeGreaterThan(9980);
    expect(result.best.params[2]!).toBeLessThan(10020);
    expect(result.best).toBe(result.tried[result.bestIndex]!.result);
    expect(Array.from(result.tried[result.bestIndex]!.start)).toEqual(starts[result.bestIndex]);
    // Other starts really do end elsewhere (converged on wrong minima with far larger RSS),
    // so the selection matters; the best is the smallest converged RSS.
    const wrong = result.tried.filter((t) => t.result.converged && t.result.rss > 100 * result.best.rss);
    expect(wrong.length).toBeGreaterThan(2);
    for (const t of result.tried) if (t.result.converged) expect(t.result.rss).toBeGreaterThanOrEqual(result.best.rss);
    expect(result.convergedCount).toBe(result.tried.filter((t) => t.result.converged).length);
  });

  it('a single start on the wrong branch gives a wrong V_π: the reason multi-start exists', () => {
    const { x, y } = kerrSweep(truth, volts, seededNormal(21));
    const single = multiStart(kerrSweepModel, x, y, [[0, 80, 4000]], bounds);
    expect(Math.abs(single.best.params[2]! - truth[2]!)).toBeGreaterThan(1000);
  });

  it('multiStartWith wraps another fitter (the robust fit) the same way', () => {
    const { x, y } = kerrSweep(truth, volts, seededNormal(22));
    y[40] = y[40]! + 500;
    const result = multiStartWith(starts, (start) => fitRobust(kerrSweepModel, x, y, start, bounds));
    expect(result.best.outliers[40]).toBe(1);
    expect(Math.abs(result.best.params[2]! - truth[2]!)).toBeLessThan(30);
  });

  it('when no start converges, returns the lowest finite RSS and says so', () => {
    const { x, y } = kerrSweep(truth, volts, seededNormal(23));
    const result = multiStart(kerrSweepModel, x, y, starts, { ...bounds, maxIterations: 1 });
    expect(result.converged).toBe(false);
    expect(result.convergedCount).toBe(0);
    const lowest = Math.min(...result.tried.map((t) => t.result.rss));
    expect(result.best.rss).toBe(lowest);
  });

  it('throws FIT_FAILED when every start is non-finite, and BAD_ARGUMENT with no starts', () => {
    const broken: CurveModel = { nParams: 1, value: (p, v) => Math.sqrt(p[0]!) * v };
    let caught: unknown;
    try {
      multiStart(broken, [1, 2, 3], [1, 2, 3], [[-1], [-2]]);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(KerrError);
    expect((caught as KerrError).code).toBe('FIT_FAILED');
    expect(() => multiStart(broken, [1, 2, 3], [1, 2, 3], [])).toThrow(/at least one start/);
  });
});
