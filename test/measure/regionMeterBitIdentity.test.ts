/**
 * The region meter's fast paths (8-bit (Y, V)/(Y, U) tables, measureInto) must give exactly the
 * doubles of a plain per-pixel loop: the same per-pixel arithmetic as core/camera/yuvToLinear's
 * tables (range expansion, matrix, clamp, linear interpolation in the transfer table), the same
 * summation order (row sums in column order, then rows in order). Random frames, regions and
 * decodings; every field compared with Object.is (bit identity, not closeness).
 */
import { describe, expect, it } from 'vitest';
import { createRegionMeter, emptyMeasurement, LUMA_WEIGHTS, type RegionMeasurement } from '../../src/measure/regionMeter.js';
import { yuvTables } from '../../src/core/camera/yuvToLinear.js';
import { seededRandom } from '../helpers/random.js';
import type { CameraDecoding, Frame, Rect } from '../../src/media/types.js';

const random = seededRandom; // mulberry32 (test/helpers/random.ts), so a failure can be replayed

/** A 4:2:0 frame of random samples: smooth luma with noise plus a few fully random rows, so codes span 0..max and some clip. */
function randomFrame(width: number, height: number, bitDepth: number, rnd: () => number): Frame {
  const cw = (width + 1) >> 1, ch = (height + 1) >> 1;
  const n = width * height + 2 * cw * ch;
  const max = (1 << bitDepth) - 1;
  const samples = bitDepth > 8 ? new Uint16Array(n) : new Uint8Array(n);
  for (let y = 0; y < height; y++) {
    const wild = rnd() < 0.2;
    for (let x = 0; x < width; x++) {
      const smooth = max * (0.5 + 0.45 * Math.sin(x / 7 + y / 11));
      samples[y * width + x] = wild ? Math.floor(rnd() * (max + 1)) : Math.max(0, Math.min(max, Math.round(smooth + (rnd() - 0.5) * max * 0.1)));
    }
  }
  for (let k = width * height; k < n; k++) samples[k] = rnd() < 0.7 ? Math.round(max / 2 + (rnd() - 0.5) * max * 0.2) : Math.floor(rnd() * (max + 1));
  const data = bitDepth > 8 ? new Uint8Array(samples.buffer) : (samples as Uint8Array);
  return { index: 0, timeS: 0, width, height, data, bitDepth };
}

/** The plain reference: every pixel decoded on its own, row sums in column order, then added row by row. */
function reference(frame: Frame, rect: Rect, stride: number, d: CameraDecoding, bitDepth: number): RegionMeasurement {
  const t = yuvTables(d, bitDepth);
  const s = bitDepth > 8 ? new Uint16Array(frame.data.buffer, frame.data.byteOffset, frame.data.length >> 1) : frame.data;
  const w = frame.width, cw = (w + 1) >> 1, ch = (frame.height + 1) >> 1;
  const uOff = w * frame.height, vOff = uOff + cw * ch;
  const lin = (c: number): number => {
    const x = (c <= 0 ? 0 : c >= 255 ? 255 : c) * t.perCode;
    const i = Math.trunc(x);
    return t.linear[i]! + (x - i) * (t.linear[i + 1]! - t.linear[i]!);
  };
  const clamp = (c: number): number => (c <= 0 ? 0 : c >= 255 ? 255 : c);
  const sums = [0, 0, 0, 0, 0, 0];
  let clipped = 0;
  for (let y = rect.y; y < rect.y + rect.h; y += stride) {
    const row = [0, 0, 0, 0, 0, 0];
    for (let x = rect.x; x < rect.x + rect.w; x++) {
      const ci = Math.floor(y / 2) * cw + Math.floor(x / 2);
      const u = s[uOff + ci]!, v = s[vOff + ci]!;
      const base = t.yCode[s[y * w + x]!]!;
      const r = base + t.rFromV[v]!;
      const g = base + (t.gFromU[u]! + t.gFromV[v]!);
      const b = base + t.bFromU[u]!;
      if (r >= t.clipThreshold || g >= t.clipThreshold || b >= t.clipThreshold) clipped++;
      row[0] += lin(r); row[1] += lin(g); row[2] += lin(b);
      row[3] += clamp(r); row[4] += clamp(g); row[5] += clamp(b);
    }
    for (let k = 0; k < 6; k++) sums[k] += row[k]!;
  }
  const n = rect.w * Math.ceil(rect.h / stride);
  const [r, g, b] = [sums[0]! / n, sums[1]! / n, sums[2]! / n];
  return {
    r, g, b, luma: LUMA_WEIGHTS.r * r + LUMA_WEIGHTS.g * g + LUMA_WEIGHTS.b * b, pixelCount: n,
    clippedFraction: clipped / n, codeR: sums[3]! / n, codeG: sums[4]! / n, codeB: sums[5]! / n,
  };
}

