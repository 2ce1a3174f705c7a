import { describe, expect, it } from 'vitest';
import { voltageFromFileName } from '../../src/stills/voltageFromFileName.js';
import { isKerrError } from '../../src/errors.js';

describe('voltageFromFileName (patterns documented in docs/stills.md)', () => {
  const cases: Array<[string, number]> = [
    ['step07_12.5kV.jpg', 12_500],
    ['0450V.png', 450],
    ['3,2kV.tif', 3_200],
    ['IMG_0001 8 kV.jpeg', 8_000],
    ['run2-0V.JPG', 0],
    ['cell_5KV_b.png', 5_000],
    ['hv_1500v.tiff', 1_500],
    ['photo 7.25 kilovolts.jpg', 7_250],
    ['series_300volt.png', 300],
    ['a/b/step1_2kV.jpg', 2_000],
    ['1.5kV_then_1500V.jpg', 1_500], // the same voltage twice is not ambiguous
  ];
  for (const [name, volts] of cases) {
    it(`${name} → ${volts} V`, () => {
      expect(voltageFromFileName(name)).toBe(volts);
    });
  }

  it('returns null when the name holds no voltage', () => {
    for (const name of ['IMG_0001.jpg', 'step07.png', 'DSC_4V5.jpg', '5Vx.png', 'v12.jpg', '500mV.png', 'kV.jpg']) {
      expect(voltageFromFileName(name)).toBeNull();
    }
  });

  it('reads the unit from the name itself, never from a digit run before it (step07_12.5kV is 12.5 kV)', () => {
    expect(voltageFromFileName('step07_12.5kV.jpg')).not.toBe(7);
  });

  it('rejects a name with two different voltages', () => {
    try {
      voltageFromFileName('cell5V_12kV.jpg');
      expect.unreachable();
    } catch (e) {
      expect(isKerrError(e) && e.oneLine()).toMatch(/more than one voltage \(5 V, 12000 V\).*--volts/);
    }
  });
});
