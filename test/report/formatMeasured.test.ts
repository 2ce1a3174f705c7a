import { describe, expect, it } from 'vitest';
import { formatMeasured } from '../../src/report/formatMeasured.js';
import { figure, formatFigure } from '../../src/report/figureCatalogue.js';
import { OUTSIDE } from '../setup/outsideSources.js';

// Convention: JCGM 100:2008 (GUM) §7.2.6 — the uncertainty is given with at most two significant
// digits and the value is rounded to the same decimal place.
describe('formatMeasured', () => {
  it('rounds the error to two significant digits and the value to match', { tags: [OUTSIDE.gum] }, () => {
    expect(formatMeasured(10212.4, 48.9)).toBe('10212 ± 49');
    expect(formatMeasured(0.41234, 0.0041)).toBe('0.4123 ± 0.0041');
    expect(formatMeasured(1.2, 0.07234)).toBe('1.200 ± 0.072');
  });

  it('shares one power of ten for very small numbers', () => {
    expect(formatMeasured(2.4137e-12, 3.2e-14)).toBe('2.414 ± 0.032 × 10⁻¹²');
  });

  it('uses significant digits when there is no error, and n/a for non-finite values', () => {
    expect(formatMeasured(84.2771)).toBe('84.3');
    expect(formatMeasured(Number.NaN, 1)).toBe('n/a');
    expect(formatMeasured(0)).toBe('0');
  });
});

describe('formatFigure', () => {
  it('shows voltages in kV and ratios in percent', () => {
    expect(formatFigure(figure('halfWaveVoltage'), { value: 10008, stdErr: 60 })).toBe('10.008 ± 0.060 kV');
    expect(formatFigure(figure('floorFraction'), { value: 0.012, stdErr: 0.00072 })).toBe('1.200 ± 0.072 %');
  });

  it('keeps the Kerr constant in SI m/V² with its power of ten', () => {
    // 2.4e-12 m/V² is the nitrobenzene value in docs/references.md (Lux notes, 2.4e-10 cm/V²).
    expect(formatFigure(figure('kerrConstant'), { value: 2.4e-12, stdErr: 2.9e-14 })).toBe('2.400 ± 0.029 × 10⁻¹² m/V²');
  });
});
