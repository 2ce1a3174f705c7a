/** The report's budget table: every term of the budget, combined and expanded rows, and a NOT VALID callout. */
import { describe, expect, it } from 'vitest';
import { budgetTableHtml } from '../../src/report/budgetTableHtml.js';
import { kerrUncertaintyBudget } from '../../src/core/uncertainty/uncertaintyBudget.js';
import { buildRunFixture } from '../fixtures/results/buildRunFixture.js';

describe('budgetTableHtml', () => {
  const { result } = buildRunFixture();
  it('gives nothing for a result without a budget (schema version 1) that passed', () => {
    expect(budgetTableHtml({ ...result })).toBeNull();
  });
  it('lists each term with its share on B and V_π, the combined and the expanded (k = 2) rows', () => {
    const uncertainty = kerrUncertaintyBudget({ kerrConstant: 2.4e-12, halfWaveVoltageV: 10000, statisticalRel: 0.001, syncRel: 0.0005, voltageCalibrationRel: 0.0057735, gapRel: 0.0072169, lengthRel: 0 });
    const text = budgetTableHtml({ ...result, uncertainty })!.toString();
    for (const name of ['statistical', 'sync', 'ramp-consistency', 'voltage-calibration', 'gap', 'length']) expect(text).toContain(`<th>${name}</th>`);
    expect(text).toContain('1.4 %'); // gap on B: 2 × 0.72 %
    expect(text).toContain('expanded (k = 2)');
    expect(text).toContain(`${(200 * uncertainty.kerrConstant.relativeCombined).toPrecision(2)} %`);
  });
  it('names every failed gate when the run is not valid', () => {
    const text = budgetTableHtml({ ...result, validity: { valid: false, failures: [{ gate: 'residual-excess', message: 'the fit leaves residuals 11× the noise' }] } })!.toString();
    expect(text).toMatch(/not to be used/);
    expect(text).toContain('residual-excess: the fit leaves residuals 11× the noise');
  });
});
