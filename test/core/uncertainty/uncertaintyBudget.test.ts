/**
 * The GUM budget (JCGM 100:2008 §5.1.6: relative uncertainties of a product of powers add in
 * quadrature with the exponents as sensitivities; §4.3.7: a ± a limit is a/√3). Worked by hand:
 * gap 4 ± 0.05 mm → u_r = 0.05/√3/4 = 0.7217 %, ×2 on B = 1.443 %; length 40 ± 0.1 mm →
 * 0.1443 %; logger ±1 % → 0.5774 %, ×2 = 1.155 %; statistical 0.1 % on V_π → 0.2 % on B.
 */
import { describe, expect, it } from 'vitest';
import { kerrUncertaintyBudget, rectangularRelative } from '../../../src/core/uncertainty/uncertaintyBudget.js';

describe('kerrUncertaintyBudget', () => {
  const budget = kerrUncertaintyBudget({
    kerrConstant: 2.2e-12, halfWaveVoltageV: 9800, statisticalRel: 0.001, syncRel: 0,
    voltageCalibrationRel: rectangularRelative(1, 100), gapRel: rectangularRelative(0.05, 4), lengthRel: rectangularRelative(0.1, 40),
  });

  it('combines the terms of B in quadrature with their exponents (hand-worked example)', () => {
    const b = budget.kerrConstant;
    const want = Math.hypot(0.002, 0, 2 * 0.005773503, 2 * 0.007216878, 0.001443376);
    expect(b.relativeCombined).toBeCloseTo(want, 9);
    expect(b.combinedStdErr / (2.2e-12 * want)).toBeCloseTo(1, 6);
    expect(b.expandedUncertainty / (2 * 2.2e-12 * want)).toBeCloseTo(1, 6);
    expect(b.terms.find((t) => t.name === 'gap')!.relative).toBeCloseTo(0.014433757, 8);
    expect(b.statisticalStdErr / (2.2e-12 * 0.002)).toBeCloseTo(1, 9);
  });

  it('keeps geometry out of V_π and marks the cell and logger terms as cancelling within one cell', () => {
    const v = budget.halfWaveVoltage;
    expect(v.terms.map((t) => t.name)).toEqual(['statistical', 'sync', 'ramp-consistency', 'voltage-calibration']);
    expect(v.relativeCombined).toBeCloseTo(Math.hypot(0.001, 0.005773503), 8);
    expect(budget.kerrConstant.relativeRunToRun).toBeCloseTo(0.002, 9);
  });

  it('takes an optional camera-response term on B (half of it on V_π)', () => {
    const withCam = kerrUncertaintyBudget({ kerrConstant: 1, halfWaveVoltageV: 1, statisticalRel: 0, syncRel: 0, voltageCalibrationRel: 0, gapRel: 0, lengthRel: 0, cameraResponseRel: 0.02 });
    expect(withCam.kerrConstant.relativeCombined).toBeCloseTo(0.02, 12);
    expect(withCam.halfWaveVoltage.relativeCombined).toBeCloseTo(0.01, 12);
    expect(withCam.kerrConstant.relativeRunToRun).toBeCloseTo(0.02, 12);
  });
});
