import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { Jimp } from 'jimp';
import { join } from 'node:path';
import { createRegionMeter, LUMA_WEIGHTS } from '../../src/measure/regionMeter.js';
import { srgbToLinear } from '../../src/core/camera/transfer.js';
import { decodePixel, yuvTables } from '../../src/core/camera/yuvToLinear.js';
import { openFrameStream } from '../../src/media/frameStream.js';
import type { CameraDecoding, Frame, Rect } from '../../src/media/types.js';
import { KerrError } from '../../src/errors.js';
import { exportFramePng, makeClip, tempDir } from '../helpers/makeClip.js';
import { OUTSIDE } from '../setup/outsideSources.js';

const decoding: CameraDecoding = { range: 'limited', matrix: 'bt709', transfer: 'srgb', clipCode: 250 };

/** A planar 4:2:0 frame from per-pixel luma and per-2x2-block chroma functions. */
function makeFrame(width: number, height: number, luma: (x: number, y: number) => number, chroma: (cx: number, cy: number) => [number, number]): Frame {
  const cw = (width + 1) >> 1;
  const ch = (height + 1) >> 1;
  const data = new Uint8Array(width * height + 2 * cw * ch);
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) data[y * width + x] = luma(x, y);
  for (let cy = 0; cy < ch; cy++) {
    for (let cx = 0; cx < cw; cx++) {
      const [u, v] = chroma(cx, cy);
      data[width * height + cy * cw + cx] = u;
      data[width * height + cw * ch + cy * cw + cx] = v;
    }
  }
  return { index: 0, timeS: 0, width, height, data };
}

/** Straightforward per-pixel reference using decodePixel (the single-pixel path). */
function referenceMeans(frame: Frame, rect: Rect, d: CameraDecoding): { r: number; g: number; b: number; clipped: number } {
  const tables = yuvTables(d);
  const cw = (frame.width + 1) >> 1;
  const ch = (frame.height + 1) >> 1;
  const out = new Float64Array(6);
  let r = 0, g = 0, b = 0, clipped = 0;
  for (let y = rect.y; y < rect.y + rect.h; y++) {
    for (let x = rect.x; x < rect.x + rect.w; x++) {
      const ci = Math.floor(y / 2) * cw + Math.floor(x / 2);
      const isClipped = decodePixel(tables, frame.data[y * frame.width + x]!, frame.data[frame.width * frame.height + ci]!, frame.data[frame.width * frame.height + cw * ch + ci]!, out);
      r += out[3]!; g += out[4]!; b += out[5]!;
      if (isClipped) clipped++;
    }
  }
  const n = rect.w * rect.h;
  return { r: r / n, g: g / n, b: b / n, clipped: clipped / n };
}

describe('createRegionMeter on synthetic frames', () => {
  it('reads a flat grey patch as the sRGB linear value of its expanded code (IEC 61966-2-1)', { tags: [OUTSIDE.srgb] }, () => {
    const frame = makeFrame(64, 48, () => 126, () => [128, 128]);
    const [s] = createRegionMeter(64, 48, [{ x: 5, y: 7, w: 20, h: 10 }], decoding).measure(frame);
    const expected = srgbToLinear((126 - 16) / 219);
    expect(s!.r).toBeCloseTo(expected, 5);
    expect(s!.g).toBeCloseTo(expected, 5);
    expect(s!.b).toBeCloseTo(expected, 5);
    expect(s!.luma).toBeCloseTo(expected, 5);
    expect(s!.pixelCount).toBe(200);
    expect(s!.clippedFraction).toBe(0);
  });

  it('weights linear R, G, B by Rec. 709 luminance coefficients 0.2126/0.7152/0.0722 (ITU-R BT.709-6)', { tags: [OUTSIDE.bt709] }, () => {
    const frame = makeFrame(32, 32, (x) => 60 + 3 * x, (cx, cy) => [90 + 4 * cx, 200 - 3 * cy]);
    const [s] = createRegionMeter(32, 32, [{ x: 3, y: 5, w: 21, h: 17 }], decoding).measure(frame);
    expect(s!.luma).toBeCloseTo(0.2126 * s!.r + 0.7152 * s!.g + 0.0722 * s!.b, 12);
    expect(LUMA_WEIGHTS.r + LUMA_WEIGHTS.g + LUMA_WEIGHTS.b).toBeCloseTo(1, 12);
  });

  it('uses chroma sample (⌊x/2⌋, ⌊y/2⌋) for odd-placed regions, matching the per-pixel reference', () => {
    const frame = makeFrame(40, 30, (x, y) => (17 * x + 29 * y) % 220 + 16, (cx, cy) => [(37 * cx + 11 * cy) % 224 + 16, (13 * cx + 41 * cy) % 224 + 16]);
    const rects = [{ x: 1, y: 1, w: 7, h: 5 }, { x: 0, y: 0, w: 40, h: 30 }, { x: 33, y: 25, w: 7, h: 5 }];
    const samples = createRegionMeter(40, 30, rects, decoding).measure(frame);
    rects.forEach((rect, k) => {
      const ref = referenceMeans(frame, rect, decoding);
      expect(samples[k]!.r).toBeCloseTo(ref.r, 12);
      expect(samples[k]!.g).toBeCloseTo(ref.g, 12);
      expect(samples[k]!.b).toBeCloseTo(ref.b, 12);
      expect(samples[k]!.clippedFraction).toBeCloseTo(ref.clipped, 12);
    });
  });

  it('reads only the region: changing every pixel outside it leaves the result unchanged', () => {
    const rect = { x: 10, y: 8, w: 12, h: 10 };
    const inside = (x: number, y: number): boolean => x >= rect.x && x < rect.x + rect.w && y >= rect.y && y < rect.y + rect.h;
    const a = makeFrame(48, 36, (x, y) => (inside(x, y) ? 100 + x : 20), (cx, cy) => (inside(2 * cx, 2 * cy) ? [140, 110] : [128, 128]));
    const b = makeFrame(48, 36, (x, y) => (inside(x, y) ? 100 + x : 230), (cx, cy) => (inside(2 * cx, 2 * cy) ? [140, 110] : [16, 240]));
    const meter = createRegionMeter(48, 36, [rect], decoding);
    expect(meter.measure(a)).toEqual(meter.measure(b));
  });

  it('counts clipped pixels: half the region at limited-range white gives clipped fraction 0.5', () => {
    const frame = makeFrame(20, 20, (x) => (x < 10 ? 235 : 100), () => [128, 128]);
    const [s] = createRegionMeter(20, 20, [{ x: 0, y: 0, w: 20, h: 20 }], decoding).measure(frame);
    expect(s!.clippedFraction).toBe(0.5);
  });

  it('throws BAD_REGION for a region outside the frame and INTERNAL for a frame of another size', () => {
    expect(() => createRegionMeter(20, 20, [{ x: 15, y: 0, w: 10, h: 5 }], decoding)).toThrow(KerrError);
    const meter = createRegionMeter(20, 20, [{ x: 0, y: 0, w: 5, h: 5 }], decoding);
    expect(() => meter.measure(makeFrame(22, 20, () => 16, () => [128, 128]))).toThrow(/22x20/);
  });
});

