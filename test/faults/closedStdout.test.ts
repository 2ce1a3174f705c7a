/**
 * Standard output closed early (`| head -1`: EPIPE) or full (`> /dev/full`: ENOSPC), for every
 * command and for --help, --version and --json output: one line on stderr, exit code 5
 * (README "Exit codes"), no stack trace, and the files the command wrote are complete.
 * "Closed early" is made certain by closing the pipe's reading end before the child writes.
 */
import { spawn, spawnSync } from 'node:child_process';
import { closeSync, existsSync, mkdtempSync, openSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { BIN, FIXTURE_RESULTS, MEDIA, ROOT, completeComparisonLabel, completeRunLabel, expectOneLine, type CliRun } from './faultHelpers.js';

const clipDir = join(MEDIA, 'sparks-halo', 'run');
const work = mkdtempSync(join(tmpdir(), 'kt-stdout-'));

function toDevFull(args: string[], cwd = ROOT): CliRun {
  const fd = openSync('/dev/full', 'w');
  try {
    const r = spawnSync(process.execPath, [BIN, ...args], { cwd, stdio: ['ignore', fd, 'pipe'], encoding: 'utf8', timeout: 300_000 });
    return { code: r.status, signal: r.signal, stdout: '', stderr: r.stderr };
  } finally {
    closeSync(fd);
  }
}

function toClosedPipe(args: string[], cwd = ROOT): Promise<CliRun> {
  return new Promise((done) => {
    const child = spawn(process.execPath, [BIN, ...args], { cwd, stdio: ['ignore', 'pipe', 'pipe'] });
    child.stdout.destroy(); // the reader is gone before anything is written
    let stderr = '';
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    child.on('close', (code, signal) => done({ code, signal, stdout: '', stderr }));
  });
}

const CLOSED = /standard output was closed before everything was written/;
const FULL = /standard output is full/;

const quick: [string, string[]][] = [
  ['--help', ['--help']],
  ['--version', ['--version']],
  ['analyze --help', ['analyze', '--help']],
  ['design', ['design', '--kerr-constant', '2.2e-12', '--length-mm', '40', '--gap-mm', '4']],
  ['design --json', ['design', '--kerr-constant', '2.2e-12', '--length-mm', '40', '--gap-mm', '4', '--json']],
  ['inspect', ['inspect', join(clipDir, 'clip.mp4')]],
  ['inspect --json', ['inspect', join(clipDir, 'clip.mp4'), '--json']],
  ['trace to stdout', ['trace', join(clipDir, 'clip.mp4'), '--roi', '90,75,40,40', '--quiet']],
];

describe('closed or full standard output', () => {
  for (const [name, args] of quick) {
    it(`${name}: full and closed stdout give one line and exit 5`, async () => {
      expectOneLine(toDevFull(args), 5, FULL);
      expectOneLine(await toClosedPipe(args), 5, CLOSED);
    });
  }

  it('analyze (summary and --json): the run folder is complete, stdout failure is one line', async () => {
    const base = ['analyze', join(clipDir, 'clip.mp4'), '--volts', join(clipDir, 'volts.csv'), '--length-mm', '45', '--gap-mm', '4.5', '--quiet', '--no-report', '--no-maps'];
    expectOneLine(toDevFull([...base, '--out', join(work, 'a1'), '--json']), 5, FULL);
    expect(completeRunLabel(join(work, 'a1'))).toEqual(expect.any(String));
    expectOneLine(await toClosedPipe([...base, '--out', join(work, 'a2')]), 5, CLOSED);
    expect(completeRunLabel(join(work, 'a2'))).toEqual(expect.any(String));
  });

  it('compare: the comparison is complete, stdout failure is one line', async () => {
    const base = ['compare', join(FIXTURE_RESULTS, 'before'), join(FIXTURE_RESULTS, 'after')];
    expectOneLine(toDevFull([...base, '--out', join(work, 'c1')]), 5, FULL);
    expect(completeComparisonLabel(join(work, 'c1'))).toBe('before+after');
    expectOneLine(await toClosedPipe([...base, '--out', join(work, 'c2')]), 5, CLOSED);
    expect(completeComparisonLabel(join(work, 'c2'))).toBe('before+after');
  });

  it('simulate: the rendered folder is complete, stdout failure is one line', async () => {
    expectOneLine(toDevFull(['simulate', join(clipDir, 'scenario.json'), '--out', join(work, 's1')]), 5, FULL);
    expect(existsSync(join(work, 's1', 'truth.json'))).toBe(true);
    expectOneLine(await toClosedPipe(['simulate', join(clipDir, 'scenario.json'), '--out', join(work, 's2')]), 5, CLOSED);
    expect(existsSync(join(work, 's2', 'clip.mp4'))).toBe(true);
  });

  it('demo and stills (on the demo photos): stdout failure is one line', async () => {
    expectOneLine(toDevFull(['demo', '--out', 'demo', '--quiet'], work), 5, FULL);
    expect(completeComparisonLabel(join(work, 'demo', 'comparison'))).toMatch(/purification/);
    const stills = ['stills', join(work, 'demo', 'after', 'photos'), '--length-mm', '40', '--gap-mm', '4', '--roi', '175,95,31,31', '--dark-roi', '250,10,60,40', '--quiet', '--no-report'];
    expectOneLine(toDevFull([...stills, '--out', join(work, 'st1')]), 5, FULL);
    expect(completeRunLabel(join(work, 'st1'))).toEqual(expect.any(String));
    expectOneLine(await toClosedPipe([...stills, '--out', join(work, 'st2'), '--json']), 5, CLOSED);
  }, 300_000);
});
