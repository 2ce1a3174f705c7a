/**
 * The figures that need no pictures (runFigures), on synthetic runs with everything planted
 * (test/core/scatter/syntheticRun, a scenario of our own): the floor split with a baseline, the
 * resistivity from a current column against a hand calculation, the electrode-height warning, a
 * planted up/down difference flagged, floor flicker, and a baseline that is not a run refused.
 */
import { describe, expect, it } from 'vitest';
import { runFigures, checkBaseline, type RunFiguresInput } from '../../src/pipeline/runFigures.js';
import { runCell } from '../../src/pipeline/runCell.js';
import { fitKerrCurve } from '../../src/core/fit/fitKerrCurve.js';
import { crossedTransmission } from '../../src/core/physics/kerr.js';
import { quantity } from '../../src/quantity.js';
import type { VoltageLog } from '../../src/io/voltageLog.js';
import type { RunResult } from '../../src/result/schema.js';
import { buildRunFixture } from '../fixtures/results/buildRunFixture.js';
import { makeSyntheticRun, type SyntheticOptions } from '../core/scatter/syntheticRun.js';

function figuresInput(o: SyntheticOptions, extra: { electrodeHeightMm?: number; log?: VoltageLog } = {}): RunFiguresInput {
  const run = makeSyntheticRun(o);
  const fit = fitKerrCurve({ voltageV: run.voltageV, intensity: run.intensity, effectiveLengthM: 0.05, gapM: 0.005, polariserAngleDeg: 45 });
  const vpi = fit.halfWaveVoltage.value;
  const log = extra.log ?? ({ timeS: run.timesS, voltageV: run.voltageV, currentA: null, rows: run.frames } as unknown as VoltageLog);
  return {
    fit, cell: runCell({ lengthMm: 50, gapMm: 5, ...(extra.electrodeHeightMm !== undefined ? { electrodeHeightMm: extra.electrodeHeightMm } : {}) }),
    times: run.timesS, voltage: run.voltageV, intensity: run.intensity,
    modulation: Float64Array.from(run.voltageV, (v) => crossedTransmission(Math.PI / 4, Math.PI * (v / vpi) ** 2)),
    used: new Uint8Array(run.frames).fill(1), particleRate: quantity(2, 1, '1/min'),
    floorFraction: quantity(fit.floorLevel.value / fit.amplitude.value, 0.001), syncOffset: quantity(0, 0.005, 's'),
    voltageAt: (t) => Float64Array.from(t, (x) => run.voltageV[Math.max(0, Math.min(run.frames - 1, Math.round(x * run.options.fps)))]!),
    log,
  };
}

describe('runFigures', () => {
  it('reports floor flicker, the particle rate it was given, and an up/down comparison not flagged', () => {
    const f = runFigures(figuresInput({ seed: 94, durationS: 12 }));
    expect(f.scatter.floorFlicker!.value).toBeGreaterThan(0);
    expect(f.scatter.particleEventRate!.value).toBe(2);
    expect(f.hysteresis!.flagged).toBe(false);
    expect(f.conductivity).toBeUndefined();
  });

  it('splits the floor with a baseline run and fills the conductivity from the current column', () => {
    // planted: ρ = 5e8 ohm·m → R = ρ·d/A = 5e8·0.005/(0.05·0.01) = 5e9 ohm
    const voltageV = Float64Array.from({ length: 100 }, (_, k) => 120 * k);
    const log = { timeS: Float64Array.from(voltageV, (_, k) => k), voltageV, currentA: Float64Array.from(voltageV, (v) => v / 5e9), temperatureC: null, rows: 100 } as unknown as VoltageLog;
    const i = figuresInput({ seed: 94, durationS: 12 }, { electrodeHeightMm: 10, log });
    const baseline = { ...buildRunFixture().result, floorFraction: quantity(0.002, 0.0002) };
    const f = runFigures({ ...i, baseline });
    expect(f.scatter.polariserLeakFraction!.value).toBe(0.002);
    expect(f.scatter.scatterFloorFraction!.value).toBeCloseTo(i.floorFraction.value - 0.002, 12);
    expect(f.conductivity!.readable).toBe(true);
    // hand calculation from the formula ρ = V·A/(I·d) at the highest row
    const vHigh = 120 * 99;
    expect(f.conductivity!.resistivity.value / ((vHigh * 0.05 * 0.01) / ((vHigh / 5e9) * 0.005))).toBeCloseTo(1, 9);
  });

  it('asks for the electrode height when the log has a current column but the height is unknown', () => {
    const i = figuresInput({ seed: 95, durationS: 8 });
    const f = runFigures({ ...i, log: { ...i.log, currentA: Float64Array.from(i.log.voltageV, (v) => v / 5e9) } });
    expect(f.conductivity).toBeUndefined();
    expect(f.warnings.find((w) => w.code === 'no-electrode-height')!.message).toMatch(/--electrode-height-mm/);
  });

  it('flags a planted up/down difference', () => {
    const f = runFigures(figuresInput({ seed: 97, halfWaveDownV: 10500 }));
    expect(f.hysteresis!.flagged).toBe(true);
    expect(f.warnings.map((w) => w.code)).toContain('hysteresis');
  });

  it('names the same difference compression lag, not hysteresis, in footage starved of bits', () => {
    const i = figuresInput({ seed: 97, halfWaveDownV: 10500 });
    const starved = runFigures({ ...i, bitsPerPixel: 0.04 });
    expect(starved.hysteresis!.flagged).toBe(true); // the measurement is the same
    const codes = starved.warnings.map((w) => w.code);
    expect(codes).toContain('compression-lag');
    expect(codes).not.toContain('hysteresis');
    expect(starved.warnings.find((w) => w.code === 'compression-lag')!.message).toMatch(/0\.040 bits per pixel/);
    // at a healthy bitrate it stays hysteresis
    expect(runFigures({ ...i, bitsPerPixel: 0.5 }).warnings.map((w) => w.code)).toContain('hysteresis');
  });

  it('refuses a baseline that is not a run result', () => {
    expect(() => checkBaseline({ kind: 'something-else' } as unknown as RunResult)).toThrow(/not a kerrtrace run result/);
  });
});
