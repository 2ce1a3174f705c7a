import { mkdtempSync, openSync, closeSync, writeFileSync, symlinkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { environmentError, withEnvironment } from '../../src/io/environmentError.js';
import { missingPathText } from '../../src/io/missingPathText.js';

const errno = (code: string, path?: string): NodeJS.ErrnoException => Object.assign(new Error(`${code}: x`), { code, ...(path ? { path } : {}) });

describe('environmentError', () => {
  it('says each system error in plain words with the path and what to do', () => {
    const cases: [string, RegExp][] = [
      ['EACCES', /permission denied while writing \/data\/run1 \(EACCES\)\. Choose a folder you may write to/],
      ['EROFS', /\/data\/run1 is on a read-only file system .*\(EROFS\)\. Choose a folder on a writable disk/],
      ['ENOSPC', /no space left on the disk while writing \/data\/run1 \(ENOSPC\)\. Free some space/],
      ['ENOTDIR', /a part of the path \/data\/run1 is a file, not a folder/],
      ['ELOOP', /\/data\/run1 leads into a loop of symbolic links/],
      ['EMFILE', /too many files are open .*ulimit -n/],
      ['EPIPE', /closed by the program reading it/],
    ];
    for (const [code, pattern] of cases) {
      const e = environmentError(errno(code), '/data/run1', 'writing');
      expect(e?.code).toBe('ENVIRONMENT');
      expect(e?.oneLine()).toMatch(pattern);
    }
  });

  it('leaves anything else alone, and uses the error\'s own path when none is given', () => {
    expect(environmentError(new Error('plain bug'))).toBeUndefined();
    expect(environmentError(errno('ERR_SOMETHING'))).toBeUndefined();
    expect(environmentError(errno('EACCES', '/etc/x'))?.oneLine()).toMatch(/\/etc\/x/);
  });

  it('withEnvironment converts a real failing call (EISDIR from writing over a folder)', () => {
    const dir = mkdtempSync(join(tmpdir(), 'kt-env-'));
    expect(() => withEnvironment(dir, 'writing', () => closeSync(openSync(dir, 'w')))).toThrow(/is a folder where a file was expected \(EISDIR\)/);
  });
});

describe('missingPathText', () => {
  it('names link loops and dangling links instead of "does not exist"', () => {
    const dir = mkdtempSync(join(tmpdir(), 'kt-miss-'));
    symlinkSync(join(dir, 'b'), join(dir, 'a'));
    symlinkSync(join(dir, 'a'), join(dir, 'b'));
    symlinkSync(join(dir, 'gone.mp4'), join(dir, 'clip.mp4'));
    writeFileSync(join(dir, 'file'), 'x');
    expect(missingPathText(join(dir, 'a'), 'fallback')).toMatch(/a is a symbolic link that points, through other links, back to itself \(a loop\)/);
    expect(missingPathText(join(dir, 'clip.mp4'), 'fallback')).toMatch(/clip\.mp4 is a symbolic link to .*gone\.mp4, which does not exist/);
    expect(missingPathText(join(dir, 'file', 'x'), 'fallback')).toMatch(/goes through a file as if it were a folder/);
    expect(missingPathText(join(dir, 'plain'), 'fallback')).toBe('fallback');
  });
});
