import { describe, expect, it } from 'vitest';
import { correctExposure, correctSeries, exposureGains, median } from '../../src/measure/exposure.js';
import { KerrError } from '../../src/errors.js';

describe('median', () => {
  it('takes the middle value, or the mean of the two middle values, without reordering the input', () => {
    const values = [5, 1, 3];
    expect(median(values)).toBe(3);
    expect(values).toEqual([5, 1, 3]);
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([])).toBeNaN();
  });
});

describe('exposureGains: gain_t = ref_t / median(ref) (docs/DESIGN.md camera model)', () => {
  it('recovers a known gain sequence from a constant card seen through it', () => {
    const trueGain = [1, 1.2, 0.8, 1.1, 0.95];
    const card = 0.3;
    const g = exposureGains(trueGain.map((k) => k * card));
    const medianGain = median(trueGain);
    trueGain.forEach((k, i) => expect(g.gains[i]).toBeCloseTo(k / medianGain, 12));
    expect(g.medianReference).toBeCloseTo(card * medianGain, 12);
    expect(g.minGain).toBeCloseTo(0.8 / medianGain, 12);
    expect(g.maxGain).toBeCloseTo(1.2 / medianGain, 12);
    expect(g.invalidFrames).toBe(0);
  });

  it('subtracts the dark level first when given (model: both scale with the gain)', () => {
    const gain = [1, 2, 0.5];
    const dark = gain.map((k) => 0.01 * k);
    const ref = gain.map((k) => 0.21 * k);
    // median(gain) = 1, so the gains come back unchanged
    expect(Array.from(exposureGains(ref, dark).gains)).toEqual(gain.map((x) => expect.closeTo(x, 12)));
  });

  it('marks frames whose reference is not above the dark level as NaN and counts them', () => {
    const g = exposureGains([0.2, 0, NaN, 0.4]);
    expect(g.invalidFrames).toBe(2);
    expect(g.gains[1]).toBeNaN();
    expect(g.gains[2]).toBeNaN();
    expect(g.gains[0]).toBeCloseTo(0.2 / 0.3, 12);
  });

  it('throws BAD_REGION when the reference is never usable', () => {
    let caught: unknown;
    try { exposureGains([0, 0, 0]); } catch (e) { caught = e; }
    expect(caught).toBeInstanceOf(KerrError);
    expect((caught as KerrError).code).toBe('BAD_REGION');
    expect((caught as KerrError).path).toBe('--reference-roi');
  });
});

describe('correction (roi − dark)/gain', () => {
  it('applies to one value and to series, with optional dark and gains', () => {
    expect(correctExposure(0.5, 0.1, 2)).toBeCloseTo(0.2, 12);
    expect(Array.from(correctSeries([1, 2], [0.5, 0.5], [2, 0.5]))).toEqual([0.25, 3]);
    expect(Array.from(correctSeries([1, 2]))).toEqual([1, 2]);
    const input = [1, 2];
    correctSeries(input, [1, 1]);
    expect(input).toEqual([1, 2]);
  });
});
