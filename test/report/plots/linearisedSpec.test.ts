import { describe, expect, it } from 'vitest';
import { halfWaveVoltageV } from '../../../src/core/physics/kerr.js';
import { linearisedSpec } from '../../../src/report/plots/linearisedSpec.js';
import { buildRunFixture } from '../../fixtures/results/buildRunFixture.js';

describe('linearisedSpec', () => {
  it('draws the regression line through the origin reaching Vπ² at δ = π (Kerr law: V² = d²/(2π·B·L)·δ)', () => {
    const { result, trace } = buildRunFixture();
    const made = linearisedSpec(result, trace);
    expect(made).not.toBeNull();
    const line = (made!.spec.datasets as { line: { retardanceRad: number; voltageSqKv2: number }[] }).line;
    expect(line[0]).toMatchObject({ retardanceRad: 0, voltageSqKv2: 0 });
    const end = line[1]!;
    const halfWaveKv = halfWaveVoltageV(result.linearised!.kerrConstant.value, result.model.effectiveLengthM, result.model.gapM) / 1000;
    // The slope V²/δ times π equals V_π² computed independently from the half-wave formula.
    expect((end.voltageSqKv2 / end.retardanceRad) * Math.PI).toBeCloseTo(halfWaveKv * halfWaveKv, 9);
  });

  it('keeps first-branch points only (|V| ≤ Vπ, 0 ≤ δ ≤ π) and the measured points follow the line', () => {
    const { result, trace } = buildRunFixture({ noise: 0 });
    const points = (linearisedSpec(result, trace)!.spec.datasets as { points: { retardanceRad: number; voltageSqKv2: number }[] }).points;
    const halfWaveKv = result.halfWaveVoltage.value / 1000;
    expect(points.length).toBeGreaterThan(100);
    for (const p of points) {
      expect(p.retardanceRad).toBeGreaterThanOrEqual(0);
      expect(p.retardanceRad).toBeLessThanOrEqual(Math.PI);
      expect(p.voltageSqKv2).toBeLessThanOrEqual(halfWaveKv * halfWaveKv * (1 + 1e-12));
      // Noise-free fixture: δ = π·V²/Vπ² exactly (fixture B = fit B).
      expect(p.retardanceRad).toBeCloseTo((Math.PI * p.voltageSqKv2) / (halfWaveKv * halfWaveKv), 6);
    }
  });

  it('returns null when the run has no linearised reduction', () => {
    const { result, trace } = buildRunFixture();
    result.linearised = null;
    expect(linearisedSpec(result, trace)).toBeNull();
  });
});
