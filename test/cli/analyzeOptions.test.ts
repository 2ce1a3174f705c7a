/**
 * The analyze command line, option by option, on the project's own clean ramp
 * (test-media/cfr-ramp: 240×180, 30 fps, sRGB, B = 2.4e-12 m/V², L = 50 mm, d = 5 mm, polariser at
 * 45°, no static retardance; truth in run/truth.json). Each option is checked for WHAT it changes,
 * against the clip's truth or against a closed-form relation; the runs are shared (beforeAll) and go
 * two at a time. The truth is the project's own simulator's (docs/scenario.md), so the truth checks
 * are end-to-end self-consistency of simulate → analyze; the closed-form relations (L/L_eff, the
 * Jones factor, normal equations, hashes) stand on their own. Needs dist/ (`npx tsc -p tsconfig.json`; `npm test` builds it).
 */
import { createHash } from 'node:crypto';
import { copyFileSync, mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TEST_MEDIA, inBatches, kerrtraceCli, readResultJson, readTraceCsv, requireBuiltCli, type CliRun } from '../helpers/cliRun.js';

const CASE = join(TEST_MEDIA, 'cfr-ramp', 'run');
const CLIP = join(CASE, 'clip.mp4');
const VOLTS = join(CASE, 'volts.csv');
const TRUTH = JSON.parse(readFileSync(join(CASE, 'truth.json'), 'utf8')) as {
  kerrConstantMPerV2: number; halfWaveVoltageV: number;
  cell: { lengthM: number; gapM: number; polariserAngleDeg: number; staticRetardanceRad: number };
  channels: Record<'r' | 'g' | 'b', { weight: number; kerrConstantMPerV2: number }>;
};
const GEOMETRY = ['--length-mm', '50', '--gap-mm', '5'];

let work: string;
const runs: Record<string, { dir: string; cli: CliRun }> = {};

async function analyze(name: string, extra: string[], opts: { clip?: string; volts?: string; out?: boolean; maps?: boolean; cwd?: string } = {}): Promise<void> {
  const dir = join(work, name);
  const args = ['analyze', opts.clip ?? CLIP, '--volts', opts.volts ?? VOLTS, ...GEOMETRY, ...extra, '--quiet', '--no-report'];
  if (opts.maps !== true) args.push('--no-maps');
  if (opts.out !== false) args.push('--out', dir);
  runs[name] = { dir, cli: await kerrtraceCli(args, opts.cwd ? { cwd: opts.cwd } : {}) };
}

function ok(name: string) {
  const r = runs[name]!;
  expect(r.cli.stderr, `${name}: ${r.cli.stderr}`).toBe('');
  expect(r.cli.code).toBe(0);
  return { result: readResultJson(r.dir), dir: r.dir };
}

/**
 * A run whose options describe the clip wrongly (static retardance it does not have, sRGB read as
 * light): the fit cannot describe the data, so the residual gate marks it not valid, exit 3, with
 * the result kept for inspection (docs/analyze.md, "Gates").
 */
function keptNotValid(name: string) {
  const r = runs[name]!;
  expect(r.cli.code, `${name}: ${r.cli.stderr}`).toBe(3);
  expect(r.cli.stderr).toMatch(/^kerrtrace: the run failed a check: the fit leaves residuals .* marked not valid/);
  const result = readResultJson(r.dir);
  expect(result.validity.valid).toBe(false);
  expect(result.validity.failures.map((f: { gate: string }) => f.gate)).toContain('residual-excess');
  return { result, dir: r.dir };
}

/** |x − truth| within k standard errors: the tool's own claim that σ covers the truth. */
function expectCovers(q: { value: number; stdErr: number }, truth: number, k = 3): void {
  expect(q.stdErr).toBeGreaterThan(0);
  expect(Math.abs(q.value - truth), `${q.value} ± ${q.stdErr} vs truth ${truth}`).toBeLessThanOrEqual(k * q.stdErr);
}

let copyDir: string;

