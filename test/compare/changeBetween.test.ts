import { describe, expect, it } from 'vitest';
import { mean, sampleStandardDeviation, tTestTwoSample } from 'simple-statistics';
import { changeBetween } from '../../src/compare/changeBetween.js';
import { OUTSIDE } from '../setup/outsideSources.js';

describe('changeBetween', () => {
  it('matches a hand calculation of difference, relative change and z (first-order propagation, GUM §5.1.2)', { tags: [OUTSIDE.gum] }, () => {
    // a = 0.0120 ± 0.0007, b = 0.0046 ± 0.0003 (floor fraction before and after filtering).
    // Δ = −0.0074; σΔ = √(0.0007² + 0.0003²) = √(4.9e-7 + 0.9e-7) = √5.8e-7 = 7.6158e-4
    // r = 0.0046/0.0120 − 1 = −0.616667; σr = √((0.0046·0.0007/0.0120²)² + (0.0003/0.0120)²)
    //   = √(0.0223611² + 0.025²) = √(5.0002e-4 + 6.25e-4) = 0.0335413
    // z = −0.0074/7.6158e-4 = −9.7167
    const { change, relativeChange, zScore } = changeBetween({ value: 0.012, stdErr: 0.0007 }, { value: 0.0046, stdErr: 0.0003 });
    expect(change.value).toBeCloseTo(-0.0074, 12);
    expect(change.stdErr).toBeCloseTo(7.6158e-4, 8);
    expect(relativeChange!.value).toBeCloseTo(-0.616667, 6);
    expect(relativeChange!.stdErr).toBeCloseTo(0.0335413, 6);
    expect(zScore).toBeCloseTo(-9.7167, 4);
  });

  it('gives the same z as simple-statistics’ two-sample t-test for equal-size samples', { tags: [OUTSIDE.simpleStatistics] }, () => {
    // With equal sizes n, the pooled-variance t of simple-statistics' tTestTwoSample equals
    // (m₂ − m₁)/√(s₁²/n + s₂²/n) — exactly our z with stdErr = s/√n (Welch 1947; pooled t with n₁ = n₂).
    const before = [2.41, 2.38, 2.44, 2.40, 2.39, 2.43, 2.42, 2.37, 2.45, 2.40].map((x) => x * 1e-12);
    const after = [2.47, 2.44, 2.49, 2.46, 2.43, 2.50, 2.45, 2.48, 2.46, 2.47].map((x) => x * 1e-12);
    const q = (xs: number[]) => ({ value: mean(xs), stdErr: sampleStandardDeviation(xs) / Math.sqrt(xs.length) });
    const { zScore } = changeBetween(q(before), q(after));
    const t = tTestTwoSample(after, before, 0) as number;
    expect(zScore).toBeCloseTo(t, 9);
  });

  it('leaves σ and z out when an uncertainty is missing, and skips the relative change when asked or when a = 0', () => {
    const noErr = changeBetween({ value: 2 }, { value: 3, stdErr: 0.1 });
    expect(noErr.change).toEqual({ value: 1 });
    expect(noErr.zScore).toBeNull();
    expect(noErr.relativeChange).toEqual({ value: 0.5 });
    expect(changeBetween({ value: 0, stdErr: 1 }, { value: 3, stdErr: 1 }).relativeChange).toBeNull();
    expect(changeBetween({ value: 1, stdErr: 1 }, { value: 3, stdErr: 1 }, false).relativeChange).toBeNull();
  });
});
