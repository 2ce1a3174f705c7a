import { describe, expect, it } from 'vitest';
import { MAD_TO_SIGMA, median, robustScale } from '../../../src/core/fit/robustScale.js';
import { seededNormal } from '../../helpers/random.js';

describe('robustScale (MAD × 1/Φ⁻¹(3/4))', () => {
  it('uses the normal-consistency factor 1/0.6744897501960817 (standard normal quartile, Abramowitz & Stegun table 26.1)', () => {
    expect(MAD_TO_SIGMA).toBeCloseTo(1 / 0.6744897501960817, 14);
  });

  it('worked by hand: [1, 2, 3, 4, 100] has median 3 and median absolute deviation 1', () => {
    expect(robustScale([1, 2, 3, 4, 100])).toBeCloseTo(MAD_TO_SIGMA, 14);
    expect(median([4, 1, 3, 2])).toBe(2.5);
  });

  it('estimates σ of normal data and ignores 20 % wild points (breakdown point 50 %, Hampel 1974)', () => {
    const normal = seededNormal(11);
    const sample = Array.from({ length: 20000 }, () => 3 * normal());
    expect(robustScale(sample)).toBeGreaterThan(2.9);
    expect(robustScale(sample)).toBeLessThan(3.1);
    for (let i = 0; i < sample.length; i += 5) sample[i] = 1e6;
    expect(robustScale(sample)).toBeLessThan(4.5);
  });

  it('skips non-finite entries, gives NaN for none, and leaves the input unchanged', () => {
    const input = [5, Number.NaN, 1, Infinity, 3];
    expect(robustScale(input)).toBeCloseTo(2 * MAD_TO_SIGMA, 14);
    expect(input).toEqual([5, Number.NaN, 1, Infinity, 3]);
    expect(Number.isNaN(robustScale([Number.NaN]))).toBe(true);
  });
});
