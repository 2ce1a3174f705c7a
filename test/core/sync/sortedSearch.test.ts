import { describe, expect, it } from 'vitest';
import { lowerBound, segmentIndex, upperBound } from '../../../src/core/sync/sortedSearch.js';
import { decimateCurve } from '../../../src/core/sync/decimateCurve.js';
import { medianStep } from '../../../src/core/sync/medianStep.js';

// Hand-worked cases (the usual lower/upper bound definitions, as in C++'s std::lower_bound: common practice).
describe('sortedSearch', () => {
  const t = Float64Array.of(0, 1, 1, 2);
  it('lowerBound: first index with t ≥ x', () => {
    expect([-1, 0, 0.5, 1, 1.5, 2, 3].map((x) => lowerBound(t, x))).toEqual([0, 0, 1, 1, 3, 3, 4]);
  });
  it('upperBound: first index with t > x', () => {
    expect([-1, 0, 0.5, 1, 1.5, 2, 3].map((x) => upperBound(t, x))).toEqual([0, 1, 1, 3, 3, 4, 4]);
  });
  it('segmentIndex: segment holding x, clamped to the ends', () => {
    const s = Float64Array.of(0, 1, 2, 3);
    expect([-5, 0, 0.5, 1, 2.5, 3, 9].map((x) => segmentIndex(s, x))).toEqual([0, 0, 0, 1, 2, 2, 2]);
  });
});

describe('decimateCurve and medianStep (hand-worked)', () => {
  it('keeps the highest finite point of each bin', () => {
    const out = decimateCurve(Float64Array.of(0, 1, 2, 3, 4, 5), Float64Array.of(0.1, 0.5, Number.NaN, 0.2, 0.9, 0.3), 2);
    // finite points 0,1,3,4,5 → bins [0,1] and [3,4,5]
    expect(out).toEqual({ offsetS: [1, 4], score: [0.5, 0.9] });
  });
  it('median of the positive steps, ignoring repeats', () => {
    expect(medianStep(Float64Array.of(0, 0.1, 0.1, 0.2, 0.5))).toBeCloseTo(0.1, 15);
  });
});
