/**
 * The analyze command through the real command line (dist/, built by `npm test` before Vitest),
 * on the outside bench clip green_ramps (test/reference/bench-clips, provenance in
 * test/reference/README.md): every headline figure in result.json and on the screen is checked
 * against the clip's truth.json with the bounds of test/helpers/benchTruth.ts (the renderer's
 * stated accuracy and what follows from it). Bad input gives one line, a non-zero exit, no stack
 * trace and nothing written; --force replaces the folder it wrote and nothing else.
 */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { benchClip } from '../helpers/referenceData.js';
import { expectHeadlineMatchesTruth, readBenchTruth } from '../helpers/benchTruth.js';
import { cliEnv } from '../helpers/cliEnv.js';
import { benchClipTag } from '../setup/outsideSources.js';

const ROOT = join(__dirname, '..', '..');
const BIN = join(ROOT, 'bin', 'kerrtrace.js');

function kerrtrace(args: string[]) {
  const r = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', timeout: 240_000, env: cliEnv() });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function expectOneLineError(r: { code: number | null; stderr: string }, pattern: RegExp) {
  expect(r.code).not.toBe(0);
  const lines = r.stderr.trim().split('\n');
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(pattern);
  expect(r.stderr).not.toMatch(/\n\s+at /);
}

/** The value and standard error printed on a summary row (`name   value ± stdErr unit`). */
function printed(stdout: string, row: string): { value: number; stdErr: number } {
  const line = stdout.split('\n').map((l) => l.trimStart()).find((l) => l.startsWith(row));
  expect(line, `summary row "${row}"`).toBeDefined();
  const m = line!.slice(row.length).match(/^\s+([-+\d.e]+) ± ([\d.e+-]+)/);
  expect(m, `"${line}" shows value ± standard error`).not.toBeNull();
  return { value: Number(m![1]), stdErr: Number(m![2]) };
}

const sha256 = (path: string): string => createHash('sha256').update(readFileSync(path)).digest('hex');

describe('kerrtrace analyze (command line)', { tags: [benchClipTag('green_ramps')] }, () => {
  let work: string;
  const { clip, volts } = benchClip('green_ramps');
  const truth = readBenchTruth('green_ramps');
  const geometry = ['--length-mm', String(truth.L_mm), '--gap-mm', String(truth.d_mm)];
  const roi = truth.roi.join(',');
  beforeAll(() => {
    work = mkdtempSync(join(tmpdir(), 'kt-analyze-'));
  });

  it('writes result.json whose every headline figure matches truth.json, prints the same figures, writes trace.csv, and refuses to overwrite without --force', () => {
    const out = join(work, 'run1');
    const r = kerrtrace(['analyze', clip, '--volts', volts, ...geometry, '--roi', roi, '--out', out, '--quiet', '--no-report']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const result = JSON.parse(readFileSync(join(out, 'result.json'), 'utf8'));
    expect(result.identifiable).toBe(true);
    expectHeadlineMatchesTruth(result, truth);
    // The screen shows the standard error to two significant digits and the value rounded to the
    // same decimal place (GUM §7.2.6; src/quantity.ts): each printed number lies within half a
    // unit of the error's last digit.
    const rows = [['Kerr constant B', 'kerrConstant'], ['half-wave voltage', 'halfWaveVoltage'], ['floor fraction', 'floorFraction'], ['contrast ratio', 'contrastRatio'], ['sync offset', 'syncOffset']] as const;
    const halfUnit = (x: number, digits: number): number => 0.5 * 10 ** (Math.floor(Math.log10(Math.abs(x))) - digits + 1);
    for (const [row, key] of rows) {
      const shown = printed(r.stdout, row);
      expect(Math.abs(shown.value - result[key].value), row).toBeLessThanOrEqual(halfUnit(result[key].stdErr, 2) * (1 + 1e-9));
      expect(Math.abs(shown.stdErr - result[key].stdErr), `${row}: standard error`).toBeLessThanOrEqual(halfUnit(result[key].stdErr, 2) * (1 + 1e-9));
    }
    expect(result.kerrConstant.unit).toBe('m/V^2');
    expect(result.halfWaveVoltage.unit).toBe('V');
    expect(result.syncOffset.unit).toBe('s');
    expect(result.inputs.video.sha256).toBe(sha256(clip));
    expect(result.fit.degreesOfFreedom).toBeGreaterThan(100);
    const csv = readFileSync(join(out, 'trace.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toBe('time_s,frame,voltage_V,intensity,model,residual,used,excluded_reason');
    expect(csv).toHaveLength(truth.frames + 1);
    const again = kerrtrace(['analyze', clip, '--volts', volts, ...geometry, '--out', out, '--quiet']);
    expectOneLineError(again, /already exists.*--force/);
  });

  it('--force replaces the folder it wrote with the new run, and touches nothing else', () => {
    const out = join(work, 'forced');
    const neighbour = join(work, 'notes.txt');
    writeFileSync(neighbour, 'cell A, filled Tuesday\n');
    const inputsBefore = [sha256(clip), sha256(volts)];
    expect(kerrtrace(['analyze', clip, '--volts', volts, ...geometry, '--roi', roi, '--out', out, '--quiet', '--no-report', '--label', 'first']).code).toBe(0);
    const first = JSON.parse(readFileSync(join(out, 'result.json'), 'utf8'));
    expect(first.label).toBe('first');
    // A file the user put in since is theirs: --force refuses to replace the folder and keeps it.
    writeFileSync(join(out, 'stale.txt'), 'added by hand\n');
    const refused = kerrtrace(['analyze', clip, '--volts', volts, ...geometry, '--roi', roi, '--out', out, '--quiet', '--no-report', '--label', 'second', '--force']);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/holds a file it did not write \(stale\.txt\), so --force will not replace it/);
    expect(JSON.parse(readFileSync(join(out, 'result.json'), 'utf8')).label).toBe('first');
    expect(readFileSync(join(out, 'stale.txt'), 'utf8')).toBe('added by hand\n');
    rmSync(join(out, 'stale.txt'));
    const r = kerrtrace(['analyze', clip, '--volts', volts, ...geometry, '--roi', roi, '--out', out, '--quiet', '--no-report', '--label', 'second', '--force']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const second = JSON.parse(readFileSync(join(out, 'result.json'), 'utf8'));
    expect(second.label).toBe('second'); // the content really is the new run's
    expect(second.kerrConstant.value).toBe(first.kerrConstant.value); // same inputs, same answer
    expect(readFileSync(join(out, 'trace.csv'), 'utf8').trim().split('\n')).toHaveLength(truth.frames + 1);
    expect(readFileSync(neighbour, 'utf8')).toBe('cell A, filled Tuesday\n'); // nothing else touched
    expect([sha256(clip), sha256(volts)]).toEqual(inputsBefore);
    expect(readdirSync(work).filter((f) => f.includes('partial') || f.startsWith('.'))).toEqual([]);
  });

  it('--json prints result.json', () => {
    const r = kerrtrace(['analyze', clip, '--volts', volts, ...geometry, '--roi', roi, '--out', join(work, 'json'), '--json', '--no-report']);
    expect(r.code).toBe(0);
    const printedJson = JSON.parse(r.stdout);
    expect(printedJson.kind).toBe('kerrtrace-run');
    expect(printedJson).toEqual(JSON.parse(readFileSync(join(work, 'json', 'result.json'), 'utf8')));
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
