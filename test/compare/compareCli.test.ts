/**
 * The real command line: `node bin/kerrtrace.js compare ...`; `npm test` compiles dist/ before Vitest runs.
 * Bad input must give one line on stderr and a non-zero exit code, never a stack trace.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cliEnv } from '../helpers/cliEnv.js';

const projectRoot = fileURLToPath(new URL('../../', import.meta.url));
const fixtures = join(projectRoot, 'test/fixtures/results');
let work: string;

function kerrtrace(...args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [join(projectRoot, 'bin/kerrtrace.js'), ...args], { cwd: work, encoding: 'utf8', timeout: 240_000, env: cliEnv() });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

function expectOneLineFailure(r: { status: number | null; stderr: string }, pattern: RegExp): void {
  expect(r.status).not.toBe(0);
  const lines = r.stderr.trimEnd().split('\n');
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(/^kerrtrace: /);
  expect(lines[0]).toMatch(pattern);
  expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
}

beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'kerrtrace-cli-'));
});
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('kerrtrace compare (CLI)', () => {
  it('loads the compiled command line', () => {
    const r = kerrtrace('compare', '--help');
    expect(r.stderr).toBe('');
    expect(r.stdout).toMatch(/--allow-different-cells/);
  });

  it('compares two runs, prints the verdict and writes the files', () => {
    const r = kerrtrace('compare', join(fixtures, 'before'), join(fixtures, 'after', 'result.json'), '--out', 'cmp', '--label', 'before', '--label', 'after');
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/^From before to after: .*the floor fraction fell by/m);
    for (const f of ['comparison.html', 'comparison.json', 'comparison.csv', 'summary.md']) expect(existsSync(join(work, 'cmp', f))).toBe(true);
  });

  it('never overwrites an earlier comparison without --force; --force replaces it whole and touches nothing else', () => {
    expect(kerrtrace('compare', join(fixtures, 'before'), join(fixtures, 'after'), '--out', 'again', '--label', 'first A', '--label', 'first B').status).toBe(0);
    const firstJson = readFileSync(join(work, 'again', 'comparison.json'), 'utf8');
    expect(firstJson).toContain('first A');
    writeFileSync(join(work, 'again', 'stale.txt'), 'left by hand\n');
    writeFileSync(join(work, 'neighbour.txt'), 'not kerrtrace\'s\n');
    expectOneLineFailure(kerrtrace('compare', join(fixtures, 'before'), join(fixtures, 'after'), '--out', 'again'), /already exists .* add --force/);
    expect(readFileSync(join(work, 'again', 'comparison.json'), 'utf8')).toBe(firstJson); // refused: untouched
    const fixturesBefore = readdirSync(fixtures, { recursive: true }).map(String).sort().map((f) => [f, statSync(join(fixtures, f)).mtimeMs]);
    // The file added by hand is the user's: --force refuses to replace the folder and keeps it.
    expectOneLineFailure(kerrtrace('compare', join(fixtures, 'before'), join(fixtures, 'after'), '--out', 'again', '--force'), /holds a file it did not write \(stale\.txt\)/);
    expect(readFileSync(join(work, 'again', 'stale.txt'), 'utf8')).toBe('left by hand\n');
    expect(readFileSync(join(work, 'again', 'comparison.json'), 'utf8')).toBe(firstJson);
    rmSync(join(work, 'again', 'stale.txt'));
    const r = kerrtrace('compare', join(fixtures, 'before'), join(fixtures, 'after'), '--out', 'again', '--label', 'second A', '--label', 'second B', '--force');
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const secondJson = readFileSync(join(work, 'again', 'comparison.json'), 'utf8');
    expect(secondJson).toContain('second A'); // the content really was replaced
    expect(secondJson).not.toContain('first A');
    expect(readFileSync(join(work, 'again', 'summary.md'), 'utf8')).toContain('second B');
    expect(readFileSync(join(work, 'neighbour.txt'), 'utf8')).toBe('not kerrtrace\'s\n'); // nothing else touched
    expect(readdirSync(fixtures, { recursive: true }).map(String).sort().map((f) => [f, statSync(join(fixtures, f)).mtimeMs])).toEqual(fixturesBefore);
  });

  it('refuses a missing result file in one line', () => {
    expectOneLineFailure(kerrtrace('compare', join(fixtures, 'before'), 'no-such-run', '--out', 'x1'), /no result file at no-such-run/);
  });

  it('refuses a file that is not JSON in one line', () => {
    writeFileSync(join(work, 'notes.json'), 'cell A, second try\n');
    expectOneLineFailure(kerrtrace('compare', join(fixtures, 'before'), 'notes.json', '--out', 'x2'), /notes\.json is not valid JSON/);
  });

  it('refuses runs of different cells without --allow-different-cells, writing nothing', () => {
    expectOneLineFailure(kerrtrace('compare', join(fixtures, 'before'), join(fixtures, 'other-cell'), '--out', 'x3'), /different cells: gap 5\.00 mm in before but 4\.00 mm in other-cell.*--allow-different-cells/);
    expect(existsSync(join(work, 'x3'))).toBe(false);
    const r = kerrtrace('compare', join(fixtures, 'before'), join(fixtures, 'other-cell'), '--out', 'x3', '--allow-different-cells');
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/warning: The runs were made with different cells/);
  });

  it('refuses a --label count that does not match the runs', () => {
    expectOneLineFailure(kerrtrace('compare', join(fixtures, 'before'), join(fixtures, 'after'), '--out', 'x4', '--label', 'only-one'), /one --label per run/);
  });
});
