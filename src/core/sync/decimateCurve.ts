/**
 * At most `maxPoints` points of a score curve for plotting: the finite points are split into equal
 * bins in order and the highest point of each bin is kept (so peaks survive the thinning).
 * Never mutates its inputs.
 * @example decimateCurve(Float64Array.of(0, 1, 2, 3), Float64Array.of(0.1, 0.5, NaN, 0.2), 2) → { offsetS: [1, 3], score: [0.5, 0.2] }
 */
export function decimateCurve(offsetS: Float64Array, score: Float64Array, maxPoints: number): { offsetS: number[]; score: number[] } {
  const valid: number[] = [];
  for (let i = 0; i < score.length; i++) if (Number.isFinite(score[i])) valid.push(i);
  const out = { offsetS: [] as number[], score: [] as number[] };
  const bins = Math.min(maxPoints, valid.length);
  for (let b = 0; b < bins; b++) {
    const from = Math.floor((b * valid.length) / bins);
    const to = Math.floor(((b + 1) * valid.length) / bins);
    let pick = valid[from];
    for (let j = from + 1; j < to; j++) if (score[valid[j]] > score[pick]) pick = valid[j];
    out.offsetS.push(offsetS[pick]);
    out.score.push(score[pick]);
  }
  return out;
}
