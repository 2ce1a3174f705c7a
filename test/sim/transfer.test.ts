import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { bt709Decode, bt709Encode, hlgEncode, makeCodeEncoder, pqEncode, srgbDecode, srgbEncode, toneCurveDecode, toneCurveEncode, transferDecode, transferEncode } from '../../src/sim/transfer.js';
import { yuv420p10FromRgb } from '../../src/sim/yuv420p10FromRgb.js';
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

describe('HDR and phone curves of the simulator', () => {
  it('HLG OETF (ITU-R BT.2100-2): E = 1/12 → 0.5, E = 1 → 1, and the core decoder inverts it', () => {
    expect(hlgEncode(1 / 12)).toBeCloseTo(0.5, 12);
    expect(hlgEncode(1)).toBeCloseTo(1, 6);
    for (const l of [0.001, 0.05, 0.3, 0.9]) expect(transferDecode('hlg', hlgEncode(l))).toBeCloseTo(l, 10);
  });

  it('PQ: full scale shown at 1000 cd/m² encodes to E′ ≈ 0.7518 (SMPTE ST 2084 value for 1000 cd/m², from memory) and decodes back', () => {
    expect(pqEncode(1)).toBeCloseTo(0.7518, 3);
    for (const l of [0.002, 0.1, 0.6]) expect(transferDecode('pq', pqEncode(l))).toBeCloseTo(l, 9);
  });

  it('the phone tone curve is monotone, adds mid-tone contrast and round-trips', () => {
    const curve = { exponent: 2.2, midContrast: 0.4 };
    let last = -1;
    for (let k = 0; k <= 200; k++) {
      const v = toneCurveEncode(curve, k / 200);
      expect(v).toBeGreaterThan(last);
      last = v;
    }
    // slope of S at mid-grey is 1 + k, at the ends 1 − k
    const s = (x: number) => toneCurveEncode({ exponent: 1, midContrast: 0.4 }, x);
    expect((s(0.5 + 1e-6) - s(0.5 - 1e-6)) / 2e-6).toBeCloseTo(1.4, 4);
    for (const l of [0.01, 0.2, 0.7]) expect(toneCurveDecode(curve, toneCurveEncode(curve, l))).toBeCloseTo(l, 9);
  });

  it('10-bit code tables round to the nearest code, also where PQ crowds many codes into one bin', () => {
    for (const t of ['hlg', 'pq'] as const) {
      const codes = makeCodeEncoder(t, 10);
      for (const l of [1e-5, 3e-4, 0.01, 0.2, 0.77]) expect(codes.encode(l)).toBe(Math.round(1023 * transferEncode(t, l)));
    }
    expect(makeCodeEncoder('pq', 10).topCode).toBe(Math.round(1023 * pqEncode(1)));
  });
});

describe('yuv420p10FromRgb (ITU-R BT.2020-2 Tables 4 and 5)', () => {
  it('puts white at Y 940, black at 64, neutral chroma at 512, and a red patch at the BT.2020 values', () => {
    const out = new Uint16Array(6);
    yuv420p10FromRgb(new Uint16Array(12).fill(1023), 2, 2, out);
    expect(Array.from(out)).toEqual([940, 940, 940, 940, 512, 512]);
    yuv420p10FromRgb(new Uint16Array(12), 2, 2, out);
    expect(Array.from(out)).toEqual([64, 64, 64, 64, 512, 512]);
    const red = new Uint16Array(12);
    for (let p = 0; p < 4; p++) red[3 * p] = 1023;
    yuv420p10FromRgb(red, 2, 2, out);
    expect(out[0]).toBe(Math.round(64 + 876 * 0.2627));
    expect(out[4]).toBe(Math.round(512 + 896 * (-0.2627 / 1.8814)));
    expect(out[5]).toBe(Math.round(512 + 896 * ((1 - 0.2627) / 1.4746)));
  });
});
