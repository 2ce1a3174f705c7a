/**
 * Errors of the environment through the real command line: a full disk, a read-only file system,
 * a folder the user may not write to, link loops and dangling links, pseudo file systems, an
 * empty --out, and an ffprobe without execute permission. Each gives one line naming the path and
 * what to do, the documented exit code (README "Exit codes": 2 bad input, 3 tool failed,
 * 5 environment), no stack trace, no "internal error", and leaves any earlier result complete.
 *
 * Full and read-only disks are real: small tmpfs mounts (tests run as root in CI). Where mounting
 * is impossible those cases are skipped with a notice naming why. The permission case runs the
 * tool as user "nobody" through setpriv (root ignores file modes), skipped when setpriv is missing.
 * "Before decoding" is shown by pointing KERRTRACE_FFPROBE at a missing file: had decoding
 * started, the error would be about ffprobe instead of the output.
 */
import { spawnSync } from 'node:child_process';
import { createRequire } from 'node:module';
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readdirSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { FIXTURE_RESULTS, MEDIA, completeComparisonLabel, expectOneLine, kerrtrace, leftovers } from './faultHelpers.js';

const clipDir = join(MEDIA, 'sparks-halo', 'run');
const analyzeArgs = ['analyze', join(clipDir, 'clip.mp4'), '--volts', join(clipDir, 'volts.csv'), '--length-mm', '45', '--gap-mm', '4.5', '--quiet', '--no-report', '--no-maps'];
const compareArgs = ['compare', join(FIXTURE_RESULTS, 'before'), join(FIXTURE_RESULTS, 'after')];
const noDecoding = { KERRTRACE_FFPROBE: '/nonexistent/ffprobe', KERRTRACE_FFMPEG: '/nonexistent/ffmpeg' };

const work = mkdtempSync(join(tmpdir(), 'kt-env-'));
const mounts: string[] = [];

function mount(dir: string, sizeBytes: number): boolean {
  mkdirSync(dir, { recursive: true });
  const r = spawnSync('mount', ['-t', 'tmpfs', '-o', `size=${sizeBytes}`, 'tmpfs', dir], { encoding: 'utf8' });
  if (r.status !== 0) return false;
  mounts.push(dir);
  return true;
}

const canMount = ((): boolean => {
  const probe = join(work, 'probe-mount');
  const ok = mount(probe, 65536);
  if (!ok) console.warn('test/faults/environment: cannot mount tmpfs here (needs root); full-disk and read-only cases skipped');
  return ok;
})();

/** Fills a tmpfs until it has no room left (ENOSPC), leaving `leaveBytes` free. */
function fill(dir: string, leaveBytes: number): void {
  spawnSync('sh', ['-c', `dd if=/dev/zero of=${dir}/filler bs=4096 2>/dev/null; true`]);
  if (leaveBytes > 0) spawnSync('truncate', ['-s', `-${leaveBytes}`, join(dir, 'filler')]);
}

afterAll(() => {
  for (const m of mounts.reverse()) spawnSync('umount', ['-l', m]);
});

