import { describe, expect, it } from 'vitest';
import { decodingFor } from '../../../src/core/camera/decodingFor.js';
import type { KerrError } from '../../../src/errors.js';

const tagged = { colourTransfer: 'iec61966-2-1', colourMatrix: 'bt709', colourRange: 'limited' as const, height: 1080 };

describe('decodingFor: decoding chosen from stream tags (ffprobe names)', () => {
  it('reads iec61966-2-1 as srgb, bt709 matrix, limited range, clip code 250, without notes', () => {
    const d = decodingFor(tagged);
    expect(d).toEqual({ range: 'limited', matrix: 'bt709', transfer: 'srgb', clipCode: 250, notes: [] });
  });

  it.each([['bt709', 'bt709'], ['smpte170m', 'bt709'], ['linear', 'linear'], ['gamma22', 'gamma:2.2']])('maps color_transfer %s to %s', (tag, expected) => {
    expect(decodingFor({ ...tagged, colourTransfer: tag }).transfer).toBe(expected);
  });

  it('assumes srgb with a note when the transfer is not tagged', () => {
    const d = decodingFor({ ...tagged, colourTransfer: 'unknown' });
    expect(d.transfer).toBe('srgb');
    expect(d.notes.join(' ')).toMatch(/transfer/);
  });

  it('reads the HDR transfers from their tags: arib-std-b67 → hlg, smpte2084 → pq (ITU-R BT.2100; ffprobe names), and bt2020nc → the BT.2020 matrix', () => {
    const hlg = decodingFor({ ...tagged, colourTransfer: 'arib-std-b67', colourMatrix: 'bt2020nc' });
    expect(hlg).toMatchObject({ transfer: 'hlg', matrix: 'bt2020', notes: [] });
    const pq = decodingFor({ ...tagged, colourTransfer: 'smpte2084', colourMatrix: 'bt2020nc' });
    expect(pq.transfer).toBe('pq');
    expect(pq.notes.join(' ')).toMatch(/clipped highlights cannot be recognised/);
  });

  it('refuses a tagged transfer or matrix it cannot decode, in one line, instead of decoding it as something else', () => {
    for (const meta of [{ ...tagged, colourTransfer: 'log316' }, { ...tagged, colourTransfer: 'smpte428' }, { ...tagged, colourMatrix: 'bt2020c' }, { ...tagged, colourMatrix: 'ycgco' }]) {
      let caught: unknown;
      try { decodingFor(meta); } catch (e) { caught = e; }
      expect((caught as { code?: string }).code).toBe('UNSUPPORTED_ENCODING');
      expect((caught as KerrError).oneLine()).not.toMatch(/\n/);
    }
  });

  it('accepts an unknown transfer tag when a measured response is given, and says so', () => {
    const d = decodingFor({ ...tagged, colourTransfer: 'log316' }, { response: { code: [0, 128, 255], linear: [0, 0.3, 1] } });
    expect(d.response).toBeDefined();
    expect(d.notes.join(' ')).toMatch(/measured camera response/);
  });

  it('maps BT.601 matrix tags and guesses by frame height when untagged (common practice: HD is BT.709)', () => {
    expect(decodingFor({ ...tagged, colourMatrix: 'smpte170m' }).matrix).toBe('bt601');
    expect(decodingFor({ ...tagged, colourMatrix: 'unknown', height: 720 }).matrix).toBe('bt709');
    const sd = decodingFor({ ...tagged, colourMatrix: 'unknown', height: 480 });
    expect(sd.matrix).toBe('bt601');
    expect(sd.notes.length).toBe(1);
  });

  it('assumes limited range with a note when the range is unknown, keeps full when tagged', () => {
    expect(decodingFor({ ...tagged, colourRange: 'unknown' }).range).toBe('limited');
    expect(decodingFor({ ...tagged, colourRange: 'unknown' }).notes.length).toBe(1);
    expect(decodingFor({ ...tagged, colourRange: 'full' }).range).toBe('full');
  });

  it('lets overrides win over tags, without notes for the overridden parts', () => {
    const d = decodingFor({ ...tagged, colourTransfer: 'unknown' }, { transfer: 'gamma:2.4', clipCode: 240, range: 'full' });
    expect(d.transfer).toBe('gamma:2.4');
    expect(d.clipCode).toBe(240);
    expect(d.range).toBe('full');
    expect(d.notes).toEqual([]);
  });
});
