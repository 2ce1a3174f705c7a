/**
 * The camera's true response, end to end with the project's simulator (numbers invented):
 * - video from a "phone" whose tone curve (power law 1.8 with a mid-tone S-curve) differs from its
 *   BT.709 tag: the run's response check warns; a calibration clip of the same camera (the
 *   analyser turning steadily, period found by the tool; or the same clip with its angles as a
 *   CSV record) run through `kerrtrace calibrate-camera` gives a profile, and with
 *   `--camera-profile` B comes within 2 % of the truth;
 * - a photo series from a phone curve tagged sRGB: a calibration photo set (angle in each file
 *   name) gives a profile that brings B within 2 %.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyzeRun } from '../../src/pipeline/analyze.js';
import { halfWaveVoltageV } from '../../src/core/physics/kerr.js';
import { parseScenario } from '../../src/sim/scenario.js';
import { simulateRun } from '../../src/sim/simulate.js';
import { renderCalibrationPhotos, renderStillPhotos } from '../../src/sim/renderStillPhotos.js';
import type { RunResult } from '../../src/result/schema.js';

const ROOT = join(__dirname, '..', '..');
const BIN = join(ROOT, 'bin', 'kerrtrace.js');
const haveCli = existsSync(join(ROOT, 'dist', 'cli', 'main.js'));
const B = 2.4e-12;
const PHONE = { exponent: 1.8, midContrast: 0.45 };

function kerrtrace(args: string[]) {
  const r = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', timeout: 300_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const camera = { widthPx: 240, heightPx: 180, frameRateHz: 30, ambient: 0.01, transfer: 'bt709', toneCurve: PHONE, crf: 20 };
const base = {
  cell: { kerrConstantMPerV2: B, lengthMm: 50, gapMm: 5, liquidBreakdownKvPerMm: 6 },
  light: { profile: 'gaussian', sigmaPx: 8, centreXPx: 120, centreYPx: 90, wavelengthNm: 532, amplitude: 0.6 },
  dirt: { scatterFloor: 0.006, haloPeak: 0.003, haloSigmaPx: 60 },
  camera,
  logger: { sampleRateHz: 10, noiseV: 10, clockOffsetS: 0.3 },
};
const runScenario = {
  ...base, label: 'phone curve run', seed: 41,
  drive: { segments: [
    { kind: 'hold', durationS: 0.5 }, { kind: 'ramp', toHalfWaveFraction: 1.15, durationS: 3 },
    { kind: 'ramp', toV: 0, durationS: 3 }, { kind: 'hold', durationS: 0.5 }] },
};
const calibrationScenario = {
  ...base, label: 'calibration: analyser turning', seed: 42,
  cell: { ...base.cell, analyserAngleDeg: 45, analyserTurnPeriodS: 4 },
  drive: { segments: [{ kind: 'hold', durationS: 8 }] },
};

let work: string;
beforeAll(() => { work = mkdtempSync(join(tmpdir(), 'kt-profile-')); });
afterAll(() => { rmSync(work, { recursive: true, force: true }); });

describe.skipIf(!haveCli)('a camera profile corrects a phone curve that its tags do not describe', () => {
  it('video: the run check warns; the profile from a rotating-analyser clip brings B within 2 %', async () => {
    const run = await simulateRun(parseScenario(runScenario, 'run.json'), join(work, 'run'));
    const cal = await simulateRun(parseScenario(calibrationScenario, 'cal.json'), join(work, 'cal'));
    const hooks = { toolVersion: 'test', ffmpegVersion: null };
    const o = { videoPath: run.files.clip, voltsPath: run.files.volts, lengthMm: 50, gapMm: 5 };

    const tagsOnly = (await analyzeRun(o, hooks)).result;
    expect(tagsOnly.cameraResponse?.route).toBe('tags');
    expect(tagsOnly.cameraResponse?.check.departs).toBe(true);
    expect(tagsOnly.warnings.map((w) => w.code)).toContain('camera-response');
    // the named term is at least the error the tags leave
    expect(tagsOnly.cameraResponse!.check.standardUncertainty.value).toBeGreaterThan(0.5 * Math.abs(tagsOnly.kerrConstant.value - B));

    const profilePath = join(work, 'phone.json');
    const c = kerrtrace(['calibrate-camera', cal.files.clip, '--out', profilePath, '--quiet']);
    expect(c.stderr).toBe('');
    expect(c.code).toBe(0);
    const profile = JSON.parse(readFileSync(profilePath, 'utf8')) as { source: { kind: string; lightPeriodS: number }; fit: { residualRms: number } };
    expect(profile.source.kind).toBe('rotating-analyser');
    expect(Math.abs(profile.source.lightPeriodS - 2)).toBeLessThan(0.02); // half of the 4 s turn

    const withProfile = (await analyzeRun({ ...o, cameraProfilePath: profilePath }, hooks)).result;
    console.log(`phone curve: B off ${((tagsOnly.kerrConstant.value / B - 1) * 100).toFixed(2)} % from the tags, ${((withProfile.kerrConstant.value / B - 1) * 100).toFixed(2)} % with the profile (residual ${(profile.fit.residualRms * 100).toFixed(2)} %)`);
    expect(Math.abs(withProfile.kerrConstant.value / B - 1)).toBeLessThan(0.02);
    expect(Math.abs(tagsOnly.kerrConstant.value / B - 1)).toBeGreaterThan(0.02); // the profile is what fixes it
    expect(withProfile.cameraResponse).toMatchObject({ route: 'profile', profile: { path: profilePath } });
    expect(withProfile.cameraResponse!.check.departs).toBe(false);

    // the same clip with the angles given as a record (0 = parallel; the analyser turns 90°/s)
    const anglesCsv = join(work, 'angles.csv');
    writeFileSync(anglesCsv, `time_s,angle_deg\n${Array.from({ length: 241 }, (_v, k) => `${(k / 30).toFixed(6)},${(3 * k).toFixed(3)}`).join('\n')}\n`);
    const tablePath = join(work, 'phone-angles.json');
    expect(kerrtrace(['calibrate-camera', cal.files.clip, '--angles', anglesCsv, '--out', tablePath, '--quiet']).code).toBe(0);
    const withTable = (await analyzeRun({ ...o, cameraProfilePath: tablePath }, hooks)).result;
    expect(Math.abs(withTable.kerrConstant.value / B - 1)).toBeLessThan(0.02);

    // a second run refuses to overwrite the profile without --force, in one line
    const again = kerrtrace(['calibrate-camera', cal.files.clip, '--out', profilePath, '--quiet']);
    expect(again.code).toBe(2);
    expect(again.stderr.trim().split('\n')).toHaveLength(1);
  }, 600_000);

  it('photos: a calibration photo set named by angle gives a profile that corrects a phone-curve JPEG series to within 2 %', async () => {
    const photoScenario = { ...base, label: 'phone photos', seed: 51, camera: { widthPx: 200, heightPx: 140, transfer: 'srgb', toneCurve: PHONE }, light: { ...base.light, centreXPx: 100, centreYPx: 70, sigmaPx: 9 } };
    const calDir = join(work, 'cal-photos');
    const runDir = join(work, 'run-photos');
    const angles = Array.from({ length: 19 }, (_v, i) => i * 5); // 0..90° in 5° steps
    mkdirSync(calDir, { recursive: true });
    mkdirSync(runDir, { recursive: true });
    for (const p of renderCalibrationPhotos(photoScenario, angles, 'photo scenario')) {
      await sharp(p.rgb, { raw: { width: p.width, height: p.height, channels: 3 } }).jpeg({ quality: 95 }).toFile(join(calDir, `ang${String(p.analyserDeg).padStart(3, '0')}.jpg`));
    }
    const vpi = halfWaveVoltageV(B, 0.05, 0.005);
    const volts = Array.from({ length: 13 }, (_, i) => Math.round((1.1 * vpi * i) / 12));
    for (const p of renderStillPhotos(photoScenario, volts, 'photo scenario')) {
      await sharp(p.rgb, { raw: { width: p.width, height: p.height, channels: 3 } }).jpeg({ quality: 95 }).toFile(join(runDir, `photo_${p.voltageV}V.jpg`));
    }
    const profilePath = join(work, 'phone-photos.json');
    const c = kerrtrace(['calibrate-camera', calDir, '--out', profilePath, '--quiet']);
    expect(c.stderr).toBe('');
    const stills = (extra: string[]) => {
      const r = kerrtrace(['stills', runDir, '--length-mm', '50', '--gap-mm', '5', '--roi', '87,57,27,27', '--dark-roi', '150,5,40,30',
        '--out', join(work, `stills-out-${extra.length}`), '--json', '--force', '--no-report', ...extra]);
      expect(r.stderr).toBe('');
      return JSON.parse(r.stdout) as RunResult;
    };
    const plain = stills([]);
    const corrected = stills(['--camera-profile', profilePath]);
    console.log(`phone-curve photos: B off ${((plain.kerrConstant.value / B - 1) * 100).toFixed(2)} % as sRGB, ${((corrected.kerrConstant.value / B - 1) * 100).toFixed(2)} % with the profile`);
    expect(Math.abs(corrected.kerrConstant.value / B - 1)).toBeLessThan(0.02);
    expect(Math.abs(plain.kerrConstant.value / B - 1)).toBeGreaterThan(0.02);
    expect(corrected.cameraResponse?.route).toBe('profile');
  }, 300_000);
});
