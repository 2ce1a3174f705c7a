import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  INCOMPLETE_MARKER, OUTPUT_MARKER, checkOutputDir, checkOutputFile, openOutputDirInPlace, recoverOutput, resolveOutputPath,
  stageOutputDir, writeOutputFile,
} from '../../src/io/outputDir.js';

describe('output folders', () => {
  it('are written whole: nothing is visible until commit, and abandon leaves nothing behind', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    const staged = stageOutputDir(join(root, 'run'), false);
    staged.write('a.txt', 'x');
    expect(existsSync(join(root, 'run'))).toBe(false);
    staged.commit();
    expect(readdirSync(join(root, 'run')).sort()).toEqual([OUTPUT_MARKER, 'a.txt']);
    const again = stageOutputDir(join(root, 'other'), false);
    again.abandon();
    expect(readdirSync(root)).toEqual(['run']);
  });

  it('--force replaces a folder kerrtrace wrote, but never one it did not write or one holding an input', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    const first = stageOutputDir(join(root, 'run'), false);
    first.write('old.txt', 'old');
    first.commit();
    const second = stageOutputDir(join(root, 'run'), true);
    second.write('new.txt', 'new');
    second.commit();
    expect(readdirSync(join(root, 'run')).sort()).toEqual([OUTPUT_MARKER, 'new.txt']);

    const mine = join(root, 'notes');
    mkdirSync(mine);
    writeFileSync(join(mine, 'lab-notebook.txt'), 'keep me');
    expect(() => checkOutputDir(mine, true, [])).toThrow(/not a folder kerrtrace wrote/);
    expect(() => stageOutputDir(mine, true)).toThrow(/not a folder kerrtrace wrote/);
    expect(readdirSync(mine)).toEqual(['lab-notebook.txt']);

    expect(() => checkOutputDir(root, true, [join(root, 'run', 'new.txt')])).toThrow(/holds one of the inputs/);
    expect(() => checkOutputDir(join(root, 'run'), false, [])).toThrow(/already exists and would be overwritten/);
  });
});

/** A process id that is certainly not running any more. */
function deadPid(): number {
  const r = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
  return Number(r.stdout);
}

function ourFolder(path: string, files: Record<string, string>): void {
  mkdirSync(path, { recursive: true });
  writeFileSync(join(path, OUTPUT_MARKER), 'x');
  for (const [name, text] of Object.entries(files)) writeFileSync(join(path, name), text);
}

