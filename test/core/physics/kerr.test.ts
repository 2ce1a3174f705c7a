import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  DEG,
  cmPerV2ToMPerV2,
  crossedTransmission,
  halfWaveFieldVPerM,
  halfWaveVoltageV,
  jonesTransmission,
  kerrConstantFromHalfWave,
  mPerV2ToCmPerV2,
  quarterWaveFieldVPerM,
  retardanceRad,
} from '../../../src/core/physics/kerr.js';
import { OUTSIDE } from '../../setup/outsideSources.js';

describe('Kerr relations', { tags: [OUTSIDE.workedExamples] }, () => {
  it('half-wave field, worked example: nitrobenzene K = 2.4e-10 cm/V² at 30 kV/cm needs L = 1/(2KE²) ≈ 2.3 cm (J. Lux, "Electro-optical theory" web notes)', () => {
    const kerr = cmPerV2ToMPerV2(2.4e-10); // m/V²
    const fieldVPerM = 30e3 / 1e-2; // 30 kV/cm
    const lengthM = 1 / (2 * kerr * fieldVPerM ** 2);
    expect(lengthM * 100).toBeCloseTo(2.3, 1);
    expect(halfWaveFieldVPerM(kerr, lengthM) / fieldVPerM).toBeCloseTo(1, 12);
    // the same cell with a 1 cm gap: V_π = E·d = 30 kV and δ(V_π) = π
    expect(halfWaveVoltageV(kerr, lengthM, 0.01)).toBeCloseTo(30e3, 6);
    expect(retardanceRad(kerr, lengthM, 30e3, 0.01)).toBeCloseTo(Math.PI, 12);
  });

  it('quarter-wave field problem: B = 2.2e-10 cm/V², l = 10 cm ⇒ E = 1/(2√(B·l)) ≈ 1.1e4 V/cm (Irodov, Problems in General Physics, answer recomputed)', () => {
    const fieldVPerM = quarterWaveFieldVPerM(cmPerV2ToMPerV2(2.2e-10), 0.1);
    const fieldVPerCm = 1 / (2 * Math.sqrt(2.2e-10 * 10)); // the formula in Irodov's cm units: 10 660 V/cm
    expect(fieldVPerM / 100 / fieldVPerCm).toBeCloseTo(1, 12);
    expect(Math.round(fieldVPerM / 100 / 1e3) / 10).toBe(1.1); // 1.1e4 to two figures
    // at that field the retardance is a quarter wave, π/2
    expect(retardanceRad(cmPerV2ToMPerV2(2.2e-10), 0.1, fieldVPerM * 0.01, 0.01)).toBeCloseTo(Math.PI / 2, 12);
    // the quarter-wave voltage is V_π/√2
    const vPi = halfWaveVoltageV(2.2e-12, 0.1, 0.01);
    expect(fieldVPerM * 0.01).toBeCloseTo(vPi / Math.SQRT2, 6);
  });

  it('halfWaveVoltageV and kerrConstantFromHalfWave are inverses; the doc example 2.4e-12 m/V², 5 cm, 5 mm gives ≈ 10206 V', () => {
    const vPi = halfWaveVoltageV(2.4e-12, 0.05, 0.005);
    expect(vPi).toBeCloseTo(10206, 0);
    expect(kerrConstantFromHalfWave(vPi, 0.05, 0.005) / 2.4e-12).toBeCloseTo(1, 12);
  });

  it('cm/V² ↔ m/V²: tables’ 2.4e-10 cm/V² is 2.4e-12 m/V² (SI), and back', () => {
    expect(cmPerV2ToMPerV2(2.4e-10)).toBeCloseTo(2.4e-12, 24);
    expect(mPerV2ToCmPerV2(2.4e-12)).toBeCloseTo(2.4e-10, 22);
    expect(mPerV2ToCmPerV2(cmPerV2ToMPerV2(1.37e-10))).toBeCloseTo(1.37e-10, 22);
  });
});

