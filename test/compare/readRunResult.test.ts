import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readRunResult } from '../../src/compare/readRunResult.js';
import { buildRunFixture } from '../fixtures/results/buildRunFixture.js';

const fixtures = new URL('../fixtures/results/', import.meta.url).pathname;
let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'kerrtrace-read-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function write(name: string, content: unknown): string {
  const p = join(dir, name);
  writeFileSync(p, typeof content === 'string' ? content : JSON.stringify(content));
  return p;
}

async function failure(path: string): Promise<{ code: string; message: string; hint?: string }> {
  try {
    await readRunResult(path);
  } catch (err) {
    return err as { code: string; message: string; hint?: string };
  }
  throw new Error('expected readRunResult to fail');
}

describe('readRunResult', () => {
  it('reads the committed fixtures from a folder or a file, with the file’s SHA-256', async () => {
    for (const name of ['before', 'after', 'other-cell']) {
      const fromDir = await readRunResult(join(fixtures, name));
      const fromFile = await readRunResult(join(fixtures, name, 'result.json'));
      expect(fromDir.result.kind).toBe('kerrtrace-run');
      expect(fromFile.result).toEqual(fromDir.result);
      const expected = createHash('sha256').update(readFileSync(join(fixtures, name, 'result.json'))).digest('hex');
      expect(fromDir.source.sha256).toBe(expected);
    }
  });

  it('says when the file or folder is missing', async () => {
    const e = await failure(join(dir, 'nowhere'));
    expect(e.code).toBe('BAD_RESULT');
    expect(e.message).toMatch(/^no result file at /);
    const empty = mkdtempSync(join(dir, 'empty-'));
    expect((await failure(empty)).message).toMatch(/holds no result\.json/);
  });

  it('says when the file is not JSON', async () => {
    const e = await failure(write('broken.json', '{"kind": "kerrtrace-run",'));
    expect(e.code).toBe('BAD_RESULT');
    expect(e.message).toMatch(/is not valid JSON/);
    expect(e.message).not.toContain('\n');
  });

  it('refuses another kind of file, another schema version and unknown fields', async () => {
    const { result } = buildRunFixture();
    expect((await failure(write('kind.json', { ...result, kind: 'something-else' }))).message).toMatch(/expected a kerrtrace run result .* but received kind "something-else"/);
    expect((await failure(write('version.json', { ...result, schemaVersion: 3 }))).message).toMatch(/expected result schema version 1 or 2 .* but received 3/);
    // a negative uncertainty is damage, not a figure (issue 12: compare accepted a negative σ)
    expect((await failure(write('negative.json', { ...result, kerrConstant: { value: 2e-12, stdErr: -1e-14, unit: 'm/V^2' } }))).message).toMatch(/non-negative uncertainty "kerrConstant.stdErr"/);
    expect((await failure(write('nonphysical.json', { ...result, halfWaveVoltage: { value: -9000, stdErr: 10, unit: 'V' } }))).message).toMatch(/positive "halfWaveVoltage.value"/);
    expect((await failure(write('extra.json', { ...result, surprise: 1 }))).message).toMatch(/unknown field "surprise"/);
    expect((await failure(write('array.json', [1, 2]))).message).toMatch(/does not hold a JSON object/);
  });

  it('refuses damaged figures and geometry', async () => {
    const { result } = buildRunFixture();
    expect((await failure(write('gap.json', { ...result, cell: { ...result.cell, gapM: -1 } }))).message).toMatch(/positive number "cell.gapM"/);
    expect((await failure(write('fig.json', { ...result, kerrConstant: 2.4e-12 }))).message).toMatch(/figure \{value, stdErr\} "kerrConstant"/);
  });

  it('accepts null for numbers JSON cannot hold (written for NaN/Infinity)', async () => {
    const { result } = buildRunFixture();
    const p = write('nulls.json', { ...result, contrastRatio: { value: null, stdErr: null } });
    expect((await readRunResult(p)).result.contrastRatio.value).toBeNull();
  });
});
