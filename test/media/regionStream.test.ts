import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync } from 'node:fs';
import { openRegionStream } from '../../src/media/regionStream.js';
import { openFrameStream } from '../../src/media/frameStream.js';
import { decoderThreads, rawPipesArgs } from '../../src/media/rawVideoPipes.js';
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import { ffmpegPath } from '../../src/media/ffmpegPaths.js';
import { probeMedia } from '../../src/media/probe.js';
import { KerrError } from '../../src/errors.js';
import { ffprobeFrameTimes, makeClip, tempDir } from '../helpers/makeClip.js';
import { OUTSIDE } from '../setup/outsideSources.js';

describe('openRegionStream', () => {
  let tmp: Awaited<ReturnType<typeof tempDir>>;
  let clip: string;
  beforeAll(async () => {
    tmp = await tempDir('regions');
    clip = await makeClip(tmp.dir, 'c.mp4', { width: 160, height: 120, fps: 20, durationS: 1.5, source: 'testsrc2' });
  });
  afterAll(async () => { await tmp.cleanup(); });

  it('delivers each region\'s aligned crop with exactly the pixels of the whole frame (Y, U and V planes)', async () => {
    const regions = [{ x: 3, y: 5, w: 10, h: 7 }, { x: 100, y: 60, w: 40, h: 30 }, { x: 0, y: 0, w: 160, h: 120 }];
    const stream = openRegionStream(clip, regions);
    const layout = await stream.layout();
    expect(layout.crops).toEqual([{ x: 2, y: 4, w: 12, h: 8 }, { x: 100, y: 60, w: 40, h: 30 }, { x: 0, y: 0, w: 160, h: 120 }]);
    expect(layout.offsets[0]).toEqual({ x: 1, y: 1, w: 10, h: 7 });
    const wholes: Uint8Array[] = [];
    for await (const f of openFrameStream(clip, { maxFrames: 5 })) wholes.push(f.data.slice());
    let n = 0;
    for await (const set of stream) {
      if (set.index >= 5) break;
      const whole = wholes[set.index]!;
      layout.crops.forEach((c, k) => {
        const frame = set.regions[k]!;
        expect([frame.width, frame.height]).toEqual([c.w, c.h]);
        const cw = c.w >> 1, ch = c.h >> 1;
        for (let y = 0; y < c.h; y++) for (let x = 0; x < c.w; x++) expect(frame.data[y * c.w + x]).toBe(whole[(c.y + y) * 160 + c.x + x]);
        for (const plane of [0, 1]) {
          const cropBase = c.w * c.h + plane * cw * ch;
          const wholeBase = 160 * 120 + plane * 80 * 60;
          for (let y = 0; y < ch; y++) for (let x = 0; x < cw; x++) expect(frame.data[cropBase + y * cw + x]).toBe(whole[wholeBase + (c.y / 2 + y) * 80 + c.x / 2 + x]);
        }
      });
      n++;
    }
    expect(n).toBe(5);
    expect(existsSync(`/proc/${(await stream.closed())!.pid}`)).toBe(false);
  });

  it('times frames by the container timestamps (ffprobe per-frame pts of a variable-frame-rate clip)', { tags: [OUTSIDE.ffprobe] }, async () => {
    const vfr = await makeClip(tmp.dir, 'vfr.mp4', { width: 160, height: 120, fps: 30, durationS: 1.5, vfr: true });
    const reference = await ffprobeFrameTimes(vfr);
    const times: number[] = [];
    for await (const set of openRegionStream(vfr, [{ x: 0, y: 0, w: 8, h: 8 }, { x: 80, y: 80, w: 8, h: 8 }])) times.push(set.timeS);
    expect(times.length).toBe(reference.length);
    times.forEach((t, i) => expect(Math.abs(t - reference[i]!)).toBeLessThan(1e-6));
  });

  it('uses one decode: split then crop, one pipe per region', async () => {
    const probe = await probeMedia(clip);
    const args = rawPipesArgs({ probe, outputs: [{ filter: 'crop=8:8:0:0', width: 8, height: 8 }, { filter: 'crop=8:8:8:8', width: 8, height: 8 }], expectedFrames: 30, pixelFormat: 'yuv420p' });
    expect(args.filter((a) => a === '-i').length).toBe(1);
    expect(args.join(' ')).toContain('split=2');
    expect(args).toContain('pipe:1');
    expect(args).toContain('pipe:3');
  });

  it('decodes with more threads than ffmpeg would pick, and the pixels are those of a one-thread decode', async () => {
    const probe = await probeMedia(clip);
    const args = rawPipesArgs({ probe, outputs: [{ filter: '', width: 160, height: 120 }], expectedFrames: 30, pixelFormat: 'yuv420p' });
    expect(args[args.indexOf('-threads') + 1]).toBe(String(decoderThreads()));
    expect(args.indexOf('-threads')).toBeLessThan(args.indexOf('-i')); // a decoder option, before the input
    // the reference: ffmpeg itself, one decoding thread, the same raw 4:2:0 frames
    const { stdout } = await promisify(execFile)(ffmpegPath(), ['-v', 'error', '-threads', '1', '-i', clip, '-vsync', '0', '-f', 'rawvideo', '-pix_fmt', 'yuv420p', '-'], { encoding: 'buffer', maxBuffer: 1 << 26 });
    const frameBytes = 160 * 120 * 3 / 2;
    let n = 0;
    for await (const f of openFrameStream(clip)) {
      expect(Buffer.from(f.data.subarray(0, frameBytes)).equals(stdout.subarray(n * frameBytes, (n + 1) * frameBytes))).toBe(true);
      n++;
    }
    expect(n * frameBytes).toBe(stdout.length);
  });

  it('ends a truncated file with TRUNCATED_MEDIA and refuses regions outside the frame', async () => {
    const cut = await makeClip(tmp.dir, 'cut.mp4', { width: 160, height: 120, fps: 30, durationS: 2, truncateFraction: 0.5 });
    await expect((async () => { for await (const s of openRegionStream(cut, [{ x: 0, y: 0, w: 8, h: 8 }, { x: 8, y: 8, w: 8, h: 8 }])) void s; })())
      .rejects.toMatchObject({ code: 'TRUNCATED_MEDIA', details: { framesExpected: 60 } });
    const stream = openRegionStream(clip, [{ x: 150, y: 0, w: 20, h: 8 }]);
    await expect(stream.layout()).rejects.toBeInstanceOf(KerrError);
    expect(stream.pid).toBeUndefined();
  });
});
