import { describe, expect, it } from 'vitest';
import { linearRegression, linearRegressionLine, rSquared } from 'simple-statistics';
import { explainedShare } from '../../../src/core/gates/explainedShare.js';

describe('explainedShare (coefficient of determination)', () => {
  it('agrees with simple-statistics rSquared for a least-squares line (outside library)', () => {
    const pts: [number, number][] = [[0, 1.1], [1, 2.9], [2, 5.2], [3, 6.8], [4, 9.3], [5, 10.9]];
    const line = linearRegressionLine(linearRegression(pts));
    const y = Float64Array.from(pts, (p) => p[1]);
    const m = Float64Array.from(pts, (p) => line(p[0]));
    expect(explainedShare(y, m)).toBeCloseTo(rSquared(pts, line), 12);
  });

  it('is 1 for a perfect model, near 0 for a model that only gives the mean, and skips non-finite pairs', () => {
    const y = Float64Array.of(1, 4, 2, 8, 5, NaN);
    expect(explainedShare(y, y)).toBe(1);
    const mean = (1 + 4 + 2 + 8 + 5) / 5;
    expect(explainedShare(y, new Float64Array(6).fill(mean))).toBeCloseTo(0, 12);
    expect(explainedShare(Float64Array.of(1, 2), Float64Array.of(1, 2))).toBeNaN();
    expect(explainedShare(Float64Array.of(3, 3, 3), Float64Array.of(3, 3, 3))).toBeNaN();
  });
});
