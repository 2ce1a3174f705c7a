/**
 * Short positive excursions in a time-ordered series of standardised residuals z_t (residual over
 * its expected standard deviation): a particle drifting through the beam, a reflection flicker.
 * An event starts where z rises above `zHigh`; it extends to both sides while z stays above
 * `zLow` (hysteresis thresholds, so the whole crossing is flagged, not just its peak). Events
 * longer than `maxDurationS` are a misfit of the model or a real change and are not flagged.
 * NaN entries (frames not in the fit) end an event.
 * Pure. Returns per-frame flags and the number of separate events with their peak z.
 */
export interface SpikeDetection {
  flags: Uint8Array;
  events: number;
  peaks: { index: number; z: number }[];
}

export function detectSpikes(
  z: ArrayLike<number>,
  timeS: ArrayLike<number>,
  options: { zHigh?: number; zLow?: number; maxDurationS?: number } = {},
): SpikeDetection {
  const zHigh = options.zHigh ?? 5;
  const zLow = options.zLow ?? 2.5;
  const maxDurationS = options.maxDurationS ?? 1.0;
  const n = z.length;
  const flags = new Uint8Array(n);
  const peaks: { index: number; z: number }[] = [];
  let t = 0;
  while (t < n) {
    if (!(z[t]! > zHigh) || flags[t]) {
      t++;
      continue;
    }
    let start = t;
    while (start > 0 && z[start - 1]! > zLow) start--;
    let end = t;
    while (end + 1 < n && z[end + 1]! > zLow) end++;
    let peak = start;
    for (let k = start; k <= end; k++) if (z[k]! > z[peak]!) peak = k;
    if (timeS[end]! - timeS[start]! <= maxDurationS) {
      for (let k = start; k <= end; k++) flags[k] = 1;
      peaks.push({ index: peak, z: z[peak]! });
    }
    t = end + 1;
  }
  return { flags, events: peaks.length, peaks };
}
