/**
 * The Kerr modulation term T(V) = sin²(2θ)·sin²(π/2·(V/V_π)² + φ/2), checked against an explicit
 * Jones-matrix product computed here with complex numbers (Jones calculus, any optics text; the
 * same outside source as kerr.test.ts), against kerr.ts's crossedTransmission, and its slope in
 * V_π against a central difference.
 */
import { describe, expect, it } from 'vitest';
import { crossedTransmission, jonesTransmission } from '../../../src/core/physics/kerr.js';
import { modulationPhase, modulationTerm, modulationTermSlopeHalfWave, polariserAngleFactor } from '../../../src/core/physics/modulationTerm.js';
import { OUTSIDE } from '../../setup/outsideSources.js';

/**
 * |analyser · retarder · polariser|² for unit light: polariser along (cos θ, sin θ) with the field
 * on x, retarder diag(1, e^{iδ}) (slow axis across the field), analyser crossed, along (−sin θ, cos θ).
 */
function explicitJones(thetaRad: number, retardanceRad: number): number {
  const ex = { re: Math.cos(thetaRad), im: 0 };
  const ey = { re: Math.sin(thetaRad) * Math.cos(retardanceRad), im: Math.sin(thetaRad) * Math.sin(retardanceRad) };
  const re = -Math.sin(thetaRad) * ex.re + Math.cos(thetaRad) * ey.re;
  const im = -Math.sin(thetaRad) * ex.im + Math.cos(thetaRad) * ey.im;
  return re * re + im * im;
}

describe('modulationTerm', { tags: [OUTSIDE.workedExamples] }, () => {
  const halfWaveV = 9000;

  it('equals the explicit Jones product with retardance δ = π·(V/V_π)² + φ', () => {
    for (const angleDeg of [45, 30, 10, 80]) {
      for (const staticRad of [0, 0.2, 1.3]) {
        for (const voltageV of [0, 1500, 4500, 9000, 12000, -7000]) {
          const delta = Math.PI * (voltageV / halfWaveV) ** 2 + staticRad;
          const t = modulationTerm(voltageV, halfWaveV, polariserAngleFactor(angleDeg), staticRad);
          expect(t).toBeCloseTo(explicitJones((angleDeg * Math.PI) / 180, delta), 12);
          expect(t).toBeCloseTo(crossedTransmission((angleDeg * Math.PI) / 180, delta), 12);
          expect(t).toBeCloseTo(jonesTransmission((angleDeg * Math.PI) / 180, (angleDeg * Math.PI) / 180 - Math.PI / 2, delta), 12);
        }
      }
    }
  });

  it('is 0 at zero field, sin²(2θ) at the half-wave voltage and sin²(π/8) at half of it (θ = 45°)', () => {
    expect(modulationTerm(0, halfWaveV, 1)).toBe(0);
    expect(modulationTerm(halfWaveV, halfWaveV, polariserAngleFactor(30))).toBeCloseTo(0.75, 12); // sin²(60°)
    expect(modulationTerm(halfWaveV / 2, halfWaveV, polariserAngleFactor(45))).toBeCloseTo(Math.sin(Math.PI / 8) ** 2, 12);
    expect(modulationPhase(halfWaveV, halfWaveV, 0.4)).toBeCloseTo(Math.PI / 2 + 0.2, 14);
  });

  it('has the angle factor of a polariser at 45° (1) and along the field (0)', () => {
    expect(polariserAngleFactor(45)).toBeCloseTo(1, 15);
    expect(polariserAngleFactor(0)).toBe(0);
    expect(polariserAngleFactor(90)).toBeCloseTo(0, 15);
    expect(polariserAngleFactor(15)).toBeCloseTo(0.25, 14); // sin²(30°)
  });

  it('has the slope in V_π of a central difference', () => {
    for (const [voltageV, staticRad] of [[3000, 0], [8000, 0.3], [11000, 0]] as const) {
      const h = 1e-3;
      const numeric = (modulationTerm(voltageV, halfWaveV + h, 0.8, staticRad) - modulationTerm(voltageV, halfWaveV - h, 0.8, staticRad)) / (2 * h);
      const analytic = modulationTermSlopeHalfWave(voltageV, halfWaveV, 0.8, staticRad);
      expect(Math.abs(analytic - numeric)).toBeLessThan(1e-9 + 1e-6 * Math.abs(analytic));
    }
  });
});
