/**
 * Short positive spikes in a time-ordered series of standardised residuals z_t (residual divided
 * by its expected standard deviation): runs of at most `maxRun` consecutive frames with
 * z_t > zLimit. Longer runs are a misfit of the model or a real change, not a particle crossing
 * the beam, and are not flagged. NaN entries (frames not in the fit) break runs.
 * Pure. Returns per-frame flags and the number of separate spikes (events).
 */
export function detectSpikes(z: ArrayLike<number>, options: { zLimit?: number; maxRun?: number } = {}): { flags: Uint8Array; events: number } {
  const zLimit = options.zLimit ?? 5;
  const maxRun = options.maxRun ?? 4;
  const n = z.length;
  const flags = new Uint8Array(n);
  let events = 0;
  let t = 0;
  while (t < n) {
    if (z[t]! > zLimit) {
      let end = t;
      while (end + 1 < n && z[end + 1]! > zLimit) end++;
      if (end - t + 1 <= maxRun) {
        for (let k = t; k <= end; k++) flags[k] = 1;
        events++;
      }
      t = end + 1;
    } else t++;
  }
  return { flags, events };
}
