/**
 * The `simulate` command through the real command line (node bin/kerrtrace.js), as a user runs it.
 * `npm test` compiles dist/ before Vitest runs (run `npx tsc -p .` first when running this file alone).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { cliEnv } from '../helpers/cliEnv.js';

const root = fileURLToPath(new URL('../../', import.meta.url));
const work = mkdtempSync(join(tmpdir(), 'kerrtrace-sim-cli-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function run(args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [join(root, 'bin', 'kerrtrace.js'), ...args], { cwd: root, encoding: 'utf8', timeout: 240_000, env: cliEnv() });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

const good = () => ({
  cell: { kerrConstantMPerV2: 2.4e-12, lengthMm: 40, gapMm: 4 },
  camera: { widthPx: 160, heightPx: 120, frameRateHz: 15 },
  drive: { segments: [{ kind: 'ramp', toHalfWaveFraction: 1, durationS: 1 }] },
});

function scenarioFile(name: string, json: unknown): string {
  const path = join(work, name);
  writeFileSync(path, typeof json === 'string' ? json : JSON.stringify(json, null, 2));
  return path;
}

function expectOneLineRefusal(file: string, pattern: RegExp): string {
  const out = join(work, `out-${file}`);
  const r = run(['simulate', join(work, file), '--out', out]);
  expect(r.status).toBe(2);
  const lines = r.stderr.trimEnd().split('\n');
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(/^kerrtrace: /);
  expect(lines[0]).toMatch(pattern);
  expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
  expect(existsSync(out)).toBe(false); // nothing written
  expect(readdirSync(work).filter((f) => f.includes('.partial-'))).toEqual([]);
  return lines[0]!;
}

describe('kerrtrace simulate (command line)', () => {
  it('writes the four files for a good scenario and says what it wrote', () => {
    const file = scenarioFile('good.json', good());
    const out = join(work, 'good-run');
    const r = run(['simulate', file, '--out', out]);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(readdirSync(out).sort()).toEqual(['.kerrtrace-output', 'clip.mp4', 'scenario.json', 'truth.json', 'volts.csv']);
    expect(r.stdout).toContain('15 frames');
    // a second run without --force is refused and leaves the files alone
    const again = run(['simulate', file, '--out', out]);
    expect(again.status).toBe(2);
    expect(again.stderr).toMatch(/already exists and would be overwritten.*--force/);
  });

  it('--force replaces the run it wrote with the new one, whole, and touches nothing beside it', () => {
    const out = join(work, 'forced-run');
    const neighbour = join(work, 'neighbour.txt');
    writeFileSync(neighbour, 'cell A, first fill\n'); // the user's own file beside the output
    expect(run(['simulate', scenarioFile('first.json', good()), '--out', out, '--quiet']).status).toBe(0);
    const firstLog = readFileSync(join(out, 'volts.csv'), 'utf8');
    const second = good();
    second.cell.kerrConstantMPerV2 = 4.8e-12;
    const r = run(['simulate', scenarioFile('second.json', second), '--out', out, '--force', '--quiet']);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const truth = JSON.parse(readFileSync(join(out, 'truth.json'), 'utf8')) as { B: number };
    expect(truth.B).toBe(4.8e-12); // the content really is the second scenario's
    expect(JSON.parse(readFileSync(join(out, 'scenario.json'), 'utf8')).cell.kerrConstantMPerV2).toBe(4.8e-12);
    // The drive is a fraction of V_π, so twice the B drives to 1/√2 of the voltage: another log.
    expect(readFileSync(join(out, 'volts.csv'), 'utf8')).not.toBe(firstLog);
    expect(readFileSync(neighbour, 'utf8')).toBe('cell A, first fill\n'); // nothing else touched
    expect(readdirSync(out).sort()).toEqual(['.kerrtrace-output', 'clip.mp4', 'scenario.json', 'truth.json', 'volts.csv']);
    expect(readdirSync(work).filter((f) => /\.(tmp|partial|backup)-/.test(f))).toEqual([]);
  });

  it('refuses an unknown key in one line naming it and the close valid key', () => {
    const json = good() as Record<string, unknown>;
    (json.cell as Record<string, unknown>).lenghtMm = 40;
    scenarioFile('unknown.json', json);
    expectOneLineRefusal('unknown.json', /unknown key cell\.lenghtMm.*did you mean lengthMm/);
  });

  it('refuses a missing required key in one line', () => {
    const json = good();
    delete (json.cell as Partial<typeof json.cell>).kerrConstantMPerV2;
    scenarioFile('missing.json', json);
    expectOneLineRefusal('missing.json', /missing required key cell\.kerrConstantMPerV2/);
  });

  it('refuses a negative size in one line', () => {
    scenarioFile('negative.json', { ...good(), cell: { ...good().cell, gapMm: -4 } });
    expectOneLineRefusal('negative.json', /expected a positive number .* for cell\.gapMm .* but received -4/);
  });

  it('refuses a voltage beyond the breakdown field with a high-voltage caution', () => {
    scenarioFile('unsafe.json', { ...good(), drive: { segments: [{ kind: 'ramp', toKv: 20, durationS: 1 }] } }); // 5 MV/m
    const line = expectOneLineRefusal('unsafe.json', /breakdown field 3 MV\/m/);
    expect(line).toMatch(/Caution: kilovolt supplies and charged cells can kill/);
  });

  it('refuses a file that is not JSON, naming the line', () => {
    scenarioFile('broken.json', '{\n  "cell": {\n    "gapMm": 4,\n  }\n}\n');
    expectOneLineRefusal('broken.json', /not valid JSON at line 4/);
  });
});
