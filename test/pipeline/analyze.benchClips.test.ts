/**
 * The whole analyze path against the outside bench clips in test/reference/bench-clips: three
 * recordings with known truth made by a renderer that is not part of kerrtrace (provenance in
 * test/reference/README.md, which quotes the renderer's notes: a careful analysis recovers B within
 * 1 %, the offset within a frame and the floor fraction within 0.002). Every other bound below is
 * derived from those three by the physics, and says how in a comment.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyzeRun, type AnalyzeOptions } from '../../src/pipeline/analyze.js';
import { benchClip, type BenchClipName } from '../helpers/referenceData.js';
import { benchClipTag } from '../setup/outsideSources.js';

interface Truth {
  B: number; L_mm: number; d_mm: number; offset_s: number; floorFraction: number; framePeriod_s: number;
  maxFrameInterval_s: number; roi: [number, number, number, number]; referenceRoi?: [number, number, number, number];
  halfWaveVoltage_V: number; contrastRatio: number; maxVoltage_V: number;
}

/** The renderer's stated accuracy for a careful analysis (test/reference/README.md). */
const B_REL = 0.01;
const FLOOR_ABS = 0.002;

function truthOf(name: BenchClipName): Truth {
  return JSON.parse(readFileSync(benchClip(name).truth, 'utf8')) as Truth;
}

async function run(name: BenchClipName, withRoi: boolean) {
  const t = truthOf(name);
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

/**
 * The contrast ratio the truth allows when the floor fraction f is known only to ±0.002:
 * C = (A·T_max + F)/F = 1 + T_max/f, where T = sin²(π/2·(V/V_π)²) (crossed polarisers at 45°) and
 * T_max is its highest value over the drive, 1 once the drive reaches V_π; so C lies between
 * 1 + T_max/(f + 0.002) and 1 + T_max/(f − 0.002).
 */
function contrastBounds(t: Truth): [number, number] {
  const transmission = t.maxVoltage_V >= t.halfWaveVoltage_V ? 1 : Math.sin((Math.PI / 2) * (t.maxVoltage_V / t.halfWaveVoltage_V) ** 2) ** 2;
  return [1 + transmission / (t.floorFraction + FLOOR_ABS), 1 + transmission / (t.floorFraction - FLOOR_ABS)];
}

describe('analyze on the outside bench clips (test/reference/bench-clips)', () => {
  for (const name of ['green_ramps', 'vfr_past_halfwave', 'white_steps_reference_card'] as const) {
    it(`${name}: recovers B within 1 %, the offset within one frame and the floor within 0.002 (bench-clips README)`, { tags: [benchClipTag(name)] }, async () => {
      const { t, r } = await run(name, true);
      expect(r.identifiable).toBe(true);
      expect(Math.abs(r.kerrConstant.value / t.B - 1)).toBeLessThan(B_REL);
      // V_π = d/√(2·B·L), so a relative error ε in B is ε/2 in V_π: B within 1 % puts V_π within 0.5 %.
      expect(Math.abs(r.halfWaveVoltage.value / t.halfWaveVoltage_V - 1)).toBeLessThan(B_REL / 2);
      expect(Math.abs(r.syncOffset.value - t.offset_s)).toBeLessThan(t.framePeriod_s);
      expect(Math.abs(r.floorFraction.value - t.floorFraction)).toBeLessThan(FLOOR_ABS);
      const [cLo, cHi] = contrastBounds(t);
      expect(cLo).toBeLessThan(t.contrastRatio); // the derivation reproduces the renderer's own figure
      expect(cHi).toBeGreaterThan(t.contrastRatio);
      expect(r.contrastRatio.value).toBeGreaterThan(cLo);
      expect(r.contrastRatio.value).toBeLessThan(cHi);
      // The stated uncertainty is honest and useful: the truth lies within 3 standard errors
      // (coverage factor k = 3, JCGM 100:2008 §6.3: about 99.7 % for a normal error), and the standard
      // error is no larger than the 1 % a careful analysis reaches, so a huge σ cannot pass.
      expect(r.kerrConstant.stdErr).toBeGreaterThan(0);
      expect(Math.abs(r.kerrConstant.value - t.B)).toBeLessThan(3 * r.kerrConstant.stdErr!);
      expect(r.kerrConstant.stdErr! / t.B).toBeLessThan(B_REL);
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
    expect(Math.abs(r.kerrConstant.value - t.B)).toBeLessThan(3 * r.kerrConstant.stdErr!);
  });
});
