/**
 * percentileSpread against sorting and percentileSorted (the definition it must reproduce bit for
 * bit): random samples with and without ties, small and odd sizes, NaN and −0 (sorted instead).
 * Self-consistency checks, no outside source.
 */
import { describe, expect, it } from 'vitest';
import { percentileSpread } from '../../../src/core/stats/percentileSpread.js';
import { percentileSorted } from '../../../src/core/stats/percentileSorted.js';
import { seededNormal } from '../../helpers/random.js';

function bySorting(values: Float64Array, qLow: number, qHigh: number): number {
  const s = Float64Array.from(values).sort();
  return percentileSorted(s, qHigh) - percentileSorted(s, qLow);
}

describe('percentileSpread', () => {
  it('gives exactly the sorted p_high − p_low for random samples, with and without ties', () => {
    const normal = seededNormal(5);
    let checked = 0;
    for (const n of [1, 2, 3, 4, 7, 20, 99, 100, 451]) {
      for (const ties of [false, true]) {
        for (const [qLow, qHigh] of [[0.05, 0.95], [0, 1], [0.5, 0.5], [0.25, 0.75], [0.01, 0.99]] as const) {
          const v = new Float64Array(n);
          for (let i = 0; i < n; i++) v[i] = ties ? Math.round(normal() * 2) / 4 : Math.fround(normal() * 0.1 + 0.3);
          const want = bySorting(v, qLow, qHigh);
          const got = percentileSpread(Float64Array.from(v), qLow, qHigh);
          if (!Object.is(got, want)) expect.fail(`n=${n} ties=${ties} q=${qLow}..${qHigh}: ${got} but sorting gives ${want}`);
          checked++;
        }
      }
    }
    expect(checked).toBe(9 * 2 * 5);
  });

  it('handles sorted, reversed and constant samples, and the worked example', () => {
    const up = Float64Array.from({ length: 300 }, (_v, i) => i);
    for (const v of [up, up.slice().reverse(), new Float64Array(300).fill(0.25)]) {
      expect(percentileSpread(Float64Array.from(v), 0.05, 0.95)).toBe(bySorting(v, 0.05, 0.95));
    }
    expect(percentileSpread(Float64Array.of(5, 1, 4, 2, 3), 0.05, 0.95)).toBeCloseTo(3.6, 12);
  });

  it('falls back to sorting for NaN and −0, and gives NaN for an empty sample', () => {
    const withNaN = Float64Array.of(3, NaN, 1, 2, 5, 4);
    expect(Object.is(percentileSpread(Float64Array.from(withNaN), 0.05, 0.95), bySorting(withNaN, 0.05, 0.95))).toBe(true);
    const withNegZero = Float64Array.of(0, -0, 0, -0, 1);
    expect(Object.is(percentileSpread(Float64Array.from(withNegZero), 0, 0.3), bySorting(withNegZero, 0, 0.3))).toBe(true);
    expect(percentileSpread(new Float64Array(0), 0.05, 0.95)).toBeNaN();
  });
});
