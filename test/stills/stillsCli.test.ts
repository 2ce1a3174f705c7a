// Runs the real command line (node bin/kerrtrace.js stills); needs `npx tsc -p .` first, as `npm test` does.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { halfWaveVoltageV, crossedTransmission, DEG } from '../../src/core/physics/kerr.js';
import type { RunResult } from '../../src/result/schema.js';
import { BEAM_ROI, DARK_ROI, tempFolder, writeJpeg } from './stillsFixtures.js';
import { testMediaFile } from '../helpers/referenceData.js';
import { cliEnv } from '../helpers/cliEnv.js';

const root = fileURLToPath(new URL('../..', import.meta.url));
const bin = `${root}bin/kerrtrace.js`;

function kerrtrace(args: string[]): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [bin, ...args], { cwd: root, encoding: 'utf8', timeout: 240_000, env: cliEnv() });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}
const stills = (args: string[]) => kerrtrace(['stills', ...args]);
const readResult = (dir: string): RunResult => JSON.parse(readFileSync(join(dir, 'result.json'), 'utf8')) as RunResult;
const rectArg = (r: { x: number; y: number; w: number; h: number }) => `${r.x},${r.y},${r.w},${r.h}`;
const REGIONS = ['--roi', rectArg(BEAM_ROI), '--dark-roi', rectArg(DARK_ROI)];

// A sweep of our own: B = 2.4e-12 m/V^2 (nitrobenzene, Lux notes), L = 50 mm, d = 5 mm ⇒ V_pi ≈ 10.2 kV.
const B = 2.4e-12, L = 0.05, D = 0.005;
const VPI = halfWaveVoltageV(B, L, D);
const FLOOR = 0.02, AMP = 0.5;
const VOLTS = [0, 2000, 4000, 6000, 7000, 8000, 9000, 10000, 11000, 12000, 13000];
const SECONDS_APART = 7;
const beamAt = (v: number): number => FLOOR + AMP * crossedTransmission(45 * DEG, Math.PI * (v / VPI) ** 2); // Jones calculus, DESIGN.md

