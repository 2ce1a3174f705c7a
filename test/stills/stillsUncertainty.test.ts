/**
 * The photo budget (JCGM 100:2008 §5.1.6 relative terms with exponents; §4.3.7 a ± a limit is
 * a/√3), worked by hand: gap 4.5 ± 0.05 mm → u_r = 0.05/√3/4.5 = 0.6415 %, ×2 on B = 1.283 %;
 * length 45 ± 0.1 mm → 0.1283 %; meter ±1 % → 0.5774 %, ×2 = 1.155 %.
 */
import { describe, expect, it } from 'vitest';
import { stillsUncertainty } from '../../src/stills/stillsUncertainty.js';
import { fitKerrCurve, type KerrCurveInput } from '../../src/core/fit/fitKerrCurve.js';
import { crossedTransmission, DEG, halfWaveVoltageV } from '../../src/core/physics/kerr.js';
import { OUTSIDE } from '../setup/outsideSources.js';

const B = 1.9e-12, L = 0.045, D = 0.0045, VPI = halfWaveVoltageV(B, L, D), AMP = 0.5, FLOOR = 0.02;
const volts = [0, 1500, 3000, 4500, 6000, 7500, 9000, 10500, 12000, 13500, 15000];
const noise = [0.002, -0.001, 0.0015, -0.002, 0.001, 0, -0.0015, 0.002, -0.001, 0.0005, -0.0005];
const input: KerrCurveInput = {
  voltageV: Float64Array.from(volts),
  intensity: Float64Array.from(volts, (v, i) => FLOOR + AMP * crossedTransmission(45 * DEG, Math.PI * (v / VPI) ** 2) + noise[i]!),
  effectiveLengthM: L, gapM: D, polariserAngleDeg: 45, robust: true,
};

describe('stillsUncertainty', { tags: [OUTSIDE.gum] }, () => {
  it('statistical, meter, gap and length terms worked by hand; no sync or ramp contribution', () => {
    const fit = fitKerrCurve(input);
    const u = stillsUncertainty({ fit, curveInput: input, voltsAccuracyPercent: 1, gapM: D, gapToleranceM: 5e-5, lengthM: L, lengthToleranceM: 1e-4 });
    const term = (name: string) => u.kerrConstant.terms.find((t) => t.name === name)!;
    expect(term('gap').relative).toBeCloseTo(0.01283, 5);
    expect(term('length').relative).toBeCloseTo(0.001283, 6);
    expect(term('voltage-calibration').relative).toBeCloseTo(0.011547, 6);
    expect(term('statistical').relative).toBeCloseTo(2 * fit.halfWaveVoltage.stdErr! / fit.halfWaveVoltage.value, 12);
    expect(term('sync').relative).toBe(0);
    expect(term('sync').note).toMatch(/photos carry their voltage/);
    expect(term('ramp-consistency').relative).toBe(0);
    expect(u.kerrConstant.terms.some((t) => t.name === 'open-level')).toBe(false);
    const quadrature = Math.hypot(...u.kerrConstant.terms.map((t) => t.relative));
    expect(u.kerrConstant.relativeCombined).toBeCloseTo(quadrature, 12);
    expect(u.kerrConstant.combinedStdErr).toBeCloseTo(fit.kerrConstant.value * quadrature, 20);
  });

  it('an open level with a tolerance adds the refit term; without one the term is listed as 0 with the reason', () => {
    const held = { ...input, openLevel: AMP };
    const fit = fitKerrCurve(held);
    const base = { fit, curveInput: held, voltsAccuracyPercent: 0, gapM: D, gapToleranceM: 0, lengthM: L, lengthToleranceM: 0 };
    const withU = stillsUncertainty({ ...base, openLevel: { stdErr: 0.01, note: 'test' } });
    const open = withU.halfWaveVoltage.terms.find((t) => t.name === 'open-level')!;
    // independent estimate: refit at 0.51 and 0.49 by hand
    const at = (l: number) => fitKerrCurve({ ...held, openLevel: l, halfWaveGuessesV: [fit.halfWaveVoltage.value], onlyGivenStarts: true }).halfWaveVoltage.value;
    expect(open.relative).toBeCloseTo(Math.abs(at(0.51) - at(0.49)) / (2 * fit.halfWaveVoltage.value), 9);
    expect(open.relative).toBeGreaterThan(0);
    const without = stillsUncertainty({ ...base, openLevel: { stdErr: undefined, note: 'one open photo' } });
    expect(without.halfWaveVoltage.terms.find((t) => t.name === 'open-level')).toMatchObject({ relative: 0, note: expect.stringMatching(/not known \(one open photo\)/) });
  });
});
