/**
 * A logger dropout across the top of a sweep (issue "honest numbers"): the sync search must leave
 * the frames that fall in the gap out rather than bridge the gap with a straight line, which reads
 * the peak voltage far too low and pulls the offset. Synthetic trace (invented numbers): a sin²
 * arc of the drive to 0.87·V_π over 8 s, 15 fps, a 45 Hz log with 2.5 s missing up to just past the peak,
 * crossed-polariser transmission sin²(π/2·V²/V_π²) (DESIGN.md), a little intensity noise.
 */
import { describe, expect, it } from 'vitest';
import { findSyncOffset } from '../../../src/core/sync/findSyncOffset.js';
import { createModulationScorer } from '../../../src/core/sync/modulationScorer.js';

const VPI = 10_000;
const OFFSET_S = 0.6;
const drive = (t: number): number => (t < 1 || t > 9 ? 0 : 0.87 * VPI * Math.sin((Math.PI * (t - 1)) / 8) ** 2);

function scene(gap: [number, number] | null) {
  let seed = 7;
  const noise = (): number => { seed = (seed * 16807) % 2147483647; return (seed / 2147483647 - 0.5) * 0.004; };
  const frameTimesS = Float64Array.from({ length: 150 }, (_x, k) => k / 15);
  const intensity = Float64Array.from(frameTimesS, (t) => 0.02 + 0.5 * Math.sin((Math.PI / 2) * (drive(t - OFFSET_S) / VPI) ** 2) ** 2 + noise());
  const logT: number[] = [];
  for (let t = -1; t <= 11; t += 1 / 45) if (!gap || t < gap[0] || t > gap[1]) logT.push(t);
  const logTimeS = Float64Array.from(logT);
  return { frameTimesS, intensity, logTimeS, logVoltageV: Float64Array.from(logT, drive) };
}

describe('sync across a logger dropout', () => {
  // log time: the top of the arc is at 5 s; a gap to one side of it reads the rising flank low
  // when bridged (the search then put the offset 262 ms off at a stated 14 ms)
  const gap: [number, number] = [3.0, 5.5];
  it('finds the offset as well as with the whole log (a bridged gap put it several σ off)', () => {
    const whole = findSyncOffset(scene(null));
    const dropped = findSyncOffset(scene(gap));
    expect(Math.abs(whole.offsetS - OFFSET_S)).toBeLessThan(1 / 30);
    expect(Math.abs(dropped.offsetS - OFFSET_S)).toBeLessThan(1 / 30); // half a frame
    // the run's offset uncertainty adds a frame's timing, Δt/√12 (docs/uncertainty.md, "Sync term")
    expect(Math.abs(dropped.offsetS - OFFSET_S)).toBeLessThan(2 * Math.hypot(dropped.offsetStdErrS!, 1 / 15 / Math.sqrt(12)));
  });

  it('leaves the frames whose log time falls inside the gap out of each trial', () => {
    const s = scene(gap);
    const scorer = createModulationScorer(s.frameTimesS, s.intensity, s.logTimeS, s.logVoltageV, 20);
    const gathered = scorer.gather(OFFSET_S);
    const inGap = Array.from(s.frameTimesS).filter((t) => t - OFFSET_S > gap[0] + 0.02 && t - OFFSET_S < gap[1] - 0.02).length;
    expect(inGap).toBeGreaterThan(25);
    expect(gathered).toBeLessThanOrEqual(scorer.overlapFrames(OFFSET_S) - inGap);
    expect(gathered).toBeGreaterThanOrEqual(scorer.overlapFrames(OFFSET_S) - inGap - 2);
  });
});
