/**
 * The change from quantity a to quantity b with its uncertainty, assuming independent errors
 * (first-order propagation, GUM JCGM 100:2008 §5.1.2):
 *   Δ = b − a,                σ_Δ = √(σa² + σb²)
 *   r = b/a − 1,              σ_r = √((b·σa/a²)² + (σb/a)²)
 *   z = Δ/σ_Δ                 (a standard score; |z| < 2 is read as "no change within uncertainty")
 * `relative: false` skips r (for signed quantities such as an up/down difference).
 * Missing or zero uncertainties leave σ (and z) out rather than inventing them.
 * Never throws; a = 0 gives relativeChange null.
 * @example changeBetween({value: 0.012, stdErr: 0.0007}, {value: 0.0046, stdErr: 0.0003}).relativeChange
 *   ≈ {value: -0.617, stdErr: 0.0335}
 */
import type { Quantity } from '../quantity.js';

export interface ChangeResult {
  change: Quantity;
  relativeChange: Quantity | null;
  zScore: number | null;
}

export function changeBetween(a: Quantity, b: Quantity, relative = true): ChangeResult {
  const hasErr = isErr(a.stdErr) && isErr(b.stdErr);
  const sa = a.stdErr ?? 0;
  const sb = b.stdErr ?? 0;
  const changeValue = b.value - a.value;
  const changeErr = hasErr ? Math.hypot(sa, sb) : undefined;
  const change: Quantity = changeErr === undefined ? { value: changeValue } : { value: changeValue, stdErr: changeErr };
  if (a.unit !== undefined) change.unit = a.unit;
  let relativeChange: Quantity | null = null;
  if (relative && a.value !== 0 && Number.isFinite(a.value)) {
    const r = b.value / a.value - 1;
    relativeChange = hasErr ? { value: r, stdErr: Math.hypot((b.value * sa) / (a.value * a.value), sb / a.value) } : { value: r };
  }
  const zScore = changeErr !== undefined && changeErr > 0 ? changeValue / changeErr : null;
  return { change, relativeChange, zScore };
}

function isErr(x: number | undefined): x is number {
  return x !== undefined && Number.isFinite(x) && x >= 0;
}
