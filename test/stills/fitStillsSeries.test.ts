import { describe, expect, it } from 'vitest';
import { fitStillsSeries } from '../../src/stills/fitStillsSeries.js';
import { stillsRecord } from '../../src/stills/stillsRecord.js';
import { formatStillsSummary } from '../../src/stills/formatStillsSummary.js';
import { stillsCsv } from '../../src/stills/stillsCsv.js';
import type { StillsSeries } from '../../src/stills/readStillsSeries.js';
import { crossedTransmission, DEG, halfWaveVoltageV } from '../../src/core/physics/kerr.js';

const B = 2.4e-12, L = 0.05, D = 0.005; // nitrobenzene (Lux notes); our own cell
const VPI = halfWaveVoltageV(B, L, D);

function series(volts: number[], opts: { clipped?: number[]; floor?: number; amp?: number } = {}): StillsSeries {
  const n = volts.length;
  const intensity = Float64Array.from(volts, (v) => (opts.floor ?? 0.03) + (opts.amp ?? 0.4) * crossedTransmission(45 * DEG, Math.PI * (v / VPI) ** 2));
  const clippedFraction = new Float64Array(n);
  for (const i of opts.clipped ?? []) clippedFraction[i] = 0.2;
  return {
    voltageV: Float64Array.from(volts), intensity, files: volts.map((v, i) => `p${i}_${v}V.jpg`), clippedFraction,
    exposureRelative: new Float64Array(n).fill(1), warnings: [], width: 160, height: 120, notes: [], roi: { x: 0, y: 0, w: 10, h: 10 },
    roiIsWholeFrame: false, roiLinear: intensity.slice(), darkLinear: null, referenceLinear: null, exposureBasis: 'exif', voltageSource: 'file-names',
    transfers: volts.map(() => 'srgb' as const), bitDepths: volts.map(() => 8), leftOut: [],
  };
}
const fitOf = (s: StillsSeries) => fitStillsSeries({ voltageV: s.voltageV, intensity: s.intensity, clippedFraction: s.clippedFraction, effectiveLengthM: L, gapM: D, polariserAngleDeg: 45 });

describe('fitStillsSeries', () => {
  it('recovers B, V_pi and the floor fraction from exact crossed-polariser data (Jones calculus, T = sin²(δ/2))', () => {
    const s = series([0, 2000, 4000, 6000, 8000, 9000, 10000, 11000, 12000, 13000]);
    const r = fitOf(s);
    expect(r.fit).not.toBeNull();
    expect(r.fit!.kerrConstant.value / B).toBeCloseTo(1, 6);
    expect(r.fit!.halfWaveVoltage.value / VPI).toBeCloseTo(1, 6);
    expect(r.floorFraction!.value).toBeCloseTo(0.03 / 0.4, 6);
    expect(r.model[6]).toBeCloseTo(s.intensity[6]!, 9);
  });

  it('leaves clipped photos out of the fit and counts them (the fit still works)', () => {
    const s = series([0, 2000, 4000, 6000, 8000, 9000, 10000, 11000, 12000], { clipped: [6] });
    s.intensity[6] = 0.2; // what a clipped photo reads: wrong
    const r = fitOf(s);
    expect(r.used[6]).toBe(0);
    expect(r.excludedReason[6]).toBe('clipped');
    expect(r.excluded).toEqual({ clipped: 1 });
    expect(r.fit!.kerrConstant.value / B).toBeCloseTo(1, 5);
  });

  it('too few photos or voltages: no fit, and says why', () => {
    const r = fitOf(series([0, 5000, 10000]));
    expect(r.fit).toBeNull();
    expect(r.noFitReason).toMatch(/at least 6 usable photos at 4 or more different voltages; this series has 3 usable photo\(s\) at 3 voltage\(s\)/);
    expect(fitOf(series([0, 0, 0, 5000, 5000, 10000, 10000])).fit).toBeNull();
  });

  it('a sweep far below V_pi is not identifiable: the record holds no B and the summary says so plainly (DESIGN.md, identifiability)', () => {
    const s = series([0, 500, 1000, 1500, 2000, 2500, 3000, 0, 500, 1000, 1500, 2000, 2500, 3000], { amp: 0.4 });
    // camera noise of 0.003 (deterministic pattern): at 0.3·V_pi the Kerr signal is only ~0.007
    const pattern = [1, -1, 0.5, -0.5, 0.8, -0.3, 0.1];
    s.intensity.forEach((_, i) => (s.intensity[i]! += 0.003 * pattern[i % pattern.length]! * (i < 7 ? 1 : -1)));
    const r = fitOf(s);
    expect(r.fit).not.toBeNull();
    expect(r.fit!.identifiable).toBe(false);
    const rec = stillsRecord({ series: s, fit: r, folder: 'f', createdAt: '2024-01-01T00:00:00Z', toolVersion: 'test', options: {}, cell: { lengthM: L, effectiveLengthM: L, gapM: D, polariserAngleDeg: 45 }, inputs: { photos: [], volts: null } });
    expect(rec.fit!.kerrConstant).toBeNull();
    expect(rec.fit!.halfWaveVoltage).toBeNull();
    const text = formatStillsSummary(s, r, { folder: 'f', effectiveLengthM: L, gapM: D, polariserAngleDeg: 45 });
    expect(text).toMatch(/B could not be separated from brightness/);
    expect(text).not.toMatch(/Kerr constant B/);
  });

  it('stills.csv has one row per photo with model and residual', () => {
    const s = series([0, 2000, 4000, 6000, 8000, 9000, 10000, 11000, 12000]);
    const r = fitOf(s);
    const lines = stillsCsv(s, r).trim().split('\n');
    expect(lines).toHaveLength(10);
    const cells = lines[7]!.split(',');
    expect(cells[0]).toBe('p6_10000V.jpg');
    expect(Number(cells[1])).toBe(10000);
    expect(cells[9]).toBe('1');
    expect(Math.abs(Number(cells[12]))).toBeLessThan(1e-6);
  });
});
