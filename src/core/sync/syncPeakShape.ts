/**
 * How well the best synchronisation offset is defined, from the fine score R²(offset) around it.
 *
 * - `sharpnessS`: the mean over both sides of the distance (s) at which R² has dropped by
 *   `sharpnessDrop` below the best; each side is found by doubling from 1/8 frame interval up to
 *   the searched width plus one frame, then 12 bisections. Null when neither side drops that far.
 * - `offsetStdErrS`: 1 σ (s) from the curvature of R² at the optimum (central difference over half
 *   a frame interval h): ΔRSS = σ² ⇔ ΔR² = (1 − R²)/(n − 4) for the 4 fitted quantities (a, b,
 *   V_π, offset), so σ = √(2(1 − R²)/(n − 4) / −R''). Assumes independent frame residuals
 *   (optimistic when they are correlated); null when the curvature is not negative or n ≤ 4.
 * @example syncPeakShape(fineAtBest, 0.45, 0.999, 595, 1/30, 29.5, 0.01) → { sharpnessS: 0.17, offsetStdErrS: 0.002 }
 */
export function syncPeakShape(
  fineAtBest: (offsetS: number) => number,
  bestOffsetS: number,
  bestScore: number,
  framesUsed: number,
  frameIntervalS: number,
  searchedWidthS: number,
  sharpnessDrop: number,
): { sharpnessS: number | null; offsetStdErrS: number | null } {
  const widths: number[] = [];
  for (const side of [-1, 1]) {
    const width = dropDistance(fineAtBest, bestOffsetS, bestScore - sharpnessDrop, side, frameIntervalS, searchedWidthS);
    if (width !== null) widths.push(width);
  }
  const sharpnessS = widths.length > 0 ? widths.reduce((a, b) => a + b, 0) / widths.length : null;
  const h = frameIntervalS / 2;
  const curvature = (fineAtBest(bestOffsetS - h) - 2 * bestScore + fineAtBest(bestOffsetS + h)) / (h * h);
  const offsetStdErrS = curvature < 0 && framesUsed > 4 ? Math.sqrt((2 * Math.max(1 - bestScore, 0)) / (framesUsed - 4) / -curvature) : null;
  return { sharpnessS, offsetStdErrS };
}

/** Distance (s) on one side at which the score first falls to `threshold`, or null within the searched width. */
function dropDistance(fineAtBest: (offsetS: number) => number, bestOffsetS: number, threshold: number, side: number, frameIntervalS: number, searchedWidthS: number): number | null {
  let inner = 0;
  for (let d = frameIntervalS / 8; d <= searchedWidthS + frameIntervalS; d *= 2) {
    if (fineAtBest(bestOffsetS + side * d) <= threshold) {
      let outer = d;
      for (let it = 0; it < 12; it++) {
        const mid = (inner + outer) / 2;
        if (fineAtBest(bestOffsetS + side * mid) <= threshold) outer = mid;
        else inner = mid;
      }
      return (inner + outer) / 2;
    }
    inner = d;
  }
  return null;
}
