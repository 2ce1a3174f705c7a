import { describe, expect, it } from 'vitest';
import { bt709ToLinear, parseTransfer, srgbToLinear, toLinear, transferLut } from '../../../src/core/camera/transfer.js';
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
