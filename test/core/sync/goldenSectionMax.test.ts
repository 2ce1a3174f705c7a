import { describe, expect, it } from 'vitest';
import { goldenSectionMax } from '../../../src/core/sync/goldenSectionMax.js';

describe('goldenSectionMax', () => {
  it('finds the maximum of x·e^(−x) at x = 1 (calculus: derivative (1 − x)·e^(−x))', () => {
    const r = goldenSectionMax((x) => x * Math.exp(-x), 0, 4, 1e-8);
    expect(r.converged).toBe(true);
    expect(r.x).toBeCloseTo(1, 6);
    expect(r.value).toBeCloseTo(Math.exp(-1), 12);
  });

  it('shrinks the bracket by the golden ratio 0.618 per step (Numerical Recipes §10.2)', () => {
    const r = goldenSectionMax((x) => -Math.abs(x - 0.3), 0, 1, 1e-6);
    const expectedIterations = Math.ceil(Math.log(1e-6) / Math.log((Math.sqrt(5) - 1) / 2));
    expect(Math.abs(r.iterations - expectedIterations)).toBeLessThanOrEqual(1);
    expect(r.x).toBeCloseTo(0.3, 5);
  });

  it('reports no convergence when the iteration cap is hit', () => {
    const r = goldenSectionMax((x) => -(x * x), -1, 1, 1e-12, 5);
    expect(r.iterations).toBe(5);
    expect(r.converged).toBe(false);
  });

  it('returns an end point when the maximum lies there, and treats NaN as −∞', () => {
    expect(goldenSectionMax((x) => x, 0, 2, 1e-6).x).toBe(2);
    const r = goldenSectionMax((x) => (x < 0.5 ? Number.NaN : -((x - 0.7) ** 2)), 0, 1, 1e-6);
    expect(r.x).toBeCloseTo(0.7, 5);
  });
});
