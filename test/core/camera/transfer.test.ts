import { describe, expect, it } from 'vitest';
import { HLG_A, HLG_B, HLG_C, PQ, bt709ToLinear, hlgToLinear, parseTransfer, pqToCdM2, srgbToLinear, toLinear, transferLut } from '../../../src/core/camera/transfer.js';
import { KerrError } from '../../../src/errors.js';
import { OUTSIDE } from '../../setup/outsideSources.js';

describe('sRGB decoding (IEC 61966-2-1:1999)', { tags: [OUTSIDE.srgb] }, () => {
  it('maps V = 0.5 to 0.214041 (IEC 61966-2-1, value listed in docs/references.md)', () => {
    expect(srgbToLinear(0.5)).toBeCloseTo(0.214041, 6);
  });

  it('maps 8-bit code 128 to 0.215861 through the table (IEC 61966-2-1)', () => {
    expect(transferLut('srgb')[128]).toBeCloseTo(0.215861, 6);
  });

  it('uses the linear segment V/12.92 up to V = 0.04045 and the power segment above (IEC 61966-2-1)', () => {
    expect(srgbToLinear(0.02)).toBeCloseTo(0.02 / 12.92, 12);
    expect(srgbToLinear(0.04045)).toBeCloseTo(0.04045 / 12.92, 12);
    expect(srgbToLinear(0.8)).toBeCloseTo(((0.8 + 0.055) / 1.055) ** 2.4, 12);
    // the code's two segments meet: either side of the breakpoint the decoded values differ by the
    // slope times the step (1/12.92 per unit of V) plus the standard's own 1e-7 mismatch, no more
    for (const step of [1e-6, 1e-9]) {
      const below = srgbToLinear(0.04045 - step);
      const above = srgbToLinear(0.04045 + step);
      expect(Math.abs(above - below)).toBeLessThan((2 * step) / 12.92 * 1.01 + 1e-7);
    }
    // and the power segment starts right after it (V = 0.04046 is on the power curve, not the line)
    expect(srgbToLinear(0.04046)).toBeCloseTo(((0.04046 + 0.055) / 1.055) ** 2.4, 14);
  });

  it('clamps signals outside 0..1', () => {
    expect(srgbToLinear(-0.2)).toBe(0);
    expect(srgbToLinear(1.3)).toBe(1);
  });
});

describe('BT.709 inverse OETF (ITU-R BT.709-6)', { tags: [OUTSIDE.bt709] }, () => {
  it('is V/4.5 below V = 0.081', () => {
    expect(bt709ToLinear(0.05)).toBeCloseTo(0.05 / 4.5, 12);
    expect(bt709ToLinear(0.08)).toBeCloseTo(0.08 / 4.5, 12);
  });

  it('is ((V + 0.099)/1.099)^(1/0.45) from V = 0.081', () => {
    for (const v of [0.081, 0.3, 0.5, 0.9, 1]) expect(bt709ToLinear(v)).toBeCloseTo(((v + 0.099) / 1.099) ** (1 / 0.45), 12);
  });

  it('undoes the BT.709 OETF V = 1.099·L^0.45 − 0.099 (L ≥ 0.018), V = 4.5·L below (ITU-R BT.709-6 item 1.2)', () => {
    for (const light of [0.001, 0.01, 0.018, 0.05, 0.2, 0.5, 0.9]) {
      const signal = light < 0.018 ? 4.5 * light : 1.099 * light ** 0.45 - 0.099;
      expect(bt709ToLinear(signal)).toBeCloseTo(light, 3);
    }
  });
});

describe('other curves', () => {
  it('gamma:G is a pure power law (0.5^2.2 = 0.2176, hand calculation)', () => {
    expect(toLinear('gamma:2.2', 0.5)).toBeCloseTo(0.217638, 6);
  });

  it('linear passes the signal through', () => {
    expect(toLinear('linear', 0.37)).toBe(0.37);
  });

  it('tables run from 0 to 1, rise monotonically and repeat the last entry as a guard', () => {
    for (const name of ['srgb', 'bt709', 'gamma:2.4', 'linear'] as const) {
      const lut = transferLut(name);
      expect(lut.length).toBe(257);
      expect(lut[0]).toBe(0);
      expect(lut[255]).toBeCloseTo(1, 12);
      expect(lut[256]).toBe(lut[255]);
      for (let k = 1; k < 256; k++) expect(lut[k]!).toBeGreaterThan(lut[k - 1]!);
    }
  });
});