const DECODINGS: CameraDecoding[] = [
  { range: 'limited', matrix: 'bt709', transfer: 'srgb', clipCode: 250 },
  { range: 'full', matrix: 'bt601', transfer: 'bt709', clipCode: 254 },
  { range: 'limited', matrix: 'bt2020', transfer: 'hlg', clipCode: 240 },
  { range: 'full', matrix: 'bt709', transfer: 'gamma:2.2', clipCode: 250, response: { code: [0, 64, 128, 192, 255], linear: [0, 0.05, 0.2, 0.55, 1] } },
];

function expectSame(got: RegionMeasurement, want: RegionMeasurement, what: string): void {
  for (const key of Object.keys(want) as (keyof RegionMeasurement)[]) {
    if (!Object.is(got[key], want[key])) expect.fail(`${what}: ${key} is ${got[key]} but the plain loop gives ${want[key]}`);
  }
}

describe('region meter against a plain per-pixel loop (bit identity)', () => {
  for (const bitDepth of [8, 10]) {
    it(`${bitDepth}-bit: random frames, regions (odd and even edges) and row strides give the same doubles`, () => {
      const rnd = random(bitDepth * 1000 + 7);
      let compared = 0;
      for (const d of DECODINGS) {
        for (let trial = 0; trial < 6; trial++) {
          const width = 24 + Math.floor(rnd() * 60), height = 20 + Math.floor(rnd() * 50);
          const frame = randomFrame(width, height, bitDepth, rnd);
          const rects: Rect[] = [];
          const strides: number[] = [];
          for (let k = 0; k < 5; k++) {
            const x = Math.floor(rnd() * (width - 1)), y = Math.floor(rnd() * (height - 1));
            rects.push({ x, y, w: 1 + Math.floor(rnd() * (width - x)), h: 1 + Math.floor(rnd() * (height - y)) });
            strides.push(1 + Math.floor(rnd() * 3));
          }
          rects.push({ x: 0, y: 0, w: width, h: height });
          strides.push(1);
          const meter = createRegionMeter(width, height, rects, d, strides, bitDepth);
          const fresh = meter.measure(frame);
          const into = meter.measureInto(frame, rects.map(emptyMeasurement));
          rects.forEach((rect, i) => {
            const want = reference(frame, rect, strides[i]!, d, bitDepth);
            expectSame(fresh[i]!, want, `${d.transfer} ${JSON.stringify(rect)} stride ${strides[i]}`);
            expectSame(into[i]!, want, `measureInto ${d.transfer} ${JSON.stringify(rect)}`);
            compared++;
          });
        }
      }
      expect(compared).toBe(DECODINGS.length * 6 * 6);
    });
  }

  it('measureInto fills the objects it is given and refuses a wrong number of them', () => {
    const rnd = random(3);
    const frame = randomFrame(32, 32, 8, rnd);
    const meter = createRegionMeter(32, 32, [{ x: 1, y: 1, w: 9, h: 9 }], DECODINGS[0]!);
    const out = [emptyMeasurement()];
    expect(meter.measureInto(frame, out)[0]).toBe(out[0]);
    expect(out[0]!.pixelCount).toBe(81);
    expect(() => meter.measureInto(frame, [])).toThrow(/1 regions was given 0 outputs/);
  });
});
