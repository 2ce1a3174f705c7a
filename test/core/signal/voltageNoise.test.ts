/**
 * Logger noise from second differences: for white noise σ on a locally straight signal,
 * Δ²v = v₊ − 2v + v₋ has variance (1 + 4 + 1)σ² = 6σ² (sum of independent variances), and
 * 1.4826·MAD estimates a normal standard deviation (1/Φ⁻¹(3/4); Rousseeuw & Croux 1993).
 * Checked against the sample standard deviation of the noise the test adds (simple-statistics).
 */
import { sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { voltageNoiseV } from '../../../src/core/signal/voltageNoise.js';
import { seededNormal } from '../../helpers/random.js';

/** Ramps up and down with holds and four fast steps, sampled at 10 Hz for 400 s. */
function drive(n: number): Float64Array {
  return Float64Array.from({ length: n }, (_, k) => {
    const t = k / 10;
    const phase = t % 40;
    const ramp = phase < 15 ? 600 * phase : phase < 20 ? 9000 : phase < 35 ? 9000 - 600 * (phase - 20) : 0;
    const step = Math.floor(t / 100) % 2 === 1 ? 2000 : 0;
    return ramp + step;
  });
}

describe('voltageNoiseV', () => {
  it('recovers the added noise on ramps, holds, corners and steps within 10 % (n = 4000)', () => {
    for (const [seed, sigma] of [[1, 10], [2, 3], [3, 40]] as const) {
      const noise = seededNormal(seed);
      const added = Float64Array.from({ length: 4000 }, () => sigma * noise());
      const clean = drive(4000);
      const logged = clean.map((v, k) => v + added[k]!);
      const realised = sampleStandardDeviation(Array.from(added));
      // The MAD of 4000 correlated second differences has a relative standard error of a few per
      // cent (1.17/√n for independent normal data, more for the MA(2) correlation): 10 % is > 3σ.
      expect(Math.abs(voltageNoiseV(logged) / realised - 1), `σ = ${sigma}`).toBeLessThan(0.1);
    }
  });

  it('is zero for a noise-free ramp, a parabola (constant Δ²) and fewer than five samples', () => {
    expect(voltageNoiseV(Float64Array.from({ length: 50 }, (_, k) => 12.5 * k))).toBe(0);
    expect(voltageNoiseV(Float64Array.from({ length: 50 }, (_, k) => 3 * k * k))).toBe(0);
    expect(voltageNoiseV([0, 100, -100, 50])).toBe(0);
  });

  it('is not moved by a few huge jumps (robust scale), unlike a plain standard deviation of Δ²', () => {
    const noise = seededNormal(9);
    const logged = Float64Array.from({ length: 1000 }, (_, k) => 5 * k + 10 * noise() + (k % 97 === 0 ? 5000 : 0));
    const est = voltageNoiseV(logged);
    expect(est).toBeGreaterThan(8.5);
    expect(est).toBeLessThan(11.5);
    const d2 = Array.from({ length: 998 }, (_, k) => logged[k + 2]! - 2 * logged[k + 1]! + logged[k]!);
    expect(sampleStandardDeviation(d2) / Math.sqrt(6)).toBeGreaterThan(5 * est);
  });
});
