import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { traceVideo } from '../../src/pipeline/trace.js';
import { regionTraceColumns, regionTraceCsv } from '../../src/pipeline/regionTraceCsv.js';
import { median } from '../../src/measure/exposure.js';
import { KerrError } from '../../src/errors.js';
import { makeClip, tempDir } from '../helpers/makeClip.js';
import { benchClip } from '../helpers/referenceData.js';
import { OUTSIDE } from '../setup/outsideSources.js';


interface CardTruth {
  referenceRoi: [number, number, number, number];
  roi: [number, number, number, number];
  exposureGain: { terms: Array<[number, number, number]> };
}

describe('traceVideo', () => {
  let tmp: Awaited<ReturnType<typeof tempDir>>;
  beforeAll(async () => { tmp = await tempDir('trace'); });
  afterAll(async () => { await tmp.cleanup(); });

  it('recovers the drifting exposure of the reference-card bench clip from its grey card (bench-clips truth.json exposureGain, within 1.5 %)', { tags: [OUTSIDE.whiteSteps] }, async () => {
    const truth = JSON.parse(readFileSync(benchClip('white_steps_reference_card').truth, 'utf8')) as CardTruth;
    const [rx, ry, rw, rh] = truth.referenceRoi;
    const [bx, by, bw, bh] = truth.roi;
    const t = await traceVideo(benchClip('white_steps_reference_card').clip, {
      regions: [{ x: bx, y: by, w: bw, h: bh }],
      reference: { x: rx, y: ry, w: rw, h: rh },
    });
    // truth: gain(t) = exp(Σ a·sin(2πt/P + φ)); our gains are normalised by their median.
    const trueGain = Array.from(t.timeS, (s) => Math.exp(truth.exposureGain.terms.reduce((acc, [a, p, phi]) => acc + a * Math.sin((2 * Math.PI * s) / p + phi), 0)));
    const norm = median(trueGain);
    let worst = 0, sumAbs = 0;
    for (let i = 0; i < t.frames; i++) {
      const relError = Math.abs(t.gains!.gains[i]! / (trueGain[i]! / norm) - 1);
      worst = Math.max(worst, relError);
      sumAbs += relError;
    }
    expect(worst).toBeLessThan(0.015); // single frames: 8-bit steps and H.264 on a flat card
    expect(sumAbs / t.frames).toBeLessThan(0.004);
    expect(t.gains!.maxGain / t.gains!.minGain).toBeGreaterThan(1.3); // it really drifted (±20 %)
    // corrected = raw / gain
    for (const i of [0, 100, 400]) expect(t.corrected[0]!.luma[i]).toBeCloseTo(t.regions[0]!.luma[i]! / t.gains!.gains[i]!, 12);
  });

  it('gives the same numbers whether ffmpeg crops each region or delivers whole frames', async () => {
    const clip = await makeClip(tmp.dir, 'c.mp4', { width: 320, height: 240, fps: 10, durationS: 1.5, source: 'testsrc2' });
    const opts = { regions: [{ x: 33, y: 41, w: 20, h: 15 }, { x: 201, y: 100, w: 31, h: 40 }], dark: { x: 5, y: 200, w: 10, h: 10 } };
    const cropped = await traceVideo(clip, opts);
    const whole = await traceVideo(clip, { ...opts, cropToRegions: false });
    expect(cropped.crops).toEqual([{ x: 32, y: 40, w: 22, h: 16 }, { x: 200, y: 100, w: 32, h: 40 }, { x: 4, y: 200, w: 12, h: 10 }]);
    expect(whole.crops).toEqual([{ x: 0, y: 0, w: 320, h: 240 }]);
    expect(cropped.frames).toBe(15);
    for (const k of [0, 1]) {
      expect(Array.from(cropped.corrected[k]!.luma)).toEqual(Array.from(whole.corrected[k]!.luma));
      expect(Array.from(cropped.regions[k]!.r)).toEqual(Array.from(whole.regions[k]!.r));
    }
    // dark-subtracted: corrected = raw − dark, per channel
    for (let i = 0; i < cropped.frames; i++) {
      expect(cropped.corrected[1]!.g[i]).toBeCloseTo(cropped.regions[1]!.g[i]! - cropped.dark!.g[i]!, 12);
    }
  });

  it('writes the documented CSV columns, one row per frame', async () => {
    const clip = await makeClip(tmp.dir, 'd.mp4', { width: 160, height: 120, fps: 10, durationS: 1, vfr: true });
    const t = await traceVideo(clip, { regions: [{ x: 10, y: 10, w: 8, h: 8 }, { x: 50, y: 50, w: 8, h: 8 }], dark: { x: 0, y: 0, w: 4, h: 4 }, reference: { x: 100, y: 20, w: 20, h: 20 } });
    const columns = regionTraceColumns(t);
    expect(columns).toEqual([
      'time_s', 'frame',
      'roi1_luma', 'roi1_r', 'roi1_g', 'roi1_b', 'roi1_clipped_fraction',
      'roi2_luma', 'roi2_r', 'roi2_g', 'roi2_b', 'roi2_clipped_fraction',
      'dark_luma', 'dark_r', 'dark_g', 'dark_b', 'dark_clipped_fraction',
      'reference_luma', 'reference_r', 'reference_g', 'reference_b', 'reference_clipped_fraction', 'gain',
    ]);
    const lines = regionTraceCsv(t).trimEnd().split('\n');
    expect(lines.length).toBe(t.frames + 1);
    const row = lines[3]!.split(',');
    expect(row.length).toBe(columns.length);
    expect(Number(row[0])).toBeCloseTo(t.timeS[2]!, 6);
    expect(Number(row[1])).toBe(2);
    expect(Number(row[2])).toBeCloseTo(t.corrected[0]!.luma[2]!, 6);
  });

  it('refuses regions outside the frame naming the option, and an empty region list', async () => {
    const clip = await makeClip(tmp.dir, 'e.mp4', { width: 160, height: 120, fps: 10, durationS: 0.5 });
    await expect(traceVideo(clip, { regions: [] })).rejects.toMatchObject({ code: 'BAD_ARGUMENT' });
    await expect(traceVideo(clip, { regions: [{ x: 0, y: 0, w: 4, h: 4 }], dark: { x: 150, y: 0, w: 20, h: 4 } })).rejects.toSatisfy(
      (e: unknown) => e instanceof KerrError && e.code === 'BAD_REGION' && e.message.includes('--dark-roi') && e.message.includes('160x120'));
  });
});
