/**
 * The one exclusion stage on synthetic runs with everything planted (test/core/scatter/syntheticRun,
 * a scenario of our own): particles found before any fit, each at a planted passage and none on a
 * clean run; sparks; an exposure jump at the planted frame; exposure drift warned about without a
 * reference region and not with one; the open window and its turning margins.
 */
import { describe, expect, it } from 'vitest';
import { preSyncExclusions, particleExclusions, OPEN_TURNING_MARGIN_S } from '../../src/pipeline/frameExclusions.js';
import { findSparks } from '../../src/pipeline/findSparks.js';
import type { CorrectedSeries } from '../../src/pipeline/correctedSeries.js';
import { makeSyntheticRun, type SyntheticOptions } from '../core/scatter/syntheticRun.js';

function stage(o: SyntheticOptions, extra: { referenceGiven?: boolean; openWindowS?: [number, number] } = {}) {
  const run = makeSyntheticRun(o);
  const { gridWidth, gridHeight, stepPx: step, frames } = run;
  const clip = {
    grid: { data: run.grid, frames, gridWidth, gridHeight, step },
    beamRect: { x: run.beamBox.x0 * step, y: run.beamBox.y0 * step, w: (run.beamBox.x1 - run.beamBox.x0 + 1) * step, h: (run.beamBox.y1 - run.beamBox.y0 + 1) * step },
    nFrames: frames, times: run.timesS,
    beam: { luma: run.intensity, r: run.intensity, g: run.intensity, b: run.intensity, clipped: new Float64Array(frames) },
  };
  const gain = extra.referenceGiven ? run.gain : new Float64Array(frames).fill(1);
  const intensity = extra.referenceGiven ? run.intensity : Float64Array.from(run.intensity, (v, f) => v * run.gain[f]!);
  const series: CorrectedSeries = { intensity, gain, gainFromReference: extra.referenceGiven === true, warnings: [] };
  const sparks = findSparks({ ...clip, geom: undefined });
  const ex = preSyncExclusions({ clip, series, sparks, referenceGiven: extra.referenceGiven === true, logIntervalS: 0.1, ...(extra.openWindowS ? { openWindowS: extra.openWindowS } : {}) });
  return { run, ex };
}

describe('preSyncExclusions on a synthetic run with particles and sparks', () => {
  const particles = [80, 170, 265, 350, 440, 515];
  const sparks = [60, 230, 400];
  const { ex } = stage({ seed: 91, particleFrames: particles, sparkFrames: sparks, particleLength: 6 });

  it('finds at least half the planted particle passages without a fit, every one at a planted passage', () => {
    // the model is conservative (spikeFreeTrend): a passage on a steep ramp can hide, a false one
    // is never made; those on the slow parts of the sweep (80, 265, 515 here) must be found
    const found = ex.events.filter((e) => e.kind === 'particle');
    expect(found.length).toBeGreaterThanOrEqual(particles.length / 2);
    for (const p of [80, 265, 515]) expect(found.some((e) => e.frameIndex >= p && e.frameIndex < p + 6)).toBe(true);
    for (const e of found) expect(particles.some((p) => e.frameIndex >= p && e.frameIndex < p + 6)).toBe(true);
    ex.excluded.forEach((why, f) => { if (why === 'particle') expect(particles.some((p) => f >= p - 1 && f < p + 7)).toBe(true); });
    // the rate over the 20 s run counts the passages found
    expect((ex.particleRate.value * 20) / 60).toBeCloseTo(found.length, 1);
  });

  it('lists the sparks (±1) as events and reasons, and no exposure jump', () => {
    expect(Math.abs(ex.events.filter((e) => e.kind === 'spark').length - sparks.length)).toBeLessThanOrEqual(1);
    for (const s of sparks) expect(ex.excluded[s]).toBe('spark');
    expect(ex.events.filter((e) => e.kind === 'exposure-jump')).toEqual([]);
    expect(ex.warnings.map((w) => w.code)).not.toContain('exposure-drift');
  });
});

describe('particleExclusions on a clean run', () => {
  it('finds no particle on a run without any, sweep peaks included', () => {
    // the sweep goes past V_π (1.3×), so the intensity has a smooth peak on each ramp: a running
    // median alone cuts those off; the local quadratic keeps them
    const run = makeSyntheticRun({ seed: 7, maxOverHalfWave: 1.3 });
    const r = particleExclusions({ excluded: new Array(run.frames).fill(null), intensity: run.intensity, times: run.timesS, logIntervalS: 0.1 });
    expect(r.events).toEqual([]);
    expect(r.excluded.every((e) => e === null)).toBe(true);
  });
});

describe('preSyncExclusions: exposure', () => {
  it('finds an exposure jump at the planted frame, leaves it out and warns without a reference', () => {
    const { ex } = stage({ seed: 93, durationS: 12, ambient: 0.05, gain: (_t, f) => (f >= 200 ? 0.85 : 1) });
    expect(ex.events.filter((e) => e.kind === 'exposure-jump').map((e) => e.frameIndex)).toEqual([200]);
    expect(ex.excluded[200]).toBe('exposure-jump');
    const w = ex.warnings.find((x) => x.code === 'exposure-drift');
    expect(w!.guideSection).toBe('lock-exposure');
    expect(w!.message).toMatch(/lock exposure or put a constant reference card in view and give --reference-roi/i);
  });

  it('warns about slow exposure drift without a reference, not with one', () => {
    const card = { x0: 40, y0: 2, x1: 46, y1: 8, level: 0.3 };
    const drift = (t: number) => 1 + 0.15 * Math.sin(t / 2);
    expect(stage({ seed: 92, durationS: 12, card, gain: drift }).ex.warnings.map((x) => x.code)).toContain('exposure-drift');
    expect(stage({ seed: 92, durationS: 12, card, gain: drift }, { referenceGiven: true }).ex.warnings.map((x) => x.code)).not.toContain('exposure-drift');
  });
});

describe('preSyncExclusions: open window', () => {
  it('marks the window, the turning margins either side, and returns the window levels', () => {
    const { run, ex } = stage({ seed: 94, durationS: 12 }, { openWindowS: [5, 6] });
    const t = run.timesS;
    for (let f = 0; f < run.frames; f++) {
      if (t[f]! >= 5 && t[f]! <= 6) expect(ex.excluded[f]).toBe('open-window');
      else if (t[f]! >= 5 - OPEN_TURNING_MARGIN_S && t[f]! <= 6 + OPEN_TURNING_MARGIN_S) expect(ex.excluded[f]).toBe('open-turning');
    }
    expect(ex.openWindowLevels!.length).toBe(ex.excluded.filter((e) => e === 'open-window').length);
  });
});
