/**
 * Compare with budgets (issue 12): between runs of one cell the gap, length and voltage
 * calibration terms cancel, so a 1.25 % change in B with 0.1 % statistical errors is significant
 * even though each run's combined uncertainty is about 1.9 %. Numbers invented for the test.
 */
import { describe, expect, it } from 'vitest';
import { compareRuns } from '../../src/compare/compareRuns.js';
import { kerrUncertaintyBudget, rectangularRelative } from '../../src/core/uncertainty/uncertaintyBudget.js';
import { cancellingTerms } from '../../src/compare/runToRunQuantity.js';
import { buildRunFixture } from '../fixtures/results/buildRunFixture.js';
import type { RunResult } from '../../src/result/schema.js';

function withBudget(label: string, b: number): RunResult {
  const r = buildRunFixture({ label, kerrConstant: b, warnings: [] }).result;
  const vpi = r.halfWaveVoltage.value;
  const uncertainty = kerrUncertaintyBudget({ kerrConstant: b, halfWaveVoltageV: vpi, statisticalRel: 0.0005, syncRel: 0, voltageCalibrationRel: rectangularRelative(1, 100), gapRel: rectangularRelative(0.05, 4), lengthRel: 0 });
  return { ...r, uncertainty, kerrConstant: { value: b, stdErr: uncertainty.kerrConstant.combinedStdErr, unit: 'm/V^2' } };
}

describe('compare with uncertainty budgets', () => {
  it('names the terms that cancel for one cell and judges the change on the run-to-run terms alone', () => {
    const a = withBudget('before', 2.4e-12);
    const b = withBudget('after', 2.43e-12);
    expect(cancellingTerms([a, b])).toEqual(['voltage-calibration', 'gap']);
    const c = compareRuns([a, b], ['before', 'after']);
    expect(c.warnings.map((w) => w.code)).toContain('terms-cancel');
    const change = c.changes.find((x) => x.key === 'kerrConstant')!;
    expect(change.verdict).toBe('rose'); // z ≈ 0.0125/(0.001·√2) ≈ 8.8; with the combined σ it would be ≈ 0.5
    expect(change.zScore!).toBeGreaterThan(5);
    // each run still shows its full combined uncertainty
    expect(c.figures.find((f) => f.key === 'kerrConstant')!.values[0]!.stdErr).toBeCloseTo(a.kerrConstant.stdErr!, 20);
  });
});
