import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { isVariableFrameRate, parseRate, probeMedia, probeVideo } from '../../src/media/probe.js';
import { KerrError } from '../../src/errors.js';
import { ffmpeg, ffprobeDecodedFrameCount, ffprobeStreams, makeClip, tempDir } from '../helpers/makeClip.js';
import { benchClip } from '../helpers/referenceData.js';
import { OUTSIDE } from '../setup/outsideSources.js';


async function probeError(path: string): Promise<KerrError> {
  try {
    await probeVideo(path);
  } catch (e) {
    if (e instanceof KerrError) return e;
    throw e;
  }
  throw new Error(`expected ${path} to be refused`);
}

describe('probeVideo against ffprobe', { tags: [OUTSIDE.ffprobe] }, () => {
  let tmp: Awaited<ReturnType<typeof tempDir>>;
  beforeAll(async () => { tmp = await tempDir('probe'); });
  afterAll(async () => { await tmp.cleanup(); });

  const sizes = [
    { width: 160, height: 120, fps: 30, durationS: 2 },
    { width: 320, height: 240, fps: 25, durationS: 1.6 },
    { width: 200, height: 150, fps: 60, durationS: 1 },
  ];
  it.each(sizes)('$width x $height at $fps fps: size, frames, rates and duration agree with ffprobe', async (spec) => {
    const clip = await makeClip(tmp.dir, `c${spec.width}.mp4`, { ...spec, tags: { range: 'tv', matrix: 'bt709', transfer: 'bt709', primaries: 'bt709' } });
    const info = await probeVideo(clip);
    const ref = await ffprobeStreams(clip);
    const s = ref.streams[0]!;
    expect([info.width, info.height]).toEqual([s.width, s.height]);
    expect(info.frameCount).toBe(await ffprobeDecodedFrameCount(clip));
    expect(info.frameCount).toBe(Math.round(spec.fps * spec.durationS)); // lavfi made exactly this many
    expect(info.nominalFps).toBeCloseTo(parseRate(s.r_frame_rate)!, 9);
    expect(info.meanFps).toBeCloseTo(spec.fps, 3);
    expect(info.durationS).toBeCloseTo(Number(s.duration), 6);
    expect(info.variableFrameRate).toBe(false);
    expect(info.rotationDeg).toBe(0);
    expect(info.codec).toBe('h264');
    expect(info.container).toBe(ref.format.format_name);
    expect(info.pixelFormat).toBe('yuv420p');
    expect(info.bitDepth).toBe(8);
    expect(info.colourRange).toBe('limited');
    expect(info.colourTransfer).toBe('bt709');
    expect(info.colourMatrix).toBe('bt709');
    expect(info.colourPrimaries).toBe('bt709');
  });

  it('applies rotation metadata: a 90° clip is reported at its displayed size', async () => {
    const clip = await makeClip(tmp.dir, 'rot.mp4', { width: 160, height: 96, fps: 10, durationS: 1, rotate: 90 });
    const info = await probeVideo(clip);
    const ref = await ffprobeStreams(clip);
    const s = ref.streams[0]!;
    const ccw = s.side_data_list?.find((d) => d.rotation !== undefined)?.rotation;
    expect(ccw).toBeDefined();
    expect(info.rotationDeg).toBe(((-ccw! % 360) + 360) % 360);
    expect([info.codedWidth, info.codedHeight]).toEqual([s.width, s.height]);
    expect([info.width, info.height]).toEqual([s.height, s.width]);
  });

  it('flags variable frame rate and reads a full-range JPEG-style stream as full range', async () => {
    const vfr = await makeClip(tmp.dir, 'vfr.mp4', { width: 160, height: 120, fps: 30, durationS: 2, vfr: true });
    const p = await probeMedia(vfr);
    expect(p.info.variableFrameRate).toBe(true);
    expect(p.frameIntervalS!.max).toBeGreaterThan(2 * p.frameIntervalS!.min);
    expect(p.info.frameCount).toBe(await ffprobeDecodedFrameCount(vfr));
    const full = await makeClip(tmp.dir, 'full.mp4', { width: 160, height: 120, fps: 10, durationS: 1, pixFmt: 'yuvj420p' });
    expect((await probeVideo(full)).colourRange).toBe('full');
  });

  it('counts frames when the container does not list them (Matroska)', async () => {
    const mp4 = await makeClip(tmp.dir, 'm.mp4', { width: 160, height: 120, fps: 15, durationS: 2 });
    const mkv = join(tmp.dir, 'm.mkv');
    await ffmpeg(['-i', mp4, '-c', 'copy', mkv]);
    const info = await probeVideo(mkv);
    expect(info.frameCountCounted).toBe(true);
    expect(info.frameCount).toBe(await ffprobeDecodedFrameCount(mkv));
  });

  it('reads the variable-frame-rate bench clip as VFR with its 1/60 s tick and longest interval (bench-clips truth.json: maxFrameInterval_s)', { tags: [OUTSIDE.vfr] }, async () => {
    const truth = JSON.parse(readFileSync(benchClip('vfr_past_halfwave').truth, 'utf8')) as { maxFrameInterval_s: number };
    const p = await probeMedia(benchClip('vfr_past_halfwave').clip);
    expect(p.info.variableFrameRate).toBe(true);
    expect(p.frameIntervalS!.min).toBeCloseTo(1 / 60, 4);
    expect(p.frameIntervalS!.max).toBeCloseTo(truth.maxFrameInterval_s, 4);
    const cfr = await probeVideo(benchClip('green_ramps').clip);
    expect(cfr.variableFrameRate).toBe(false);
    expect(cfr.nominalFps).toBe(30);
  });
});

