/**
 * The widening for correlated residuals. Check values: for an AR(1) series with coefficient ρ the
 * variance of a mean grows by (1 + ρ)/(1 − ρ) (the classic n_eff = n·(1 − ρ)/(1 + ρ); e.g. Bence,
 * Ecology 76, 628 (1995)); independent residuals give no widening. Tolerances cover the sampling
 * scatter of one long simulated series (stated per check).
 */
import { describe, expect, it } from 'vitest';
import { correlatedErrorInflation } from '../../../src/core/uncertainty/correlatedErrorInflation.js';
import { makeRng } from '../../../src/sim/rng.js';

function ar1(n: number, rho: number, seed: number): Float64Array {
  const rng = makeRng(seed);
  const x = new Float64Array(n);
  let prev = 0;
  for (let t = 0; t < n; t++) { prev = rho * prev + Math.sqrt(1 - rho * rho) * rng.normal(); x[t] = prev; }
  return x;
}

describe('correlatedErrorInflation', () => {
  it('a constant (mean) fit on AR(1) residuals widens by about √((1+ρ)/(1−ρ)) (ρ = 0.8 → 3)', () => {
    const n = 20000;
    const r = ar1(n, 0.8, 7);
    const out = correlatedErrorInflation(new Float64Array(n).fill(1), r, new Float64Array(n).fill(1), 1);
    expect(out.inflation[0]).toBeGreaterThan(2.7); // ±10 % for one series of 20 000 points
    expect(out.inflation[0]).toBeLessThan(3.3);
    expect(out.effectiveFrames[0]).toBeGreaterThan(n / 14);
    expect(out.effectiveFrames[0]).toBeLessThan(n / 7);
  });

  it('independent residuals are not widened (factor 1 within 5 %)', () => {
    const n = 20000;
    const r = ar1(n, 0, 11);
    const out = correlatedErrorInflation(new Float64Array(n).fill(1), r, new Float64Array(n).fill(1), 1);
    expect(out.inflation[0]).toBeLessThan(1.05);
    expect(out.inflation[0]).toBeGreaterThanOrEqual(1);
  });

  it('a slope fit sees correlation too (two parameters), and a singular design gives no widening', () => {
    const n = 5000;
    const r = ar1(n, 0.6, 3);
    const g = new Float64Array(2 * n);
    for (let t = 0; t < n; t++) { g[2 * t] = 1; g[2 * t + 1] = t / n; }
    const out = correlatedErrorInflation(g, r, new Float64Array(n).fill(1), 2);
    expect(out.inflation[1]).toBeGreaterThan(1.7); // √(1.6/0.4) = 2
    expect(out.inflation[1]).toBeLessThan(2.3);
    const flat = correlatedErrorInflation(new Float64Array(2 * n).fill(1), r, new Float64Array(n).fill(1), 2);
    expect(flat.singular).toBe(true);
    expect(flat.inflation).toEqual([1, 1]);
  });
});
