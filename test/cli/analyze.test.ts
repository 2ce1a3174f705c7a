/**
 * The analyze command through the real command line (dist/, built by `npm test` before Vitest):
 * the happy path writes result.json and trace.csv; bad input gives one line, a non-zero exit,
 * no stack trace and nothing written.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';

const ROOT = join(__dirname, '..', '..');
const BIN = join(ROOT, 'bin', 'kerrtrace.js');
const CLIP_DIR = join(ROOT, '..', 'shared', 'reference', 'bench-clips', 'green_ramps');
const have = existsSync(CLIP_DIR) && existsSync(join(ROOT, 'dist', 'cli', 'main.js'));

function kerrtrace(args: string[]) {
  const r = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', timeout: 120_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function expectOneLineError(r: { code: number | null; stderr: string }, pattern: RegExp) {
  expect(r.code).not.toBe(0);
  const lines = r.stderr.trim().split('\n');
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(pattern);
  expect(r.stderr).not.toMatch(/\n\s+at /);
}

describe.skipIf(!have)('kerrtrace analyze (command line)', () => {
  let work: string;
  const clip = join(CLIP_DIR, 'clip.mp4');
  const volts = join(CLIP_DIR, 'volts.csv');
  const geometry = ['--length-mm', '45', '--gap-mm', '4.5'];
  beforeAll(() => {
    work = mkdtempSync(join(tmpdir(), 'kt-analyze-'));
  });

  it('writes result.json with the required fields and trace.csv, and refuses to overwrite without --force', () => {
    const out = join(work, 'run1');
    const r = kerrtrace(['analyze', clip, '--volts', volts, ...geometry, '--roi', '213,147,56,58', '--out', out, '--quiet', '--no-report']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Kerr constant B\s+1\.8\de-12 ± [\d.e-]+ m\/V\^2/);
    const result = JSON.parse(readFileSync(join(out, 'result.json'), 'utf8'));
    for (const k of ['kerrConstant', 'halfWaveVoltage', 'syncOffset', 'floorFraction', 'contrastRatio']) expect(result[k].value).toEqual(expect.any(Number));
    expect(result.kerrConstant.unit).toBe('m/V^2');
    expect(result.halfWaveVoltage.unit).toBe('V');
    expect(result.syncOffset.unit).toBe('s');
    expect(result.inputs.video.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(result.fit.degreesOfFreedom).toBeGreaterThan(100);
    const csv = readFileSync(join(out, 'trace.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toBe('time_s,frame,voltage_V,intensity,model,residual,used,excluded_reason');
    expect(csv).toHaveLength(601);
    const again = kerrtrace(['analyze', clip, '--volts', volts, ...geometry, '--out', out, '--quiet']);
    expectOneLineError(again, /already exists.*--force/);
  });

  it('--json prints result.json', () => {
    const r = kerrtrace(['analyze', clip, '--volts', volts, ...geometry, '--roi', '213,147,56,58', '--out', join(work, 'json'), '--json', '--no-report']);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).kind).toBe('kerrtrace-run');
  });

  const bad: [string, (dir: string) => string[], RegExp][] = [
    ['a negative gap', () => ['--length-mm', '45', '--gap-mm', '-4'], /expected a positive electrode gap in mm for --gap-mm but received -4/],
    ['a zero length', () => ['--length-mm', '0', '--gap-mm', '4.5'], /--length-mm/],
    ['an ROI off the frame', () => [...geometry, '--roi', '460,300,50,50'], /frame|outside|off/i],
    ['a malformed ROI', () => [...geometry, '--roi', '12,13,14'], /x,y,w,h/],
    ['a log that does not overlap the video at the given offset', () => [...geometry, '--offset-s', '500'], /overlap/],
    ['a log that never leaves zero', (dir) => {
      const p = join(dir, 'zero.csv');
      writeFileSync(p, 'time_s,voltage_V\n' + Array.from({ length: 100 }, (_, i) => `${i * 0.2},0`).join('\n') + '\n');
      return [...geometry, '--volts', p];
    }, /never leaves zero/],
    ['a log with one voltage level', (dir) => {
      const p = join(dir, 'level.csv');
      writeFileSync(p, 'time_s,voltage_kV\n' + Array.from({ length: 200 }, (_, i) => `${(i * 0.1).toFixed(1)},5.0`).join('\n') + '\n');
      return [...geometry, '--volts', p];
    }, /single voltage level.*Record a ramp/],
    ['a log with a stray header line', (dir) => {
      const p = join(dir, 'stray.csv');
      const lines = readFileSync(volts, 'utf8').split('\n');
      lines.splice(40, 0, 'time_s,voltage_kV');
      writeFileSync(p, lines.join('\n'));
      return [...geometry, '--volts', p];
    }, /line 41/],
  ];
  for (const [what, extra, pattern] of bad) {
    it(`refuses ${what} in one line and writes nothing`, () => {
      const dir = mkdtempSync(join(work, 'bad-'));
      const args = extra(dir);
      const hasVolts = args.includes('--volts');
      const out = join(dir, 'out');
      const r = kerrtrace(['analyze', clip, ...(hasVolts ? [] : ['--volts', volts]), ...args, '--out', out, '--quiet']);
      expectOneLineError(r, pattern);
      expect(existsSync(out)).toBe(false);
      expect(readdirSync(dir).filter((f) => f.includes('partial'))).toEqual([]);
    });
  }
});
