import { describe, expect, it } from 'vitest';
import { numericGradient } from '../../../src/core/fit/numericGradient.js';

describe('numericGradient (central differences, h = ε^(1/3)·|p|)', () => {
  it('matches analytic derivatives to about ε^(2/3) (Nocedal & Wright, Numerical Optimization §8.1)', () => {
    // f = a·exp(−b·x)·sin(c·x): derivatives by hand
    const f = (p: Float64Array, x: number) => p[0]! * Math.exp(-p[1]! * x) * Math.sin(p[2]! * x);
    const p = Float64Array.of(2.5, 0.3, 1.7);
    const out = new Float64Array(3);
    for (const x of [0.2, 1, 3.3]) {
      numericGradient(f, p, x, out);
      const e = Math.exp(-p[1]! * x);
      const s = Math.sin(p[2]! * x);
      const c = Math.cos(p[2]! * x);
      const exact = [e * s, -x * p[0]! * e * s, x * p[0]! * e * c];
      exact.forEach((d, j) => expect(Math.abs(out[j]! - d)).toBeLessThan(1e-9 * (Math.abs(d) + 1e-3)));
    }
  });

  it('keeps the step in proportion for tiny parameters (1e-7, as in NIST Hahn1) and handles 0', () => {
    const f = (p: Float64Array, x: number) => p[0]! * x ** 3 + p[1]! * x;
    const p = Float64Array.of(-1.2e-7, 0);
    const out = new Float64Array(2);
    numericGradient(f, p, 500, out);
    expect(out[0]! / 500 ** 3).toBeCloseTo(1, 9);
    expect(out[1]! / 500).toBeCloseTo(1, 9);
  });

  it('restores the parameter vector exactly', () => {
    const p = Float64Array.of(0.1, 1 / 3, 1e300);
    const before = Array.from(p);
    numericGradient((q, x) => q[0]! + q[1]! * x + q[2]! * 1e-300, p, 2, new Float64Array(3));
    expect(Array.from(p)).toEqual(before);
  });
});
