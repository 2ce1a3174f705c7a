/**
 * Thins a long series for plotting while keeping its shape: the index range is cut into equal
 * buckets and from each bucket the samples holding the smallest and the largest value are kept
 * (in their original order), together with the first and last sample of the series. Spikes and
 * dips survive; a 9000-frame trace drawn with 2000 points looks the same as the full one.
 * (Min/max decimation is common practice in oscilloscope displays.)
 * Values that are null or non-finite are ignored when choosing extremes but never invented.
 * Returns the kept indices in increasing order; when the series already has ≤ maxPoints samples
 * all indices are returned. Throws a plain Error when maxPoints < 4 (a programming error).
 * @example downsampleMinMax([0, 5, 1, 1, 1, 1, 1, -3, 1, 0], 4) → [0, 1, 7, 9]
 */
export function downsampleMinMax(values: ArrayLike<number | null>, maxPoints: number): number[] {
  if (!(maxPoints >= 4)) throw new Error(`downsampleMinMax needs maxPoints >= 4, got ${maxPoints}`);
  const n = values.length;
  if (n <= maxPoints) return Array.from({ length: n }, (_, i) => i);
  const buckets = Math.floor((maxPoints - 2) / 2);
  const kept = new Set<number>([0, n - 1]);
  for (let b = 0; b < buckets; b++) {
    const start = 1 + Math.floor((b * (n - 2)) / buckets);
    const end = 1 + Math.floor(((b + 1) * (n - 2)) / buckets);
    let minI = -1;
    let maxI = -1;
    for (let i = start; i < end; i++) {
      const v = values[i];
      if (v === null || v === undefined || !Number.isFinite(v)) continue;
      if (minI < 0 || v < (values[minI] as number)) minI = i;
      if (maxI < 0 || v > (values[maxI] as number)) maxI = i;
    }
    if (minI < 0 && start < end) {
      kept.add(start); // a bucket of missing values: keep one so the gap stays visible
    } else {
      if (minI >= 0) kept.add(minI);
      if (maxI >= 0) kept.add(maxI);
    }
  }
  return [...kept].sort((a, b) => a - b);
}
