import { describe, expect, it } from 'vitest';
import { AIR_BREAKDOWN_V_PER_M, designCell, RISE_10_90_PER_TAU, VACUUM_PERMITTIVITY_F_PER_M } from '../../src/design/designCell.js';
import { isKerrError } from '../../src/errors.js';
import { OUTSIDE } from '../setup/outsideSources.js';

describe('designCell', () => {
  it('inverse path reproduces the nitrobenzene half-wave worked example: K = 2.4e-10 cm/V^2 at 30 kV/cm needs L ≈ 2.3 cm (J. Lux, "Electro-optical theory" web notes)', { tags: [OUTSIDE.workedExamples] }, () => {
    // 30 kV/cm across a 1 cm gap is 30 kV; across 5 mm it is 15 kV: the length depends on the field only.
    for (const [gapM, targetV] of [[0.01, 30_000], [0.005, 15_000]] as const) {
      const d = designCell({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM, targetVoltageV: targetV });
      const lengthCm = d.target!.effectiveLengthForHalfWave.value * 100;
      expect(Math.abs(lengthCm - 2.3)).toBeLessThan(0.05); // source quotes 2 significant figures
      expect(d.target!.field.value).toBeCloseTo(3e6, 6); // 30 kV/cm = 3e6 V/m
      expect(d.target!.effectiveLengthForHalfWave.unit).toBe('m');
    }
  });

  it('a cell built at the inverse length has the target as its half-wave voltage (round trip)', () => {
    const first = designCell({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM: 0.004, targetVoltageV: 12_000 });
    const built = designCell({ kerrConstantMPerV2: 2.4e-12, lengthM: first.target!.effectiveLengthForHalfWave.value, gapM: 0.004 });
    expect(built.halfWaveVoltage.value).toBeCloseTo(12_000, 6);
  });

  it('quarter-wave field matches the Irodov Kerr-cell problem: B = 2.2e-10 cm/V^2, l = 10 cm ⇒ E ≈ 1.1e4 V/cm (Irodov, Problems in General Physics; answer recomputed from E = 1/(2·sqrt(B·l)))', { tags: [OUTSIDE.workedExamples] }, () => {
    const d = designCell({ kerrConstantMPerV2: 2.2e-12, lengthM: 0.1, gapM: 0.01 });
    const fieldVPerCm = d.quarterWaveField.value / 100;
    expect(Math.abs(fieldVPerCm - 1.1e4)).toBeLessThan(0.05e4); // 1.066e4 rounds to 1.1e4
    // and the quarter-wave voltage is the half-wave voltage over sqrt(2) (DESIGN.md)
    expect(d.quarterWaveVoltage.value).toBeCloseTo(d.halfWaveVoltage.value / Math.SQRT2, 9);
    expect(d.quarterWaveField.value * d.gap.value).toBeCloseTo(d.quarterWaveVoltage.value, 6);
  });

  it('half-wave voltage follows V_pi = d/sqrt(2·B·L) (DESIGN.md); the effective length replaces L', () => {
    const d = designCell({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM: 0.005 });
    // hand calc: V_pi^2 = d^2/(2BL) = 2.5e-5 / 2.4e-13 = 1.041666...e8 V^2
    expect(d.halfWaveVoltage.value).toBeCloseTo(Math.sqrt(2.5e-5 / 2.4e-13), 6);
    expect(d.halfWaveVoltage.unit).toBe('V');
    const longer = designCell({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, effectiveLengthM: 0.2, gapM: 0.005 });
    expect(longer.halfWaveVoltage.value).toBeCloseTo(d.halfWaveVoltage.value / 2, 6);
  });

  it('capacitance uses eps0 = 8.8541878128e-12 F/m (CODATA 2018): hand calculation for 50 x 20 mm plates, 5 mm gap, eps_r 35', { tags: [OUTSIDE.publishedTables] }, () => {
    expect(VACUUM_PERMITTIVITY_F_PER_M).toBe(8.8541878128e-12);
    const d = designCell({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM: 0.005, electrodeHeightM: 0.02, relativePermittivity: 35, sourceResistanceOhm: 50, riseTimeS: 10e-9 });
    // hand calc: C = 8.8541878128e-12 * 35 * (0.05*0.02) / 0.005 = 8.8541878128 * 7 pF = 61.9793146896 pF
    expect(d.capacitance!.value).toBeCloseTo(61.9793146896e-12, 20);
    expect(d.capacitance!.unit).toBe('F');
    // stored energy 1/2 C V_pi^2 with V_pi^2 = 1.0416666...e8 V^2: 3.22808930675e-3 J (hand calc)
    expect(d.storedEnergy!.value).toBeCloseTo(0.5 * 61.9793146896e-12 * (2.5e-5 / 2.4e-13), 12);
    expect(d.storedEnergy!.value).toBeCloseTo(3.22808930675e-3, 9);
    // RC: tau = 50 ohm * C; 10-90% rise = ln 9 * tau ≈ 2.2 tau (first-order step response, common practice)
    expect(d.rcChargingTime!.value).toBeCloseTo(50 * 61.9793146896e-12, 20);
    expect(d.rcRiseTime10To90!.value / d.rcChargingTime!.value).toBeCloseTo(2.2, 1);
    expect(RISE_10_90_PER_TAU).toBeCloseTo(Math.log(0.9 / 0.1), 12);
    // peak (mean ramp) current I = C V_pi / t_rise
    expect(d.peakCurrent!.value).toBeCloseTo((61.9793146896e-12 * Math.sqrt(2.5e-5 / 2.4e-13)) / 10e-9, 9);
    expect(d.storedCharge!.value).toBeCloseTo(61.9793146896e-12 * Math.sqrt(2.5e-5 / 2.4e-13), 15);
  });

  it('leaves electrical figures null and says what is missing without height or permittivity', () => {
    const d = designCell({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM: 0.005, electrodeHeightM: 0.02 });
    expect(d.capacitance).toBeNull();
    expect(d.storedEnergy).toBeNull();
    expect(d.peakCurrent).toBeNull();
    expect(d.notes.join(' ')).toContain('--permittivity');
  });

  it('notes when the source resistance cannot give the requested rise time', () => {
    const d = designCell({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM: 0.005, electrodeHeightM: 0.02, relativePermittivity: 35, sourceResistanceOhm: 1000, riseTimeS: 10e-9 });
    // hand calc: ln 9 * 1000 ohm * 61.98 pF = 2.1972 * 61.98 ns = 136.2 ns
    expect(d.notes.join(' ')).toMatch(/10-90% rise takes 136 ns, longer than the requested 10 ns/);
  });

  it('breakdown margin: default air 3 kV/mm (common practice); warning below 1, caution below 2, quiet above', () => {
    expect(AIR_BREAKDOWN_V_PER_M).toBe(3e6);
    const base = { kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM: 0.005 };
    const air = designCell(base); // half-wave field 1/sqrt(2*2.4e-12*0.05) = 2.04e6 V/m
    expect(air.breakdown.margin.value).toBeCloseTo(3e6 * Math.sqrt(2 * 2.4e-12 * 0.05), 9);
    expect(air.breakdown.level).toBe('caution');
    expect(air.breakdown.basis).toContain('common practice');
    expect(air.warnings.join(' ')).toContain('within a factor 2');
    const weak = designCell({ ...base, breakdownFieldVPerM: 1.5e6 });
    expect(weak.breakdown.level).toBe('warning');
    expect(weak.warnings.join(' ')).toContain('this cell would need more field than the stated breakdown strength');
    const strong = designCell({ ...base, breakdownFieldVPerM: 10e6 });
    expect(strong.breakdown.level).toBe('ok');
    expect(strong.warnings).toEqual([]);
  });

  it('never suggests exceeding a rating: the breakdown warnings point to length or liquid, not more voltage', () => {
    const weak = designCell({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM: 0.005, breakdownFieldVPerM: 1e6, targetVoltageV: 20_000 });
    const text = weak.warnings.join(' ');
    expect(text).toMatch(/longer cell/);
    expect(text).not.toMatch(/raise the voltage|increase the voltage|exceed the breakdown/i);
    expect(text).toMatch(/never exceed the rating/);
  });

  it('rejects non-positive or non-finite geometry with the option name', () => {
    const bad: Array<[Record<string, number>, string]> = [
      [{ lengthM: -0.05 }, '--length-mm'],
      [{ gapM: 0 }, '--gap-mm'],
      [{ kerrConstantMPerV2: Number.NaN }, '--kerr-constant'],
      [{ electrodeHeightM: -1 }, '--electrode-height-mm'],
      [{ relativePermittivity: 0.5 }, '--permittivity'],
    ];
    for (const [override, option] of bad) {
      try {
        designCell({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM: 0.005, ...override });
        expect.unreachable(`no error for ${option}`);
      } catch (e) {
        expect(isKerrError(e)).toBe(true);
        if (isKerrError(e)) {
          expect(e.code).toBe('BAD_ARGUMENT');
          expect(e.path).toBe(option);
        }
      }
    }
  });
});
