import { afterEach, describe, expect, it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { listStillPhotos, sniffImageFormat } from '../../src/stills/listStillPhotos.js';
import { tempFolder, writeJpeg, writePng8 } from './stillsFixtures.js';

let cleanup: (() => void) | null = null;
afterEach(() => cleanup?.());

describe('listStillPhotos', () => {
  it('sniffs signatures: JPEG FF D8 FF, PNG 89 50 4E 47, TIFF II*\\0 / MM\\0* (format specifications)', () => {
    expect(sniffImageFormat(new Uint8Array([0xff, 0xd8, 0xff, 0xe0]))).toBe('jpeg');
    expect(sniffImageFormat(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]))).toBe('png');
    expect(sniffImageFormat(new Uint8Array([0x49, 0x49, 0x2a, 0x00]))).toBe('tiff');
    expect(sniffImageFormat(new Uint8Array([0x4d, 0x4d, 0x00, 0x2a]))).toBe('tiff');
    expect(sniffImageFormat(new Uint8Array([0x47, 0x49, 0x46, 0x38]))).toBe('unknown');
  });

  it('natural order, non-images ignored and counted, raw files skipped with a reason', async () => {
    const t = tempFolder();
    cleanup = t.cleanup;
    for (const n of ['step10_1kV.jpg', 'step2_0V.png', 'step1_0V.JPEG']) {
      if (n.endsWith('png')) await writePng8(join(t.dir, n), { beam: 0.1, width: 8, height: 8 });
      else await writeJpeg(join(t.dir, n), { beam: 0.1, width: 8, height: 8 });
    }
    writeFileSync(join(t.dir, 'volts.csv'), 'file,voltage\n');
    writeFileSync(join(t.dir, 'IMG_1.DNG'), 'raw');
    writeFileSync(join(t.dir, '.hidden.jpg'), 'x');
    const l = await listStillPhotos(t.dir);
    expect(l.photos).toEqual(['step1_0V.JPEG', 'step2_0V.png', 'step10_1kV.jpg']);
    expect(l.formats).toEqual(['jpeg', 'png', 'jpeg']);
    expect(l.ignored).toEqual(['volts.csv']);
    expect(l.skipped).toEqual([{ file: 'IMG_1.DNG', reason: expect.stringMatching(/camera raw file/) }]);
  });

  it('a .png that is not a PNG is refused with a line saying so', async () => {
    const t = tempFolder();
    cleanup = t.cleanup;
    await writeJpeg(join(t.dir, 'real.jpg'), { beam: 0.1, width: 8, height: 8 });
    const { copyFileSync } = await import('node:fs');
    copyFileSync(join(t.dir, 'real.jpg'), join(t.dir, 'fake.png'));
    await expect(listStillPhotos(t.dir)).rejects.toThrow(/fake\.png does not look like a PNG file \(its first bytes are those of a JPEG file\)/);
  });
});
