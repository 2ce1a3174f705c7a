import { describe, expect, it } from 'vitest';
import { frameTimes } from '../../src/sim/frameTimes.js';
import { makeRng } from '../../src/sim/rng.js';

describe('frame times', () => {
  it('spaces a constant rate exactly: 30 fps for 2 s gives 60 frames at k/30', () => {
    const c = frameTimes({ kind: 'constant', frameRateHz: 30, rational: [30, 1] }, 2, makeRng(1));
    expect(c.timesS.length).toBe(60);
    expect(c.timesS[59]).toBeCloseTo(59 / 30, 12);
    expect(c.ticks).toBeNull();
  });

  it('keeps 29.97 fps on k·100/2997', () => {
    const c = frameTimes({ kind: 'constant', frameRateHz: 29.97, rational: [2997, 100] }, 1, makeRng(1));
    expect(c.timesS.length).toBe(30);
    expect(c.timesS[29]).toBeCloseTo((29 * 100) / 2997, 12);
  });

  it('draws variable intervals of whole ticks within the limits, with the given weights', () => {
    const c = frameTimes({ kind: 'variable', tickHz: 60, minTicks: 1, maxTicks: 3, tickWeights: [1, 2, 1] }, 60, makeRng(4));
    const counts = [0, 0, 0, 0];
    let worstTimeErrorS = 0;
    for (let k = 1; k < c.ticks!.length; k++) {
      const step = c.ticks![k]! - c.ticks![k - 1]!;
      counts[step] = (counts[step] ?? 0) + 1;
      worstTimeErrorS = Math.max(worstTimeErrorS, Math.abs(c.timesS[k]! - c.ticks![k]! / 60));
    }
    expect(counts.length).toBe(4); // no interval outside 1..3 ticks
    expect(counts[0]).toBe(0);
    expect(worstTimeErrorS).toBeLessThan(1e-12);
    const n = c.ticks!.length - 1;
    expect(counts[2]! / n).toBeCloseTo(0.5, 1);
    expect(c.timesS[c.timesS.length - 1]!).toBeLessThan(60);
    // mean interval 2 ticks → about 30 frames per second
    expect(n / 60).toBeCloseTo(30, 0);
  });

  it('never draws a zero-weight interval', () => {
    const c = frameTimes({ kind: 'variable', tickHz: 60, minTicks: 1, maxTicks: 3, tickWeights: [0, 1, 0] }, 5, makeRng(2));
    const steps = new Set<number>();
    for (let k = 1; k < c.ticks!.length; k++) steps.add(c.ticks![k]! - c.ticks![k - 1]!);
    expect([...steps]).toEqual([2]);
  });
});
