import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, readFileSync } from 'node:fs';
import { alignCrop, openFrameStream, yuv420FrameBytes } from '../../src/media/frameStream.js';
import { probeMedia } from '../../src/media/probe.js';
import { KerrError } from '../../src/errors.js';
import type { Frame } from '../../src/media/types.js';
import { ffprobeFrameTimes, makeClip, tempDir } from '../helpers/makeClip.js';
import { benchClip } from '../helpers/referenceData.js';
import { OUTSIDE } from '../setup/outsideSources.js';


/** Copies of the Y planes (frame data is reused by the stream). */
async function lumaPlanes(stream: AsyncIterable<Frame>, limit = Infinity): Promise<Array<{ index: number; timeS: number; width: number; height: number; y: Uint8Array }>> {
  const out = [];
  for await (const f of stream) {
    out.push({ index: f.index, timeS: f.timeS, width: f.width, height: f.height, y: f.data.slice(0, f.width * f.height) });
    if (out.length >= limit) break;
  }
  return out;
}

/** Linux: a reaped process has no /proc entry (a zombie keeps one, in state Z). */
function processGone(pid: number): boolean {
  return !existsSync(`/proc/${pid}`);
}

/** Alive and not a zombie. */
function processRunning(pid: number): boolean {
  try {
    return !readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.startsWith('Z');
  } catch {
    return false;
  }
}