describe('jonesTransmission', { tags: [OUTSIDE.workedExamples] }, () => {
  it('Malus’s law at δ = 0: T = cos²θ (any optics text)', () => {
    for (const angleDeg of [0, 15, 30, 45, 60, 90, 135]) {
      expect(jonesTransmission(angleDeg * DEG + 0.2, 0.2, 0)).toBeCloseTo(Math.cos(angleDeg * DEG) ** 2, 14);
    }
  });

  it('crossed at 45° gives sin²(δ/2) (0 closed, 1 at δ = π); parallel at 45° gives cos²(δ/2)', () => {
    for (const delta of [0, 0.3, Math.PI / 2, Math.PI, 4]) {
      expect(jonesTransmission(45 * DEG, -45 * DEG, delta)).toBeCloseTo(Math.sin(delta / 2) ** 2, 14);
      expect(crossedTransmission(45 * DEG, delta)).toBeCloseTo(Math.sin(delta / 2) ** 2, 14);
      expect(jonesTransmission(45 * DEG, 45 * DEG, delta)).toBeCloseTo(Math.cos(delta / 2) ** 2, 14);
    }
    expect(jonesTransmission(45 * DEG, -45 * DEG, Math.PI)).toBeCloseTo(1, 14);
  });

  it('equals |A(β)·W(δ)·P(α)·e_α|² from explicit 2×2 complex Jones matrices (property test over angles and retardances)', () => {
    type C = [number, number]; // re, im
    type M = [[C, C], [C, C]];
    const mul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
    const add = (a: C, b: C): C => [a[0] + b[0], a[1] + b[1]];
    const matmul = (a: M, b: M): M => [
      [add(mul(a[0][0], b[0][0]), mul(a[0][1], b[1][0])), add(mul(a[0][0], b[0][1]), mul(a[0][1], b[1][1]))],
      [add(mul(a[1][0], b[0][0]), mul(a[1][1], b[1][0])), add(mul(a[1][0], b[0][1]), mul(a[1][1], b[1][1]))],
    ];
    const polariser = (angle: number): M => {
      const c = Math.cos(angle);
      const s = Math.sin(angle);
      return [[[c * c, 0], [c * s, 0]], [[c * s, 0], [s * s, 0]]];
    };
    // retarder with axes along (x, field) and across (y): phases −δ/2 and +δ/2
    const retarder = (delta: number): M => [
      [[Math.cos(delta / 2), -Math.sin(delta / 2)], [0, 0]],
      [[0, 0], [Math.cos(delta / 2), Math.sin(delta / 2)]],
    ];
    fc.assert(
      fc.property(
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        fc.double({ min: 0, max: 4 * Math.PI, noNaN: true }),
        (alpha, beta, delta) => {
          const system = matmul(polariser(beta), matmul(retarder(delta), polariser(alpha)));
          // unit-intensity light already polarised along α
          const ex: C = [Math.cos(alpha), 0];
          const ey: C = [Math.sin(alpha), 0];
          const outX = add(mul(system[0][0], ex), mul(system[0][1], ey));
          const outY = add(mul(system[1][0], ex), mul(system[1][1], ey));
          const intensity = outX[0] ** 2 + outX[1] ** 2 + outY[0] ** 2 + outY[1] ** 2;
          expect(jonesTransmission(alpha, beta, delta)).toBeCloseTo(intensity, 12);
        },
      ),
      { numRuns: 500, seed: 42 },
    );
  });

  it('crossedTransmission(θ, δ) = jonesTransmission(θ, θ − 90°, δ) = sin²(2θ)·sin²(δ/2)', () => {
    fc.assert(
      fc.property(fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }), fc.double({ min: 0, max: 10, noNaN: true }), (theta, delta) => {
        expect(crossedTransmission(theta, delta)).toBeCloseTo(jonesTransmission(theta, theta - Math.PI / 2, delta), 12);
      }),
      { numRuns: 300, seed: 7 },
    );
  });
});
