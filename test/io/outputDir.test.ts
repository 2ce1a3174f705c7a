import { existsSync, mkdirSync, mkdtempSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { OUTPUT_MARKER, checkOutputDir, stageOutputDir } from '../../src/io/outputDir.js';

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
