import { describe, expect, it } from 'vitest';
import { makeRng, NORMAL_TABLE } from '../../src/sim/rng.js';

describe('seeded generator', () => {
  it('repeats the same numbers for the same seed and differs for another seed', () => {
    const a = makeRng(42);
    const b = makeRng(42);
    const c = makeRng(43);
    const xs = Array.from({ length: 100 }, () => a.nextU32());
    expect(Array.from({ length: 100 }, () => b.nextU32())).toEqual(xs);
    expect(Array.from({ length: 100 }, () => c.nextU32())).not.toEqual(xs);
  });

  it('splits into child streams that do not depend on how much the parent drew', () => {
    const a = makeRng(7);
    const childBefore = a.split('frame', 3).nextU32();
    for (let i = 0; i < 1000; i++) a.nextU32();
    expect(a.split('frame', 3).nextU32()).toBe(childBefore);
    expect(a.split('frame', 4).nextU32()).not.toBe(childBefore);
    expect(a.split('logger', 3).nextU32()).not.toBe(childBefore);
  });

  it('draws uniforms with mean 1/2 and variance 1/12 (standard error bounds, common practice)', () => {
    const r = makeRng(1);
    const n = 200_000;
    let sum = 0;
    let sumSq = 0;
    const bins = new Float64Array(16);
    let lowest = Infinity;
    let highest = -Infinity;
    for (let i = 0; i < n; i++) {
      const u = r.uniform();
      lowest = Math.min(lowest, u);
      highest = Math.max(highest, u);
      sum += u;
      sumSq += u * u;
      bins[Math.floor(u * 16)]! += 1;
    }
    expect(lowest).toBeGreaterThanOrEqual(0);
    expect(highest).toBeLessThan(1);
    const mean = sum / n;
    expect(Math.abs(mean - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n));
    expect(sumSq / n - mean * mean).toBeCloseTo(1 / 12, 3);
    // chi-square with 15 degrees of freedom: 99.9 % point is 37.7 (statistical tables)
    const expected = n / 16;
    let chi2 = 0;
    for (const b of bins) chi2 += ((b - expected) ** 2) / expected;
    expect(chi2).toBeLessThan(37.7);
  });

  it('has a normal table with mean 0, variance 1 and the standard quantiles (e.g. 97.5 % at 1.95996)', () => {
    let sum = 0;
    let sumSq = 0;
    for (const z of NORMAL_TABLE) {
      sum += z;
      sumSq += z * z;
    }
    expect(Math.abs(sum / NORMAL_TABLE.length)).toBeLessThan(1e-6);
    expect(sumSq / NORMAL_TABLE.length).toBeCloseTo(1, 5);
    // the entry at p = 0.975 is the 97.5 % quantile 1.959964 (normal tables), within the variance rescaling
    expect(NORMAL_TABLE[Math.round(0.975 * 65536 - 0.5)]!).toBeCloseTo(1.96, 2);
    const r = makeRng(3);
    let inside = 0;
    for (let i = 0; i < 100_000; i++) if (Math.abs(r.normal()) < 1) inside++;
    // 68.27 % of a normal lies within ±1σ (normal tables)
    expect(inside / 100_000).toBeCloseTo(0.6827, 2);
  });
});
