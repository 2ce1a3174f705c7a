/**
 * `kerrtrace watch` through the real command line (dist/): bad input and a missing camera give one
 * line naming the problem, a non-zero exit, no stack trace, and nothing written.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

const ROOT = join(__dirname, '..', '..');
const BIN = join(ROOT, 'bin', 'kerrtrace.js');
const have = existsSync(join(ROOT, 'dist', 'cli', 'main.js'));
const cwd = mkdtempSync(join(tmpdir(), 'kerrtrace-watch-cli-'));
afterAll(() => rmSync(cwd, { recursive: true, force: true }));

function watch(args: string[]) {
  const r = spawnSync(process.execPath, [BIN, 'watch', ...args], { encoding: 'utf8', timeout: 60_000, cwd });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function expectOneLine(r: { code: number | null; stderr: string }, pattern: RegExp): void {
  expect(r.code).not.toBe(0);
  const lines = r.stderr.trim().split('\n');
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(pattern);
  expect(r.stderr).not.toMatch(/\n\s+at /);
}

describe.skipIf(!have)('kerrtrace watch (command line)', () => {
  it('names the missing camera in one line and exits non-zero', () => {
    const r = watch(['/dev/video57']);
    expectOneLine(r, /no camera at \/dev\/video57/);
    expect(r.code).toBe(2);
  });

  it('names a missing clip', () => {
    expectOneLine(watch(['--source', 'nothing-here.mp4']), /clip nothing-here\.mp4 does not exist/);
  });

  it('refuses bad numbers and regions before opening anything', () => {
    expectOneLine(watch(['--source', 'x.mp4', '--gap-mm', '-4']), /--gap-mm/);
    expectOneLine(watch(['--source', 'x.mp4', '--roi', '1,2,3']), /--roi/);
    expectOneLine(watch(['--source', 'x.mp4', '--port', '70000']), /--port/);
    expectOneLine(watch(['--source', 'x.mp4', '--record-for', '5']), /--record-for needs --record/);
    expectOneLine(watch(['--demo', '--volts', 'a.csv']), /--demo brings its own clip and log/);
    expect(readdirSync(cwd)).toEqual([]);
  });
});
