import { linearRegression } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { linearisedKerr } from '../../../src/core/fit/linearisedKerr.js';
import { crossedTransmission, halfWaveVoltageV, retardanceRad } from '../../../src/core/physics/kerr.js';
import { KerrError } from '../../../src/errors.js';
import { seededNormal } from '../../helpers/random.js';
import { OUTSIDE } from '../../setup/outsideSources.js';

// Nitrobenzene B = 2.4e-12 m/V² (J. Lux, "Electro-optical theory" web notes: 2.4e-10 cm/V²) in a
// cell of our own: gap 5 mm, length 5 cm → V_π = d/√(2BL) ≈ 10206 V.
const kerrConstant = 2.4e-12;
const gapM = 0.005;
const lengthM = 0.05;
const transmissionAt = (v: number) => crossedTransmission(Math.PI / 4, retardanceRad(kerrConstant, lengthM, v, gapM));
const grid = Array.from({ length: 20 }, (_, i) => 500 * (i + 1)); // 0.5 … 10 kV

describe('linearisedKerr (δ = 2·arcsin√T, V² = d²/(2πBL)·δ)', () => {
  it('recovers B from exact transmissions, with zero intercept, and counts the points dropped at the ends', () => {
    const result = linearisedKerr({ voltageV: grid, transmission: grid.map(transmissionAt), gapM, lengthM });
    expect(result.kerrConstant.value / kerrConstant).toBeCloseTo(1, 10);
    expect(result.kerrConstant.unit).toBe('m/V^2');
    expect(result.throughOrigin.kerrConstant.value / kerrConstant).toBeCloseTo(1, 10);
    expect(Math.abs(result.intercept.value)).toBeLessThan(1e-4); // V², against V² up to 1e8
    expect(result.r2).toBeCloseTo(1, 12);
    // T ≤ 0.02 ⇔ V ≤ V_π·√(2·asin√0.02/π) ≈ 3068 V: the six points 0.5…3 kV;
    // T ≥ 0.98 ⇔ V ≥ V_π·√(1 − 2·asin√0.02/π) ≈ 9735 V: the point at 10 kV.
    expect(halfWaveVoltageV(kerrConstant, lengthM, gapM)).toBeCloseTo(10206, 0);
    expect(result.droppedByReason).toEqual({ outsideRange: 7, nonFinite: 0 });
    expect(result.dropped).toBe(7);
    expect(result.points).toBe(13);
  });

  it('with noisy transmissions: slope equals simple-statistics’ linearRegression of V² on δ; B and σ_B follow by error propagation', { tags: [OUTSIDE.simpleStatistics] }, () => {
    const normal = seededNormal(5);
    const voltages = Array.from({ length: 60 }, (_, i) => 3200 + i * 100);
    const transmission = voltages.map((v) => transmissionAt(v) + 0.004 * normal());
    const result = linearisedKerr({ voltageV: voltages, transmission, gapM, lengthM });
    const pairs: [number, number][] = [];
    transmission.forEach((t, i) => {
      if (t > 0.02 && t < 0.98) pairs.push([2 * Math.asin(Math.sqrt(t)), voltages[i]! ** 2]);
    });
    expect(result.points).toBe(pairs.length);
    const reference = linearRegression(pairs);
    expect(result.slopeV2PerRad.value / reference.m).toBeCloseTo(1, 10);
    expect(result.intercept.value - reference.b).toBeCloseTo(0, 0);
    // slope standard error by the hand formula √(RSS/(n−2)/Σ(δ−δ̄)²)
    const n = pairs.length;
    const meanD = pairs.reduce((s, [d]) => s + d, 0) / n;
    const sdd = pairs.reduce((s, [d]) => s + (d - meanD) ** 2, 0);
    const rss = pairs.reduce((s, [d, v2]) => s + (v2 - reference.b - reference.m * d) ** 2, 0);
    const slopeStdErr = Math.sqrt(rss / (n - 2) / sdd);
    expect(result.slopeV2PerRad.stdErr! / slopeStdErr).toBeCloseTo(1, 8);
    // B = d²/(2πLs), σ_B/B = σ_s/s
    expect(result.kerrConstant.value).toBeCloseTo((gapM * gapM) / (2 * Math.PI * lengthM * reference.m), 20);
    expect(result.kerrConstant.stdErr! / result.kerrConstant.value).toBeCloseTo(slopeStdErr / reference.m, 10);
    // and B lands near the truth within a few of its own standard errors
    expect(Math.abs(result.kerrConstant.value - kerrConstant)).toBeLessThan(4 * result.kerrConstant.stdErr!);
  });

  it('a static offset shows up in the intercept and biases only the through-origin slope', () => {
    // Transmission computed with 0.3 rad of extra static retardance: δ_measured = δ_Kerr + 0.3.
    const voltages = Array.from({ length: 30 }, (_, i) => 4000 + i * 180);
    const transmission = voltages.map((v) => Math.sin((retardanceRad(kerrConstant, lengthM, v, gapM) + 0.3) / 2) ** 2);
    const result = linearisedKerr({ voltageV: voltages, transmission, gapM, lengthM });
    expect(result.kerrConstant.value / kerrConstant).toBeCloseTo(1, 8);
    const slope = result.slopeV2PerRad.value;
    expect(result.intercept.value / (-0.3 * slope)).toBeCloseTo(1, 8);
    expect(Math.abs(result.throughOrigin.kerrConstant.value / kerrConstant - 1)).toBeGreaterThan(0.02);
  });

  it('drops non-finite points and counts them; custom minT/maxT change what is dropped', () => {
    const transmission = grid.map(transmissionAt);
    transmission[10] = Number.NaN;
    const result = linearisedKerr({ voltageV: grid, transmission, gapM, lengthM, minT: 0, maxT: 1 });
    expect(result.droppedByReason).toEqual({ outsideRange: 0, nonFinite: 1 });
    expect(result.points).toBe(19);
    expect(result.kerrConstant.value / kerrConstant).toBeCloseTo(1, 9);
  });

  it('rejects bad geometry, bad limits and too few usable points', () => {
    const transmission = grid.map(transmissionAt);
    expect(() => linearisedKerr({ voltageV: grid, transmission, gapM: -0.005, lengthM })).toThrow(/gapM/);
    expect(() => linearisedKerr({ voltageV: grid, transmission, gapM, lengthM: 0 })).toThrow(/lengthM/);
    expect(() => linearisedKerr({ voltageV: grid, transmission, gapM, lengthM, minT: 0.9, maxT: 0.1 })).toThrow(KerrError);
    expect(() => linearisedKerr({ voltageV: grid, transmission: transmission.slice(1), gapM, lengthM })).toThrow(/transmission/);
    let caught: unknown;
    try {
      linearisedKerr({ voltageV: [1000, 2000, 3000], transmission: [0.001, 0.01, 0.015], gapM, lengthM });
    } catch (e) {
      caught = e;
    }
    expect((caught as KerrError).code).toBe('NOT_IDENTIFIABLE');
  });
});
