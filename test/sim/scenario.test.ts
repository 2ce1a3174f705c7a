import { readFileSync, readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { KerrError } from '../../src/errors.js';
import { parseScenario, SCENARIO_KEYS } from '../../src/sim/scenario.js';

const minimal = () => ({
  cell: { kerrConstantMPerV2: 2.4e-12, lengthMm: 50, gapMm: 5 },
  drive: { segments: [{ kind: 'ramp', toKv: 8, durationS: 4 }] },
});

function errorOf(json: unknown): KerrError {
  try {
    parseScenario(json, 'run.json');
  } catch (e) {
    if (e instanceof KerrError) return e;
    throw e;
  }
  throw new Error('expected parseScenario to throw');
}

describe('parseScenario', () => {
  it('fills the documented defaults and converts to SI', () => {
    const s = parseScenario(minimal(), 'run.json');
    expect(s.cell.lengthM).toBeCloseTo(0.05, 12);
    expect(s.cell.effectiveLengthM).toBeCloseTo(0.05, 12);
    expect(s.cell.gapM).toBeCloseTo(0.005, 12);
    expect((s.cell.polariserAngleRad * 180) / Math.PI).toBeCloseTo(45, 12);
    expect((s.cell.analyserAngleRad * 180) / Math.PI).toBeCloseTo(-45, 12);
    expect(s.cell.breakdownFieldVPerM).toBe(3e6); // air, about 3 MV/m (common practice)
    expect(s.durationS).toBe(4);
    expect(s.camera).toMatchObject({ widthPx: 320, heightPx: 240, gain: 1, transfer: 'srgb', crf: 18 });
    expect(s.camera.timing).toEqual({ kind: 'constant', frameRateHz: 30, rational: [30, 1] });
    expect(s.light.wavelengthM).toBeCloseTo(532e-9, 15);
    expect(s.light.channelWeights[1]).toBe(1);
    expect(s.logger).toMatchObject({ sampleRateHz: 10, clockOffsetS: 0, timeUnit: 's', voltageUnit: 'V', delimiter: ',', durationS: 4 });
    expect(s.drive).toEqual({ kind: 'segments', startV: 0, segments: [{ kind: 'ramp', toV: 8000, durationS: 4 }] });
  });

  it('resolves toHalfWaveFraction with V_π = d/√(2·B·L_eff)', () => {
    const json = minimal();
    json.drive.segments = [{ kind: 'ramp', toHalfWaveFraction: 0.5, durationS: 2 } as never];
    const s = parseScenario(json, 'run.json');
    const halfWaveV = 0.005 / Math.sqrt(2 * 2.4e-12 * 0.05);
    expect(s.drive.kind === 'segments' && s.drive.segments[0]!.kind === 'ramp' ? s.drive.segments[0]!.toV : NaN).toBeCloseTo(0.5 * halfWaveV, 6);
  });

  it('keeps 29.97 fps as the exact fraction 2997/100', () => {
    const s = parseScenario({ ...minimal(), camera: { frameRateHz: 29.97 } }, 'run.json');
    expect(s.camera.timing).toMatchObject({ rational: [2997, 100] });
  });

  it('rejects an unknown key, naming it and the close valid one', () => {
    const json = minimal() as Record<string, unknown>;
    (json.cell as Record<string, unknown>).gapMM = 5;
    const e = errorOf(json);
    expect(e.code).toBe('BAD_SCENARIO');
    expect(e.oneLine()).toContain('cell.gapMM');
    expect(e.oneLine()).toContain('did you mean gapMm');
    expect(e.oneLine()).not.toContain('\n');
  });

  it('rejects an unknown top-level key and lists the valid ones', () => {
    const e = errorOf({ ...minimal(), camra: {} });
    expect(e.oneLine()).toMatch(/unknown key camra.*did you mean camera/);
  });

  it('names a missing required key', () => {
    const json = minimal();
    delete (json.cell as Partial<typeof json.cell>).gapMm;
    const e = errorOf(json);
    expect(e.message).toContain('missing required key cell.gapMm');
    expect(errorOf({ cell: minimal().cell }).message).toContain('missing required key drive');
  });

  it('rejects negative sizes with the expected/received shape', () => {
    const json = minimal();
    json.cell.gapMm = -4;
    expect(errorOf(json).message).toBe('expected a positive number (the electrode gap in mm) for cell.gapMm in run.json but received -4');
    expect(errorOf({ ...minimal(), light: { sigmaPx: -2 } }).message).toContain('light.sigmaPx');
    expect(errorOf({ ...minimal(), camera: { widthPx: -320 } }).message).toContain('camera.widthPx');
  });

  it('refuses a drive above the breakdown field of air with a high-voltage caution (3 MV/m, common practice)', () => {
    const json = minimal();
    json.drive.segments = [{ kind: 'ramp', toKv: 16, durationS: 4 }]; // 16 kV / 5 mm = 3.2 MV/m
    const e = errorOf(json);
    expect(e.code).toBe('UNSAFE');
    expect(e.oneLine()).toContain('3.2 MV/m');
    expect(e.oneLine()).toMatch(/Caution/);
    expect(e.oneLine()).not.toContain('\n');
    // exactly at the limit is allowed; a stated liquid rating raises it
    json.drive.segments = [{ kind: 'ramp', toKv: 15, durationS: 4 }];
    expect(() => parseScenario(json, 'run.json')).not.toThrow();
    json.drive.segments = [{ kind: 'ramp', toKv: 16, durationS: 4 }];
    expect(() => parseScenario({ ...json, cell: { ...json.cell, liquidBreakdownKvPerMm: 10 } }, 'run.json')).not.toThrow();
  });

  it('rejects contradictions: both frame-rate forms, dispersion without white light, decimal comma with comma delimiter', () => {
    expect(errorOf({ ...minimal(), camera: { frameRateHz: 30, variableFrameRate: {} } }).message).toContain('both given');
    expect(errorOf({ ...minimal(), light: { dispersion: [1, 1, 1.1] } }).message).toContain('dispersion only with');
    expect(errorOf({ ...minimal(), logger: { decimalComma: true } }).message).toContain('delimiter other than');
    expect(errorOf({ ...minimal(), camera: { variableFrameRate: {}, readNoise: 0, photonsPerFullScale: 0 } }).message).toContain('needs camera noise');
    expect(errorOf({ ...minimal(), camera: { widthPx: 321 } }).message).toContain('even frame width');
  });

  it('rejects a reference patch over the beam', () => {
    const e = errorOf({ ...minimal(), camera: { referencePatch: { xPx: 150, yPx: 110, widthPx: 20, heightPx: 20 } } });
    expect(e.message).toContain('overlaps the beam');
  });

  it('rejects points out of time order and a Kerr constant given in cm/V² by mistake', () => {
    expect(errorOf({ ...minimal(), drive: { points: [{ timeS: 1, voltageV: 0 }, { timeS: 0.5, voltageV: 10 }] } }).message).toContain('time order');
    const json = minimal();
    json.cell.kerrConstantMPerV2 = 2.4e-10 * 1e4; // not a plausible m/V² value
    expect(errorOf(json).oneLine()).toContain('cm/V²');
  });

  it('parses the example scenarios shipped in scenarios/', () => {
    const dir = new URL('../../scenarios/', import.meta.url);
    const files = readdirSync(dir).filter((f) => f.endsWith('.json'));
    expect(files).toContain('example-ramp.json');
    for (const f of files) {
      const s = parseScenario(JSON.parse(readFileSync(new URL(f, dir), 'utf8')), f);
      expect(s.durationS).toBeGreaterThan(0);
    }
  });

  it('has every accepted key documented in docs/scenario.md', () => {
    const doc = readFileSync(new URL('../../docs/scenario.md', import.meta.url), 'utf8');
    const backticked = new Set<string>();
    for (const m of doc.matchAll(/`([^`]+)`/g)) for (const word of m[1]!.split(/[^A-Za-z0-9]+/)) backticked.add(word);
    for (const keys of Object.values(SCENARIO_KEYS)) {
      for (const key of keys) expect(backticked.has(key), `docs/scenario.md lacks ${key}`).toBe(true);
    }
  });
});
