import { describe, expect, it } from 'vitest';
import { runningMedian } from '../../../src/core/signal/runningMedian.js';

// Expected values worked by hand from the definition of a running median (Tukey 1977, ch. 7).
describe('runningMedian', () => {
  it('removes a spike no longer than the half-width and keeps a step', () => {
    const x = Float64Array.of(1, 1, 1, 9, 9, 1, 1, 1, 1, 5, 5, 5, 5, 5);
    const m = runningMedian(x, new Uint8Array(x.length).fill(1), 2);
    // the two-frame spike at 3–4 is gone; the step to 5 at frame 9 stays where it is
    // (frame 1's window {1, 1, 1, 9} has an even count: the mean of the middle two)
    expect(Array.from(m)).toEqual([1, 1, 1, 1, 1, 1, 1, 1, 1, 5, 5, 5, 5, 5]);
  });

  it('skips excluded frames instead of bridging them, and gives NaN there', () => {
    const x = Float64Array.of(1, 100, 2, 3, 4);
    const m = runningMedian(x, Uint8Array.of(1, 0, 1, 1, 1), 1);
    // included: 1, 2, 3, 4 → windows {1,2}, {1,2,3}, {2,3,4}, {3,4}
    expect(m[1]).toBeNaN();
    expect(Array.from(m).filter((v) => !Number.isNaN(v))).toEqual([1.5, 2, 3, 3.5]);
  });

  it('follows a ramp exactly', () => {
    const x = Float64Array.from({ length: 20 }, (_, i) => 0.5 * i);
    const m = runningMedian(x, new Uint8Array(20).fill(1), 3);
    for (let i = 3; i < 17; i++) expect(m[i]).toBe(x[i]);
  });

  it('rejects mismatched lengths', () => {
    expect(() => runningMedian(new Float64Array(3), new Uint8Array(2), 1)).toThrow(/one entry per frame/);
  });
});
