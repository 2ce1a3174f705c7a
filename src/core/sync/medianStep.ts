/**
 * Median of the positive successive differences of a time series (s): the typical frame or log
 * interval, robust to gaps and repeated times; the upper median for an even count. The series
 * must span some time (validateSyncInput checks that for findSyncOffset).
 * @example medianStep(Float64Array.of(0, 0.1, 0.2, 0.5)) // 0.1
 */
export function medianStep(timeS: Float64Array): number {
  const steps: number[] = [];
  for (let i = 1; i < timeS.length; i++) {
    const d = timeS[i] - timeS[i - 1];
    if (d > 0) steps.push(d);
  }
  steps.sort((a, b) => a - b);
  return steps[Math.floor(steps.length / 2)];
}
