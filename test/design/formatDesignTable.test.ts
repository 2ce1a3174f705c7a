import { describe, expect, it } from 'vitest';
import { formatDesignTable, withPrefix } from '../../src/design/formatDesignTable.js';
import { designCellReport } from '../../src/design/designCellReport.js';
import { SAFETY_CAUTIONS, SAFETY_DEFERENCE } from '../../src/safety/cautions.js';

describe('formatDesignTable', () => {
  it('engineering prefixes with three significant figures', () => {
    expect(withPrefix(10206.2, 'V')).toBe('10.2 kV');
    expect(withPrefix(61.9793e-12, 'F')).toBe('62 pF');
    expect(withPrefix(3.228e-3, 'J')).toBe('3.23 mJ');
    expect(withPrefix(136.2e-9, 's')).toBe('136 ns');
    expect(withPrefix(999.9, 'V')).toBe('1 kV');
    expect(withPrefix(0, 'A')).toBe('0 A');
  });

  it('prints the figures, fields in kV/mm and kV/cm, and the safety cautions', () => {
    const text = formatDesignTable(designCellReport({ liquid: 'nitrobenzene', lengthM: 0.05, gapM: 0.005, electrodeHeightM: 0.02 }));
    expect(text).toMatch(/half-wave voltage\s+10\.2 kV/);
    expect(text).toMatch(/half-wave field\s+2\.04 kV\/mm \(20\.4 kV\/cm\)/);
    expect(text).toMatch(/capacitance\s+62 pF/);
    expect(text).toMatch(/Convention: Kerr constant B in m\/V\^2/);
    expect(text).toMatch(/Safety:/);
    // every shared caution (src/safety/cautions.ts) and the deference sentence, word for word
    const flat = text.replace(/\s+/g, ' ');
    for (const c of SAFETY_CAUTIONS) expect(flat).toContain(c.text);
    expect(flat).toContain(SAFETY_DEFERENCE);
  });

  it('shows one column per end of a disputed range', () => {
    const text = formatDesignTable(designCellReport({ liquid: 'water', lengthM: 0.05, gapM: 0.005 }));
    const header = text.split('\n').find((l) => l.includes('water, low end') && l.includes('water, high end'));
    expect(header).toBeDefined();
  });
});
