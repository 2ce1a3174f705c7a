import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { grabFramePng } from '../../src/media/grabFrame.js';
import { ffmpegPath } from '../../src/media/ffmpegPaths.js';
import { isKerrError } from '../../src/errors.js';

let dir = '';
let clip = '';
let rotated = '';

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'kerrtrace-grab-'));
  clip = join(dir, 'black-then-white.mp4');
  rotated = join(dir, 'rotated.mp4');
  // 1 s black then 1 s white, 160×120 at 10 fps (tiny, so the test stays fast)
  const make = spawnSync(ffmpegPath(), ['-v', 'error', '-y',
    '-f', 'lavfi', '-i', 'color=c=black:s=160x120:r=10:d=1', '-f', 'lavfi', '-i', 'color=c=white:s=160x120:r=10:d=1',
    '-filter_complex', '[0:v][1:v]concat=n=2:v=1[v]', '-map', '[v]', '-c:v', 'libx264', '-pix_fmt', 'yuv420p', clip]);
  expect(make.status).toBe(0);
  const rot = spawnSync(ffmpegPath(), ['-v', 'error', '-y', '-i', clip, '-c', 'copy', '-metadata:s:v:0', 'rotate=90', rotated]);
  expect(rot.status).toBe(0);
});

afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

async function meanOf(png: Buffer): Promise<number> {
  const stats = await sharp(png).stats();
  return stats.channels[0]!.mean;
}

describe('grabFramePng', () => {
  it('returns the frame at the requested time as a PNG of the video size', async () => {
    const early = await grabFramePng(clip, 0.3);
    const late = await grabFramePng(clip, 1.5);
    expect(early.subarray(1, 4).toString('latin1')).toBe('PNG');
    const meta = await sharp(late).metadata();
    expect([meta.width, meta.height]).toEqual([160, 120]);
    expect(await meanOf(early)).toBeLessThan(30);
    expect(await meanOf(late)).toBeGreaterThan(225);
  });

  it('applies the rotation metadata, like the analysis (displayed orientation)', async () => {
    const meta = await sharp(await grabFramePng(rotated, 0.5)).metadata();
    expect([meta.width, meta.height]).toEqual([120, 160]);
  });

  it('fails clearly for a time past the end, a missing file and a negative time', async () => {
    const codeOf = async (p: Promise<unknown>) => { try { await p; return 'none'; } catch (e) { return isKerrError(e) ? e.code : String(e); } };
    expect(await codeOf(grabFramePng(clip, 30))).toBe('FFMPEG_FAILED');
    expect(await codeOf(grabFramePng(join(dir, 'missing.mp4'), 0))).toBe('FILE_NOT_FOUND');
    expect(await codeOf(grabFramePng(clip, -1))).toBe('BAD_ARGUMENT');
  });
});
