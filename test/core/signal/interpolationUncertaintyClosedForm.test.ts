/**
 * Uncertainty of a linearly interpolated voltage: logger noise in quadrature with the bend of the
 * signal between samples, σ² = σ_noise² + (½·max(0, |Δ²v| − 3√6·σ_noise))², the larger bend of the
 * two samples bracketing the query. Closed-form cases: an unresolved step of height h sampled once
 * on each side is off by up to h/2 at the midpoint (the straight line through (t_k, 0) and
 * (t_k+1, h) against a true value of 0 or h), and Δ² there is ±h. A Monte Carlo over steps at random
 * instants checks that the stated σ covers the actual interpolation error.
 */
import { describe, expect, it } from 'vitest';
import { interpolationUncertaintyV } from '../../../src/core/signal/interpolationUncertainty.js';
import { interpolateAt } from '../../../src/core/signal/interpolate.js';
import { seededRandom } from '../../helpers/random.js';

const t = (n: number) => Float64Array.from({ length: n }, (_, k) => k);

describe('interpolationUncertaintyV', () => {
  it('is the logger noise alone on a straight ramp, and NaN outside the log', () => {
    const v = Float64Array.from({ length: 20 }, (_, k) => 250 * k);
    const s = interpolationUncertaintyV(t(20), v, [0, 0.5, 7.25, 19, -0.1, 19.5], 12);
    expect(Array.from(s.subarray(0, 4))).toEqual([12, 12, 12, 12]);
    expect(Number.isNaN(s[4]!)).toBe(true);
    expect(Number.isNaN(s[5]!)).toBe(true);
  });

  it('gives half the height of an unresolved step around it (no noise)', () => {
    const v = Float64Array.from([0, 0, 0, 0, 1000, 1000, 1000, 1000]);
    // Δ² is +1000 at sample 3 and −1000 at sample 4: bend 500 on the intervals touching them
    const s = interpolationUncertaintyV(t(8), v, [0.5, 1.5, 2.5, 3.5, 4.5, 5.5, 6.5], 0);
    expect(Array.from(s)).toEqual([0, 0, 500, 500, 500, 0, 0]);
  });

  it('ignores second differences within 3√6·σ of noise and counts only the excess', () => {
    const sigma = 10;
    const threshold = 3 * Math.sqrt(6) * sigma; // ≈ 73.5 V
    const small = Float64Array.from([0, 0, 0, 70, 140, 210]); // Δ² = 70 < threshold at sample 2
    expect(interpolationUncertaintyV(t(6), small, [2.5], sigma)[0]).toBe(sigma);
    const big = Float64Array.from([0, 0, 0, 300, 600, 900]); // Δ² = 300 at sample 2
    expect(interpolationUncertaintyV(t(6), big, [2.5], sigma)[0]).toBeCloseTo(Math.hypot(sigma, (300 - threshold) / 2), 12);
  });

  it('covers the actual error of interpolating across steps at random instants (Monte Carlo, 2000 steps)', () => {
    const rnd = seededRandom(4);
    let within1 = 0, within2 = 0, n = 0;
    for (let k = 0; k < 2000; k++) {
      const h = 500 + 2000 * rnd();
      const at = 5 + rnd(); // the step happens between samples 5 and 6
      const truth = (x: number) => (x >= at ? h : 0);
      const v = Float64Array.from(t(12), truth);
      const q = 5 + rnd();
      const est = interpolateAt(t(12), v, Float64Array.of(q))[0]!;
      const sigma = interpolationUncertaintyV(t(12), v, [q], 0)[0]!;
      const err = Math.abs(est - truth(q));
      if (err <= sigma) within1++;
      if (err <= 2 * sigma) within2++;
      n++;
    }
    // Here σ = h/2. With the step at u_s and the query at u (both uniform on the interval) the
    // straight line is off by h·u before the step and h·(1 − u) after it: within h/2 with
    // probability 2·(½ − ⅛) = 0.75, and never beyond h = 2σ. A normal error would stay within 1σ
    // 68 % of the time, so the stated σ is not too small.
    expect(within1 / n).toBeGreaterThanOrEqual(0.68);
    expect(within2).toBe(n);
  });
});
