import { describe, expect, it } from 'vitest';
import { exposureDrift } from '../../../src/core/scatter/exposureDrift.js';
import { normalSource } from './syntheticRun.js';

const n = 600;
const normal = normalSource(51);
const ramp = Float64Array.from({ length: n }, (_, f) => Math.sin((Math.PI * f) / n) ** 2);
const all = new Uint8Array(n).fill(1);

describe('exposureDrift', () => {
  it('flags a background drifting by ±20 %', () => {
    const level = Float64Array.from({ length: n }, (_, f) => 0.05 * (1 + 0.2 * Math.sin((2 * Math.PI * f) / 300)) + 0.0002 * normal());
    const r = exposureDrift({ level, modulation: ramp, include: all });
    expect(r.judged).toBe(true);
    expect(r.drifting).toBe(true);
    expect(r.ratio).toBeGreaterThan(1.3);
  });

  it('does not flag light that follows the drive upwards (scatter from the opening shutter)', () => {
    const level = Float64Array.from(ramp, (m) => 0.05 + 0.02 * m + 0.0002 * normal());
    const r = exposureDrift({ level, modulation: ramp, include: all });
    expect(r.driveSlope).toBeCloseTo(0.02, 3);
    expect(r.drifting).toBe(false);
    expect(r.ratio).toBeLessThan(1.03);
  });

  it('flags a camera that darkens the background as the spot brightens (automatic exposure)', () => {
    const level = Float64Array.from(ramp, (m) => 0.05 * (1 - 0.25 * m) + 0.0002 * normal());
    const r = exposureDrift({ level, modulation: ramp, include: all });
    expect(r.driveSlope).toBe(0);
    expect(r.drifting).toBe(true);
  });

  it('does not judge a background too dark to measure, and skips excluded frames', () => {
    const dark = Float64Array.from({ length: n }, () => 0.0005 + 0.0001 * normal());
    expect(exposureDrift({ level: dark, modulation: ramp, include: all }).judged).toBe(false);
    const level = new Float64Array(n).fill(0.05);
    level[100] = 0.5; level[101] = 0.5; level[102] = 0.5; // a spark, excluded by the caller
    const include = Uint8Array.from(all);
    include[100] = 0; include[101] = 0; include[102] = 0;
    const r = exposureDrift({ level, modulation: ramp, include });
    expect(r.ratio).toBeCloseTo(1, 12);
    expect(Number.isNaN(r.driveFreeLevel[100]!)).toBe(true);
  });
});
