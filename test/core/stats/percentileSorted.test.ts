import { describe, expect, it } from 'vitest';
import { quantileSorted } from 'simple-statistics';
import { percentileSorted } from '../../../src/core/stats/percentileSorted.js';

describe('percentileSorted', () => {
  it('interpolates between order statistics (Hyndman & Fan type 7, as NumPy’s default)', () => {
    const s = Float64Array.of(1, 2, 3, 4);
    expect(percentileSorted(s, 0.5)).toBe(2.5);
    expect(percentileSorted(s, 0)).toBe(1);
    expect(percentileSorted(s, 1)).toBe(4);
    expect(percentileSorted(s, 0.25)).toBeCloseTo(1.75, 12); // numpy.percentile([1,2,3,4], 25) = 1.75
    expect(percentileSorted([], 0.5)).toBeNaN();
  });

  it('agrees with simple-statistics at the median of odd samples', () => {
    const s = [0.5, 1, 7, 9, 12];
    expect(percentileSorted(s, 0.5)).toBe(quantileSorted(s, 0.5));
  });
});
