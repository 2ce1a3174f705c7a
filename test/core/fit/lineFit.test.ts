import { linearRegression, rSquared } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { fitLine } from '../../../src/core/fit/lineFit.js';
import { KerrError } from '../../../src/errors.js';
import { seededNormal } from '../../helpers/random.js';
import { OUTSIDE } from '../../setup/outsideSources.js';

// Anscombe's quartet, data set I (F. J. Anscombe, "Graphs in statistical analysis",
// The American Statistician 27, 1973): published summary y = 3.00 + 0.500·x, residual sum of
// squares 13.75 on 9 d.f., estimated standard error of the slope 0.118, R² = 0.667 (from memory).
const anscombeX = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
const anscombeY = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];

describe('fitLine', () => {
  it('reproduces Anscombe’s published regression summary for data set I', () => {
    const fit = fitLine(anscombeX, anscombeY);
    expect(fit.slope).toBeCloseTo(0.5, 3);
    expect(fit.intercept).toBeCloseTo(3.0, 2);
    expect(fit.rss).toBeCloseTo(13.75, 1); // 13.763 from the printed (2-decimal) data
    expect(fit.dof).toBe(9);
    expect(fit.slopeStdErr).toBeCloseTo(0.118, 3);
    expect(fit.r2).toBeCloseTo(0.667, 3);
  });

  it('agrees with simple-statistics’ linearRegression and rSquared on noisy data', { tags: [OUTSIDE.simpleStatistics] }, () => {
    const normal = seededNormal(3);
    const x = Array.from({ length: 50 }, (_, i) => 1000 + i * 7.5);
    const y = x.map((v) => 2.5e6 + 3200 * v + 4e4 * normal());
    const fit = fitLine(x, y);
    const reference = linearRegression(x.map((v, i) => [v, y[i]!]));
    expect(fit.slope / reference.m).toBeCloseTo(1, 10);
    expect(fit.intercept / reference.b).toBeCloseTo(1, 8);
    const line = (v: number) => reference.b + reference.m * v;
    expect(fit.r2).toBeCloseTo(rSquared(x.map((v, i) => [v, y[i]!]), line), 9);
  });

  it('slope and intercept standard errors match the textbook formulas evaluated by hand', () => {
    const x = [1, 2, 4, 7, 11];
    const y = [3.1, 4.8, 9.2, 15.1, 22.6];
    const fit = fitLine(x, y);
    const n = x.length;
    const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
    const mx = mean(x);
    const sxx = x.reduce((s, v) => s + (v - mx) ** 2, 0);
    const residuals = x.map((v, i) => y[i]! - fit.intercept - fit.slope * v);
    const s2 = residuals.reduce((s, r) => s + r * r, 0) / (n - 2);
    expect(fit.slopeStdErr).toBeCloseTo(Math.sqrt(s2 / sxx), 12);
    expect(fit.interceptStdErr).toBeCloseTo(Math.sqrt(s2 * (1 / n + (mx * mx) / sxx)), 12);
  });

  it('through the origin: b = Σxy/Σx², se = √(RSS/(n−1)/Σx²), intercept exactly 0', () => {
    const x = [1, 2, 3, 4];
    const y = [2.1, 3.9, 6.2, 7.9];
    const fit = fitLine(x, y, { throughOrigin: true });
    const sxy = x.reduce((s, v, i) => s + v * y[i]!, 0);
    const sxx = x.reduce((s, v) => s + v * v, 0);
    const b = sxy / sxx;
    const rss = x.reduce((s, v, i) => s + (y[i]! - b * v) ** 2, 0);
    expect(fit.slope).toBeCloseTo(b, 14);
    expect(fit.slopeStdErr).toBeCloseTo(Math.sqrt(rss / 3 / sxx), 14);
    expect(fit.intercept).toBe(0);
    expect(fit.dof).toBe(3);
  });

  it('rejects too few points, equal x values and non-finite values', () => {
    expect(() => fitLine([1, 2], [1, 2])).toThrow(KerrError);
    expect(() => fitLine([2, 2, 2], [1, 2, 3])).toThrow(/not all the same/);
    expect(() => fitLine([1, 2, Number.NaN], [1, 2, 3])).toThrow(/finite/);
    expect(() => fitLine([1, 2, 3], [1, 2])).toThrow(/y/);
  });
});
