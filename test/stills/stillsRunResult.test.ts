import { describe, expect, it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { stillsRunResult, type StillsRunInput } from '../../src/stills/stillsRunResult.js';
import type { StillsSeries } from '../../src/stills/readStillsSeries.js';
import { readRunResult } from '../../src/compare/readRunResult.js';
import { jsonSafe } from '../../src/pipeline/writeRun.js';
import { crossedTransmission, DEG, halfWaveVoltageV } from '../../src/core/physics/kerr.js';
import { tempFolder } from './stillsFixtures.js';

const B = 2.4e-12, L = 0.05, D = 0.005; // nitrobenzene (Lux notes); our own cell
const VPI = halfWaveVoltageV(B, L, D);
const FLOOR = 0.03, AMP = 0.4;

/** A measured series of exact crossed-polariser intensities (Jones calculus, DESIGN.md), no file system. */
function series(volts: number[], extra: Partial<StillsSeries> = {}): StillsSeries {
  const n = volts.length;
  const intensity = Float64Array.from(volts, (v) => FLOOR + AMP * crossedTransmission(45 * DEG, Math.PI * (v / VPI) ** 2));
  return {
    voltageV: Float64Array.from(volts), intensity, files: volts.map((v, i) => `p${i}_${v}V.jpg`), clippedFraction: new Float64Array(n),
    exposureRelative: new Float64Array(n).fill(1), warnings: [{ code: 'exposure-unknown', message: 'cannot tell', guideSection: 'lock-exposure' }], width: 160, height: 120,
    notes: ['a note'], roi: { x: 10, y: 10, w: 20, h: 20 }, beamAuto: false, surround: null, surroundLinear: null, darkRoi: null, referenceRoi: null,
    roiLinear: intensity.slice(), darkLinear: null, referenceLinear: null, exposureBasis: 'none', exposureFactors: [], voltageSource: 'file-names',
    transfers: volts.map(() => 'srgb' as const), bitDepths: volts.map(() => 8), unreadable: volts.map(() => null), captureTimeS: null, leftOut: [], openPhoto: null,
    ...extra,
  };
}
const SWEEP = [0, 2000, 4000, 6000, 7000, 8000, 9000, 10000, 11000, 12000, 13000];

function run(s: StillsSeries, over: Partial<StillsRunInput> = {}) {
  return stillsRunResult({
    series: s,
    cell: { lengthM: L, effectiveLengthM: L, gapM: D, polariserAngleDeg: 45 },
    fitOptions: {},
    label: 'bench 3',
    createdAt: '2025-04-01T09:00:00.000Z',
    tool: { name: 'kerrtrace', version: 'test', ffmpegVersion: null, node: 'v20' },
    inputs: { stills: s.files.map((f) => ({ path: f, sha256: '0'.repeat(64) })) },
    options: { lengthMm: 50 },
    ...over,
  });
}

describe('stillsRunResult', () => {
  it('fills every RunResult field like analyze: source "stills", no sync step, figures with units', () => {
    const s = series(SWEEP);
    const { result } = run(s);
    expect(result).toMatchObject({
      schemaVersion: 2, kind: 'kerrtrace-run', source: 'stills', label: 'bench 3', createdAt: '2025-04-01T09:00:00.000Z',
      syncOffset: { value: 0, unit: 's' },
      sync: { manual: true, offsetS: 0, sharpnessS: null, ambiguous: false, curve: { offsetS: [], score: [] } },
      camera: { width: 160, height: 120, fps: null, variableFrameRate: false, transfer: 'srgb', range: 'full' },
      cell: { lengthM: L, effectiveLengthM: L, gapM: D, polariserAngleDeg: 45, electrodeHeightM: null, wavelengthNm: null },
      regions: { beam: { x: 10, y: 10, w: 20, h: 20 }, beamAuto: false },
      frames: { total: 11, used: 11, excluded: {} },
      identifiable: true,
      identifiability: { openLevelUsed: false },
      log: { rows: 11, spanS: 0, currentColumn: false, temperatureC: null },
      options: { lengthMm: 50, exposureBasis: 'none', voltageSource: 'file-names', timeBasis: 'photo-index', notes: ['a note'] },
      model: { darkLevel: 0, staticRetardanceRad: 0, effectiveLengthM: L, gapM: D },
      fit: { robust: 'huber', converged: true },
      files: {},
    });
    expect(result.kerrConstant.value / B).toBeCloseTo(1, 6);
    expect(result.kerrConstant.unit).toBe('m/V^2');
    expect(result.halfWaveVoltage.unit).toBe('V');
    expect(result.quarterWaveVoltage.value).toBeCloseTo(result.halfWaveVoltage.value / Math.SQRT2, 9);
    expect(result.floorFraction.value).toBeCloseTo(FLOOR / AMP, 6);
    // the sweep passes V_pi, so the fitted curve spans floor (0 V) to floor + amp (V_pi): 0.43/0.03
    expect(result.contrastRatio.value).toBeCloseTo((FLOOR + AMP) / FLOOR, 3);
    expect(result.linearised).toMatchObject({ agreesWithFit: true });
    expect(result.linearised!.kerrConstant.value / B).toBeCloseTo(1, 4);
    expect(result.warnings).toEqual([{ code: 'exposure-unknown', message: 'cannot tell', guideSection: 'lock-exposure' }]);
  });

  it('one trace row per photo; unreadable and clipped photos are counted, clipped ones become events', () => {
    const s = series(SWEEP);
    s.intensity[3] = NaN;
    s.unreadable[3] = 'premature end of JPEG file';
    s.clippedFraction[8] = 0.4;
    s.intensity[8] = 0.3;
    const { result, trace } = run(s);
    expect(result.frames).toEqual({ total: 11, used: 9, excluded: { unreadable: 1, clipped: 1 } });
    expect(result.events).toEqual([{ kind: 'clipped', frameIndex: 8, timeS: 8, size: 0.4 }]);
    expect(trace).toHaveLength(11);
    expect(trace[3]).toMatchObject({ frameIndex: 3, timeS: 3, voltageV: 6000, used: false, excludedReason: 'unreadable', residual: null });
    expect(trace[8]).toMatchObject({ used: false, excludedReason: 'clipped' });
    expect(trace[5]!.used).toBe(true);
    expect(Math.abs(trace[5]!.residual!)).toBeLessThan(1e-9);
    expect(result.kerrConstant.value / B).toBeCloseTo(1, 5);
  });

  it('trace time is the EXIF capture time when every photo has one', () => {
    const s = series(SWEEP, { captureTimeS: Float64Array.from(SWEEP, (_, i) => 4 * i + 0.5 * (i % 2)) });
    const { result, trace } = run(s);
    expect(trace.map((r) => r.timeS)).toEqual(SWEEP.map((_, i) => 4 * i + 0.5 * (i % 2)));
    expect(result.options.timeBasis).toBe('exif-capture-time');
    expect(result.log.spanS).toBe(40);
  });

  it('dark level: median over the used photos of dark / relative exposure; dark and reference regions recorded', () => {
    const dark = Float64Array.from(SWEEP, (_, i) => 0.01 + 0.001 * i);
    const exposure = Float64Array.from(SWEEP, (_, i) => (i % 2 ? 2 : 1));
    const s = series(SWEEP, { darkLinear: dark, exposureRelative: exposure, darkRoi: { x: 0, y: 0, w: 5, h: 5 }, referenceRoi: { x: 100, y: 0, w: 5, h: 5 }, referenceLinear: new Float64Array(11) });
    const scaled = Array.from(dark, (d, i) => d / exposure[i]!).sort((a, b) => a - b);
    const { result } = run(s);
    expect(result.model.darkLevel).toBeCloseTo(scaled[5]!, 12);
    expect(result.regions.dark).toEqual({ x: 0, y: 0, w: 5, h: 5 });
    expect(result.regions.reference).toEqual({ x: 100, y: 0, w: 5, h: 5 });
  });

  it('a low sweep is flagged not identifiable with the open-level guide anchor; the open level fixes it', () => {
    const volts = [0, 500, 1000, 1500, 2000, 2500, 3000, 0, 500, 1000, 1500, 2000, 2500, 3000];
    const s = series(volts);
    const pattern = [1, -1, 0.5, -0.5, 0.8, -0.3, 0.1]; // camera noise of 0.003, deterministic
    s.intensity.forEach((_, i) => (s.intensity[i]! += 0.003 * pattern[i % pattern.length]! * (i < 7 ? 1 : -1)));
    const free = run(s).result;
    expect(free.identifiable).toBe(false);
    expect(free.warnings.find((w) => w.code === 'not-identifiable')).toMatchObject({ guideSection: 'open-level' });
    expect(free.warnings.find((w) => w.code === 'not-identifiable')!.message).toMatch(/--open-level/);
    const fixed = run(series(volts), { fitOptions: { openLevel: AMP } }).result;
    expect(fixed.identifiable).toBe(true);
    expect(fixed.identifiability.openLevelUsed).toBe(true);
    expect(fixed.kerrConstant.value / B).toBeCloseTo(1, 5);
  });

  it('plain least squares and a static retardance are recorded in the result', () => {
    const { result } = run(series(SWEEP), { fitOptions: { robust: false, staticRetardanceRad: 0 } });
    expect(result.fit.robust).toBe('none');
    expect(result.model.staticRetardanceRad).toBe(0);
  });

  it('the result is one `compare` reads (readRunResult accepts source "stills")', async () => {
    const t = tempFolder();
    try {
      writeFileSync(join(t.dir, 'result.json'), JSON.stringify(run(series(SWEEP)).result, jsonSafe, 2));
      const back = await readRunResult(t.dir);
      expect(back.result.source).toBe('stills');
      expect(back.result.kerrConstant.value / B).toBeCloseTo(1, 6);
    } finally {
      t.cleanup();
    }
  });
});

describe('stillsRunResult: budget and gates as for video', () => {
  it('B and V_π carry the combined uncertainty of the budget (no sync term), contrast has its error, the run is valid', () => {
    const s = series(SWEEP);
    s.intensity.forEach((_, i) => (s.intensity[i]! += 0.002 * [1, -1, 0.5, -0.5, 0.8, -0.3, 0.1, -0.7, 0.4, -0.2, 0.6][i]!));
    const { result } = run(s, { budget: { voltsAccuracyPercent: 1, gapToleranceM: 5e-5, lengthToleranceM: 1e-4 } });
    expect(result.uncertainty!.kerrConstant.terms.find((t) => t.name === 'sync')!.relative).toBe(0);
    expect(result.kerrConstant.stdErr).toBeCloseTo(result.uncertainty!.kerrConstant.combinedStdErr, 25);
    // gap 5 ± 0.05 mm: 2·0.05/√3/5 = 1.155 % on B; with the meter's 1.155 % the combined error exceeds 1.6 %
    expect(result.kerrConstant.stdErr! / result.kerrConstant.value).toBeGreaterThan(0.016);
    expect(result.contrastRatio.stdErr).toBeGreaterThan(0);
    expect(result.validity).toEqual({ valid: true, failures: [] });
  });

  it('with repeated voltages the photo noise is known: a voltage map that belongs to other photos fails the residual gate (marked not valid); the right map passes', () => {
    const volts = [...SWEEP, ...SWEEP];
    const wiggle = [1, -1, 0.5, -0.5, 0.8, -0.3, 0.1, -0.7, 0.4, -0.2, 0.6, -0.9, 0.3, 0.7, -0.4, -0.6, 0.9, 0.2, -0.8, 0.5, -0.1, 0.35];
    const s = series(volts);
    s.intensity.forEach((_, i) => (s.intensity[i]! += 0.002 * wiggle[i]!));
    expect(run(s).result.validity).toEqual({ valid: true, failures: [] });
    const shuffled = [7000, 13000, 0, 11000, 2000, 9000, 4000, 12000, 6000, 10000, 8000];
    const wrong = { ...s, voltageV: Float64Array.from([...shuffled, ...shuffled]) };
    const { result } = run(wrong);
    expect(result.validity!.valid).toBe(false);
    expect(result.validity!.failures.map((f) => f.gate)).toContain('residual-excess');
  });

  it('without repeats the residual gate does not apply: no noise estimate is recorded', () => {
    expect(run(series(SWEEP)).result.fit.residualOverFrameNoise).toBeNaN();
  });
});