describe('openFrameStream', () => {
  let tmp: Awaited<ReturnType<typeof tempDir>>;
  let cfr: string;
  beforeAll(async () => {
    tmp = await tempDir('stream');
    cfr = await makeClip(tmp.dir, 'cfr.mp4', { width: 160, height: 120, fps: 25, durationS: 2 });
  });
  afterAll(async () => { await tmp.cleanup(); });

  it('delivers every frame once, in order, as planar 4:2:0 in one reused buffer', async () => {
    const buffers = new Set<Uint8Array>();
    const indices: number[] = [];
    for await (const f of openFrameStream(cfr)) {
      buffers.add(f.data);
      indices.push(f.index);
      expect([f.width, f.height, f.data.length]).toEqual([160, 120, yuv420FrameBytes(160, 120)]);
    }
    expect(indices).toEqual(Array.from({ length: 50 }, (_, i) => i));
    expect(buffers.size).toBe(1);
  });

  it('times variable-frame-rate frames by the container timestamps, as ffprobe does frame by frame', { tags: [OUTSIDE.ffprobe] }, async () => {
    const vfr = await makeClip(tmp.dir, 'vfr.mp4', { width: 160, height: 120, fps: 30, durationS: 2, vfr: true });
    const reference = await ffprobeFrameTimes(vfr); // ffprobe -show_entries frame=pts_time (decodes the stream)
    const frames = await lumaPlanes(openFrameStream(vfr));
    expect(frames.length).toBe(reference.length);
    frames.forEach((f, i) => expect(Math.abs(f.timeS - reference[i]!)).toBeLessThan(1e-6));
    // and the times are really irregular (not index/fps)
    const gaps = frames.slice(1).map((f, i) => f.timeS - frames[i]!.timeS);
    expect(Math.max(...gaps) / Math.min(...gaps)).toBeGreaterThan(2);
  });

  it('times the variable-frame-rate bench clip as its renderer did (bench-clips truth.json frameTimes_s, within 1 ms)', { tags: [OUTSIDE.vfr] }, async () => {
    const truth = JSON.parse(readFileSync(benchClip('vfr_past_halfwave').truth, 'utf8')) as { frameTimes_s: number[] };
    const times: number[] = [];
    for await (const f of openFrameStream(benchClip('vfr_past_halfwave').clip, { crop: { x: 0, y: 0, w: 16, h: 16 } })) times.push(f.timeS);
    // The muxer's edit list hides the very last frame (the probe notes it); every shown frame matches.
    expect(times.length).toBeGreaterThanOrEqual(truth.frameTimes_s.length - 1);
    times.forEach((t, i) => expect(Math.abs(t - truth.frameTimes_s[i]!)).toBeLessThan(1e-3));
  });

  it('crops inside ffmpeg to exactly the pixels of the full frame (even-aligned crop)', async () => {
    const full = await lumaPlanes(openFrameStream(cfr), 3);
    const crop = { x: 20, y: 10, w: 40, h: 30 };
    const cropped = await lumaPlanes(openFrameStream(cfr, { crop }), 3);
    for (let k = 0; k < 3; k++) {
      expect([cropped[k]!.width, cropped[k]!.height]).toEqual([40, 30]);
      for (let y = 0; y < 30; y++) {
        for (let x = 0; x < 40; x++) expect(cropped[k]!.y[y * 40 + x]).toBe(full[k]!.y[(y + 10) * 160 + x + 20]);
      }
    }
  });

  it('widens an odd crop to even edges and says so in layout()', async () => {
    expect(alignCrop({ x: 3, y: 5, w: 10, h: 7 }, 160, 120)).toEqual({ x: 2, y: 4, w: 12, h: 8 });
    const stream = openFrameStream(cfr, { crop: { x: 3, y: 5, w: 10, h: 7 } });
    expect((await stream.layout()).crop).toEqual({ x: 2, y: 4, w: 12, h: 8 });
    const frames = await lumaPlanes(stream, 1);
    expect([frames[0]!.width, frames[0]!.height]).toEqual([12, 8]);
  });

  it('scales inside ffmpeg to the asked width, keeping the aspect with an even height', async () => {
    const frames = await lumaPlanes(openFrameStream(cfr, { scaleToWidth: 80 }), 2);
    expect([frames[0]!.width, frames[0]!.height]).toEqual([80, 60]);
  });

  it('delivers rotated clips upright: the frame is the stored picture turned as the metadata says', async () => {
    const plain = await makeClip(tmp.dir, 'plain.mp4', { width: 64, height: 48, fps: 5, durationS: 1, source: 'testsrc' });
    const rotated = await makeClip(tmp.dir, 'rotated.mp4', { width: 64, height: 48, fps: 5, durationS: 1, source: 'testsrc', rotate: 90 });
    const probe = await probeMedia(rotated);
    const [stored] = await lumaPlanes(openFrameStream(plain), 1);
    const [shown] = await lumaPlanes(openFrameStream(rotated), 1);
    expect([shown!.width, shown!.height]).toEqual([48, 64]);
    // Turn the stored picture clockwise by rotationDeg (90 or 270) and compare pixel by pixel.
    const cw = probe.info.rotationDeg;
    expect([90, 270]).toContain(cw);
    for (let y = 0; y < 64; y++) {
      for (let x = 0; x < 48; x++) {
        const [sx, sy] = cw === 90 ? [y, 47 - x] : [63 - y, x];
        expect(shown!.y[y * 48 + x]).toBe(stored!.y[sy * 64 + sx]);
      }
    }
  });

  it('stops and reaps ffmpeg when the loop breaks early (no zombie)', async () => {
    const long = await makeClip(tmp.dir, 'long.mp4', { width: 320, height: 240, fps: 25, durationS: 8, source: 'testsrc' });
    const stream = openFrameStream(long);
    let n = 0;
    for await (const f of stream) {
      void f;
      if (++n === 3) break;
    }
    const exit = await stream.closed();
    expect(exit).not.toBeNull();
    expect(exit!.code === 0).toBe(false); // killed, not finished
    expect(processGone(exit!.pid!)).toBe(true);
    expect(() => process.kill(exit!.pid!, 0)).toThrow();
  });

  it('applies backpressure: ffmpeg waits while the consumer is busy instead of racing to the end', async () => {
    const long = await makeClip(tmp.dir, 'long2.mp4', { width: 320, height: 240, fps: 25, durationS: 8, source: 'testsrc' });
    // 200 frames x 115 kB = 23 MB of raw video: far more than the pipe and stream buffers hold.
    const stream = openFrameStream(long);
    const it = stream[Symbol.asyncIterator]();
    await it.next();
    await new Promise((r) => setTimeout(r, 1500));
    expect(processRunning(stream.pid!)).toBe(true); // still alive: blocked on the full pipe
    expect(stream.framesRead).toBe(1);
    await it.return!();
    expect(processGone((await stream.closed())!.pid!)).toBe(true);
  });

  it('stops on an AbortSignal with its reason and reaps ffmpeg', async () => {
    const controller = new AbortController();
    const stream = openFrameStream(cfr, { signal: controller.signal });
    let caught: unknown;
    try {
      for await (const f of stream) if (f.index === 2) controller.abort(new Error('stop now'));
    } catch (e) {
      caught = e;
    }
    expect((caught as Error).message).toBe('stop now');
    expect(processGone((await stream.closed())!.pid!)).toBe(true);
  });

  it('reports progress as frames done of frames expected', async () => {
    const calls: Array<[number, number]> = [];
    for await (const f of openFrameStream(cfr, { onProgress: (d, t) => calls.push([d, t]) })) void f;
    expect(calls.length).toBe(50);
    expect(calls[0]).toEqual([1, 50]);
    expect(calls[49]).toEqual([50, 50]);
  });

  it('stops after maxFrames', async () => {
    expect((await lumaPlanes(openFrameStream(cfr, { maxFrames: 7 }))).length).toBe(7);
  });

  it('ends a truncated file with TRUNCATED_MEDIA saying how many frames were read of how many', async () => {
    const cut = await makeClip(tmp.dir, 'cut.mp4', { width: 160, height: 120, fps: 30, durationS: 3, truncateFraction: 0.5 });
    let read = 0;
    let caught: unknown;
    try {
      for await (const f of openFrameStream(cut)) { void f; read++; }
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(KerrError);
    const e = caught as KerrError;
    expect(e.code).toBe('TRUNCATED_MEDIA');
    expect(e.details?.framesRead).toBe(read);
    expect(e.details?.framesExpected).toBe(90);
    expect(read).toBeGreaterThan(10);
    expect(read).toBeLessThan(90);
    expect(e.message).toContain(`read ${read} of 90 frames`);
  });

  it('refuses a crop outside the frame before starting ffmpeg', async () => {
    const stream = openFrameStream(cfr, { crop: { x: 150, y: 0, w: 20, h: 10 } });
    await expect(lumaPlanes(stream)).rejects.toMatchObject({ code: 'BAD_REGION' });
    expect(stream.pid).toBeUndefined();
  });

  it('can be read only once', async () => {
    const stream = openFrameStream(cfr, { maxFrames: 1 });
    await lumaPlanes(stream);
    expect(() => stream[Symbol.asyncIterator]()).toThrow(KerrError);
  });
});
