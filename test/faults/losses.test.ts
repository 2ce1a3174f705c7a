/**
 * Every loss reported in the output-policy issue, through the real command line: each command
 * below once deleted or overwrote an input or an earlier result. Each must now be refused in one
 * line with exit code 2 and leave every file as it was. Stale staging folders of killed runs are
 * removed by the next run (only those with kerrtrace's name pattern and marker).
 */
import { spawnSync } from 'node:child_process';
import { copyFileSync, cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { BUILT, FIXTURE_RESULTS, MEDIA, expectOneLine, hashTree, kerrtrace } from './faultHelpers.js';

const clipDir = join(MEDIA, 'sparks-halo', 'run');
const geometry = ['--length-mm', '45', '--gap-mm', '4.5', '--quiet', '--no-report', '--no-maps'];

/** A process id that is certainly not running any more. */
function deadPid(): number {
  const r = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
  return Number(r.stdout);
}

describe.skipIf(!BUILT)('losses the output policy prevents', () => {
  let work: string;
  let run: string; // an earlier analyze result, written by kerrtrace
  beforeAll(() => {
    work = mkdtempSync(join(tmpdir(), 'kt-loss-'));
    run = join(work, 'run1');
    const r = kerrtrace(['analyze', join(clipDir, 'clip.mp4'), '--volts', join(clipDir, 'volts.csv'), ...geometry, '--out', run]);
    expect(r.code, r.stderr).toBe(0);
  });

  it('compare A B --out A --force refuses to replace run A', () => {
    const other = join(work, 'other');
    cpSync(join(FIXTURE_RESULTS, 'after'), other, { recursive: true });
    const before = hashTree(run);
    const r = kerrtrace(['compare', run, other, '--out', run, '--force']);
    expectOneLine(r, 2, /the output .*run1 is or holds one of the inputs/);
    expect(hashTree(run)).toEqual(before);
  });

  it('compare refuses an output inside a compared run folder', () => {
    const before = hashTree(run);
    const r = kerrtrace(['compare', run, join(FIXTURE_RESULTS, 'after'), '--out', join(run, 'cmp')]);
    expectOneLine(r, 2, /lies inside the input folder/);
    expect(hashTree(run)).toEqual(before);
  });

  it('analyze --force keeps an --open-video that lies in the output folder', () => {
    const out = join(work, 'holds-open');
    cpSync(run, out, { recursive: true });
    copyFileSync(join(clipDir, 'clip.mp4'), join(out, 'open.mp4'));
    const before = hashTree(out);
    const r = kerrtrace(['analyze', join(clipDir, 'clip.mp4'), '--volts', join(clipDir, 'volts.csv'), ...geometry, '--open-video', join(out, 'open.mp4'), '--out', out, '--force']);
    expectOneLine(r, 2, /is or holds one of the inputs/);
    expect(hashTree(out)).toEqual(before);
  });

  it('analyze --force keeps a --baseline that is the output folder', () => {
    const out = join(work, 'baseline-run');
    cpSync(run, out, { recursive: true });
    const before = hashTree(out);
    const r = kerrtrace(['analyze', join(clipDir, 'clip.mp4'), '--volts', join(clipDir, 'volts.csv'), ...geometry, '--baseline', out, '--out', out, '--force']);
    expectOneLine(r, 2, /is or holds one of the inputs/);
    expect(hashTree(out)).toEqual(before);
  });

  it('analyze --force keeps a video reached through a symbolic link into the output folder', () => {
    const out = join(work, 'holds-clip');
    cpSync(run, out, { recursive: true });
    copyFileSync(join(clipDir, 'clip.mp4'), join(out, 'clip.mp4'));
    copyFileSync(join(clipDir, 'volts.csv'), join(out, 'volts.csv'));
    symlinkSync(join(out, 'clip.mp4'), join(work, 'link.mp4'));
    symlinkSync(out, join(work, 'link-to-run'));
    const before = hashTree(out);
    const viaFileLink = kerrtrace(['analyze', join(work, 'link.mp4'), '--volts', join(out, 'volts.csv'), ...geometry, '--out', out, '--force']);
    expectOneLine(viaFileLink, 2, /is or holds one of the inputs/);
    const viaFolderLink = kerrtrace(['analyze', join(out, 'clip.mp4'), '--volts', join(out, 'volts.csv'), ...geometry, '--out', join(work, 'link-to-run'), '--force']);
    expectOneLine(viaFolderLink, 2, /is or holds one of the inputs/);
    expect(hashTree(out)).toEqual(before);
  });

  it('demo --out . --force and demo --out USERFOLDER --force delete nothing', () => {
    const cwd = join(work, 'lab');
    mkdirSync(cwd);
    writeFileSync(join(cwd, 'notebook.txt'), 'keep me');
    const here = kerrtrace(['demo', '--out', '.', '--force', '--quiet'], { cwd });
    expectOneLine(here, 2, /current folder/);
    const mine = kerrtrace(['demo', '--out', cwd, '--force', '--quiet']);
    expectOneLine(mine, 2, /not a folder kerrtrace wrote/);
    expect(readdirSync(cwd)).toEqual(['notebook.txt']);
  });

  it('simulate SCENARIO --out DIR --force refuses when the scenario lies in DIR', () => {
    const dir = join(work, 'sim');
    mkdirSync(dir);
    for (const f of ['clip.mp4', 'volts.csv', 'truth.json']) copyFileSync(join(clipDir, f), join(dir, f));
    // Compact JSON: a rewrite by the simulator would change the bytes.
    writeFileSync(join(dir, 'scenario.json'), JSON.stringify(JSON.parse(spawnSync('cat', [join(clipDir, 'scenario.json')], { encoding: 'utf8' }).stdout)));
    const before = hashTree(dir);
    const r = kerrtrace(['simulate', join(dir, 'scenario.json'), '--out', dir, '--force', '--quiet']);
    expectOneLine(r, 2, /is or holds one of the inputs/);
    expect(hashTree(dir)).toEqual(before);
  });

  it('stale staging and backup folders of killed runs are removed by the next run; look-alikes are kept', () => {
    const out = join(work, 'cmp');
    const pid = deadPid();
    const stale = join(work, `.cmp.partial-${pid}-1700000000000`);
    mkdirSync(join(stale, 'plots'), { recursive: true });
    writeFileSync(join(stale, '.kerrtrace-output'), 'x');
    writeFileSync(join(stale, 'plots', 'half.svg'), '<svg');
    const lookAlike = join(work, `.cmp.partial-${pid}-1700000000001`);
    mkdirSync(lookAlike);
    writeFileSync(join(lookAlike, 'mine.txt'), 'not written by kerrtrace: no marker');
    const other = join(work, `.other.partial-${pid}-1700000000000`);
    mkdirSync(other);
    writeFileSync(join(other, '.kerrtrace-output'), 'x');
    const r = kerrtrace(['compare', join(FIXTURE_RESULTS, 'before'), join(FIXTURE_RESULTS, 'after'), '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    expect(existsSync(stale)).toBe(false);
    expect(readdirSync(lookAlike)).toEqual(['mine.txt']);
    expect(existsSync(other)).toBe(true); // belongs to another output name
    // A backup whose replace finished (the new result is in place) is deleted too.
    const backup = join(work, `.cmp.backup-${pid}-1700000000000`);
    cpSync(out, backup, { recursive: true });
    const again = kerrtrace(['compare', join(FIXTURE_RESULTS, 'before'), join(FIXTURE_RESULTS, 'after'), '--out', out, '--force']);
    expect(again.code, again.stderr).toBe(0);
    expect(existsSync(backup)).toBe(false);
  });

  it('an existing empty folder is accepted as --out (mkdir out first)', () => {
    const out = join(work, 'made-first');
    mkdirSync(out);
    const r = kerrtrace(['compare', join(FIXTURE_RESULTS, 'before'), join(FIXTURE_RESULTS, 'after'), '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    expect(readdirSync(out)).toContain('comparison.html');
  });
});
