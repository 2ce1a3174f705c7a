import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { downsampleMinMax } from '../../../src/report/plots/downsampleMinMax.js';

// Min/max decimation (common practice in oscilloscope displays): every stretch keeps its lowest
// and highest sample, so spikes survive thinning.
describe('downsampleMinMax', () => {
  it('keeps every index of a short series', () => {
    expect(downsampleMinMax([3, 1, 2], 10)).toEqual([0, 1, 2]);
  });

  it('keeps the spike and the dip of a long flat series', () => {
    const values = new Array<number>(10_000).fill(1);
    values[4321] = 50;
    values[7777] = -20;
    const kept = downsampleMinMax(values, 200);
    expect(kept.length).toBeLessThanOrEqual(200);
    expect(kept).toContain(4321);
    expect(kept).toContain(7777);
    expect(kept[0]).toBe(0);
    expect(kept[kept.length - 1]).toBe(9999);
  });

  it('never returns more than maxPoints, keeps order, and keeps the global extremes', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 3000 }), fc.integer({ min: 4, max: 500 }), (values, maxPoints) => {
        const kept = downsampleMinMax(values, maxPoints);
        expect(kept.length).toBeLessThanOrEqual(Math.max(values.length <= maxPoints ? values.length : maxPoints, 0));
        for (let i = 1; i < kept.length; i++) expect(kept[i]!).toBeGreaterThan(kept[i - 1]!);
        const keptValues = kept.map((i) => values[i]!);
        expect(Math.max(...keptValues)).toBe(Math.max(...values));
        expect(Math.min(...keptValues)).toBe(Math.min(...values));
      }),
      { numRuns: 150 },
    );
  });

  it('skips missing values when choosing extremes but leaves a marker for an all-missing stretch', () => {
    const values: (number | null)[] = new Array(1000).fill(null);
    values[999] = 5;
    const kept = downsampleMinMax(values, 10);
    expect(kept).toContain(999);
    expect(kept.length).toBeLessThanOrEqual(10);
  });

  it('refuses a maxPoints below 4', () => {
    expect(() => downsampleMinMax([1, 2, 3, 4, 5], 3)).toThrow(/maxPoints/);
  });
});
