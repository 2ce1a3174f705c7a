/**
 * [lowest, highest] Kerr constant in the built-in liquid table (src/data/liquids.ts), m/V²: the
 * range the plausibility warning of the gates (core/gates/runGates) compares a result with.
 * Pure; throws nothing.
 * @example liquidKerrRangeMPerV2()[1] // the largest tabulated B (nitrobenzene's order, ~4e-12)
 */
import { LIQUIDS } from './liquids.js';

export function liquidKerrRangeMPerV2(): [number, number] {
  let lo = Infinity, hi = 0;
  for (const l of LIQUIDS) for (const k of l.kerrConstants) { lo = Math.min(lo, k.valueMPerV2); hi = Math.max(hi, k.valueMPerV2); }
  return [lo, hi];
}
