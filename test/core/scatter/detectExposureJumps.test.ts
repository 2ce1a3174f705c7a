import { describe, expect, it } from 'vitest';
import { detectExposureJumps } from '../../../src/core/scatter/detectExposureJumps.js';
import { normalSource } from './syntheticRun.js';

const n = 300;
const noise = normalSource(61);
const base = () => Float64Array.from({ length: n }, () => 0.05 + 0.0003 * noise());

describe('detectExposureJumps', () => {
  it('finds a persistent 15 % step at the right frame', () => {
    const level = base();
    for (let f = 180; f < n; f++) level[f]! *= 1.15;
    const jumps = detectExposureJumps({ level, skip: new Uint8Array(n) });
    expect(jumps.length).toBe(1);
    expect(jumps[0]!.frameIndex).toBe(180);
    expect(jumps[0]!.relStep).toBeCloseTo(0.15, 1);
    expect(jumps[0]!.size).toBeGreaterThan(8);
  });

  it('merges a step spread over two frames (rolling shutter) into one jump', () => {
    const level = base();
    level[120]! *= 0.93;
    for (let f = 121; f < n; f++) level[f]! *= 0.86;
    const jumps = detectExposureJumps({ level, skip: new Uint8Array(n) });
    expect(jumps.length).toBe(1);
    expect([120, 121]).toContain(jumps[0]!.frameIndex);
    expect(jumps[0]!.size).toBeLessThan(0);
  });

  it('ignores a one-frame spike, a slow ramp and skipped frames', () => {
    const spike = base();
    spike[100]! *= 1.5;
    expect(detectExposureJumps({ level: spike, skip: new Uint8Array(n) })).toEqual([]);
    const slow = Float64Array.from(base(), (v, f) => v * (1 + (0.3 * f) / n));
    expect(detectExposureJumps({ level: slow, skip: new Uint8Array(n) })).toEqual([]);
    const skipped = base();
    for (let f = 50; f < 53; f++) skipped[f] = 0.2; // a 3-frame flash the caller marked
    const skip = new Uint8Array(n);
    skip[50] = skip[51] = skip[52] = 1;
    expect(detectExposureJumps({ level: skipped, skip })).toEqual([]);
  });
});