beforeAll(async () => {
  requireBuiltCli();
  work = mkdtempSync(join(tmpdir(), 'kt-analyze-options-'));
  copyDir = mkdtempSync(join(tmpdir(), 'kt-analyze-default-out-'));
  copyFileSync(CLIP, join(copyDir, 'clip.mp4'));
  copyFileSync(VOLTS, join(copyDir, 'volts.csv'));
  // the reference run first: the baseline run below reads its result.json
  await analyze('base', ['--channels', 'rgb']);
  await inBatches([
    () => analyze('lengthAndAngle', ['--effective-length-mm', '60', '--polariser-angle-deg', '30']),
    () => analyze('static', ['--static-retardance-rad', '0.3']),
    () => analyze('linear', ['--transfer', 'linear']),
    () => analyze('plain', ['--no-robust']),
    () => analyze('dark', ['--dark-roi', '0,0,40,30']),
    // no --out: the default folder beside the (copied) video; maps on, as the baseline split needs them
    () => analyze('defaultOut', ['--baseline', join(work, 'base', 'result.json')], {
      clip: join(copyDir, 'clip.mp4'), volts: join(copyDir, 'volts.csv'), out: false, maps: true,
    }),
  ]);
  runs.defaultOut!.dir = join(copyDir, 'clip.kerrtrace');
}, 600_000);

afterAll(() => {
  rmSync(work, { recursive: true, force: true });
  rmSync(copyDir, { recursive: true, force: true });
});

