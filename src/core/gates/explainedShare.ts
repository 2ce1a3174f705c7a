/**
 * The share of a series' variation that a model explains, the coefficient of determination
 *
 *   R² = 1 − Σ(yᵢ − ŷᵢ)² / Σ(yᵢ − ȳ)²
 *
 * (any statistics text; e.g. NIST/SEMATECH e-Handbook of Statistical Methods, section 4.4.4). For a
 * run, y is the beam intensity of the frames used and ŷ the fitted Kerr curve: a region on the beam
 * gives R² near 1; a region on empty background gives a small R², because the drive explains
 * little of what the region shows (noise, drift), however tight the fit's own error bars look.
 * Non-finite pairs are skipped. Returns NaN with fewer than 3 pairs or no variation. Pure.
 * @example explainedShare(Float64Array.of(1, 2, 3), Float64Array.of(1, 2, 3)) // 1
 */
export function explainedShare(observed: ArrayLike<number>, model: ArrayLike<number>): number {
  let n = 0, mean = 0;
  for (let i = 0; i < observed.length; i++) {
    const y = observed[i]!, m = model[i]!;
    if (Number.isFinite(y) && Number.isFinite(m)) { n++; mean += (y - mean) / n; }
  }
  if (n < 3) return NaN;
  let ssRes = 0, ssTot = 0;
  for (let i = 0; i < observed.length; i++) {
    const y = observed[i]!, m = model[i]!;
    if (!Number.isFinite(y) || !Number.isFinite(m)) continue;
    ssRes += (y - m) ** 2;
    ssTot += (y - mean) ** 2;
  }
  return ssTot > 0 ? 1 - ssRes / ssTot : NaN;
}
