/**
 * writeRunDir with a file list decided before writing (RunResult.files, from runFiles): the folder
 * is written when it holds exactly those files, and refused (KerrError INTERNAL, nothing left at
 * the target) when it would hold others; the result is not changed by writing.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeRunDir } from '../../src/pipeline/writeRun.js';
import { runFiles } from '../../src/pipeline/runFiles.js';
import { buildRunFixture } from '../fixtures/results/buildRunFixture.js';

let dir = '';
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'kerrtrace-writerun-')); });
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

describe('writeRunDir with a decided file list', () => {
  it('writes the folder when it holds what the result lists, and leaves the result as it was', async () => {
    const { result, trace } = buildRunFixture();
    const files = runFiles({ extraFiles: ['maps/static.png'], report: false, trace, linearised: result.linearised, syncCurvePoints: 0 });
    const r = { ...result, files };
    const before = JSON.stringify(r);
    const target = await writeRunDir(join(dir, 'ok'), false, { result: r, trace, extraFiles: { 'maps/static.png': new Uint8Array([1, 2, 3]) } });
    expect(JSON.stringify(r)).toBe(before);
    expect(JSON.parse(readFileSync(join(target, 'result.json'), 'utf8')).files).toEqual({ result: 'result.json', trace: 'trace.csv', mapsStatic: 'maps/static.png' });
  });

  it('refuses a folder that would hold other files than the result lists, writing nothing', async () => {
    const { result, trace } = buildRunFixture();
    const files = runFiles({ extraFiles: [], report: true, trace, linearised: result.linearised, syncCurvePoints: 0 });
    const out = join(dir, 'mismatch');
    await expect(writeRunDir(out, false, { result: { ...result, files }, trace })).rejects.toThrow(/would hold result.json, trace.csv but its result lists/);
    expect(existsSync(out)).toBe(false);
  });
});