let work: { dir: string; cleanup: () => void };
const extraFolders: Array<() => void> = [];
let photos: string;
let lowSweep: string;
let phone: string;
beforeAll(async () => {
  work = tempFolder();
  photos = join(work.dir, 'photos');
  mkdirSync(photos);
  for (const [k, v] of VOLTS.entries()) {
    // auto exposure: brighter scenes were shot shorter, as a phone would; EXIF records it, and the capture time
    const exposure = k % 2 === 0 ? 1 : 0.5;
    const seconds = 10 + k * SECONDS_APART;
    await writeJpeg(join(photos, `step${String(k).padStart(2, '0')}_${(v / 1000).toFixed(1)}kV.jpg`), { beam: beamAt(v), exposure, black: 0.005 }, {
      exposureTime: exposure === 1 ? '1/60' : '1/120', iso: '100', fNumber: '1.8',
      dateTimeOriginal: `2024:05:17 14:${String(Math.floor(seconds / 60)).padStart(2, '0')}:${String(seconds % 60).padStart(2, '0')}`, subSecTimeOriginal: '25',
    });
  }
  // one over-exposed photo: the beam region clips, so it must be left out and counted
  await writeJpeg(join(photos, 'step11_10.5kV.jpg'), { beam: beamAt(10500), exposure: 2.5, black: 0.005 }, {
    exposureTime: '1/24', iso: '100', fNumber: '1.8', dateTimeOriginal: '2024:05:17 14:01:30', subSecTimeOriginal: '25',
  });

  // A low sweep (to 0.44 V_pi) with ±1 % flicker of the light between photos: B cannot be told from brightness.
  lowSweep = join(work.dir, 'low');
  mkdirSync(lowSweep);
  const flicker = [0.6, -0.9, 0.3, 1, -0.4, -0.8, 0.7, -0.2, 0.9, -0.6];
  for (let k = 0; k < 10; k++) {
    const v = 500 * k;
    await writeJpeg(join(lowSweep, `low${k}_${v}V.jpg`), { beam: beamAt(v) * (1 + 0.01 * flicker[k]!), black: 0.005 }, { exposureTime: '1/60', iso: '100', fNumber: '1.8' });
  }
  // the open photo: analyser parallel, no field (T = 1, so the beam is AMP), shot at half the exposure
  mkdirSync(join(work.dir, 'open'));
  await writeJpeg(join(work.dir, 'open', 'parallel.jpg'), { beam: AMP, exposure: 0.5, black: 0.005 }, { exposureTime: '1/120', iso: '100', fNumber: '1.8' });

  // A phone-like series: no exposure EXIF, auto exposure wandering ±40 %, a grey card in view,
  // ±1 % flicker of the light between photos and pixel noise.
  phone = join(work.dir, 'phone');
  mkdirSync(phone);
  const wander = [1, 0.7, 1.3, 0.6, 1.4, 0.9, 1.1, 0.8, 1.2, 0.75, 1.25, 0.65, 1.35, 1.05];
  const lightFlicker = [0.5, -1, 0.8, -0.3, 1, -0.7, 0.2, -0.9, 0.6, -0.5, 0.9, -0.2, 0.4, -0.8];
  for (let k = 0; k < 14; k++) {
    const v = 1000 * k;
    await writeJpeg(join(phone, `IMG_${String(4100 + k)} ${v / 1000} kV.jpg`), { beam: beamAt(v) * (1 + 0.01 * lightFlicker[k]!), exposure: 0.8 * wander[k]!, black: 0.005, noise: 0.02 });
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

  it('round trip: B within 3 % (the issue\'s bar), a full result.json with source "stills", trace.csv, report and regions.png', () => {
    const out = join(work.dir, 'out');
    const r = stills([photos, '--length-mm', '50', '--gap-mm', '5', ...REGIONS, '--out', out, '--quiet']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Kerr constant B/);
    expect(r.stdout).toMatch(/step11_10\.5kV\.jpg .*left out \(clipped\)/);
    expect(r.stdout).toMatch(/^ {2}photos used +11 of 12 \(left out: 1 clipped\)$/m);
    expect(r.stdout).toMatch(/^ {2}sync offset +none: each photo carries its voltage \(no clock to synchronise\)$/m);
    const result = readResult(out);
    const relErrB = result.kerrConstant.value / B - 1;
    console.log(`stills round trip: B = ${result.kerrConstant.value.toExponential(4)} ± ${result.kerrConstant.stdErr?.toExponential(2)} m/V^2 (true ${B}), relative error ${(relErrB * 100).toFixed(2)} %; V_pi ${result.halfWaveVoltage.value.toFixed(0)} V (true ${VPI.toFixed(0)} V)`);
    expect(Math.abs(relErrB)).toBeLessThan(0.03);
    expect(Math.abs(result.halfWaveVoltage.value / VPI - 1)).toBeLessThan(0.015);
    expect(Math.abs(result.floorFraction.value - FLOOR / AMP)).toBeLessThan(0.01);
    // every field analyze writes, with units where the quantity has one (ratios are dimensionless)
    expect(result).toMatchObject({
      schemaVersion: 2, kind: 'kerrtrace-run', source: 'stills', label: 'photos', identifiable: true,
      kerrConstant: { unit: 'm/V^2' }, halfWaveVoltage: { unit: 'V' }, quarterWaveVoltage: { unit: 'V' },
      syncOffset: { value: 0, unit: 's' },
      sync: { manual: true, offsetS: 0, sharpnessS: null, ambiguous: false, curve: { offsetS: [], score: [] } },
      camera: { width: 160, height: 120, fps: null, transfer: 'srgb', range: 'full' },
      regions: { beam: BEAM_ROI, dark: DARK_ROI, beamAuto: false },
      frames: { total: 12, used: 11, excluded: { clipped: 1 } },
      events: [{ kind: 'clipped', frameIndex: 11, size: 1 }],
      identifiability: { openLevelUsed: false },
      fit: { converged: true, robust: 'huber' },
      linearised: { agreesWithFit: true },
      options: { exposureBasis: 'exif', voltageSource: 'file-names', timeBasis: 'exif-capture-time' },
    });
    for (const key of ['floorFraction', 'contrastRatio'] as const) {
      expect(Number.isFinite(result[key].value)).toBe(true);
      expect(result[key].unit).toBeUndefined();
    }
    expect(result.contrastRatio.value).toBeGreaterThan(10); // (floor + amp)/floor = 26 for this sweep
    expect(result.inputs.stills).toHaveLength(12);
    for (const f of result.inputs.stills!) expect(f.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(result.warnings.find((w) => w.code === 'clipping')).toMatchObject({ guideSection: 'avoid-clipping' });
    expect(result.files).toMatchObject({ result: 'result.json', trace: 'trace.csv', report: 'report.html', summary: 'summary.md', regions: 'regions.png', stills: 'stills.csv' });
    for (const f of ['report.html', 'summary.md', 'regions.png', 'stills.csv', 'plots/time-trace.svg', 'plots/transmission.svg']) expect(existsSync(join(out, f)), f).toBe(true);
    expect(existsSync(join(out, 'plots/sync.svg'))).toBe(false); // no clock to synchronise, so no sync plot
    expect(readFileSync(join(out, 'report.html'), 'utf8')).toMatch(/photo series/);

    // trace.csv: one row per photo, time = EXIF capture time after the earliest photo
    const trace = readFileSync(join(out, 'trace.csv'), 'utf8').trim().split('\n');
    expect(trace[0]).toBe('time_s,frame,voltage_V,intensity,model,residual,used,excluded_reason');
    expect(trace).toHaveLength(13);
    const row = (k: number) => trace[k + 1]!.split(',');
    expect(Number(row(3)[0])).toBeCloseTo(3 * SECONDS_APART, 6);
    expect(Number(row(3)[2])).toBe(6000);
    expect(row(11).slice(6)).toEqual(['0', 'clipped']);
    expect(Math.abs(Number(row(7)[3]) - beamAt(10000))).toBeLessThan(0.01); // intensity in linear units of the first photo's exposure
    const csv = readFileSync(join(out, 'stills.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toBe('frame,file,voltage_V,roi_linear,dark_linear,reference_linear,exposure_relative,clipped_fraction,transfer,bit_depth,surround_linear');
    expect(csv[2]!.split(',').slice(0, 3)).toEqual(['1', 'step01_2.0kV.jpg', '2000']);
    expect(Number(csv[2]!.split(',')[6])).toBeCloseTo(0.5, 9);

    // never overwrites without --force; with --force it replaces the folder
    const again = stills([photos, '--length-mm', '50', '--gap-mm', '5', '--out', out]);
    expect(again.code).toBe(2);
    expect(again.stderr).toMatch(/already exists and would be overwritten/);
    const forced = stills([photos, '--length-mm', '50', '--gap-mm', '5', ...REGIONS, '--out', out, '--force', '--no-report', '--label', 'cell A, photos']);
    expect(forced.code).toBe(0);
    expect(readResult(out).label).toBe('cell A, photos');
    expect(existsSync(join(out, 'report.html'))).toBe(false);
    expect(existsSync(join(out, 'trace.csv'))).toBe(true);
  });

  it('without --roi the beam is found and its surround subtracted: B within 3 %, warned as auto-region, drawn on regions.png', () => {
    const out = join(work.dir, 'out-auto');
    const r = stills([photos, '--length-mm', '50', '--gap-mm', '5', '--out', out, '--quiet', '--no-report']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const result = readResult(out);
    expect(result.regions.beamAuto).toBe(true);
    const b = result.regions.beam;
    expect(b.x <= 80 && b.x + b.w >= 80 && b.y <= 60 && b.y + b.h >= 60).toBe(true); // the disc's centre (stillsFixtures)
    expect(result.regions.surround).toBeDefined();
    expect(result.warnings.map((w) => w.code)).toContain('auto-region');
    expect(Math.abs(result.kerrConstant.value / B - 1)).toBeLessThan(0.03);
    expect(result.frames.excluded).toEqual({ clipped: 1 });
    expect(existsSync(join(out, 'regions.png'))).toBe(true);
    const csv = readFileSync(join(out, 'stills.csv'), 'utf8').trim().split('\n');
    expect(Number(csv[1]!.split(',').at(-1))).toBeGreaterThan(0); // surround_linear: ambient and black level around the disc
  });

  it('a phone-like series (auto exposure tracked by a grey card, flicker, pixel noise): B within 3 %', () => {
    const out = join(work.dir, 'phone-out');
    const r = stills([phone, '--length-mm', '50', '--gap-mm', '5', ...REGIONS, '--reference-roi', '10,10,30,30', '--out', out]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const result = readResult(out);
    const relErrB = result.kerrConstant.value / B - 1;
    console.log(`phone-like stills: B = ${result.kerrConstant.value.toExponential(4)} ± ${result.kerrConstant.stdErr?.toExponential(2)} m/V^2, relative error ${(relErrB * 100).toFixed(2)} %`);
    expect(Math.abs(relErrB)).toBeLessThan(0.03);
    // The error bar is honest: the planted B lies within 3 standard errors (coverage factor k = 3,
    // JCGM 100:2008 §6.3), with no added allowance that a too-small σ could hide behind.
    expect(Math.abs(relErrB)).toBeLessThan((3 * result.kerrConstant.stdErr!) / B);
    expect(result.options.exposureBasis).toBe('reference');
    expect(result.regions.reference).toEqual({ x: 10, y: 10, w: 30, h: 30 });
    expect(result.warnings.find((w) => w.code === 'exposure-drift')).toMatchObject({ guideSection: 'lock-exposure' });
  });

  it('--json prints result.json; the default output folder is <folder>.kerrtrace beside the photos', () => {
    const r = stills([photos, '--length-mm', '50', '--gap-mm', '5', ...REGIONS, '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const printed = JSON.parse(r.stdout) as RunResult; // stdout holds the JSON and nothing else
    const written = readResult(join(work.dir, 'photos.kerrtrace'));
    expect(printed.kerrConstant).toEqual(written.kerrConstant);
    expect(printed.files.report).toBe('report.html');
  });

  it('a sweep to 0.44 V_pi is not identifiable; --open-level or --open-photo fixes the amplitude and makes it so (DESIGN.md, identifiability)', () => {
    const free = stills([lowSweep, '--length-mm', '50', '--gap-mm', '5', ...REGIONS, '--out', join(work.dir, 'low-free')]);
    // the not-identifiable gate (as analyze): the run is written, marked not valid, and the exit code is 3
    expect(free.code).toBe(3);
    expect(free.stderr).toMatch(/^kerrtrace: the run failed a check: .*marked not valid/);
    expect(free.stdout).toMatch(/Kerr constant B\s+not identifiable/);
    const freeResult = readResult(join(work.dir, 'low-free'));
    expect(freeResult.identifiable).toBe(false);
    expect(freeResult.validity).toMatchObject({ valid: false, failures: [{ gate: 'not-identifiable' }] });
    expect(freeResult.warnings.find((w) => w.code === 'not-identifiable')).toMatchObject({ guideSection: 'open-level' });
    expect(freeResult.options.timeBasis).toBe('photo-index');

    // the open level in trace.csv units: the beam's full modulation AMP at the first photo's exposure
    const open = stills([lowSweep, '--length-mm', '50', '--gap-mm', '5', ...REGIONS, '--open-level', String(AMP), '--out', join(work.dir, 'low-open')]);
    expect(open.code).toBe(0);
    const openResult = readResult(join(work.dir, 'low-open'));
    console.log(`low sweep with --open-level: B = ${openResult.kerrConstant.value.toExponential(4)} ± ${openResult.kerrConstant.stdErr?.toExponential(2)} (true ${B})`);
    expect(openResult.identifiable).toBe(true);
    expect(openResult.identifiability.openLevelUsed).toBe(true);
    expect(openResult.model.amplitude.value).toBe(AMP);
    expect(Math.abs(openResult.kerrConstant.value / B - 1)).toBeLessThan(0.05);

    // the same from the open photo itself, measured like the series and put on its exposure scale by EXIF
    const photo = stills([lowSweep, '--length-mm', '50', '--gap-mm', '5', ...REGIONS, '--open-photo', join(work.dir, 'open', 'parallel.jpg'), '--out', join(work.dir, 'low-photo')]);
    expect(photo.stderr).toBe('');
    expect(photo.code).toBe(0);
    const photoResult = readResult(join(work.dir, 'low-photo'));
    const openPhoto = photoResult.options.openPhoto as { sha256: string; level: number; exposureRelative: number };
    console.log(`low sweep with --open-photo: open level ${openPhoto.level.toFixed(4)} (true ${AMP}), B = ${photoResult.kerrConstant.value.toExponential(4)} (true ${B})`);
    expect(openPhoto.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(openPhoto.exposureRelative).toBeCloseTo(0.5, 9);
    expect(Math.abs(openPhoto.level / AMP - 1)).toBeLessThan(0.02);
    expect(photoResult.identifiable).toBe(true);
    expect(Math.abs(photoResult.kerrConstant.value / B - 1)).toBeLessThan(0.05);
  });

  const badInputs: Array<[string, () => string[], RegExp]> = [
    ['negative geometry', () => [photos, '--length-mm', '50', '--gap-mm', '-5'], /expected a positive electrode gap in mm for --gap-mm but received "-5"/],
    ['missing gap', () => [photos, '--length-mm', '50'], /no electrode gap was given/],
    ['effective length shorter than the electrodes', () => [photos, '--length-mm', '50', '--gap-mm', '5', '--effective-length-mm', '40'], /effective length at least the electrode length/],
    ['open level not positive', () => [photos, '--length-mm', '50', '--gap-mm', '5', '--open-level', '0'], /expected a positive open level .* for --open-level but received "0"/],
    ['both --open-level and --open-photo', () => [photos, '--length-mm', '50', '--gap-mm', '5', '--open-level', '0.5', '--open-photo', 'x.jpg'], /give at most one of --open-level and --open-photo/],
    ['an open photo that does not exist', () => [photos, '--length-mm', '50', '--gap-mm', '5', ...REGIONS, '--open-photo', join(work.dir, 'open', 'missing.jpg')], /the open photo .*missing\.jpg does not exist/],
    ['folder with no images', () => {
      const d = tempFolder();
      extraFolders.push(d.cleanup);
      writeFileSync(join(d.dir, 'volts.csv'), 'file,voltage\n');
      return [d.dir, '--length-mm', '50', '--gap-mm', '5'];
    }, /no JPEG, PNG or TIFF photos in/],
    ['HEIC photo', () => {
      const d = tempFolder();
      extraFolders.push(d.cleanup);
      writeFileSync(join(d.dir, 'IMG_0001.HEIC'), Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from('ftypheic\0\0\0\0mif1heic', 'latin1')]));
      return [d.dir, '--length-mm', '50', '--gap-mm', '5'];
    }, /IMG_0001\.HEIC is a HEIC\/HEIF photo.*export the photos as JPEG/],
    ['malformed region', () => [photos, '--length-mm', '50', '--gap-mm', '5', '--roi', '10,10,0,5'], /--roi/],
    ['region outside the photo', () => [photos, '--length-mm', '50', '--gap-mm', '5', '--roi', '150,0,20,10'], /--roi reaches x = 170, outside the 160x120 frame/],
    ['too few photos for a fit', () => {
      const d = tempFolder();
      extraFolders.push(d.cleanup);
      for (const name of ['a_0V.jpg', 'b_5kV.jpg', 'c_9kV.jpg']) copyFromSweep(name, d.dir);
      return [d.dir, '--length-mm', '50', '--gap-mm', '5'];
    }, /the Kerr fit needs at least 6 usable photos at 4 or more different voltages; this series has 3 usable photo\(s\) at 3 voltage\(s\)\. Take more photos/],
    ['an output that is the photo folder', () => [photos, '--length-mm', '50', '--gap-mm', '5', '--out', photos, '--force'], /the output .* is (or holds )?one of the inputs/],
  ];
  for (const [what, args, message] of badInputs) {
    it(`bad input (${what}): one clear line, exit code 2, nothing written`, () => {
      const target = join(work.dir, `never-${what.replace(/\W+/g, '-')}`);
      const argv = args();
      const r = stills(argv.includes('--out') ? argv : [...argv, '--out', target]);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      const lines = r.stderr.trimEnd().split('\n');
      expect(lines).toHaveLength(1);
      expect(lines[0]).toMatch(/^kerrtrace: /);
      expect(lines[0]).toMatch(message);
      expect(existsSync(target)).toBe(false);
      expect(readdirSync(work.dir).filter((f) => f.includes('.partial-'))).toEqual([]);
    });
  }
});

/** Copies a photo of the main sweep under another name into `dir` (for the small bad-input folders). */
function copyFromSweep(name: string, dir: string): void {
  writeFileSync(join(dir, name), readFileSync(join(photos, 'step00_0.0kV.jpg')));
}

// The same cell filmed: test-media/cfr-ramp is B = 2.4e-12 m/V^2, L = 50 mm, d = 5 mm (npm run media).
describe('kerrtrace compare accepts a stills run', () => {
  it('compares a stills run with a video run of the same cell: B agrees within the uncertainties', () => {
    const stillsOut = join(work.dir, 'cmp-stills');
    const videoOut = join(work.dir, 'cmp-video');
    expect(stills([photos, '--length-mm', '50', '--gap-mm', '5', ...REGIONS, '--out', stillsOut, '--no-report']).code).toBe(0);
    const video = kerrtrace(['analyze', testMediaFile('cfr-ramp', 'run', 'clip.mp4'), '--volts', testMediaFile('cfr-ramp', 'run', 'volts.csv'), '--length-mm', '50', '--gap-mm', '5', '--out', videoOut, '--no-maps', '--no-report', '--quiet']);
    expect(video.stderr).toBe('');
    expect(video.code).toBe(0);
    const r = kerrtrace(['compare', stillsOut, videoOut, '--out', join(work.dir, 'cmp'), '--label', 'photos', '--label', 'video']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/From photos to video: /);
    const comparison = JSON.parse(readFileSync(join(work.dir, 'cmp', 'comparison.json'), 'utf8')) as { runs: Array<{ label: string }>; warnings: Array<{ code: string }> };
    expect(comparison.runs.map((x) => x.label)).toEqual(['photos', 'video']);
    expect(comparison.warnings.map((w) => w.code)).not.toContain('different-cells');
    const bStills = readResult(stillsOut).kerrConstant;
    const bVideo = readResult(videoOut).kerrConstant;
    expect(Math.abs(bStills.value - bVideo.value) / Math.hypot(bStills.stdErr!, bVideo.stdErr!)).toBeLessThan(3);
  });
});
