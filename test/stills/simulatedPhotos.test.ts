/**
 * Stills round trip with photos rendered by the bench simulator (src/sim/renderStillPhotos.ts) at
 * chosen voltages, saved as sRGB JPEG, measured through the real command line: B within 3 % of
 * the scenario's (the bar). `npm test` compiles dist/ first.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { renderStillPhotos } from '../../src/sim/renderStillPhotos.js';
import { halfWaveVoltageV } from '../../src/core/physics/kerr.js';
import { cliEnv } from '../helpers/cliEnv.js';

const ROOT = join(__dirname, '..', '..');
const work = mkdtempSync(join(tmpdir(), 'kt-simphotos-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const B = 1.9e-12;
const scenario = {
  label: 'photo series', seed: 31,
  cell: { kerrConstantMPerV2: B, lengthMm: 45, gapMm: 4.5, liquidBreakdownKvPerMm: 6 },
  light: { profile: 'gaussian', sigmaPx: 9, centreXPx: 100, centreYPx: 70, wavelengthNm: 532, amplitude: 0.55 },
  dirt: { scatterFloor: 0.005, haloPeak: 0.002, haloSigmaPx: 50 },
  camera: { widthPx: 200, heightPx: 140, transfer: 'srgb' },
};

describe('photos rendered by the simulator', () => {
  it('recover B within 3 % through `kerrtrace stills`', async () => {
    const vpi = halfWaveVoltageV(B, 0.045, 0.0045);
    const volts = Array.from({ length: 11 }, (_, i) => Math.round((1.05 * vpi * i) / 10));
    const photos = renderStillPhotos(scenario, volts, 'test scenario');
    expect(photos).toHaveLength(11);
    for (const p of photos) {
      await sharp(p.rgb, { raw: { width: p.width, height: p.height, channels: 3 } }).jpeg({ quality: 95 })
        .toFile(join(work, `photo_${p.voltageV}V.jpg`));
    }
    const r = spawnSync(process.execPath, [join(ROOT, 'bin', 'kerrtrace.js'), 'stills', work, '--length-mm', '45', '--gap-mm', '4.5',
      '--roi', '87,57,27,27', '--dark-roi', '150,5,40,30', '--out', join(tmpdir(), `kt-simphotos-out-${process.pid}`), '--json', '--force'], { encoding: 'utf8', timeout: 240_000, env: cliEnv() });
    expect(r.stderr).toBe('');
    const result = JSON.parse(r.stdout) as { kerrConstant: { value: number }; source: string };
    rmSync(join(tmpdir(), `kt-simphotos-out-${process.pid}`), { recursive: true, force: true });
    expect(result.source).toBe('stills');
    console.log(`simulated photos: B off by ${((result.kerrConstant.value / B - 1) * 100).toFixed(2)} %`);
    expect(Math.abs(result.kerrConstant.value / B - 1)).toBeLessThan(0.03);
  });
});
