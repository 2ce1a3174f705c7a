/**
 * Photo series without --roi (issue 13, done-when): photos rendered by the bench simulator
 * (src/sim/renderStillPhotos.ts) at chosen voltages, saved as sRGB JPEG, read with the beam and
 * its surround found automatically. The floor fraction must land within 30 % of the scenario's
 * truth (the bar), B within 3 % (the bar of the other stills round trips).
 * Truth (src/sim/truth.ts definition, crossed polarisers so the zero-field Jones transmission is
 * 0): floorFraction = (F + A/ratio)/A with F the scatter floor, A the amplitude and ratio the
 * polariser pair's extinction ratio. Ambient light and the wide halo lie under beam and surround
 * alike and are not floor: the surround rings must take them out.
 */
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { renderStillPhotos } from '../../src/sim/renderStillPhotos.js';
import { halfWaveVoltageV } from '../../src/core/physics/kerr.js';
import { readStillsSeries } from '../../src/stills/readStillsSeries.js';
import { stillsRunResult } from '../../src/stills/stillsRunResult.js';

const work = mkdtempSync(join(tmpdir(), 'kt-autoregion-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const B = 1.9e-12, L = 0.045, D = 0.0045;
const A = 0.5, F = 0.02, RATIO = 2000;
const scenario = {
  label: 'photo series, beam to be found', seed: 47,
  cell: { kerrConstantMPerV2: B, lengthMm: 45, gapMm: 4.5, liquidBreakdownKvPerMm: 6, extinctionRatio: RATIO },
  light: { profile: 'gaussian', sigmaPx: 8, centreXPx: 130, centreYPx: 60, wavelengthNm: 532, amplitude: A },
  dirt: { scatterFloor: F, haloPeak: 0.01, haloSigmaPx: 45 },
  camera: { widthPx: 220, heightPx: 150, transfer: 'srgb', ambient: 0.03 },
};
const TRUTH_FLOOR_FRACTION = (F + A / RATIO) / A;

describe('photo series without --roi: beam and surround found automatically', () => {
  it('floor fraction within 30 % of the simulated truth, B within 3 %, the found beam on the spot and warned about', async () => {
    const dir = join(work, 'series');
    mkdirSync(dir);
    const vpi = halfWaveVoltageV(B, L, D);
    const volts = Array.from({ length: 12 }, (_, i) => Math.round((1.05 * vpi * i) / 11));
    for (const p of renderStillPhotos(scenario, volts, 'test scenario')) {
      await sharp(p.rgb, { raw: { width: p.width, height: p.height, channels: 3 } }).jpeg({ quality: 95 }).toFile(join(dir, `step_${p.voltageV}V.jpg`));
    }
    const series = await readStillsSeries(dir, {});
    expect(series.beamAuto).toBe(true);
    const beam = series.roi;
    expect(beam.x <= 130 && beam.x + beam.w >= 130 && beam.y <= 60 && beam.y + beam.h >= 60, JSON.stringify(beam)).toBe(true);
    expect(beam.w * beam.h).toBeLessThan(0.1 * 220 * 150); // the spot, not the photo
    expect(series.surround).not.toBeNull();
    expect(series.warnings.find((w) => w.code === 'auto-region')?.message).toMatch(/found automatically at x=\d+, y=\d+/);

    const { result } = stillsRunResult({
      series, cell: { lengthM: L, effectiveLengthM: L, gapM: D, polariserAngleDeg: 45 }, fitOptions: {},
      label: 'auto', createdAt: '2026-12-02T15:00:00.000Z', tool: { name: 'kerrtrace', version: 'test', ffmpegVersion: null, node: 'v20' },
      inputs: { stills: [] }, options: {},
    });
    const ff = result.floorFraction.value;
    console.log(`auto region: floor fraction ${ff.toFixed(4)} ± ${result.floorFraction.stdErr?.toFixed(4)} (truth ${TRUTH_FLOOR_FRACTION.toFixed(4)}), B off by ${((result.kerrConstant.value / B - 1) * 100).toFixed(2)} %`);
    expect(result.regions).toMatchObject({ beamAuto: true, beam });
    expect(result.regions.surround).toEqual(series.surround!.b1);
    expect(Math.abs(ff / TRUTH_FLOOR_FRACTION - 1)).toBeLessThan(0.3);
    expect(Math.abs(result.kerrConstant.value / B - 1)).toBeLessThan(0.03);
    expect(result.validity?.valid).toBe(true);
  });
});
