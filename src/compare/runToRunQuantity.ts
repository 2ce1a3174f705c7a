/**
 * The uncertainty of a figure as it enters a comparison with another run. Between two runs of
 * one cell with one voltage logger the terms of the budget that belong to the cell and the
 * instrument (gap, length, voltage calibration: `sharedWithinCell`) are the same number in both
 * runs, so they cancel in the ratio B₂/B₁ and in the difference's significance; only the run's own
 * terms (statistical, sync, camera response) remain: u_r = relativeRunToRun of the budget. For
 * runs of different cells, or a result without a budget (schema version 1), the combined
 * uncertainty (the figure's stdErr) is used unchanged.
 * Pure. @example runToRunQuantity(result, 'kerrConstant', true) → {value, stdErr: value·u_r,run}
 */
import type { Quantity } from '../quantity.js';
import type { RunResult } from '../result/schema.js';

export function runToRunQuantity(r: RunResult, key: string, sameCell: boolean, q: Quantity | null): Quantity | null {
  if (q === null || !sameCell || !r.uncertainty) return q;
  const budget = key === 'kerrConstant' ? r.uncertainty.kerrConstant : key === 'halfWaveVoltage' ? r.uncertainty.halfWaveVoltage : null;
  if (!budget) return q;
  return { ...q, stdErr: Math.abs(q.value) * budget.relativeRunToRun };
}

/** Names of the budget terms that cancel between the runs (present and non-zero in all of them). */
export function cancellingTerms(results: readonly RunResult[]): string[] {
  if (results.some((r) => !r.uncertainty)) return [];
  const first = results[0]!.uncertainty!.kerrConstant.terms.filter((t) => t.sharedWithinCell && t.relative > 0).map((t) => t.name);
  return first.filter((name) => results.every((r) => r.uncertainty!.kerrConstant.terms.some((t) => t.name === name && t.relative > 0)));
}
