/**
 * The truth of an outside bench clip (test/reference/bench-clips/<name>/truth.json) and the bounds
 * that the renderer's notes give for a careful analysis (test/reference/README.md: B within 1 %, the
 * offset within one frame, the floor fraction within 0.002). The other headline bounds are derived
 * from those by the physics, as each comment says; JCGM 100:2008 §6.3 for the coverage factor.
 */
import { readFileSync } from 'node:fs';
import { expect } from 'vitest';
import { benchClip, type BenchClipName } from './referenceData.js';

export interface BenchTruth {
  B: number; L_mm: number; d_mm: number; offset_s: number; floorFraction: number; framePeriod_s: number;
  maxFrameInterval_s: number; roi: [number, number, number, number]; referenceRoi?: [number, number, number, number];
  halfWaveVoltage_V: number; contrastRatio: number; maxVoltage_V: number; frames: number;
}

/** The renderer's stated accuracy for a careful analysis (test/reference/README.md). */
export const B_REL = 0.01;
export const FLOOR_ABS = 0.002;
/** Coverage factor for "the truth lies within k standard errors" (JCGM 100:2008 §6.3; k = 3 ≈ 99.7 % for a normal error). */
export const COVERAGE_K = 3;

export function readBenchTruth(name: BenchClipName): BenchTruth {
  return JSON.parse(readFileSync(benchClip(name).truth, 'utf8')) as BenchTruth;
}

/**
 * The contrast ratio the truth allows when the floor fraction f is known only to ±0.002:
 * C = (A·T_max + F)/F = 1 + T_max/f, where T = sin²(π/2·(V/V_π)²) (crossed polarisers at 45°) and
 * T_max is its highest value over the drive, 1 once the drive reaches V_π; so C lies between
 * 1 + T_max/(f + 0.002) and 1 + T_max/(f − 0.002).
 */
export function contrastBounds(t: BenchTruth): [number, number] {
  const transmission = t.maxVoltage_V >= t.halfWaveVoltage_V ? 1 : Math.sin((Math.PI / 2) * (t.maxVoltage_V / t.halfWaveVoltage_V) ** 2) ** 2;
  return [1 + transmission / (t.floorFraction + FLOOR_ABS), 1 + transmission / (t.floorFraction - FLOOR_ABS)];
}

interface Headline {
  kerrConstant: { value: number; stdErr?: number | null };
  halfWaveVoltage: { value: number };
  syncOffset: { value: number };
  floorFraction: { value: number };
  contrastRatio: { value: number };
  uncertainty?: { kerrConstant?: { statisticalStdErr?: number } };
}

/** Every headline figure of a run (result.json) against the clip's truth, with the bounds above. */
export function expectHeadlineMatchesTruth(r: Headline, t: BenchTruth): void {
  expect(Math.abs(r.kerrConstant.value / t.B - 1), 'B relative error (renderer: 1 %)').toBeLessThan(B_REL);
  // V_π = d/√(2·B·L), so a relative error ε in B is ε/2 in V_π: B within 1 % puts V_π within 0.5 %.
  expect(Math.abs(r.halfWaveVoltage.value / t.halfWaveVoltage_V - 1), 'V_pi relative error (B bound / 2)').toBeLessThan(B_REL / 2);
  expect(Math.abs(r.syncOffset.value - t.offset_s), 'offset error (renderer: one frame)').toBeLessThan(t.framePeriod_s);
  expect(Math.abs(r.floorFraction.value - t.floorFraction), 'floor fraction error (renderer: 0.002)').toBeLessThan(FLOOR_ABS);
  const [cLo, cHi] = contrastBounds(t);
  expect(cLo, 'derived bounds bracket the renderer\'s own contrast').toBeLessThan(t.contrastRatio);
  expect(cHi).toBeGreaterThan(t.contrastRatio);
  expect(r.contrastRatio.value, 'contrast (from the floor bound)').toBeGreaterThan(cLo);
  expect(r.contrastRatio.value, 'contrast (from the floor bound)').toBeLessThan(cHi);
  // The stated uncertainty is honest and useful: the truth lies within 3 combined standard errors;
  // the statistical part alone is no larger than the 1 % a careful analysis reaches, so a huge σ
  // cannot pass. The combined σ also carries Type B terms the renderer does not know about
  // (logger calibration, default ±1 %; the camera response assumed from the tags, which a sweep
  // short of V_π checks only loosely: docs/uncertainty.md), so it is bounded separately, at 10 %.
  const sigma = r.kerrConstant.stdErr ?? NaN;
  expect(sigma).toBeGreaterThan(0);
  expect(Math.abs(r.kerrConstant.value - t.B), 'truth within 3 σ(B)').toBeLessThan(COVERAGE_K * sigma);
  const statistical = r.uncertainty?.kerrConstant?.statisticalStdErr ?? NaN;
  expect(statistical / t.B, 'statistical σ(B) under the renderer\'s 1 %').toBeLessThan(B_REL);
  expect(statistical).toBeLessThanOrEqual(sigma);
  expect(sigma / t.B, 'combined σ(B) under 10 %').toBeLessThan(0.1);
}
