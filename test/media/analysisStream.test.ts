import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openAnalysisStream } from '../../src/media/analysisStream.js';
import { openFrameStream } from '../../src/media/frameStream.js';
import { probeMedia } from '../../src/media/probe.js';
import { makeClip, tempDir } from '../helpers/makeClip.js';

/**
 * The 16-bit 4:4:4 overview ('yuv16') must hold each block's mean source codes times 2^(16 − bits)
 * with the range untouched (src/media/analysisStream.ts): checked against the block means of the
 * same frames read whole (openFrameStream, 8-bit 4:2:0), for limited and full range sources.
 */
describe('openAnalysisStream: the 16-bit 4:4:4 block overview', () => {
  let tmp: Awaited<ReturnType<typeof tempDir>>;
  const clips: Record<'tv' | 'pc', string> = { tv: '', pc: '' };
  beforeAll(async () => {
    tmp = await tempDir('analysis-stream');
    clips.tv = await makeClip(tmp.dir, 'tv.mp4', { width: 96, height: 64, fps: 10, durationS: 0.6, source: 'testsrc2' });
    clips.pc = await makeClip(tmp.dir, 'pc.mp4', { width: 96, height: 64, fps: 10, durationS: 0.6, source: 'testsrc2', pixFmt: 'yuvj420p', tags: { range: 'pc' } });
  });
  afterAll(async () => { await tmp.cleanup(); });

  for (const range of ['tv', 'pc'] as const) {
    it(`gives each block its mean Y, Cb, Cr codes ×256 (${range} range, step 4)`, async () => {
      const W = 96, H = 64, step = 4, gw = W / step, gh = H / step, cells = gw * gh;
      const probe = await probeMedia(clips[range]);
      const wholes: Uint8Array[] = [];
      for await (const f of openFrameStream(clips[range], { maxFrames: 4 })) wholes.push(f.data.slice());
      const stream = openAnalysisStream(probe, [], { step, overview: { kind: 'yuv16', range: range === 'pc' ? 'full' : 'limited' }, maxFrames: 4 });
      expect(stream.overviewBitDepth).toBe(16);
      let frames = 0;
      let worst = 0;
      for await (const set of stream.frames) {
        const o = set.overview!;
        const words = new Uint16Array(o.data.buffer, o.data.byteOffset, 3 * cells);
        const whole = wholes[set.index]!;
        for (let gy = 0; gy < gh; gy++) {
          for (let gx = 0; gx < gw; gx++) {
            let y = 0, u = 0, v = 0;
            for (let py = 0; py < step; py++) for (let px = 0; px < step; px++) y += whole[(gy * step + py) * W + gx * step + px]!;
            for (let py = 0; py < step / 2; py++) {
              for (let px = 0; px < step / 2; px++) {
                const i = (gy * step / 2 + py) * (W / 2) + gx * step / 2 + px;
                u += whole[W * H + i]!; v += whole[W * H + (W / 2) * (H / 2) + i]!;
              }
            }
            const c = gy * gw + gx;
            const want = [y / (step * step), u / (step * step / 4), v / (step * step / 4)];
            for (let p = 0; p < 3; p++) worst = Math.max(worst, Math.abs(words[p * cells + c]! / 256 - want[p]!));
          }
        }
        frames++;
      }
      expect(frames).toBe(4);
      // swscale's area filter works in fixed point: its block means agree within a tenth of a code
      // (a range conversion would move mid-grey codes by several codes, and ×257 instead of ×256 up to one)
      expect(worst).toBeLessThan(0.1);
    });
  }
});
