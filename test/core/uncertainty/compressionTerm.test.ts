/**
 * The compression term (src/core/uncertainty/compressionTerm.ts): K/√bpp, worked by hand, and its
 * place in the GUM budget (B ∝ V_π⁻², so the term on V_π is half the term on B; JCGM 100:2008
 * §5.1.6). K itself is a Type B value from the project's coverage study (docs/uncertainty.md).
 */
import { describe, expect, it } from 'vitest';
import { compressionRelB, COMPRESSION_B_REL_AT_ONE_BPP } from '../../../src/core/uncertainty/compressionTerm.js';
import { kerrUncertaintyBudget } from '../../../src/core/uncertainty/uncertaintyBudget.js';

describe('compressionRelB', () => {
  it('is K over the square root of the bits per pixel per frame', () => {
    expect(compressionRelB(1)).toBeCloseTo(COMPRESSION_B_REL_AT_ONE_BPP, 15);
    expect(compressionRelB(0.49)).toBeCloseTo(COMPRESSION_B_REL_AT_ONE_BPP / 0.7, 15); // √0.49 = 0.7
    expect(compressionRelB(0.01) / compressionRelB(1)).toBeCloseTo(10, 12); // 100× fewer bits: 10× the term
  });

  it('is 0 without a bitrate (photo series, an unreadable size)', () => {
    for (const bpp of [NaN, 0, -1, Infinity]) expect(compressionRelB(bpp)).toBe(0);
  });

  it('enters B at full size and V_π at half, and does not cancel between runs of one cell', () => {
    const rel = compressionRelB(0.04);
    const b = kerrUncertaintyBudget({ kerrConstant: 1, halfWaveVoltageV: 1, statisticalRel: 0, syncRel: 0, voltageCalibrationRel: 0, gapRel: 0, lengthRel: 0, compressionRel: rel, compressionNote: 'test' });
    const onB = b.kerrConstant.terms.find((t) => t.name === 'compression')!;
    const onV = b.halfWaveVoltage.terms.find((t) => t.name === 'compression')!;
    expect(onB.relative).toBeCloseTo(rel, 15);
    expect(onV.relative).toBeCloseTo(rel / 2, 15);
    expect(onB.sharedWithinCell).toBe(false);
    expect(b.kerrConstant.relativeRunToRun).toBeCloseTo(rel, 15);
  });

  it('is left out of a budget that was not given one', () => {
    const b = kerrUncertaintyBudget({ kerrConstant: 1, halfWaveVoltageV: 1, statisticalRel: 0.001, syncRel: 0, voltageCalibrationRel: 0, gapRel: 0, lengthRel: 0 });
    expect(b.kerrConstant.terms.some((t) => t.name === 'compression')).toBe(false);
  });
});
