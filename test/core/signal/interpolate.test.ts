import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { interpolateAt } from '../../../src/core/signal/interpolate.js';
import { KerrError } from '../../../src/errors.js';

const f64 = (...xs: number[]): Float64Array => Float64Array.from(xs);

describe('interpolateAt', () => {
  it('interpolates linearly between samples (hand-computed values)', () => {
    const out = interpolateAt(f64(0, 1, 3), f64(0, 10, 30), [0, 0.25, 1, 2, 3]);
    expect(Array.from(out)).toEqual([0, 2.5, 10, 20, 30]);
  });

  it('returns NaN outside the sampled span and for NaN queries', () => {
    const out = interpolateAt(f64(1, 2), f64(5, 7), [0.999, 2.001, Number.NaN, 1.5]);
    expect(Number.isNaN(out[0])).toBe(true);
    expect(Number.isNaN(out[1])).toBe(true);
    expect(Number.isNaN(out[2])).toBe(true);
    expect(out[3]).toBe(6);
  });

  it('handles irregular spacing and unsorted queries the same as sorted ones', () => {
    const t = f64(0, 0.1, 0.15, 0.9, 1.0);
    const v = f64(3, -1, 4, 1, -5);
    const sorted = [0.05, 0.12, 0.5, 0.95];
    const shuffled = [0.95, 0.05, 0.5, 0.12];
    const a = interpolateAt(t, v, sorted);
    const b = interpolateAt(t, v, shuffled);
    expect(b[1]).toBeCloseTo(a[0], 15);
    expect(b[3]).toBeCloseTo(a[1], 15);
    expect(b[2]).toBeCloseTo(a[2], 15);
    expect(b[0]).toBeCloseTo(a[3], 15);
    expect(a[0]).toBeCloseTo(1, 12); // halfway between 3 and −1
    expect(a[2]).toBeCloseTo(4 + (1 - 4) * (0.35 / 0.75), 12);
  });

  it('writes into a given output array without touching the inputs', () => {
    const t = f64(0, 2);
    const v = f64(0, 4);
    const q = f64(1, 0.5);
    const out = new Float64Array(3).fill(-1);
    const back = interpolateAt(t, v, q, out);
    expect(back).toBe(out);
    expect(Array.from(out)).toEqual([2, 1, -1]);
    expect(Array.from(t)).toEqual([0, 2]);
    expect(Array.from(q)).toEqual([1, 0.5]);
  });

  it('reproduces a straight line exactly (piecewise-linear interpolation is exact for linear data, any numerics text)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0.001, max: 10, noNaN: true }), { minLength: 1, maxLength: 50 }),
        fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 1, maxLength: 50 }),
        fc.double({ min: -100, max: 100, noNaN: true }),
        fc.double({ min: -100, max: 100, noNaN: true }),
        (steps, fractions, slope, intercept) => {
          const t = new Float64Array(steps.length + 1);
          for (let i = 0; i < steps.length; i++) t[i + 1] = t[i] + steps[i];
          const v = Float64Array.from(t, (x) => intercept + slope * x);
          const span = t[t.length - 1];
          const q = fractions.map((f) => f * span);
          const out = interpolateAt(t, v, q);
          q.forEach((x, k) => expect(out[k]).toBeCloseTo(intercept + slope * x, 6));
          const sortedOut = interpolateAt(t, v, [...q].sort((a, b) => a - b));
          [...q].sort((a, b) => a - b).forEach((x, k) => expect(sortedOut[k]).toBeCloseTo(intercept + slope * x, 6));
        },
      ),
      { numRuns: 200, seed: 7 },
    );
  });

  it('matches a brute-force reference on random data, sorted and unsorted', () => {
    const reference = (t: Float64Array, v: Float64Array, q: number): number => {
      if (!(q >= t[0] && q <= t[t.length - 1])) return Number.NaN;
      for (let i = 0; i < t.length - 1; i++) {
        if (q >= t[i] && q <= t[i + 1]) return v[i] + ((v[i + 1] - v[i]) * (q - t[i])) / (t[i + 1] - t[i]);
      }
      return v[t.length - 1];
    };
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.integer({ min: -1000, max: 1000 }), { minLength: 2, maxLength: 40 }),
        fc.array(fc.integer({ min: -1000, max: 1000 }), { minLength: 40, maxLength: 40 }),
        fc.array(fc.double({ min: -1200, max: 1200, noNaN: true }), { maxLength: 60 }),
        (times, values, queries) => {
          const t = Float64Array.from([...times].sort((a, b) => a - b));
          const v = Float64Array.from(values.slice(0, t.length));
          const out = interpolateAt(t, v, queries);
          queries.forEach((q, k) => {
            const want = reference(t, v, q);
            if (Number.isNaN(want)) expect(Number.isNaN(out[k])).toBe(true);
            else expect(out[k]).toBeCloseTo(want, 9);
          });
        },
      ),
      { numRuns: 200, seed: 11 },
    );
  });

  it('works with a single sample (only its own time is inside)', () => {
    const out = interpolateAt(f64(2), f64(9), [2, 2.1]);
    expect(out[0]).toBe(9);
    expect(Number.isNaN(out[1])).toBe(true);
  });

  it('rejects bad sample arrays with BAD_ARGUMENT', () => {
    const codeOf = (fn: () => unknown): string | null => {
      try {
        fn();
        return null;
      } catch (err) {
        return err instanceof KerrError ? err.code : 'other';
      }
    };
    expect(codeOf(() => interpolateAt(f64(), f64(), [0]))).toBe('BAD_ARGUMENT');
    expect(codeOf(() => interpolateAt(f64(0, 1), f64(0), [0]))).toBe('BAD_ARGUMENT');
    expect(codeOf(() => interpolateAt(f64(0, 0), f64(0, 1), [0]))).toBe('BAD_ARGUMENT');
    expect(codeOf(() => interpolateAt(f64(1, 0), f64(0, 1), [0]))).toBe('BAD_ARGUMENT');
    expect(codeOf(() => interpolateAt(f64(0, 1), f64(0, 1), [0, 1], new Float64Array(1)))).toBe('BAD_ARGUMENT');
  });
});
