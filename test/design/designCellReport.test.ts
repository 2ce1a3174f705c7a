import { describe, expect, it } from 'vitest';
import { designCellReport } from '../../src/design/designCellReport.js';
import { isKerrError } from '../../src/errors.js';

function errorOf(fn: () => unknown): { code: string; line: string; path: string | undefined } {
  try {
    fn();
  } catch (e) {
    if (isKerrError(e)) return { code: e.code, line: e.oneLine(), path: e.path };
    throw e;
  }
  throw new Error('expected a KerrError');
}

describe('designCellReport', () => {
  it('cm/V^2 input is converted by ×1e-2 to m/V^2 and says so (1 cm/V^2 = 1e-2 m/V^2 from Δn = λ·B·E²: λ in cm is 100×, E² in (V/cm)² is 1e-4×)', () => {
    const cm = designCellReport({ kerrConstantCmPerV2: 2.4e-10, lengthM: 0.05, gapM: 0.005 });
    const si = designCellReport({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM: 0.005 });
    expect(cm.cases[0]!.kerrConstantMPerV2).toBeCloseTo(2.4e-12, 24);
    expect(cm.cases[0]!.design.halfWaveVoltage.value).toBeCloseTo(si.cases[0]!.design.halfWaveVoltage.value, 6);
    expect(cm.convention).toMatch(/entered in cm\/V\^2/);
    expect(cm.cases[0]!.kerrConstantOrigin).toMatch(/cm\/V\^2, converted ×1e-2/);
    expect(si.convention).toMatch(/m\/V\^2 \(SI\)/);
  });

  it('nitrobenzene from the table reproduces the Lux half-wave example through the inverse path (2.4e-10 cm/V^2, 30 kV/cm ⇒ ≈ 2.3 cm)', () => {
    const r = designCellReport({ liquid: 'nitrobenzene', gapM: 0.01, targetVoltageV: 30_000 });
    const d = r.cases[0]!.design;
    expect(Math.abs(d.target!.effectiveLengthForHalfWave.value * 100 - 2.3)).toBeLessThan(0.05);
    // laid out at that length, its half-wave voltage is the target
    expect(d.halfWaveVoltage.value).toBeCloseTo(30_000, 6);
    expect(r.notes.join(' ')).toContain('no --length-mm');
  });

  it('takes the permittivity of nitrobenzene from the table (about 35, handbook, from memory) unless given', () => {
    const r = designCellReport({ liquid: 'nitrobenzene', lengthM: 0.05, gapM: 0.005, electrodeHeightM: 0.02 });
    expect(r.cases[0]!.design.relativePermittivity!.value).toBe(35);
    expect(r.liquid!.permittivityFromMemory).toBe(true);
    const own = designCellReport({ liquid: 'nitrobenzene', lengthM: 0.05, gapM: 0.005, electrodeHeightM: 0.02, relativePermittivity: 30 });
    expect(own.cases[0]!.design.capacitance!.value / r.cases[0]!.design.capacitance!.value).toBeCloseTo(30 / 35, 12);
  });

  it('water shows both ends of the disputed range and warns that sources disagree', () => {
    const r = designCellReport({ liquid: 'water', lengthM: 0.05, gapM: 0.005 });
    expect(r.cases).toHaveLength(2);
    expect(r.warnings.join(' ')).toMatch(/disagree/);
    const [low, high] = r.cases.map((c) => c.design.halfWaveVoltage.value);
    // V_pi ∝ 1/sqrt(B): ratio sqrt(9.4/4.4)
    expect(low! / high!).toBeCloseTo(Math.sqrt(9.4e-14 / 4.4e-14), 9);
    expect(r.cases[1]!.fromMemory).toBe(true);
  });

  it('always carries the high-voltage, stored-charge, toxic-liquid and laser cautions and defers to codes', () => {
    const r = designCellReport({ kerrConstantMPerV2: 1.37e-12, lengthM: 0.05, gapM: 0.005 });
    const ids = r.cautions.map((c) => c.id);
    for (const id of ['lethal-voltage', 'stored-charge', 'toxic-liquids', 'lasers', 'ratings']) expect(ids).toContain(id);
    expect(r.deference).toMatch(/licensed professional/);
  });

  it('warns when B looks like a cm/V^2 number given as m/V^2', () => {
    const r = designCellReport({ kerrConstantMPerV2: 2.4e-10, lengthM: 0.05, gapM: 0.005 });
    expect(r.warnings.join(' ')).toMatch(/--kerr-constant-cm/);
  });

  it('bad requests: missing B, both constants, unknown liquid, missing gap or length: one line each', () => {
    const missingB = errorOf(() => designCellReport({ lengthM: 0.05, gapM: 0.005 }));
    expect(missingB.line).toMatch(/no Kerr constant was given. Give --kerr-constant/);
    const both = errorOf(() => designCellReport({ kerrConstantMPerV2: 2.4e-12, kerrConstantCmPerV2: 2.4e-10, lengthM: 0.05, gapM: 0.005 }));
    expect(both.line).toMatch(/both --kerr-constant/);
    const unknown = errorOf(() => designCellReport({ liquid: 'carbon disulfide', lengthM: 0.05, gapM: 0.005 }));
    expect(unknown.line).toMatch(/unknown liquid "carbon disulfide".*nitrobenzene, nitrotoluene, water/);
    expect(errorOf(() => designCellReport({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05 })).path).toBe('--gap-mm');
    expect(errorOf(() => designCellReport({ kerrConstantMPerV2: 2.4e-12, gapM: 0.005 })).path).toBe('--length-mm');
    expect(errorOf(() => designCellReport({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM: -0.005 })).line).toMatch(/expected a positive electrode gap for --gap-mm but received -0.005/);
    for (const e of [missingB, both, unknown]) expect(e.line).not.toMatch(/\n/);
  });
});