describe('probeVideo refuses bad input with one clear error', () => {
  let tmp: Awaited<ReturnType<typeof tempDir>>;
  beforeAll(async () => { tmp = await tempDir('probe-bad'); });
  afterAll(async () => { await tmp.cleanup(); });

  it('a missing file: FILE_NOT_FOUND', async () => {
    const e = await probeError(join(tmp.dir, 'nope.mp4'));
    expect(e.code).toBe('FILE_NOT_FOUND');
    expect(e.hint).toBeTruthy();
  });

  it('an empty file: NOT_A_VIDEO saying it is empty', async () => {
    const p = join(tmp.dir, 'empty.mp4');
    writeFileSync(p, '');
    const e = await probeError(p);
    expect(e.code).toBe('NOT_A_VIDEO');
    expect(e.message).toMatch(/empty/);
  });

  it('a text file: NOT_A_VIDEO', async () => {
    const p = join(tmp.dir, 'notes.txt');
    writeFileSync(p, 'time_s,voltage_V\n0,0\n1,100\n');
    const e = await probeError(p);
    expect(e.code).toBe('NOT_A_VIDEO');
    expect(e.message).not.toMatch(/\n/);
  });

  it('a folder: NOT_A_VIDEO', async () => {
    expect((await probeError(tmp.dir)).code).toBe('NOT_A_VIDEO');
  });

  it('an MP4 cut in half with its index at the end: TRUNCATED_MEDIA', async () => {
    const clip = await makeClip(tmp.dir, 'cut.mp4', { width: 160, height: 120, durationS: 2, faststart: false, truncateFraction: 0.5 });
    const e = await probeError(clip);
    expect(e.code).toBe('TRUNCATED_MEDIA');
  });

  it('an MP4 cut in half with its index in front probes, with a note that the data ends early', async () => {
    const clip = await makeClip(tmp.dir, 'cut-fs.mp4', { width: 160, height: 120, durationS: 2, truncateFraction: 0.5 });
    const p = await probeMedia(clip);
    expect(p.endsEarly).toBe(true);
    expect(p.expectedFrames).toBe(60);
    expect(p.notes.join(' ')).toMatch(/ends early/);
  });

  it('an audio-only file: NOT_A_VIDEO (no video stream)', async () => {
    const p = join(tmp.dir, 'tone.m4a');
    await ffmpeg(['-f', 'lavfi', '-i', 'sine=duration=0.5', p]);
    const e = await probeError(p);
    expect(e.code).toBe('NOT_A_VIDEO');
    expect(e.message).toMatch(/no video stream/);
  });

  it('a still image: NOT_A_VIDEO pointing to the stills command', async () => {
    const p = join(tmp.dir, 'still.png');
    await ffmpeg(['-f', 'lavfi', '-i', 'color=c=gray:s=32x32', '-frames:v', '1', p]);
    const e = await probeError(p);
    expect(e.code).toBe('NOT_A_VIDEO');
    expect(e.hint).toMatch(/stills/);
    expect(readFileSync(p).length).toBeGreaterThan(0);
  });
});

describe('helpers', () => {
  it('parseRate reads ffprobe rationals', () => {
    expect(parseRate('30000/1001')).toBeCloseTo(29.97003, 5);
    expect(parseRate('0/0')).toBeNull();
    expect(parseRate(undefined)).toBeNull();
  });

  it('isVariableFrameRate ignores one dropped frame and timestamp rounding but not a spread', () => {
    const tick = 1 / 1000;
    const rounded = Float64Array.from({ length: 300 }, (_, i) => (i % 3 === 0 ? 0.034 : 0.033));
    expect(isVariableFrameRate(rounded, 0.033, tick)).toBe(false);
    const oneDrop = Float64Array.from({ length: 300 }, (_, i) => (i === 100 ? 0.0667 : 0.0333));
    expect(isVariableFrameRate(oneDrop, 0.0333, 0)).toBe(false);
    const spread = Float64Array.from({ length: 300 }, (_, i) => [1, 2, 3][i % 3]! / 60);
    expect(isVariableFrameRate(spread, 2 / 60, 0)).toBe(true);
  });
});