describe('region means from the frame stream against independent decoders', { tags: [OUTSIDE.sharp, OUTSIDE.jimp] }, () => {
  let tmp: Awaited<ReturnType<typeof tempDir>>;
  beforeAll(async () => { tmp = await tempDir('meter'); });
  afterAll(async () => { await tmp.cleanup(); });

  // Reference: ffmpeg's own scaler writes the frame as a PNG (same BT.709/BT.601 matrix, limited→full
  // range, nearest chroma); sharp's stats() and jimp's pixel access read that PNG. Compared in
  // code-value space (the gamma-encoded values the PNG holds) within 0.5 code value.
  const cases = [
    { source: 'testsrc2', matrix: 'bt709' as const, tag: 'bt709' },
    { source: 'smptebars', matrix: 'bt601' as const, tag: 'smpte170m' },
  ];
  it.each(cases)('$source ($matrix): means within 0.5 code of sharp stats() and jimp on ffmpeg\'s PNG', async ({ source, matrix, tag }) => {
    const clip = await makeClip(tmp.dir, `${source}.mp4`, { width: 320, height: 240, fps: 10, durationS: 1, source, convertMatrix: matrix, tags: { range: 'tv', matrix: tag, transfer: 'iec61966-2-1' } });
    const regions = [{ x: 0, y: 0, w: 320, h: 240 }, { x: 11, y: 13, w: 61, h: 47 }, { x: 150, y: 100, w: 40, h: 40 }, { x: 201, y: 31, w: 77, h: 99 }];
    const meter = createRegionMeter(320, 240, regions, { ...decoding, matrix });
    const frameIndex = 4;
    let measured: ReturnType<typeof meter.measure> | undefined;
    for await (const frame of openFrameStream(clip)) if (frame.index === frameIndex) measured = meter.measure(frame);
    expect(measured).toBeDefined();
    const png = await exportFramePng(clip, frameIndex, join(tmp.dir, `${source}.png`), { matrix, range: 'tv' });
    const image = await Jimp.read(png);
    for (let k = 0; k < regions.length; k++) {
      const r = regions[k]!;
      const cropped = await sharp(png).extract({ left: r.x, top: r.y, width: r.w, height: r.h }).png().toBuffer();
      const stats = await sharp(cropped).stats();
      const jimpSums = [0, 0, 0];
      for (let y = r.y; y < r.y + r.h; y++) {
        for (let x = r.x; x < r.x + r.w; x++) {
          const i = (y * image.bitmap.width + x) * 4;
          for (let c = 0; c < 3; c++) jimpSums[c] += image.bitmap.data[i + c]!;
        }
      }
      const ours = [measured![k]!.codeR, measured![k]!.codeG, measured![k]!.codeB];
      for (let c = 0; c < 3; c++) {
        expect(Math.abs(ours[c]! - stats.channels[c]!.mean)).toBeLessThanOrEqual(0.5);
        expect(Math.abs(ours[c]! - jimpSums[c]! / (r.w * r.h))).toBeLessThanOrEqual(0.5);
      }
      // The linear means agree with the PNG's pixels linearised by IEC 61966-2-1 (within the
      // linear-light equivalent of half a code value at the region's level).
      const linearPng = [0, 0, 0];
      for (let y = r.y; y < r.y + r.h; y++) {
        for (let x = r.x; x < r.x + r.w; x++) {
          const i = (y * image.bitmap.width + x) * 4;
          for (let c = 0; c < 3; c++) linearPng[c] += srgbToLinear(image.bitmap.data[i + c]! / 255);
        }
      }
      const linearOurs = [measured![k]!.r, measured![k]!.g, measured![k]!.b];
      for (let c = 0; c < 3; c++) {
        const slope = (srgbToLinear(Math.min(1, (ours[c]! + 1) / 255)) - srgbToLinear(Math.max(0, (ours[c]! - 1) / 255))) / 2;
        expect(Math.abs(linearOurs[c]! - linearPng[c]! / (r.w * r.h))).toBeLessThanOrEqual(Math.max(0.5 * slope, 0.002));
      }
    }
  });
});
