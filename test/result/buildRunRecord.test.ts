import { describe, expect, it } from 'vitest';
import { buildRunRecord, type RunRecordParts } from '../../src/result/buildRunRecord.js';
import { kerrUncertaintyBudget } from '../../src/core/uncertainty/uncertaintyBudget.js';

function parts(): RunRecordParts {
  const uncertainty = kerrUncertaintyBudget({ kerrConstant: 2e-12, halfWaveVoltageV: 10000, statisticalRel: 0.01, syncRel: 0, voltageCalibrationRel: 0.02, gapRel: 0, lengthRel: 0 });
  return {
    label: 'run', createdAt: '2026-12-02T15:00:00.000Z', source: 'stills', tool: { name: 'kerrtrace', version: 't', ffmpegVersion: null, node: 'v20' },
    inputs: { stills: [] }, options: { a: 1 },
    cell: { lengthM: 0.05, effectiveLengthM: 0.05, gapM: 0.005, polariserAngleDeg: 45, electrodeHeightM: null, wavelengthNm: null },
    camera: { width: 10, height: 10, fps: null, variableFrameRate: false, transfer: 'srgb', range: 'full' },
    regions: { beam: { x: 0, y: 0, w: 2, h: 2 }, beamAuto: true },
    figures: { kerrConstant: { value: 2e-12, stdErr: 4e-14, unit: 'm/V^2' }, halfWaveVoltage: { value: 10000, stdErr: 100, unit: 'V' }, syncOffset: { value: 0, unit: 's' }, floorFraction: { value: 0.1, stdErr: 0.01 }, contrastRatio: { value: 11, stdErr: 1 } },
    uncertainty, validity: { valid: true, failures: [] }, identifiable: true,
    identifiability: { ampVpiCorrelation: 0.1, relStdErrB: 0.02, maxVoltageOverHalfWave: 1.05, openLevelUsed: false },
    model: { darkLevel: 0, floorLevel: { value: 0.05 }, amplitude: { value: 0.5 }, kerrConstant: { value: 2e-12 }, effectiveLengthM: 0.05, gapM: 0.005, polariserAngleDeg: 45, staticRetardanceRad: 0 },
    fit: { converged: true, iterations: 5, reason: 'ok', residualRms: 0.001, degreesOfFreedom: 8, starts: 3, robust: 'huber', residualAutocorrelation: 0, errorInflation: 1 },
    linearised: null, sync: { manual: true, offsetS: 0, sharpnessS: null, ambiguous: false, curve: { offsetS: [], score: [] } },
    frames: { total: 3, used: 2, excluded: { clipped: 1 } },
    events: [{ kind: 'clipped', frameIndex: 2, timeS: 2, size: 0.3 }, { kind: 'clipped', frameIndex: 0, timeS: 0, size: 0.2 }],
    log: { rows: 3, spanS: 0, currentColumn: false, temperatureC: null }, warnings: [{ code: 'w', message: 'm' }],
  };
}

describe('buildRunRecord', () => {
  it('B and V_π carry the budget\'s combined uncertainty, V_π/√2 follows, schema fields set', () => {
    const p = parts();
    const r = buildRunRecord(p);
    // combined by hand: V_π √(0.01² + 0.02²) = 2.2361 %; B doubles both: 4.4721 %
    expect(r.halfWaveVoltage).toEqual({ value: 10000, stdErr: expect.closeTo(223.607, 2), unit: 'V' });
    expect(r.kerrConstant.stdErr! / 2e-12).toBeCloseTo(0.044721, 5);
    expect(r.quarterWaveVoltage.value).toBeCloseTo(10000 / Math.SQRT2, 9);
    expect(r.quarterWaveVoltage.stdErr).toBeCloseTo(223.607 / Math.SQRT2, 2);
    expect(r).toMatchObject({ schemaVersion: 2, kind: 'kerrtrace-run', source: 'stills', label: 'run', createdAt: '2026-12-02T15:00:00.000Z', files: {}, validity: { valid: true } });
    expect(r.floorFraction).toBe(p.figures.floorFraction);
    expect(r.contrastRatio).toEqual({ value: 11, stdErr: 1 });
  });

  it('events in frame order; the caller\'s arrays are not changed', () => {
    const p = parts();
    const r = buildRunRecord(p);
    expect(r.events.map((e) => e.frameIndex)).toEqual([0, 2]);
    expect(p.events.map((e) => e.frameIndex)).toEqual([2, 0]);
    r.warnings.push({ code: 'x', message: 'y' });
    expect(p.warnings).toHaveLength(1);
  });

  it('optional sections only when given', () => {
    expect('cameraResponse' in buildRunRecord(parts())).toBe(false);
    const withScatter = buildRunRecord({ ...parts(), extras: { scatter: { floorFlicker: { value: 0.01 } } } });
    expect(withScatter.scatter).toEqual({ floorFlicker: { value: 0.01 } });
  });
});
