import { describe, expect, it } from 'vitest';
import { clippingMeter, driftPercentPerMinute, exposureMeter, extinctionMeter, framesMeter, frameTiming, logMeter } from '../../src/live/meters.js';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

describe('setup meters', () => {
  it('extinction: closed over open with an open level, thresholds 1/1000 and 1/100 (common practice)', () => {
    expect(extinctionMeter({ closedLevel: 0.0002, openLevel: 0.5, floorAboveSurround: 0.0002 }).verdict).toBe('good');
    const fair = extinctionMeter({ closedLevel: 0.002, openLevel: 0.5, floorAboveSurround: 0.002 });
    expect(fair.verdict).toBe('fair');
    expect(fair.value).toBe('closed/open 1 : 250');
    expect(extinctionMeter({ closedLevel: 0.02, openLevel: 0.5, floorAboveSurround: 0.02 }).verdict).toBe('poor');
  });

  it('extinction without an open level judges the floor above the surround', () => {
    expect(extinctionMeter({ closedLevel: 0.001, openLevel: null, floorAboveSurround: 0.001 }).verdict).toBe('good');
    expect(extinctionMeter({ closedLevel: 0.005, openLevel: null, floorAboveSurround: 0.005 }).verdict).toBe('fair');
    expect(extinctionMeter({ closedLevel: 0.05, openLevel: null, floorAboveSurround: 0.05 }).verdict).toBe('poor');
    expect(extinctionMeter({ closedLevel: Number.NaN, openLevel: null, floorAboveSurround: Number.NaN }).verdict).toBe('unknown');
  });

  it('clipping: none good, up to 1 % fair, more poor', () => {
    expect(clippingMeter(0).verdict).toBe('good');
    expect(clippingMeter(0.005).verdict).toBe('fair');
    expect(clippingMeter(0.2).verdict).toBe('poor');
    expect(clippingMeter(0.2).value).toBe('20 %');
    expect(clippingMeter(Number.NaN).verdict).toBe('unknown');
  });

  it('exposure drift: the slope of a straight line in % of the mean per minute', () => {
    // level 0.5 falling by 0.005 per minute = −1 %/min (exact for a straight line)
    const t = Array.from({ length: 600 }, (_, k) => k / 10);
    const y = t.map((s) => 0.5 - (0.005 * s) / 60);
    const mean = y.reduce((a, b) => a + b, 0) / y.length;
    expect(driftPercentPerMinute(t, y)).toBeCloseTo((-100 * 0.005) / mean, 9);
    expect(exposureMeter(driftPercentPerMinute(t, y), true).verdict).toBe('fair');
    expect(exposureMeter(0.1, true).verdict).toBe('good');
    expect(exposureMeter(-5, true).verdict).toBe('poor');
    expect(exposureMeter(Number.NaN, false).verdict).toBe('unknown');
    // under 10 s of data: no figure
    expect(Number.isNaN(driftPercentPerMinute([0, 1, 2, 3, 4, 5, 6, 7, 8, 9], [1, 1, 1, 1, 1, 1, 1, 1, 1, 1]))).toBe(true);
  });

  it('frame timing: delivered rate and frames missing from the timestamps', () => {
    const times: number[] = [];
    for (let k = 0; k < 150; k++) if (k !== 40 && k !== 41 && k !== 90) times.push(k / 30);
    const t = frameTiming(times);
    expect(t.missing).toBe(3);
    expect(t.medianIntervalS).toBeCloseTo(1 / 30, 9);
    expect(t.deliveredFps).toBeCloseTo((times.length - 1) / (149 / 30), 9);
    const clean = frameTiming(Array.from({ length: 150 }, (_, k) => k / 30));
    expect(framesMeter(clean, clean, 30, 0).verdict).toBe('good');
    expect(framesMeter(t, t, 30, 3).verdict).toBe('poor');
    expect(framesMeter(frameTiming([]), frameTiming([]), 30, 0).verdict).toBe('unknown');
  });

  it('log: rows arriving recently are good, a silent or unreadable log is flagged', () => {
    expect(logMeter(true, 40, 0.2, null).verdict).toBe('good');
    expect(logMeter(true, 40, 10, null).verdict).toBe('fair');
    expect(logMeter(true, 40, 60, null).verdict).toBe('poor');
    expect(logMeter(true, 0, Infinity, null).verdict).toBe('poor');
    expect(logMeter(true, 0, Infinity, 'waiting for volts.csv to appear').advice).toMatch(/appear/);
    expect(logMeter(false, 0, Infinity, null).verdict).toBe('unknown');
  });

  it('every meter links to a section that exists in docs/recording-a-run.md', () => {
    const guide = readFileSync(join(__dirname, '..', '..', 'docs', 'recording-a-run.md'), 'utf8');
    const anchors = [
      extinctionMeter({ closedLevel: 0, openLevel: null, floorAboveSurround: 0 }), clippingMeter(0), exposureMeter(0, true),
      framesMeter(frameTiming([0, 1, 2]), frameTiming([0, 1, 2]), null, 0), logMeter(true, 3, 0, null),
    ].map((m) => m.guideSection);
    for (const a of anchors) expect(guide, a).toContain(`<a id="${a}"></a>`);
  });
});