describe('analyze options on test-media/cfr-ramp', () => {
  it('the reference run recovers the clip\'s B and V_π within 3 standard errors (truth.json)', () => {
    const { result } = ok('base');
    expectCovers(result.kerrConstant, TRUTH.kerrConstantMPerV2);
    expectCovers(result.halfWaveVoltage, TRUTH.halfWaveVoltageV);
    expect(result.fit.robust).toBe('huber');
    expect(result.model.polariserAngleDeg).toBe(45);
    expect(result.model.staticRetardanceRad).toBe(0);
  });

  it('--effective-length-mm scales B by L/L_eff exactly and leaves V_π alone (B = d²/(2·L_eff·V_π²))', () => {
    const base = ok('base').result;
    const r = ok('lengthAndAngle').result;
    expect(r.cell.effectiveLengthM).toBeCloseTo(0.06, 12);
    expect(r.cell.lengthM).toBeCloseTo(0.05, 12);
    // V_π is what the fit measures; the length only enters the conversion to B.
    expect(r.halfWaveVoltage.value / base.halfWaveVoltage.value).toBeCloseTo(1, 6);
    expect(r.kerrConstant.value / base.kerrConstant.value).toBeCloseTo(50 / 60, 6);
    expect(r.kerrConstant.stdErr / base.kerrConstant.stdErr).toBeCloseTo(50 / 60, 4);
    // and B·L_eff·V_π²/d² = 1/2 holds for the reported numbers themselves
    expect((r.kerrConstant.value * r.cell.effectiveLengthM * r.halfWaveVoltage.value ** 2) / r.cell.gapM ** 2).toBeCloseTo(0.5, 9);
  });

  it('--polariser-angle-deg changes the model by the Jones-calculus factor: T = cos²(α−β) − sin2α·sin2β·sin²(δ/2) with β = α + 90°', () => {
    // Jones calculus for polariser α, retarder (fast axis along the field), analyser β (any optics
    // text, e.g. Hecht, Optics, ch. 8): crossed (β = α + 90°) leaves only the second term.
    const jonesFactor = (alphaDeg: number): number => {
      const a = (alphaDeg * Math.PI) / 180;
      const b = a + Math.PI / 2;
      return Math.cos(a - b) ** 2 - Math.sin(2 * a) * Math.sin(2 * b); // multiplies sin²(δ/2)
    };
    expect(jonesFactor(45)).toBeCloseTo(1, 12);
    const base = ok('base').result;
    const r = ok('lengthAndAngle').result;
    expect(r.model.polariserAngleDeg).toBe(30);
    // The same light is fitted with a model whose modulation carries jonesFactor(30) = 0.75, so the
    // fitted amplitude grows by 1/0.75 and the floor and V_π stay put (a reparametrisation).
    expect((r.model.amplitude.value * jonesFactor(30)) / (base.model.amplitude.value * jonesFactor(45))).toBeCloseTo(1, 5);
    expect(r.model.floorLevel.value / base.model.floorLevel.value).toBeCloseTo(1, 5);
    expect(r.floorFraction.value / base.floorFraction.value).toBeCloseTo(0.75, 5);
    expect(r.contrastRatio.value / base.contrastRatio.value).toBeCloseTo(1, 5);
  });

  it('--static-retardance-rad enters the model as δ = π·(V/V_π)² + δ_s: trace.csv\'s model column follows that formula', () => {
    const base = ok('base').result;
    const { result: r, dir } = keptNotValid('static');
    expect(r.model.staticRetardanceRad).toBe(0.3);
    const vpi = r.halfWaveVoltage.value;
    const floor = r.model.floorLevel.value;
    const amp = r.model.amplitude.value;
    const rows = readTraceCsv(dir).filter((row) => row.voltageV !== null && row.model !== null);
    expect(rows.length).toBeGreaterThan(250);
    let worst = 0;
    for (const row of rows) {
      const expected = floor + amp * Math.sin((Math.PI / 2) * (row.voltageV! / vpi) ** 2 + 0.15) ** 2;
      worst = Math.max(worst, Math.abs(row.model! - expected));
    }
    // trace.csv rounds voltages to 0.01 V and intensities to about 7 significant digits; with a
    // slope dI/dV up to ~amp·π/V_π the rounding alone reaches ~1e-6·amp. Leaving δ_s out of the
    // formula would miss by ~amp·sin²(0.15) ≈ 0.02·amp near zero field.
    expect(worst).toBeLessThan(2e-5 * amp);
    // This clip has no static retardance: the data peak at the true V_π, and a model that starts
    // 0.3 rad in needs less field for the same peak, so its V_π comes out larger: at the peak,
    // π·(V/V_π')² + 0.3 = π gives V_π' = V_π/√(1 − 0.3/π) ≈ 1.05·V_π (the fit compromises further).
    expect(r.halfWaveVoltage.value).toBeGreaterThan(1.02 * base.halfWaveVoltage.value);
    expect(r.kerrConstant.value).toBeLessThan(base.kerrConstant.value);
  });

  it('--transfer linear reads sRGB code values as light: the floor rises against the amplitude and B moves up', () => {
    const base = ok('base').result;
    const r = keptNotValid('linear').result;
    expect(base.camera.transfer).toBe('srgb');
    expect(r.camera.transfer).toBe('linear');
    // sRGB (IEC 61966-2-1) encodes light L as about L^(1/2.4): read as light, the dim floor is lifted
    // far more than the bright modulation, so the floor fraction grows several times (for a pure
    // power 1/2.4 a ratio of 0.01 becomes 0.01^(1/2.4) ≈ 0.15 before the surround is subtracted).
    expect(r.floorFraction.value).toBeGreaterThan(2 * base.floorFraction.value);
    expect(r.contrastRatio.value).toBeLessThan(base.contrastRatio.value / 2);
    // The concave encoding makes the signal rise sooner with V (c ∝ T^0.42 reaches half its range at
    // lower V than T does), so a sin² model puts V_π lower and B higher.
    expect(r.halfWaveVoltage.value).toBeLessThan(base.halfWaveVoltage.value);
    expect(r.kerrConstant.value).toBeGreaterThan(base.kerrConstant.value);
  });

  it('--channels rgb adds one B per camera channel; the green channel (all of the 532 nm light) recovers the truth within 3σ', () => {
    const { result } = ok('base');
    expect(result.channels).toBeDefined();
    for (const k of ['r', 'g', 'b'] as const) {
      expect(result.channels[k].unit).toBe('m/V^2');
      expect(Number.isFinite(result.channels[k].value)).toBe(true);
      // the renderer gives every channel the same B here (no dispersion in truth.json)
      expect(TRUTH.channels[k].kerrConstantMPerV2).toBe(TRUTH.kerrConstantMPerV2);
    }
    expectCovers(result.channels.g, TRUTH.channels.g.kerrConstantMPerV2);
    // the dimmer channels carry less light, hence a larger relative error
    expect(result.channels.r.stdErr / result.channels.r.value).toBeGreaterThan(result.channels.g.stdErr / result.channels.g.value);
    expect(result.channels.note).toMatch(/band/);
  });

  it('--no-robust switches off only the Huber down-weighting: the σ_V weights stay, so the plain residual sum is not zero but B still covers the truth', () => {
    const base = ok('base');
    const plain = ok('plain');
    expect(plain.result.fit.robust).toBe('none');
    // Each frame keeps its variance var_i = s0² + (dI/dV·σ_V)² (docs/analyze.md), so the floor's
    // normal equation is Σ r_i/var_i = 0, not Σ r_i = 0; the exact weighted condition is checked
    // on a sweep with known σ_V in test/core/fit/fitKerrCurve.test.ts (var_i is not in trace.csv).
    // Measured on this clip: plain Σr/(rms·√n) = 0.53 with the weights (it was < 0.01 unweighted).
    const sumRatio = (dir: string): number => {
      const res = readTraceCsv(dir).filter((r) => r.used).map((r) => r.residual!);
      const rms = Math.sqrt(res.reduce((s, x) => s + x * x, 0) / res.length);
      return res.reduce((s, x) => s + x, 0) / (rms * Math.sqrt(res.length));
    };
    expect(Math.abs(sumRatio(plain.dir))).toBeGreaterThan(0.05);
    expect(Math.abs(sumRatio(base.dir))).toBeGreaterThan(0.2);
    expect(plain.result.kerrConstant.value).not.toBe(base.result.kerrConstant.value);
    expectCovers(plain.result.kerrConstant, TRUTH.kerrConstantMPerV2);
  });

  it('--dark-roi replaces the local surround: recorded, and the floor now holds the halo under the beam; B does not move', () => {
    const base = ok('base').result;
    const r = ok('dark').result;
    expect(r.regions.dark).toEqual({ x: 0, y: 0, w: 40, h: 30 });
    expect(r.regions.surround).toBeUndefined();
    expect(base.regions.surround).toBeDefined();
    // A background level only adds to the floor (I_floor), it does not change the shape in V, so
    // B agrees within the combined standard error (×3); the halo that the local surround took out
    // (cfr-ramp renders one, haloPeak 0.003 of full scale) stays in the floor.
    expect(Math.abs(r.kerrConstant.value - base.kerrConstant.value)).toBeLessThan(3 * Math.hypot(r.kerrConstant.stdErr, base.kerrConstant.stdErr));
    expect(r.floorFraction.value).toBeGreaterThan(base.floorFraction.value + 3 * Math.hypot(r.floorFraction.stdErr, base.floorFraction.stdErr));
  });

  it('without --out, writes <video name>.kerrtrace beside the video and nothing else there', () => {
    const { dir, result } = ok('defaultOut');
    expect(readdirSync(copyDir).sort()).toEqual(['clip.kerrtrace', 'clip.mp4', 'volts.csv']);
    expect(readdirSync(dir)).toEqual(expect.arrayContaining(['result.json', 'trace.csv']));
    expect(runs.defaultOut!.cli.stdout).toContain('clip.kerrtrace');
    expect(result.inputs.video.sha256).toBe(createHash('sha256').update(readFileSync(CLIP)).digest('hex'));
  });

  it('--baseline is recorded with its hash and splits the floor: leak = F_baseline, scatter = F_run − F_baseline (σ in quadrature)', () => {
    const baseFile = join(work, 'base', 'result.json');
    const baseline = ok('base').result;
    const { result: r } = ok('defaultOut');
    expect(r.inputs.baseline.sha256).toBe(createHash('sha256').update(readFileSync(baseFile)).digest('hex'));
    expect(r.scatter.polariserLeakFraction.value).toBe(baseline.floorFraction.value);
    expect(r.scatter.scatterFloorFraction.value).toBeCloseTo(r.floorFraction.value - baseline.floorFraction.value, 15);
    expect(r.scatter.scatterFloorFraction.stdErr).toBeCloseTo(Math.hypot(r.floorFraction.stdErr, baseline.floorFraction.stdErr), 15);
  });
});
