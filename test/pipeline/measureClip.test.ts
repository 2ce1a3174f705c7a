import { describe, expect, it } from 'vitest';
import { measureClip, openClip, type ClipOptions } from '../../src/pipeline/measureClip.js';
import { decodePass } from '../../src/pipeline/decodePass.js';
import { testMediaFile } from '../helpers/referenceData.js';

/** Runs the decode-and-measure stage and counts the decodes it started (each starts at frame 1). */
async function measured(o: ClipOptions) {
  const starts: string[] = [];
  const opened = await openClip(o);
  const clip = await measureClip(opened, o, { onProgress: (stage, done) => { if (done === 1) starts.push(stage); } });
  return { clip, starts, opened };
}

describe('measureClip: one decode of the clip', () => {
  const videoPath = testMediaFile('cfr-ramp', 'run', 'clip.mp4');

  it('decodes the clip once when the beam is found automatically, and measures the beam and rings from the same pass', async () => {
    const { clip, starts, opened } = await measured({ videoPath });
    expect(starts).toEqual(['decoding']);
    expect(clip.beamAuto).toBe(true);
    expect(clip.warnings.map((w) => w.code)).toContain('auto-region');
    // The found beam is whole blocks; its block-measured luminance follows a full-resolution read of
    // the same rectangle (a second pass made here only to check). The difference is the within-block
    // averaging of codes before linearising: second order for this Gaussian spot (docs/analyze.md:
    // 0.04–0.2 % at 1–6 blocks per σ); 1 % would mean the blocks are misplaced or misdecoded.
    const full = await decodePass(opened.probe, opened.decoding, { regions: [clip.beamRect] });
    expect(full.frames).toBe(clip.nFrames);
    let worst = 0;
    for (let f = 0; f < clip.nFrames; f++) worst = Math.max(worst, Math.abs(clip.beam.luma[f]! / full.regions[0]!.luma[f]! - 1));
    expect(worst).toBeLessThan(0.01);
    expect(worst).toBeGreaterThan(0); // it is a different measurement, not the same numbers
  });

  it('decodes the clip once with a given region too', async () => {
    const { clip, starts } = await measured({ videoPath, roi: { x: 110, y: 70, w: 41, h: 41 } });
    expect(starts).toEqual(['decoding']);
    expect(clip.beamAuto).toBe(false);
  });

  it('turns the stream\'s timing remarks into run warnings (a container with fewer timestamps than frames)', async () => {
    const o: ClipOptions = { videoPath, roi: { x: 110, y: 70, w: 41, h: 41 } };
    const opened = await openClip(o);
    // Drop the last 5 timestamps, as a container that lists fewer than it holds would.
    const probe = { ...opened.probe, frameTimesS: opened.probe.frameTimesS.slice(0, -5) };
    const clip = await measureClip({ ...opened, probe }, o);
    const notes = clip.warnings.filter((w) => w.code === 'probe' && /more frames than the container has timestamps/.test(w.message));
    expect(notes).toHaveLength(1);
    expect(clip.nFrames).toBe(opened.probe.frameTimesS.length);
  });
});
