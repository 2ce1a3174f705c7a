// Runs the real command line (node bin/kerrtrace.js stills); needs `npx tsc -p .` first, as `npm test` does.
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { halfWaveVoltageV, crossedTransmission, DEG } from '../../src/core/physics/kerr.js';
import { BEAM_ROI, DARK_ROI, tempFolder, writeJpeg } from './stillsFixtures.js';

const root = fileURLToPath(new URL('../..', import.meta.url));
const bin = `${root}bin/kerrtrace.js`;

function run(args: string[]): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [bin, 'stills', ...args], { cwd: root, encoding: 'utf8', env: { ...process.env, KERRTRACE_DEBUG: '' } });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

// A sweep of our own: B = 2.4e-12 m/V^2 (nitrobenzene, Lux notes), L = 50 mm, d = 5 mm ⇒ V_pi ≈ 10.2 kV.
const B = 2.4e-12, L = 0.05, D = 0.005;
const FLOOR = 0.02, AMP = 0.5;
const VOLTS = [0, 2000, 4000, 6000, 7000, 8000, 9000, 10000, 11000, 12000, 13000];

let work: { dir: string; cleanup: () => void };
const extraFolders: Array<() => void> = [];
let photos: string;
beforeAll(async () => {
  work = tempFolder();
  photos = join(work.dir, 'photos');
  const { mkdirSync } = await import('node:fs');
  mkdirSync(photos);
  for (const [k, v] of VOLTS.entries()) {
    const t = crossedTransmission(45 * DEG, Math.PI * (v / halfWaveVoltageV(B, L, D)) ** 2); // Jones calculus, DESIGN.md
    // auto exposure: brighter scenes were shot shorter, as a phone would; EXIF records it
    const exposure = k % 2 === 0 ? 1 : 0.5;
    await writeJpeg(join(photos, `step${String(k).padStart(2, '0')}_${(v / 1000).toFixed(1)}kV.jpg`), { beam: FLOOR + AMP * t, exposure, black: 0.005 }, { exposureTime: exposure === 1 ? '1/60' : '1/120', iso: '100', fNumber: '1.8' });
  }
});
afterAll(() => {
  work.cleanup();
  for (const c of extraFolders) c();
});

describe('kerrtrace stills (real CLI)', () => {
  it('the compiled CLI exists (run `npx tsc -p .` first)', () => {
    expect(existsSync(`${root}dist/cli/main.js`)).toBe(true);
  });

  it('recovers the Kerr constant of a synthetic photo sweep and writes stills.csv and stills.json', () => {
    const out = join(work.dir, 'out');
    const r = run([photos, '--length-mm', '50', '--gap-mm', '5', '--roi', `${BEAM_ROI.x},${BEAM_ROI.y},${BEAM_ROI.w},${BEAM_ROI.h}`, '--dark-roi', `${DARK_ROI.x},${DARK_ROI.y},${DARK_ROI.w},${DARK_ROI.h}`, '--out', out]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Kerr constant B/);
    const record = JSON.parse(readFileSync(join(out, 'stills.json'), 'utf8')) as {
      fit: { kerrConstant: { value: number; stdErr: number; unit: string }; halfWaveVoltage: { value: number }; floorFraction: { value: number }; photosUsed: number };
      exposureBasis: string;
      photos: Array<{ exposureRelative: number }>;
      inputs: { photos: Array<{ sha256: string }> };
    };
    expect(record.exposureBasis).toBe('exif');
    expect(record.photos[1]!.exposureRelative).toBeCloseTo(0.5, 9);
    expect(record.fit.photosUsed).toBe(VOLTS.length);
    expect(record.fit.kerrConstant.unit).toBe('m/V^2');
    expect(Math.abs(record.fit.kerrConstant.value / B - 1)).toBeLessThan(0.03);
    expect(Math.abs(record.fit.halfWaveVoltage.value / halfWaveVoltageV(B, L, D) - 1)).toBeLessThan(0.015);
    expect(Math.abs(record.fit.floorFraction.value - FLOOR / AMP)).toBeLessThan(0.01);
    expect(record.inputs.photos[0]!.sha256).toMatch(/^[0-9a-f]{64}$/);
    const csv = readFileSync(join(out, 'stills.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toBe('file,voltage_V,intensity,roi_linear,dark_linear,reference_linear,exposure_relative,clipped_fraction,transfer,used,excluded_reason,model,residual');
    expect(csv).toHaveLength(VOLTS.length + 1);

    // never overwrites without --force
    const again = run([photos, '--length-mm', '50', '--gap-mm', '5', '--out', out]);
    expect(again.code).toBe(2);
    expect(again.stderr).toMatch(/already exists and would be overwritten/);
  });

  const bad: Array<[string, () => string[], RegExp]> = [
    ['negative geometry', () => [photos, '--length-mm', '50', '--gap-mm', '-5'], /expected a positive electrode gap in mm for --gap-mm but received "-5"/],
    ['missing gap', () => [photos, '--length-mm', '50'], /no electrode gap was given/],
    ['folder with no images', () => [work.dir, '--length-mm', '50', '--gap-mm', '5'], /no JPEG, PNG or TIFF photos in/],
    ['HEIC photo', () => {
      const d = tempFolder();
      extraFolders.push(d.cleanup);
      writeFileSync(join(d.dir, 'IMG_0001.HEIC'), Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from('ftypheic\0\0\0\0mif1heic', 'latin1')]));
      return [d.dir, '--length-mm', '50', '--gap-mm', '5'];
    }, /IMG_0001\.HEIC is a HEIC\/HEIF photo.*export the photos as JPEG/],
    ['malformed region', () => [photos, '--length-mm', '50', '--gap-mm', '5', '--roi', '10,10,0,5'], /--roi/],
  ];
  for (const [what, args, message] of bad) {
    it(`bad input (${what}): one clear line, exit code 2, no stack trace`, () => {
      const r = run(args());
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      const lines = r.stderr.trimEnd().split('\n');
      expect(lines).toHaveLength(1);
      expect(lines[0]).toMatch(/^kerrtrace: /);
      expect(lines[0]).toMatch(message);
    });
  }
});
