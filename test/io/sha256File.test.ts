import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash, randomBytes } from 'node:crypto';
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { sha256File } from '../../src/io/sha256File.js';
import { tempDir } from '../helpers/makeClip.js';

let dir: { dir: string; cleanup: () => Promise<void> };
beforeAll(async () => { dir = await tempDir('sha256'); });
afterAll(async () => { await dir.cleanup(); });

describe('sha256File', () => {
  it('gives the FIPS 180-2 example digests of "abc" and of the empty message', async () => {
    // FIPS 180-2, appendix B.1 ("abc"); the empty-message digest is the common published value
    await writeFile(join(dir.dir, 'abc'), 'abc');
    await writeFile(join(dir.dir, 'empty'), '');
    expect(await sha256File(join(dir.dir, 'abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(await sha256File(join(dir.dir, 'empty'))).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });

  it('agrees with a one-shot node:crypto digest at and around the 1 MiB read size', async () => {
    for (const bytes of [1, (1 << 20) - 1, 1 << 20, (1 << 20) + 1, 3 * (1 << 20) + 12345]) {
      const data = randomBytes(bytes);
      const path = join(dir.dir, `random-${bytes}`);
      await writeFile(path, data);
      expect(await sha256File(path), `${bytes} bytes`).toBe(createHash('sha256').update(data).digest('hex'));
    }
  });

  it('rejects with the file system error for a missing file', async () => {
    await expect(sha256File(join(dir.dir, 'missing'))).rejects.toMatchObject({ code: 'ENOENT' });
  });
});
