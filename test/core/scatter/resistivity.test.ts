import { describe, expect, it } from 'vitest';
import { liquidResistivity } from '../../../src/core/scatter/resistivity.js';
import { isKerrError } from '../../../src/errors.js';
import { normalSource } from './syntheticRun.js';

// Cell: electrodes 50 mm long, 10 mm high, 5 mm gap → A = 5e-4 m², d = 5e-3 m.
const cell = { lengthM: 0.05, electrodeHeightM: 0.01, gapM: 0.005 };

describe('liquidResistivity', () => {
  it('matches the hand calculation from the formula ρ = V·A/(I·d) on a planted current', () => {
    // planted: ρ = 2e8 ohm·m → R = ρ·d/A = 2e8·5e-3/5e-4 = 2e9 ohm; I = V/R + 3 nA meter offset
    const v = Float64Array.from({ length: 200 }, (_, k) => 100 * k);
    const i = Float64Array.from(v, (x) => x / 2e9 + 3e-9);
    const r = liquidResistivity({ voltageV: v, currentA: i, ...cell });
    const vHigh = 19900, iHigh = vHigh / 2e9;
    const handRho = (vHigh * 5e-4) / (iHigh * 5e-3); // ρ = V·A/(I·d)
    expect(r.readable).toBe(true);
    expect(r.resistivity.value).toBeCloseTo(handRho, -2);
    expect(Math.abs(r.resistivity.value / 2e8 - 1)).toBeLessThan(1e-9);
    expect(r.resistivity.unit).toBe('ohm m');
    expect(r.offsetA).toBeCloseTo(3e-9, 15);
    // Joule power at the highest voltage: P = V²/R = 19900²/2e9 = 0.198 W
    expect(r.joulePower.value).toBeCloseTo((19900 * 19900) / 2e9, 9);
    expect(r.joulePower.unit).toBe('W');
  });

  it('gives a standard error that follows the current noise', () => {
    const normal = normalSource(81);
    const v = Float64Array.from({ length: 400 }, (_, k) => 50 * k);
    const i = Float64Array.from(v, (x) => x / 1e9 + 2e-8 * normal());
    const r = liquidResistivity({ voltageV: v, currentA: i, ...cell });
    expect(r.readable).toBe(true);
    expect(Math.abs(r.resistivity.value - 1e8)).toBeLessThan(3 * r.resistivity.stdErr!);
    expect(r.resistivity.stdErr! / r.resistivity.value).toBeCloseTo(r.conductanceStdErrS / r.conductanceS, 12);
  });

  it('fits through the origin when asked', () => {
    const v = Float64Array.of(1000, 2000, 3000, 4000);
    const i = Float64Array.of(1e-6, 2e-6, 3e-6, 4e-6);
    const r = liquidResistivity({ voltageV: v, currentA: i, ...cell, withOffset: false });
    expect(r.conductanceS).toBeCloseTo(1e-9, 20);
    expect(r.resistivity.value).toBeCloseTo(1e9 * 5e-4 / 5e-3, 0);
  });

  it('says the current is too small to read when it stays within the log resolution', () => {
    // a meter reading in 1 µA steps, true current below 0.1 µA
    const normal = normalSource(82);
    const v = Float64Array.from({ length: 300 }, (_, k) => 40 * k);
    const i = Float64Array.from(v, (x) => Math.round((x / 2e11 + 0.4e-6 * normal()) / 1e-6) * 1e-6);
    const r = liquidResistivity({ voltageV: v, currentA: i, ...cell });
    expect(r.readable).toBe(false);
    expect(r.note).toMatch(/too small to read/);
    expect(r.note).toMatch(/at least/);
    expect(r.resistivity.stdErr).toBeUndefined();
    expect(r.resistivity.value).toBeGreaterThan(0);
    expect(r.resolutionA).toBeCloseTo(1e-6, 12);
  });

  it('skips empty current cells and refuses a missing electrode height', () => {
    const v = Float64Array.of(0, 1000, 2000, 3000, 4000);
    const i = Float64Array.of(0, NaN, 2e-6, 3e-6, 4e-6);
    expect(liquidResistivity({ voltageV: v, currentA: i, ...cell }).rows).toBe(4);
    let caught: unknown;
    try { liquidResistivity({ voltageV: v, currentA: i, ...cell, electrodeHeightM: 0 }); } catch (e) { caught = e; }
    expect(isKerrError(caught) && caught.path).toBe('electrodeHeight');
    expect(isKerrError(caught) && caught.inputs).toEqual(['electrodeHeight']);
  });
});
