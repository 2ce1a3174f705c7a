import { describe, expect, it } from 'vitest';
import { floorFlicker } from '../../../src/core/scatter/floorFlicker.js';
import { normalSource } from './syntheticRun.js';

describe('floorFlicker', () => {
  it('measures a planted 10 % flicker of the zero-field light within its standard error', () => {
    // zero-field frames (m < 0.02) carry floor·(1 + 0.1·ε) plus the small modulated part amp·m
    const n = 2000;
    const normal = normalSource(41);
    const floor = 0.006, amp = 0.5;
    const modulation = Float64Array.from({ length: n }, (_, f) => (f % 2 === 0 ? 0.015 * ((f % 7) / 7) : 0.5));
    const intensity = Float64Array.from(modulation, (m) => floor * (1 + 0.1 * normal()) + amp * m);
    const r = floorFlicker({ intensity, modulation, amplitude: amp, include: new Uint8Array(n).fill(1) })!;
    expect(r.frames).toBe(1000);
    expect(r.meanLevel).toBeCloseTo(floor, 3);
    // large-sample standard error of a standard deviation: s/√(2(n−1)) (Ahn & Fessler 2003)
    expect(r.flicker.stdErr).toBeCloseTo(r.flicker.value / Math.sqrt(2 * 999), 12);
    expect(Math.abs(r.flicker.value - 0.1)).toBeLessThan(3 * r.flicker.stdErr!);
  });

  it('leaves out excluded frames (events)', () => {
    const n = 100;
    const modulation = new Float64Array(n);
    const intensity = new Float64Array(n).fill(0.01);
    for (let f = 0; f < n; f++) intensity[f]! += f % 2 ? 0.0005 : -0.0005;
    intensity[50] = 0.5; // a particle spike
    const include = new Uint8Array(n).fill(1);
    const withSpike = floorFlicker({ intensity, modulation, amplitude: 0.5, include })!.flicker.value;
    include[50] = 0;
    const clean = floorFlicker({ intensity, modulation, amplitude: 0.5, include })!.flicker.value;
    expect(withSpike).toBeGreaterThan(1);
    expect(clean).toBeCloseTo(0.05, 2);
  });

  it('returns null with fewer than 5 zero-field frames or a floor at or below zero', () => {
    const m = Float64Array.of(0, 0, 0, 0.5, 0.5, 0.5);
    expect(floorFlicker({ intensity: new Float64Array(6).fill(0.01), modulation: m, amplitude: 1, include: new Uint8Array(6).fill(1) })).toBeNull();
    const z = new Float64Array(10);
    expect(floorFlicker({ intensity: Float64Array.from(z, (_, i) => (i % 2 ? 0.001 : -0.002)), modulation: z, amplitude: 1, include: new Uint8Array(10).fill(1) })).toBeNull();
  });
});