describe('environment errors are one line with exit code 5', () => {
  it.skipIf(!canMount)('a full disk before the run: refused before decoding, nothing left behind', () => {
    const disk = join(work, 'full');
    expect(mount(disk, 64 * 1024)).toBe(true);
    fill(disk, 0);
    const r = kerrtrace([...analyzeArgs, '--out', join(disk, 'run')], { env: noDecoding });
    expectOneLine(r, 5, /no space left on the disk while creating the output folder in .*full \(ENOSPC\)\. Free some space or choose --out on another disk/);
    expect(readdirSync(disk)).toEqual(['filler']);
  });

  it.skipIf(!canMount)('a disk that fills up while writing: exit 5, the earlier result kept whole, no staging left', () => {
    const disk = join(work, 'filling');
    expect(mount(disk, 512 * 1024)).toBe(true);
    const out = join(disk, 'cmp');
    const first = kerrtrace([...compareArgs, '--out', out, '--label', 'old-a', '--label', 'old-b']);
    expect(first.code, first.stderr).toBe(0);
    fill(disk, 16 * 1024); // room for the probe, not for the plots
    const r = kerrtrace([...compareArgs, '--out', out, '--force', '--label', 'new-a', '--label', 'new-b']);
    expectOneLine(r, 5, /no space left on the disk while writing .*cmp.*ENOSPC/);
    expect(completeComparisonLabel(out)).toBe('old-a+old-b');
    expect(leftovers(out)).toEqual([]);
  });

  it.skipIf(!canMount)('a read-only file system: refused before decoding', () => {
    const disk = join(work, 'ro');
    expect(mount(disk, 64 * 1024)).toBe(true);
    expect(spawnSync('mount', ['-o', 'remount,ro', disk]).status).toBe(0);
    const r = kerrtrace([...analyzeArgs, '--out', join(disk, 'run')], { env: noDecoding });
    expectOneLine(r, 5, /ro is on a read-only file system .*EROFS.*Choose a folder on a writable disk/);
    const t = kerrtrace(['trace', join(clipDir, 'clip.mp4'), '--roi', '1,1,8,8', '--out', join(disk, 't.csv')], { env: noDecoding });
    expectOneLine(t, 5, /read-only file system/);
  });

  const setpriv = spawnSync('sh', ['-c', 'command -v setpriv'], { encoding: 'utf8' }).stdout.trim();
  it.skipIf(setpriv === '' || process.getuid?.() !== 0)('a folder the user may not write to (run as nobody): exit 5, names the folder', () => {
    const locked = join(work, 'locked');
    mkdirSync(locked);
    chmodSync(work, 0o755);
    chmodSync(locked, 0o755); // owned by root: nobody may read it but not write
    const r = spawnSync(setpriv, ['--reuid=65534', '--regid=65534', '--clear-groups', process.execPath, join(__dirname, '..', '..', 'bin', 'kerrtrace.js'), ...compareArgs, '--out', join(locked, 'cmp')], { encoding: 'utf8' });
    expectOneLine({ code: r.status, signal: r.signal, stdout: r.stdout, stderr: r.stderr }, 5, /permission denied while creating the output folder in .*locked.*EACCES/);
    expect(readdirSync(locked)).toEqual([]);
  });

  it('link loops and dangling links as --out or as an input are said in plain words', () => {
    symlinkSync(join(work, 'loop-b'), join(work, 'loop-a'));
    symlinkSync(join(work, 'loop-a'), join(work, 'loop-b'));
    symlinkSync(join(work, 'nowhere'), join(work, 'dangling'));
    expectOneLine(kerrtrace([...compareArgs, '--out', join(work, 'loop-a')]), 5, /loop-a leads into a loop of symbolic links/);
    expectOneLine(kerrtrace([...compareArgs, '--out', join(work, 'loop-a', 'sub')]), 5, /leads into a loop of symbolic links/);
    expectOneLine(kerrtrace([...compareArgs, '--out', join(work, 'dangling')]), 2, /symbolic link .*dangling, which points to .*nowhere, and that does not exist/);
    const input = kerrtrace(['analyze', join(work, 'loop-a'), '--volts', join(clipDir, 'volts.csv'), '--length-mm', '45', '--gap-mm', '4.5', '--out', join(work, 'x')]);
    expectOneLine(input, 2, /loop-a is a symbolic link that points, through other links, back to itself \(a loop\)/);
    const inspect = kerrtrace(['inspect', join(work, 'dangling')]);
    expectOneLine(inspect, 2, /dangling is a symbolic link to .*nowhere, which does not exist/);
  });

  it("--out '', a pseudo file system, and a path through a file are refused at once", () => {
    expectOneLine(kerrtrace([...compareArgs, '--out', '']), 2, /--out is empty, so there is no folder to write to/);
    expectOneLine(kerrtrace([...analyzeArgs, '--out', '/proc/kerrtrace-run'], { env: noDecoding }), 2, /is on proc, a system file system that cannot hold files/);
    expectOneLine(kerrtrace([...compareArgs, '--out', '/sys/kernel/kerrtrace']), 2, /system file system/);
    writeFileSync(join(work, 'a-file'), 'x');
    expectOneLine(kerrtrace([...compareArgs, '--out', join(work, 'a-file', 'run')]), 2, /goes through the file .*a-file as if it were a folder/);
    expectOneLine(kerrtrace(['simulate', join(clipDir, 'scenario.json'), '--out', '', '--quiet']), 2, /--out is empty/);
  });

  it('an ffprobe without execute permission is named with the chmod that fixes it', () => {
    const fake = join(work, 'ffprobe');
    writeFileSync(fake, '#!/bin/sh\necho "ffprobe version 1"\n');
    chmodSync(fake, 0o644);
    const r = kerrtrace(['inspect', join(clipDir, 'clip.mp4')], { env: { KERRTRACE_FFPROBE: fake } });
    expectOneLine(r, 3, new RegExp(`ffprobe at ${fake} may not be run by this user \\(mode 644, owner uid \\d+.*Run \`chmod a\\+x ${fake}\``));
  });

  const packaged = ((): string | undefined => {
    try {
      return (createRequire(import.meta.url)('@ffprobe-installer/ffprobe') as { path: string }).path;
    } catch {
      return undefined;
    }
  })();
  const ownerOnly = packaged !== undefined && existsSync(packaged) && (statSync(packaged).mode & 0o001) === 0;
  it.skipIf(!ownerOnly || setpriv === '' || process.getuid?.() !== 0)('the packaged ffprobe, executable by its owner only, is explained to another user', () => {
    const r = spawnSync(setpriv, ['--reuid=65534', '--regid=65534', '--clear-groups', process.execPath, join(__dirname, '..', '..', 'bin', 'kerrtrace.js'), 'inspect', join(clipDir, 'clip.mp4')], {
      encoding: 'utf8', env: { ...process.env, PATH: '/nonexistent' },
    });
    expectOneLine({ code: r.status, signal: r.signal, stdout: r.stdout, stderr: r.stderr }, 3, /may not be run by this user .*Run `chmod a\+x .*ffprobe`/);
  });
});
