import { describe, expect, it } from 'vitest';
import { linearisedCrossCheck, type LinearisedCrossCheckInput } from '../../../src/core/fit/linearisedCrossCheck.js';
import { crossedTransmission, DEG, halfWaveVoltageV, retardanceRad } from '../../../src/core/physics/kerr.js';
import { KerrError } from '../../../src/errors.js';

// Nitrobenzene B = 2.4e-12 m/V² (J. Lux, "Electro-optical theory" web notes: 2.4e-10 cm/V²;
// docs/references.md) in a cell of our own: gap 5 mm, effective length 50 mm, so
// V_π = d/√(2·B·L) ≈ 10206 V.
const B = 2.4e-12, L = 0.05, D = 0.005;
const VPI = halfWaveVoltageV(B, L, D);
const FLOOR = 0.03, AMP = 0.4;
const VOLTS = [0, 2000, 3000, 4000, 5000, 6000, 7000, 8000, 9000, 10000, 11000, 12000];
/** Jones calculus, crossed polarisers: I = I_floor + I_amp·sin²(2θ)·sin²(δ/2) (DESIGN.md). */
const intensityAt = (v: number, b = B, angleDeg = 45): number => FLOOR + AMP * crossedTransmission(angleDeg * DEG, retardanceRad(b, L, v, D));

function input(over: Partial<LinearisedCrossCheckInput> = {}): LinearisedCrossCheckInput {
  return {
    voltageV: VOLTS,
    intensity: VOLTS.map((v) => intensityAt(v)),
    floorLevel: FLOOR,
    amplitude: AMP,
    polariserAngleDeg: 45,
    halfWaveVoltageV: VPI,
    gapM: D,
    effectiveLengthM: L,
    fitKerrConstant: { value: B, stdErr: 0.01 * B, unit: 'm/V^2' },
    ...over,
  };
}

describe('linearisedCrossCheck (first branch, T = (I − I_floor)/(I_amp·sin²2θ), V² against 2·arcsin√T)', () => {
  it('recovers the B that made noise-free points and agrees with a fit of that B', () => {
    expect(VPI).toBeCloseTo(10206, 0);
    const check = linearisedCrossCheck(input())!;
    expect(check.kerrConstant.value / B).toBeCloseTo(1, 8);
    expect(check.kerrConstant.unit).toBe('m/V^2');
    // Below V_π with 0.02 < T < 0.98: 4 kV (T ≈ 0.057) … 9 kV (T ≈ 0.88). 0, 2 and 3 kV are too
    // dark (T ≈ 0.018 at 3 kV); 10 kV is too close to full (T ≈ 0.996); 11 and 12 kV are past V_π.
    expect(check.points).toBe(6);
    expect(check.agreesWithFit).toBe(true);
    expect(Math.abs(check.zScore)).toBeLessThan(1e-3);
  });

  it('leaves out points at or past V_π: the second branch would otherwise read as a smaller retardance', () => {
    // A V_π guess far above the sweep lets 11 and 12 kV in; their T (≈ 0.93, 0.68) maps back onto the first
    // branch and pulls B down.
    const open = linearisedCrossCheck(input({ halfWaveVoltageV: 1e6 }))!;
    expect(open.points).toBe(8);
    expect(open.kerrConstant.value).toBeLessThan(0.95 * B);
  });

  it('divides by sin²(2θ): a polariser at 30° (sin²60° = 0.75) still gives the true B', () => {
    const intensity = VOLTS.map((v) => intensityAt(v, B, 30));
    const check = linearisedCrossCheck(input({ intensity, polariserAngleDeg: 30 }))!;
    expect(check.kerrConstant.value / B).toBeCloseTo(1, 8);
    // The same points read as if at 45° give a different B.
    const wrong = linearisedCrossCheck(input({ intensity, polariserAngleDeg: 45 }))!;
    expect(Math.abs(wrong.kerrConstant.value / B - 1)).toBeGreaterThan(0.05);
  });

  it('leaves out the points the fit flagged as outliers', () => {
    const intensity = VOLTS.map((v) => intensityAt(v));
    intensity[6] = intensity[6]! + 0.15; // a spark at 7 kV
    const spoilt = linearisedCrossCheck(input({ intensity }))!;
    expect(Math.abs(spoilt.kerrConstant.value / B - 1)).toBeGreaterThan(0.01);
    const outliers = new Uint8Array(VOLTS.length);
    outliers[6] = 1;
    const cleaned = linearisedCrossCheck(input({ intensity, outliers }))!;
    expect(cleaned.points).toBe(5);
    expect(cleaned.kerrConstant.value / B).toBeCloseTo(1, 8);
  });

  it('flags points of a 10 % larger B against the fit of the true B (z = ΔB/√(σ_fit² + σ_lin²))', () => {
    const intensity = VOLTS.map((v) => intensityAt(v, 1.1 * B));
    const check = linearisedCrossCheck(input({ intensity }))!;
    expect(check.kerrConstant.value / B).toBeGreaterThan(1.05);
    expect(check.agreesWithFit).toBe(false);
    const sigma = Math.hypot(0.01 * B, check.kerrConstant.stdErr ?? 0);
    expect(check.zScore).toBeCloseTo((check.kerrConstant.value - B) / sigma, 10);
    expect(check.zScore).toBeGreaterThan(3);
  });

  it('returns null when no reduction can be made', () => {
    // fewer than 5 first-branch points
    const few = [0, 4000, 8000, 11000, 12000, 13000, 14000];
    expect(linearisedCrossCheck(input({ voltageV: few, intensity: few.map((v) => intensityAt(v)) }))).toBeNull();
    // enough points, but all darker than T = 0.02 (linearisedKerr: not identifiable)
    const dim = [100, 200, 300, 400, 500, 600];
    expect(linearisedCrossCheck(input({ voltageV: dim, intensity: dim.map((v) => intensityAt(v)) }))).toBeNull();
    // no amplitude to normalise by, polariser along the field, no V_π
    expect(linearisedCrossCheck(input({ amplitude: 0 }))).toBeNull();
    expect(linearisedCrossCheck(input({ amplitude: Number.NaN }))).toBeNull();
    expect(linearisedCrossCheck(input({ polariserAngleDeg: 0 }))).toBeNull();
    expect(linearisedCrossCheck(input({ halfWaveVoltageV: Number.NaN }))).toBeNull();
  });

  it('does not change its inputs', () => {
    const intensity = Float64Array.from(VOLTS, (v) => intensityAt(v));
    const copy = Float64Array.from(intensity);
    linearisedCrossCheck(input({ intensity }));
    expect(intensity).toEqual(copy);
  });

  it('refuses intensities or outlier flags that do not match the voltages, naming the field', () => {
    expect(() => linearisedCrossCheck(input({ intensity: [1, 2, 3] }))).toThrow(KerrError);
    expect(() => linearisedCrossCheck(input({ intensity: [1, 2, 3] }))).toThrow(/intensity/);
    expect(() => linearisedCrossCheck(input({ outliers: new Uint8Array(2) }))).toThrow(/outliers/);
    expect(() => linearisedCrossCheck(input({ gapM: -0.005 }))).toThrow(/gap/);
  });
});
