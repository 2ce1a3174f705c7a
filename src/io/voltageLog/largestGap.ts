/**
 * The largest interval of a voltage log when it exceeds 10× the median interval (a dropout worth a
 * warning; 10× is our choice), with the median (upper median for an even count) and the index of
 * the sample after the gap. Null with fewer than 4 samples or no such gap. Times in s.
 * @example largestGap(Float64Array.of(0, 1, 2, 3, 50)) → { gapS: 47, medianS: 1, index: 4 }
 */
export function largestGap(timeS: Float64Array): { gapS: number; medianS: number; index: number } | null {
  if (timeS.length < 4) return null;
  const intervals = new Float64Array(timeS.length - 1);
  for (let i = 1; i < timeS.length; i++) intervals[i - 1] = timeS[i] - timeS[i - 1];
  const sorted = intervals.slice().sort();
  const medianS = sorted[Math.floor(sorted.length / 2)];
  let best = 0;
  for (let i = 1; i < intervals.length; i++) if (intervals[i] > intervals[best]) best = i;
  if (!(intervals[best] > 10 * medianS)) return null;
  return { gapS: intervals[best], medianS, index: best + 1 };
}