describe('the output policy', () => {
  it('accepts an existing empty folder and replaces it with the result', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    mkdirSync(join(root, 'made-first'));
    const staged = stageOutputDir(join(root, 'made-first'), false);
    staged.write('a.txt', 'x');
    staged.commit();
    expect(readdirSync(join(root, 'made-first')).sort()).toEqual([OUTPUT_MARKER, 'a.txt']);
    expect(readdirSync(root)).toEqual(['made-first']);
  });

  it('--force will not replace a folder it wrote once the user has added a file to it', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    const first = stageOutputDir(join(root, 'run'), false);
    first.write('result.json', '{}');
    first.commit();
    expect(readFileSync(join(root, 'run', OUTPUT_MARKER), 'utf8')).toMatch(/files: \[".kerrtrace-output","result.json"\]/);
    writeFileSync(join(root, 'run', 'my-notes.txt'), 'keep me');
    expect(() => checkOutputDir(join(root, 'run'), true)).toThrow(/also holds a file it did not write \(my-notes\.txt\)/);
    expect(readFileSync(join(root, 'run', 'my-notes.txt'), 'utf8')).toBe('keep me');
  });

  it('refuses an output that is, holds or lies inside an input, also through links', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    ourFolder(join(root, 'run'), { 'clip.mp4': 'video' });
    symlinkSync(join(root, 'run', 'clip.mp4'), join(root, 'link.mp4'));
    symlinkSync(join(root, 'run'), join(root, 'run-link'));
    expect(() => checkOutputDir(join(root, 'run'), true, [join(root, 'link.mp4')])).toThrow(/is or holds one of the inputs/);
    expect(() => checkOutputDir(join(root, 'run-link'), true, [join(root, 'run', 'clip.mp4')])).toThrow(/is or holds one of the inputs/);
    expect(() => checkOutputDir(root, true, [join(root, 'run')])).toThrow(/is or holds one of the inputs/);
    expect(() => checkOutputDir(join(root, 'run', 'sub'), true, [join(root, 'run')])).toThrow(/lies inside the input folder/);
    expect(() => checkOutputDir(join(root, 'run-link', 'sub'), true, [join(root, 'run')])).toThrow(/lies inside the input folder/);
    expect(readdirSync(join(root, 'run')).sort()).toEqual([OUTPUT_MARKER, 'clip.mp4']);
  });

  it('never replaces the current folder or one above it', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    ourFolder(join(root, 'demo'), { 'a.txt': 'x' });
    mkdirSync(join(root, 'demo', 'inner'));
    const cwd = process.cwd();
    try {
      process.chdir(join(root, 'demo', 'inner'));
      expect(() => checkOutputDir('.', true)).toThrow(/current folder/);
      expect(() => checkOutputDir(join(root, 'demo'), true)).toThrow(/current folder/);
    } finally {
      process.chdir(cwd);
    }
  });

  it('restores the backup of a replace that was killed after moving the old result aside', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    const pid = deadPid();
    ourFolder(join(root, `.run.backup-${pid}-1700000000000`), { 'result.json': 'old' });
    ourFolder(join(root, `.run.partial-${pid}-1700000000001`), { 'result.json': 'new, complete' });
    const notes: string[] = [];
    recoverOutput(join(root, 'run'), (n) => notes.push(n));
    expect(readFileSync(join(root, 'run', 'result.json'), 'utf8')).toBe('old');
    expect(readdirSync(root)).toEqual(['run']);
    expect(notes.join('\n')).toMatch(/restored the earlier result .*run from \.run\.backup-/);
  });

  it('restores a backup into an empty folder made meanwhile, and keeps it when the path now holds something else', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    const pid = deadPid();
    ourFolder(join(root, `.run.backup-${pid}-1`), { 'result.json': 'old' });
    mkdirSync(join(root, 'run'));
    recoverOutput(join(root, 'run'), () => {});
    expect(readFileSync(join(root, 'run', 'result.json'), 'utf8')).toBe('old');
    ourFolder(join(root, `.other.backup-${pid}-1`), { 'result.json': 'old' });
    mkdirSync(join(root, 'other'));
    writeFileSync(join(root, 'other', 'mine.txt'), 'user file');
    const notes: string[] = [];
    recoverOutput(join(root, 'other'), (n) => notes.push(n));
    expect(existsSync(join(root, `.other.backup-${pid}-1`, 'result.json'))).toBe(true);
    expect(notes.join()).toMatch(/waits in .*\.other\.backup-/);
  });

  it('deletes the backup when the new result made it in, and leaves folders of live processes and look-alikes alone', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    const pid = deadPid();
    ourFolder(join(root, 'run'), { 'result.json': 'new' });
    // A kill during the delete: the marker goes last, so the half-deleted backup is still recognised.
    mkdirSync(join(root, `.run.backup-${pid}-1`));
    writeFileSync(join(root, `.run.backup-${pid}-1`, OUTPUT_MARKER), 'x');
    ourFolder(join(root, `.run.partial-${process.pid}-2`), { 'a.txt': 'being written by this process' });
    mkdirSync(join(root, `.run.partial-${pid}-3`));
    writeFileSync(join(root, `.run.partial-${pid}-3`, 'notes.txt'), 'no marker: not ours');
    recoverOutput(join(root, 'run'), () => {});
    expect(readdirSync(root).sort()).toEqual([`.run.partial-${pid}-3`, `.run.partial-${process.pid}-2`, 'run'].sort());
    expect(readFileSync(join(root, 'run', 'result.json'), 'utf8')).toBe('new');
  });

  it('removes an in-place folder left incomplete by a dead writer and brings its backup back', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    const pid = deadPid();
    ourFolder(join(root, 'demo'), { [INCOMPLETE_MARKER]: String(pid), 'half.txt': 'x' });
    ourFolder(join(root, `.demo.backup-${pid}-5`), { 'whole.txt': 'old demo' });
    recoverOutput(join(root, 'demo'), () => {});
    expect(readdirSync(join(root, 'demo')).sort()).toEqual([OUTPUT_MARKER, 'whole.txt']);
  });

  it('in-place writing: commit deletes the old folder, abandon puts it back', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    ourFolder(join(root, 'demo'), { 'old.txt': 'old' });
    const a = openOutputDirInPlace(join(root, 'demo'), { force: true });
    a.write('new.txt', 'new');
    expect(readdirSync(root).some((e) => e.startsWith('.demo.backup-'))).toBe(true);
    a.abandon();
    expect(readdirSync(root)).toEqual(['demo']);
    expect(readdirSync(join(root, 'demo')).sort()).toEqual([OUTPUT_MARKER, 'old.txt']);
    const b = openOutputDirInPlace(join(root, 'demo'), { force: true });
    b.write('new.txt', 'new');
    b.commit();
    expect(readdirSync(root)).toEqual(['demo']);
    expect(readdirSync(join(root, 'demo')).sort()).toEqual([OUTPUT_MARKER, 'new.txt']);
  });

  it('refuses empty, looping, dangling and pseudo-file-system paths in plain words', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    symlinkSync(join(root, 'b'), join(root, 'a'));
    symlinkSync(join(root, 'a'), join(root, 'b'));
    symlinkSync(join(root, 'missing'), join(root, 'dangling'));
    expect(() => resolveOutputPath('')).toThrow(/--out is empty/);
    expect(() => resolveOutputPath(join(root, 'a'))).toThrow(/loop of symbolic links/);
    expect(() => resolveOutputPath(join(root, 'dangling', 'x'))).toThrow(/points to .*missing, and that does not exist/);
    expect(() => resolveOutputPath('/proc/self/kt')).toThrow(/on proc, a system file system/);
  });

  it('single files (trace): never over the input, even through a link; stale temporary files of dead runs removed', () => {
    const root = mkdtempSync(join(tmpdir(), 'kt-out-'));
    writeFileSync(join(root, 'clip.mp4'), 'video');
    symlinkSync(join(root, 'clip.mp4'), join(root, 'out.csv'));
    expect(() => checkOutputFile(join(root, 'out.csv'), true, [join(root, 'clip.mp4')])).toThrow(/is the input/);
    const stale = join(root, `.t.csv.partial-${deadPid()}-1`);
    writeFileSync(stale, 'half');
    checkOutputFile(join(root, 't.csv'), false, []);
    expect(existsSync(stale)).toBe(false);
    writeOutputFile(join(root, 't.csv'), 'a,b\n', false);
    expect(readFileSync(join(root, 't.csv'), 'utf8')).toBe('a,b\n');
    expect(() => checkOutputFile(join(root, 't.csv'), false, [])).toThrow(/already exists/);
  });
});