describe('parseTransfer', () => {
  it('accepts the four forms, case-insensitively', () => {
    expect(parseTransfer('sRGB', '--transfer')).toBe('srgb');
    expect(parseTransfer('bt709', '--transfer')).toBe('bt709');
    expect(parseTransfer('linear', '--transfer')).toBe('linear');
    expect(parseTransfer('gamma:2.2', '--transfer')).toBe('gamma:2.2');
  });

  it.each(['foo', 'gamma:', 'gamma:0', 'gamma:-1', 'gamma:12', ''])('rejects %j with a BAD_ARGUMENT naming the option', (text) => {
    let caught: unknown;
    try {
      parseTransfer(text, '--transfer');
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(KerrError);
    expect((caught as KerrError).code).toBe('BAD_ARGUMENT');
    expect((caught as KerrError).message).toContain('--transfer');
    expect((caught as KerrError).hint).toBeTruthy();
  });
});

describe('HLG inverse OETF (ITU-R BT.2100-2 Table 5; ARIB STD-B67)', () => {
  it('derives b = 1 − 4a and c = 0.5 − a·ln(4a) from a = 0.17883277 and matches the published 0.28466892 and 0.55991073', () => {
    expect(HLG_B).toBeCloseTo(0.28466892, 8);
    expect(HLG_C).toBeCloseTo(0.55991073, 8);
  });

  it('is E′²/3 up to E′ = 1/2, giving 1/12 there, and continuous into the log segment (BT.2100 design: the OETF is √(3E) below E = 1/12)', () => {
    expect(hlgToLinear(0.5)).toBeCloseTo(1 / 12, 12);
    expect(hlgToLinear(0.25)).toBeCloseTo(0.0625 / 3, 12);
    expect(Math.abs(hlgToLinear(0.5 + 1e-9) - 1 / 12)).toBeLessThan(1e-8);
  });

  it('maps E′ = 1 to 1 (nominal peak) and undoes the BT.2100 OETF E′ = a·ln(12E − b) + c above E = 1/12', () => {
    expect(hlgToLinear(1)).toBeCloseTo(1, 6);
    for (const e of [0.1, 0.3, 0.7]) {
      const signal = HLG_A * Math.log(12 * e - HLG_B) + HLG_C;
      expect(hlgToLinear(signal)).toBeCloseTo(e, 10);
    }
    for (const e of [0.001, 0.05]) expect(hlgToLinear(Math.sqrt(3 * e))).toBeCloseTo(e, 12);
  });

  it('parses hlg and pq as transfer names', () => {
    expect(parseTransfer('HLG', '--transfer')).toBe('hlg');
    expect(parseTransfer('pq', '--transfer')).toBe('pq');
  });
});

describe('PQ EOTF (SMPTE ST 2084:2014)', () => {
  it('gives 10000 cd/m² at E′ = 1 and 0 at E′ = 0 (the curve\'s definition)', () => {
    expect(pqToCdM2(1)).toBeCloseTo(10000, 6);
    expect(pqToCdM2(0)).toBe(0);
    expect(toLinear('pq', 1)).toBeCloseTo(1, 9);
  });

  it('undoes the ST 2084 inverse EOTF E′ = ((c1 + c2·Y^m1)/(1 + c3·Y^m1))^m2, Y = L/10000', () => {
    for (const cd of [0.1, 1, 100, 203, 1000, 4000]) {
      const y = (cd / 10000) ** PQ.m1;
      const signal = ((PQ.c1 + PQ.c2 * y) / (1 + PQ.c3 * y)) ** PQ.m2;
      expect(pqToCdM2(signal) / cd).toBeCloseTo(1, 10);
    }
  });

  it('puts 100 cd/m² near E′ = 0.508 (common practice: SDR white sits at about half the PQ signal; from memory)', () => {
    expect(pqToCdM2(0.508)).toBeGreaterThan(98);
    expect(pqToCdM2(0.508)).toBeLessThan(102);
  });

  it('tabulates finely for 10-bit sources: 4 entries per 8-bit code, table and curve agree', () => {
    const lut = transferLut('pq', 4);
    expect(lut.length).toBe(255 * 4 + 2);
    expect(lut[1020]).toBeCloseTo(1, 9);
    expect(lut[510]).toBeCloseTo(toLinear('pq', 0.5), 12);
  });
});
