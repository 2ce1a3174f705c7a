import { describe, expect, it } from 'vitest';
import { linearisedCrossCheck } from '../../src/stills/linearisedCrossCheck.js';
import { fitKerrCurve } from '../../src/core/fit/fitKerrCurve.js';
import { crossedTransmission, DEG, halfWaveVoltageV } from '../../src/core/physics/kerr.js';

const B = 2.4e-12, L = 0.05, D = 0.005; // nitrobenzene (Lux notes); our own cell
const FLOOR = 0.03, AMP = 0.4;
const VOLTS = Float64Array.from([0, 2000, 3000, 4000, 5000, 6000, 7000, 8000, 9000, 10000, 11000, 12000]);
const intensityFor = (b: number) => Float64Array.from(VOLTS, (v) => FLOOR + AMP * crossedTransmission(45 * DEG, Math.PI * (v / halfWaveVoltageV(b, L, D)) ** 2));

describe('linearisedCrossCheck', () => {
  it('on exact data the linearised B equals the fitted B (V² = d²/(2π·B·L)·δ, δ = 2·arcsin√T)', () => {
    const intensity = intensityFor(B);
    const fit = fitKerrCurve({ voltageV: VOLTS, intensity, effectiveLengthM: L, gapM: D, polariserAngleDeg: 45 });
    const { linearised, warning } = linearisedCrossCheck({ voltageV: VOLTS, intensity, outliers: fit.outliers, fit, polariserAngleDeg: 45, gapM: D, effectiveLengthM: L });
    expect(linearised!.kerrConstant.value / B).toBeCloseTo(1, 6);
    expect(linearised!.kerrConstant.unit).toBe('m/V^2');
    // first branch below V_pi ≈ 10.2 kV with 0.02 < T < 0.98: 4 kV (T ≈ 0.057) ... 9 kV (T ≈ 0.88);
    // 0, 2 and 3 kV are too dark (T ≈ 0.018 at 3 kV), 10 kV too close to full (T ≈ 0.996)
    expect(linearised!.points).toBe(6);
    expect(linearised!.agreesWithFit).toBe(true);
    expect(warning).toBeNull();
  });

  it('flags a first branch that disagrees with the fit (here: points of a 10 % larger B against the fit of the true B)', () => {
    const fit = fitKerrCurve({ voltageV: VOLTS, intensity: intensityFor(B), effectiveLengthM: L, gapM: D, polariserAngleDeg: 45 });
    const other = intensityFor(1.1 * B);
    const { linearised, warning } = linearisedCrossCheck({ voltageV: VOLTS, intensity: other, outliers: fit.outliers, fit, polariserAngleDeg: 45, gapM: D, effectiveLengthM: L });
    expect(linearised!.agreesWithFit).toBe(false);
    expect(linearised!.kerrConstant.value / B).toBeGreaterThan(1.05);
    expect(warning).toMatchObject({ code: 'linearised-disagrees' });
  });

  it('fewer than 5 first-branch points: no reduction', () => {
    const volts = Float64Array.from([0, 4000, 8000, 11000, 12000, 13000, 14000]);
    const intensity = Float64Array.from(volts, (v) => FLOOR + AMP * crossedTransmission(45 * DEG, Math.PI * (v / halfWaveVoltageV(B, L, D)) ** 2));
    const fit = fitKerrCurve({ voltageV: volts, intensity, effectiveLengthM: L, gapM: D, polariserAngleDeg: 45 });
    expect(linearisedCrossCheck({ voltageV: volts, intensity, outliers: fit.outliers, fit, polariserAngleDeg: 45, gapM: D, effectiveLengthM: L })).toEqual({ linearised: null, warning: null });
  });
});
