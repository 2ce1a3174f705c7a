/**
 * Per-channel fits (--channels rgb) on a simulated white-light run whose Kerr constant differs per
 * camera channel (scenario `light.dispersion`): each channel's B is recovered within 3 %.
 * The truth is the scenario itself (simulator: src/sim), rendered here into a temporary folder.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parseScenario } from '../../src/sim/scenario.js';
import { simulateRun } from '../../src/sim/simulate.js';
import { analyzeRun } from '../../src/pipeline/analyze.js';

const work = mkdtempSync(join(tmpdir(), 'kt-channels-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const B = 2.0e-12;
const dispersion = [0.85, 1, 1.2] as const;

describe('per-channel Kerr fits', () => {
  it('recovers B for the red, green and blue channels of a white-light run with dispersion', async () => {
    const scenario = parseScenario({
      label: 'white light with dispersion',
      seed: 7,
      cell: { kerrConstantMPerV2: B, lengthMm: 40, gapMm: 4, liquidBreakdownKvPerMm: 6 },
      light: { profile: 'tophat', radiusPx: 14, centreXPx: 80, centreYPx: 60, white: true, dispersion, amplitude: 0.5 },
      dirt: { scatterFloor: 0.004, haloPeak: 0.002, haloSigmaPx: 40 },
      camera: { widthPx: 160, heightPx: 120, frameRateHz: 30, crf: 18 },
      drive: { segments: [{ kind: 'hold', durationS: 0.5 }, { kind: 'ramp', toHalfWaveFraction: 0.9, durationS: 3 }, { kind: 'ramp', toV: 0, durationS: 3 }, { kind: 'hold', durationS: 0.5 }] },
      logger: { sampleRateHz: 20, clockOffsetS: 0.2 },
    }, 'channels test');
    const sim = await simulateRun(scenario, join(work, 'sim'), { force: true });
    const roi = sim.truth.roi as number[];
    const out = await analyzeRun({
      videoPath: join(work, 'sim', 'clip.mp4'), voltsPath: join(work, 'sim', 'volts.csv'), lengthMm: 40, gapMm: 4,
      roi: { x: roi[0]!, y: roi[1]!, w: roi[2]!, h: roi[3]! }, channels: 'rgb',
    }, { toolVersion: 'test', ffmpegVersion: null });
    const ch = out.result.channels!;
    expect(ch.note).toMatch(/broad band/);
    expect(Math.abs(ch.r.value / (B * dispersion[0]) - 1)).toBeLessThan(0.03);
    expect(Math.abs(ch.g.value / (B * dispersion[1]) - 1)).toBeLessThan(0.03);
    expect(Math.abs(ch.b.value / (B * dispersion[2]) - 1)).toBeLessThan(0.03);
  });
});
