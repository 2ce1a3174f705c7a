import { describe, expect, it } from 'vitest';
import { findLiquid, LIQUIDS, liquidNames } from '../../src/data/liquids.js';
import { isKerrError } from '../../src/errors.js';
import { OUTSIDE } from '../setup/outsideSources.js';

describe('built-in liquid table', () => {
  it('holds exactly the values of docs/references.md', { tags: [OUTSIDE.publishedTables] }, () => {
    // nitrobenzene 2.4e-12 m/V^2 (Lux notes, 2.4e-10 cm/V^2); eps_r about 35 at 20 °C (handbook tables, from memory)
    const nb = findLiquid('nitrobenzene');
    expect(nb.kerrConstants.map((k) => k.valueMPerV2)).toEqual([2.4e-12]);
    expect(nb.kerrConstants[0]!.source).toMatch(/Lux/);
    expect(nb.kerrConstants[0]!.fromMemory).toBe(false);
    expect(nb.relativePermittivity).toMatchObject({ relative: 35, fromMemory: true });
    // nitrotoluene 1.37e-12 m/V^2 (general tables, from memory)
    const nt = findLiquid('nitrotoluene');
    expect(nt.kerrConstants.map((k) => k.valueMPerV2)).toEqual([1.37e-12]);
    expect(nt.kerrConstants[0]!.fromMemory).toBe(true);
    // water: 4.4e-14 (Lux notes) to 9.4e-14 m/V^2 (other tables, from memory) - a range
    const w = findLiquid('water');
    expect(w.disputed).toBe(true);
    expect(w.kerrConstants.map((k) => k.valueMPerV2)).toEqual([4.4e-14, 9.4e-14]);
    expect(w.kerrConstants.map((k) => k.fromMemory)).toEqual([false, true]);
  });

  it('every entry states unit convention, source and temperature', () => {
    for (const l of LIQUIDS) {
      for (const k of l.kerrConstants) {
        expect(k.asPublished).toMatch(/(m|cm)\/V\^2$/);
        expect(k.source.length).toBeGreaterThan(5);
        expect(k.temperature.length).toBeGreaterThan(0);
        if (k.asPublished.endsWith('cm/V^2')) expect(Number.parseFloat(k.asPublished) * 1e-2).toBeCloseTo(k.valueMPerV2, 20);
        else expect(Number.parseFloat(k.asPublished)).toBe(k.valueMPerV2);
      }
    }
  });

  it('finds names case-insensitively and lists the known ones for an unknown name', () => {
    expect(findLiquid('  NitroBenzene ').name).toBe('nitrobenzene');
    try {
      findLiquid('acetone');
      expect.unreachable();
    } catch (e) {
      expect(isKerrError(e)).toBe(true);
      if (isKerrError(e)) {
        expect(e.code).toBe('BAD_ARGUMENT');
        for (const n of liquidNames()) expect(e.oneLine()).toContain(n);
      }
    }
  });
});
