/**
 * The whole analyze path against the outside bench clips in test/reference/bench-clips: three
 * recordings with known truth made by a renderer that is not part of kerrtrace (provenance in
 * test/reference/README.md, which quotes the renderer's notes: a careful analysis recovers B within
 * 1 %, the offset within a frame and the floor fraction within 0.002). Every other bound below is
 * derived from those three by the physics (test/helpers/benchTruth.ts says how).
 */
import { describe, expect, it } from 'vitest';
import { analyzeRun, type AnalyzeOptions } from '../../src/pipeline/analyze.js';
import { benchClip, type BenchClipName } from '../helpers/referenceData.js';
import { B_REL, COVERAGE_K, FLOOR_ABS, expectHeadlineMatchesTruth, readBenchTruth } from '../helpers/benchTruth.js';
import { benchClipTag } from '../setup/outsideSources.js';

async function run(name: BenchClipName, withRoi: boolean) {
  const t = readBenchTruth(name);
  const files = benchClip(name);
  const o: AnalyzeOptions = {
    videoPath: files.clip,
    voltsPath: files.volts,
    lengthMm: t.L_mm,
    gapMm: t.d_mm,
  };
  if (withRoi) o.roi = { x: t.roi[0], y: t.roi[1], w: t.roi[2], h: t.roi[3] };
  if (t.referenceRoi) o.referenceRoi = { x: t.referenceRoi[0], y: t.referenceRoi[1], w: t.referenceRoi[2], h: t.referenceRoi[3] };
  const out = await analyzeRun(o, { toolVersion: 'test', ffmpegVersion: null });
  return { t, r: out.result };
}

describe('analyze on the outside bench clips (test/reference/bench-clips)', () => {
  for (const name of ['green_ramps', 'vfr_past_halfwave', 'white_steps_reference_card'] as const) {
    it(`${name}: recovers B within 1 %, the offset within one frame and the floor within 0.002 (bench-clips README)`, { tags: [benchClipTag(name)] }, async () => {
      const { t, r } = await run(name, true);
      expect(r.identifiable).toBe(true);
      expectHeadlineMatchesTruth(r, t);
      expect(r.events.filter((e) => e.kind === 'spark' || e.kind === 'particle')).toHaveLength(0);
    });
  }

  // Without the ROI the beam region is the one analyze finds; the renderer's notes speak of any
  // careful analysis, so the same bounds hold (B within 1 %, floor fraction within 0.002).
  it('green_ramps with the beam found automatically: the beam inside the true ROI, B within 1 %, floor within 0.002', { tags: [benchClipTag('green_ramps')] }, async () => {
    const { t, r } = await run('green_ramps', false);
    expect(r.regions.beamAuto).toBe(true);
    const cx = r.regions.beam.x + r.regions.beam.w / 2;
    const cy = r.regions.beam.y + r.regions.beam.h / 2;
    expect(cx).toBeGreaterThan(t.roi[0]);
    expect(cx).toBeLessThan(t.roi[0] + t.roi[2]);
    expect(cy).toBeGreaterThan(t.roi[1]);
    expect(cy).toBeLessThan(t.roi[1] + t.roi[3]);
    expect(Math.abs(r.kerrConstant.value / t.B - 1)).toBeLessThan(B_REL);
    expect(Math.abs(r.floorFraction.value - t.floorFraction)).toBeLessThan(FLOOR_ABS);
    expect(Math.abs(r.kerrConstant.value - t.B)).toBeLessThan(COVERAGE_K * r.kerrConstant.stdErr!);
  });
});
