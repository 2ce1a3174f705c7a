import { describe, expect, it } from 'vitest';
import { CURVE_SAMPLES, transmissionSpec } from '../../../src/report/plots/transmissionSpec.js';
import { modelIntensity } from '../../../src/report/plots/modelIntensity.js';
import { buildRunFixture } from '../../fixtures/results/buildRunFixture.js';

interface CurveRow { voltageV: number; voltageKv: number; intensity: number }

function curveOf(spec: Record<string, unknown>): CurveRow[] {
  return (spec.datasets as { curve: CurveRow[] }).curve;
}

describe('transmissionSpec', () => {
  it('draws the fitted curve exactly as result.model evaluated by the Kerr physics (relative 1e-9)', () => {
    const { result, trace } = buildRunFixture({ polariserAngleDeg: 38 });
    result.model.staticRetardanceRad = 0.21;
    const curve = curveOf(transmissionSpec(result, trace).spec);
    expect(curve.length).toBe(CURVE_SAMPLES);
    const m = result.model;
    for (const row of curve) {
      // I = I_floor + I_amp·sin²(2θ)·sin²((δ_static + 2π·B·L_eff·V²/d²)/2) (Kerr law and Jones
      // calculus, any optics text), written out here rather than through src/core/physics/kerr.ts,
      // which the code under test uses
      const deltaRad = m.staticRetardanceRad + (2 * Math.PI * m.kerrConstant.value * m.effectiveLengthM * row.voltageV ** 2) / m.gapM ** 2;
      const expected = m.floorLevel.value + m.amplitude.value * Math.sin((2 * m.polariserAngleDeg * Math.PI) / 180) ** 2 * Math.sin(deltaRad / 2) ** 2;
      expect(Math.abs(row.intensity - expected)).toBeLessThanOrEqual(1e-9 * Math.abs(expected));
      expect(row.voltageKv).toBeCloseTo(row.voltageV / 1000, 12);
    }
  });

  it('at 45° the curve is floor + amp·sin²(π/2·V²/Vπ²), Vπ = d/√(2·B·L_eff) (Kerr law, any optics text)', () => {
    const { result, trace } = buildRunFixture();
    const m = result.model;
    const halfWave = m.gapM / Math.sqrt(2 * m.kerrConstant.value * m.effectiveLengthM); // V_π = d/√(2·B·L_eff)
    for (const row of curveOf(transmissionSpec(result, trace).spec)) {
      const expected = m.floorLevel.value + m.amplitude.value * Math.sin((Math.PI / 2) * (row.voltageV / halfWave) ** 2) ** 2;
      expect(Math.abs(row.intensity - expected)).toBeLessThanOrEqual(1e-9 * Math.abs(expected));
    }
    expect(modelIntensity(m, halfWave)).toBeCloseTo(m.floorLevel.value + m.amplitude.value, 12);
  });

  it('spans the recorded voltage range and splits used from excluded frames', () => {
    const { result, trace } = buildRunFixture();
    const made = transmissionSpec(result, trace);
    const curve = curveOf(made.spec);
    const volts = trace.filter((r) => r.voltageV !== null).map((r) => r.voltageV as number);
    expect(curve[0]!.voltageV).toBe(Math.min(0, ...volts));
    expect(curve[curve.length - 1]!.voltageV).toBe(Math.max(...volts));
    const points = (made.spec.datasets as { points: { series: string }[] }).points;
    const excludedWithVoltage = trace.filter((r) => !r.used && r.voltageV !== null).length;
    expect(points.filter((p) => p.series === 'excluded frame').length).toBe(excludedWithVoltage);
    expect(made.thinned).toBe(false);
  });
});
