import { describe, expect, it } from 'vitest';
import { levenbergMarquardt, type CurveModel } from '../../../src/core/fit/levenbergMarquardt.js';
import { fitRobust } from '../../../src/core/fit/robustFit.js';
import { KerrError } from '../../../src/errors.js';
import { kerrSweep, kerrSweepModel } from './kerrCurve.js';
import { seededNormal, seededRandom } from '../../helpers/random.js';

const truth = [5, 100, 10000]; // floor, amplitude (counts), V_π (V): a scenario of our own
const volts = Array.from({ length: 200 }, (_, i) => (12000 * i) / 199);
const start = [0, 90, 9000];

/** Kerr sweep with unit normal noise and 10 % of the points hit by bright spikes of +50…+150 (sparks). */
function spikedSweep(seed: number) {
  const { x, y } = kerrSweep(truth, volts, seededNormal(seed));
  const clean = Float64Array.from(y);
  const uniform = seededRandom(seed + 1000);
  const planted = new Set<number>();
  while (planted.size < 20) planted.add(Math.floor(uniform() * volts.length));
  for (const i of planted) y[i] = y[i]! + 50 + 100 * uniform();
  return { x, y, clean, planted };
}

describe('fitRobust (Huber IRLS, k = 1.345, MAD scale)', () => {
  for (const seed of [1, 2, 3, 4, 5]) {
    it(`recovers the parameters despite 10 % planted spikes where plain LM does not (seed ${seed})`, () => {
      const { x, y, planted } = spikedSweep(seed);
      const plain = levenbergMarquardt(kerrSweepModel, x, y, start);
      const robust = fitRobust(kerrSweepModel, x, y, start);
      // Tolerances: floor within 1 count (noise σ = 1), amplitude within 1.5 %, V_π within 0.4 %.
      // (All spikes are bright, so even Huber keeps a small upward bias of a few tenths of a count.)
      const within = (p: Float64Array) =>
        Math.abs(p[0]! - truth[0]!) < 1 && Math.abs(p[1]! - truth[1]!) < 1.5 && Math.abs(p[2]! - truth[2]!) < 40;
      expect(within(robust.params)).toBe(true);
      expect(within(plain.params)).toBe(false);
      expect(Math.abs(plain.params[0]! - truth[0]!)).toBeGreaterThan(3); // spikes drag the plain floor up
      expect(robust.converged).toBe(true);
      expect(robust.reweightsConverged).toBe(true);
      expect(robust.reweights).toBeGreaterThan(0);
      // Every planted spike is flagged (>4 robust σ), and almost nothing else is.
      for (const i of planted) expect(robust.outliers[i]).toBe(1);
      expect(robust.outlierCount).toBeLessThanOrEqual(planted.size + 2);
      for (const i of planted) expect(robust.weights[i]!).toBeLessThan(0.1);
      // The MAD scale sees the noise, not the spikes.
      expect(robust.robustScale).toBeGreaterThan(0.8);
      expect(robust.robustScale).toBeLessThan(1.4);
    });
  }

  it('standard errors with spikes stay close to those of the clean fit (Huber covariance), not inflated by the spikes', () => {
    const { x, y, clean } = spikedSweep(3);
    const robust = fitRobust(kerrSweepModel, x, y, start);
    const reference = levenbergMarquardt(kerrSweepModel, x, clean, start);
    for (let j = 0; j < 3; j++) {
      expect(robust.stdErr[j]! / reference.stdErr[j]!).toBeGreaterThan(0.9);
      expect(robust.stdErr[j]! / reference.stdErr[j]!).toBeLessThan(1.6);
    }
    expect(robust.correlation(2, 2)).toBeCloseTo(1, 12);
  });

  it('with k → ∞ nothing is downweighted and the result is the least-squares fit, covariance included', () => {
    const { x, y } = kerrSweep(truth, volts, seededNormal(9));
    const robust = fitRobust(kerrSweepModel, x, y, start, { huberK: 1e12 });
    const plain = levenbergMarquardt(kerrSweepModel, x, y, start);
    for (let j = 0; j < 3; j++) {
      expect(robust.params[j]!).toBeCloseTo(plain.params[j]!, 6);
      expect(robust.stdErr[j]! / plain.stdErr[j]!).toBeCloseTo(1, 6);
    }
    expect(Array.from(robust.weights).every((w) => w === 1)).toBe(true);
  });

  it('maxReweights 0 is the plain fit; caller weights of 0 leave points out and get Huber weight 0', () => {
    const { x, y } = spikedSweep(4);
    const none = fitRobust(kerrSweepModel, x, y, start, { maxReweights: 0 });
    const plain = levenbergMarquardt(kerrSweepModel, x, y, start);
    expect(Array.from(none.params)).toEqual(Array.from(plain.params));
    expect(none.reweights).toBe(0);
    const w = new Float64Array(x.length).fill(1);
    w[10] = 0;
    y[10] = Number.NaN;
    const masked = fitRobust(kerrSweepModel, x, y, start, { weights: w });
    expect(masked.weights[10]).toBe(0);
    expect(masked.outliers[10]).toBe(0);
    expect(masked.dof).toBe(x.length - 1 - 3);
  });

  it('an exact fit of most points (zero MAD) stops reweighting instead of dividing by zero', () => {
    const line: CurveModel = { nParams: 2, value: (p, xi) => p[0]! + p[1]! * xi };
    const x = [0, 1, 2, 3, 4, 5, 6, 7];
    const y = x.map((xi) => 1 + 2 * xi);
    y[7] = 100;
    const result = fitRobust(line, x, y, [0, 0]);
    expect(result.reweightsConverged).toBe(true);
    expect(Number.isFinite(result.params[0]!)).toBe(true);
  });

  it('rejects a non-positive Huber constant with a KerrError', () => {
    expect(() => fitRobust(kerrSweepModel, volts, volts, start, { huberK: 0 })).toThrow(KerrError);
    expect(() => fitRobust(kerrSweepModel, volts, volts, start, { maxReweights: -1 })).toThrow(/maxReweights/);
  });
});
