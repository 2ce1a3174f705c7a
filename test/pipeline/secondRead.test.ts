/**
 * A bounded block store whose window was placed on a provisional beam that the whole clip does not
 * confirm (a beam that moves, or a brighter flicker early on): analyze reads the clip a second time
 * with the beam found as the region, says so, and still measures the beam. The provisional search
 * is steered to a corner here (the first search that finds a beam), so the case is made on demand.
 */
import { describe, expect, it, vi } from 'vitest';
import { testMediaFile } from '../helpers/referenceData.js';

let calls = 0;
vi.mock('../../src/pipeline/findClipBeam.js', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../src/pipeline/findClipBeam.js')>();
  return {
    ...real,
    findClipBeam: (grid: Parameters<typeof real.findClipBeam>[0]) => {
      const found = real.findClipBeam(grid); // throws while no beam shows yet (the store asks again later)
      calls++;
      if (calls > 1) return found;
      // the first (provisional) search that finds one: a beam in the top-left corner
      const corner = { x0: 0, y0: 0, x1: 1, y1: 1 };
      return { ...found, boxes: [corner, corner, corner, corner] as const };
    },
  };
});

describe('bounded store: the whole clip puts the beam outside the window', () => {
  it('reads the clip again with the found beam as the region, warns, and measures the same beam', async () => {
    const { measureClip, openClip } = await import('../../src/pipeline/measureClip.js');
    const o = { videoPath: testMediaFile('cfr-ramp', 'run', 'clip.mp4'), maxGridRows: 40 };
    const starts: string[] = [];
    const clip = await measureClip(await openClip(o), o, { onProgress: (stage, done) => { if (done === 1) starts.push(stage); } });
    expect(starts).toEqual(['decoding', 'decoding']);
    expect(clip.beamAuto).toBe(true);
    expect(clip.warnings.some((w) => w.code === 'auto-region' && /read a second time/.test(w.message))).toBe(true);
    // the second read measured the found beam at full resolution: it swings with the drive (the
    // scenario's spot has amplitude 0.6 of full scale, test-media/cfr-ramp/scenario.json; a tenth of
    // that is the bound, far above the frame noise and far below the swing)
    let hi = -Infinity, lo = Infinity;
    for (const v of clip.beam.luma) { hi = Math.max(hi, v); lo = Math.min(lo, v); }
    expect(hi - lo).toBeGreaterThan(0.06);
  }, 60_000);
});
