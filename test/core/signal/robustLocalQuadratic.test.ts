import { describe, expect, it } from 'vitest';
import { robustLocalQuadratic } from '../../../src/core/signal/robustLocalQuadratic.js';

// A quadratic is reproduced exactly by a local quadratic fit (LOESS of degree 2, Cleveland 1979);
// bisquare rounds take weight off a short spike, so the trend under it ends well below the spike
// (three rounds, as LOWESS does: a big spike is only partly removed).
describe('robustLocalQuadratic', () => {
  const n = 41;
  const times = Float64Array.from({ length: n }, (_, i) => i * 0.05);
  const all = new Uint8Array(n).fill(1);

  it('reproduces a parabola exactly, peak included', () => {
    const x = Float64Array.from(times, (t) => 3 - (t - 1) ** 2 + 0.5 * t);
    const m = robustLocalQuadratic(x, all, times, 6);
    for (let i = 0; i < n; i++) expect(m[i]).toBeCloseTo(x[i]!, 10);
  });

  it('takes weight off a three-frame spike on a curved background with a little noise', () => {
    const noise = (i: number) => 0.001 * Math.sin(i * 12.9898); // deterministic, bounded
    const base = Float64Array.from(times, (t, i) => 1 + 0.3 * t - 0.2 * t * t + noise(i));
    const x = base.slice();
    for (let i = 19; i < 22; i++) x[i] = x[i]! + 0.5;
    const m = robustLocalQuadratic(x, all, times, 8);
    const plain = robustLocalQuadratic(x, all, times, 8, 0);
    for (let i = 19; i < 22; i++) {
      // the rounds reduce the pull of the unweighted fit (0.19 → 0.14 at the spike centre here)
      expect(m[i]! - base[i]!).toBeLessThan(0.8 * (plain[i]! - base[i]!));
      expect(m[i]! - base[i]!).toBeLessThan(0.15);
    }
  });
});
