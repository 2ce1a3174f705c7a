import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { bt709Decode, bt709Encode, makeCodeEncoder, srgbDecode, srgbEncode, transferEncode } from '../../src/sim/transfer.js';
import { OUTSIDE } from '../setup/outsideSources.js';

describe('sRGB transfer (IEC 61966-2-1:1999, values as quoted in docs/references.md)', { tags: [OUTSIDE.srgb] }, () => {
  it('encodes linear 0.214041 to 0.5 and decodes 0.5 back to 0.214041', () => {
    expect(srgbEncode(0.214041)).toBeCloseTo(0.5, 6);
    expect(srgbDecode(0.5)).toBeCloseTo(0.214041, 6);
  });

  it('decodes 8-bit code 128 to 0.215861 (IEC 61966-2-1)', () => {
    expect(srgbDecode(128 / 255)).toBeCloseTo(0.215861, 6);
  });

  it('uses the linear segment below 0.0031308 (12.92·L, IEC 61966-2-1)', () => {
    expect(srgbEncode(0.002)).toBeCloseTo(0.02584, 10);
    expect(srgbDecode(0.04045)).toBeCloseTo(0.04045 / 12.92, 12);
  });

  it('round-trips any level in [0, 1]', () => {
    fc.assert(fc.property(fc.double({ min: 0, max: 1, noNaN: true }), (l) => Math.abs(srgbDecode(srgbEncode(l)) - l) < 1e-12));
  });
});

describe('BT.709 transfer (ITU-R BT.709-6)', { tags: [OUTSIDE.bt709] }, () => {
  it('inverse: L = V/4.5 below 0.081, ((V + 0.099)/1.099)^(1/0.45) above', () => {
    expect(bt709Decode(0.0405)).toBeCloseTo(0.0405 / 4.5, 12);
    expect(bt709Decode(0.5)).toBeCloseTo(Math.pow(0.599 / 1.099, 1 / 0.45), 12);
    expect(bt709Encode(0.018)).toBeCloseTo(0.081, 3); // the two segments meet at L = 0.018, V ≈ 0.081
  });

  it('round-trips any level in [0, 1]', () => {
    fc.assert(fc.property(fc.double({ min: 0, max: 1, noNaN: true }), (l) => Math.abs(bt709Decode(bt709Encode(l)) - l) < 1e-9));
  });
});

describe('makeCodeEncoder (linear light → 8-bit code)', () => {
  for (const transfer of ['srgb', 'bt709', 'linear'] as const) {
    it(`gives round(255·encode(L)) for ${transfer}, clipping outside [0, 1]`, () => {
      const codes = makeCodeEncoder(transfer);
      fc.assert(
        fc.property(fc.double({ min: -0.5, max: 1.5, noNaN: true }), (l) => {
          const direct = Math.round(255 * transferEncode(transfer, Math.min(1, Math.max(0, l))));
          return codes.encode(l) === direct;
        }),
        { numRuns: 20000 },
      );
    });
  }

  it('puts linear 0.215861 at sRGB code 128, the level code 128 decodes to (IEC 61966-2-1)', { tags: [OUTSIDE.srgb] }, () => {
    const codes = makeCodeEncoder('srgb');
    expect(codes.encode(0.215861)).toBe(128);
    // 0.214041 encodes to 0.5 = code 127.5, right on a rounding boundary: 127 or 128, nothing else
    expect([127, 128]).toContain(codes.encode(0.214041));
  });
});
