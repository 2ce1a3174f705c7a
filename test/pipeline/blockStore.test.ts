/**
 * The bounded block store (src/pipeline/blockStore.ts): memory that does not grow with the clip's
 * length, yet every frame's sums of the boxes around the beam and every frame's mean kept. Checked
 * against the unbounded store of the same decode, value for value: the box series and the frame
 * means are the same numbers, the rows kept are evenly spaced and hold the same numbers as those frames'
 * rows, and the beam found on them is the beam found on every frame.
 */
import { describe, expect, it } from 'vitest';
import { createBlockStore } from '../../src/pipeline/blockStore.js';
import { decodePass } from '../../src/pipeline/decodePass.js';
import { openClip } from '../../src/pipeline/measureClip.js';
import { findClipBeam, type ClipBeam } from '../../src/pipeline/findClipBeam.js';
import { fullRateBoxes } from '../../src/pipeline/fullRateBoxes.js';
import { blockSeries } from '../../src/pipeline/blockSeries.js';
import { atRows, boxSumSeries, clipFrames, frameMeansOf } from '../../src/pipeline/gridAccess.js';
import { frameMeans } from '../../src/core/events/frameMeans.js';
import { testMediaFile } from '../helpers/referenceData.js';

describe('createBlockStore', () => {
  // 4×3 blocks; block c of frame f holds f + c/100; block 5 of every 7th frame is clipped
  const gw = 4, gh = 3, cells = gw * gh;
  const fill = (f: number) => (luma: Float32Array, clipped: Uint8Array, bitOffset: number) => {
    for (let c = 0; c < cells; c++) luma[c] = f + c / 100;
    if (f % 7 === 0) { const bit = bitOffset + 5; clipped[bit >> 3] |= 1 << (bit & 7); }
  };

  it('unbounded: one row per frame', () => {
    const s = createBlockStore({ cells, gridWidth: gw, gridHeight: gh, step: 8, capFrames: 4 });
    for (let f = 0; f < 50; f++) s.add(f, fill(f));
    const g = s.finish();
    expect(g.frames).toBe(50);
    expect(g.frameOf).toBeUndefined();
    expect(g.data[49 * cells + 3]).toBeCloseTo(49.03, 5);
  });

  it('bounded: at most maxRows rows, evenly spaced; every frame of the boxes and every frame sum kept', () => {
    const box = { x0: 1, y0: 1, x1: 2, y1: 2 };
    const s = createBlockStore({ cells, gridWidth: gw, gridHeight: gh, step: 8, capFrames: 10, bounded: { maxRows: 16, boxesFor: () => [box] } });
    for (let f = 0; f < 100; f++) s.add(f, fill(f));
    const g = s.finish();
    expect(clipFrames(g)).toBe(100);
    expect(g.frames).toBeLessThanOrEqual(16);
    const rows = Array.from(g.frameOf!);
    const stride = rows[1]! - rows[0]!;
    expect(rows[0]).toBe(0);
    expect(stride).toBe(8); // 100 frames into 16 rows: 1 → 2 → 4 → 8
    rows.forEach((f, r) => { expect(f).toBe(r * stride); expect(g.data[r * cells + 2]).toBeCloseTo(f + 0.02, 5); });
    // the box: blocks 5, 6, 9, 10 at every frame, Σ = 4f + 0.30; block 5 clipped every 7th frame
    const sums = boxSumSeries(g, box)!;
    expect(sums).toHaveLength(100);
    for (const f of [0, 1, 37, 99]) expect(sums[f]).toBeCloseTo(4 * f + 0.3, 4);
    const series = blockSeries(g, box);
    for (let f = 0; f < 100; f++) expect(series.clipped[f]).toBe(f % 7 === 0 ? 0.25 : 0);
    // a box it did not track is refused, not guessed
    expect(boxSumSeries(g, { x0: 0, y0: 0, x1: 1, y1: 1 })).toBeNull();
    expect(() => blockSeries(g, { x0: 0, y0: 0, x1: 1, y1: 1 })).toThrow(/not one of the boxes/);
    const means = frameMeansOf(g);
    for (const f of [0, 5, 99]) expect(means[f]).toBeCloseTo(f + (cells - 1) / 200, 5);
    expect(Array.from(atRows(g, Float64Array.from({ length: 100 }, (_, f) => f)))).toEqual(rows);
  });
});

describe('bounded store on a real decode (test-media cfr-ramp)', () => {
  it('gives the found beam, its block series and the frame means of the unbounded store', async () => {
    const opened = await openClip({ videoPath: testMediaFile('cfr-ramp', 'run', 'clip.mp4') });
    const step = 4;
    const full = await decodePass(opened.probe, opened.decoding, { regions: [], overviewStep: step });
    const grid = full.grid!;
    const found = findClipBeam(grid);
    let provisional: ClipBeam | null = null;
    const bounded = await decodePass(opened.probe, opened.decoding, {
      regions: [], overviewStep: step,
      // no beam in the first 40 frames (the drive holds at zero): the store waits for one
      bounded: {
        maxRows: 40,
        boxesFor: (rows) => {
          try { provisional = findClipBeam(rows); } catch { return null; }
          return fullRateBoxes(grid, provisional.geom.beam, provisional.geom.b1, provisional.boxes);
        },
      },
    });
    const b = bounded.grid!;
    expect(b.frameOf).toBeDefined();
    expect(b.frames).toBeLessThanOrEqual(40);
    expect(clipFrames(b)).toBe(full.frames);
    const again = findClipBeam(b);
    expect(again.boxes[0]).toEqual(found.boxes[0]);
    const first = provisional as ClipBeam | null;
    expect(first!.boxes[0]).toEqual(found.boxes[0]);
    // every frame of the beam and its rings: the same numbers as the unbounded store's
    for (const box of first!.boxes) {
      const a = blockSeries(grid, box), c = blockSeries(b, box);
      expect(Array.from(c.luma)).toEqual(Array.from(a.luma));
      expect(Array.from(c.clipped)).toEqual(Array.from(a.clipped));
    }
    const m1 = frameMeans(grid.data, grid.frames, grid.gridWidth * grid.gridHeight), m2 = frameMeansOf(b);
    for (let f = 0; f < m1.length; f++) expect(m2[f]).toBeCloseTo(m1[f]!, 12);
  });
});

describe('analyze with a bounded block store (as a long clip gets)', () => {
  it('cfr-ramp with the store bounded at 40 rows: the provisional beam within a block of the whole clip\'s, and the same B', async () => {
    const { analyzeRun } = await import('../../src/pipeline/analyze.js');
    const { PROVISIONAL_EDGE_BLOCKS } = await import('../../src/pipeline/measureClip.js');
    const { readFileSync } = await import('node:fs');
    const sc = JSON.parse(readFileSync(testMediaFile('cfr-ramp', 'scenario.json'), 'utf8')) as { cell: { lengthMm: number; gapMm: number } };
    const o = { videoPath: testMediaFile('cfr-ramp', 'run', 'clip.mp4'), voltsPath: testMediaFile('cfr-ramp', 'run', 'volts.csv'), lengthMm: sc.cell.lengthMm, gapMm: sc.cell.gapMm };
    const hooks = { toolVersion: 'test', ffmpegVersion: null };
    const full = (await analyzeRun(o, hooks)).result;
    const bounded = (await analyzeRun({ ...o, maxGridRows: 40 }, hooks)).result;
    // read once (no second-read warning); the beam box kept is the one found on the first rows
    expect(bounded.warnings.some((w) => /read a second time/.test(w.message))).toBe(false);
    const step = 2; // 320-px-wide clip: chooseGridStep gives 2-px blocks
    const a = full.regions.beam, b = bounded.regions.beam;
    for (const [p, q] of [[a.x, b.x], [a.y, b.y], [a.x + a.w, b.x + b.w], [a.y + a.h, b.y + b.h]] as const) expect(Math.abs(p - q)).toBeLessThanOrEqual(PROVISIONAL_EDGE_BLOCKS * step);
    // a block more or less of edge moves B and V_π by far less than their σ (measured: −0.024 % and
    // +0.012 % against σ(B) of 1.2 %); bound: a tenth of σ
    expect(Math.abs(bounded.kerrConstant.value - full.kerrConstant.value)).toBeLessThan(0.1 * full.kerrConstant.stdErr!);
    expect(Math.abs(bounded.halfWaveVoltage.value - full.halfWaveVoltage.value)).toBeLessThan(0.1 * full.halfWaveVoltage.stdErr!);
  }, 60_000);
});

describe('a bounded store tracks every box the analysis reads at full rate', () => {
  it('with --roi and with a found beam: the spark and keep-out boxes (and the beam and rings) are tracked, so nothing falls back to whole-frame means', async () => {
    const { measureClip } = await import('../../src/pipeline/measureClip.js');
    const { sparkBox, keepOutBox } = await import('../../src/pipeline/fullRateBoxes.js');
    const { readFileSync } = await import('node:fs');
    const truth = JSON.parse(readFileSync(testMediaFile('cfr-ramp', 'run', 'truth.json'), 'utf8')) as { roi: number[] };
    const [x, y, w, h] = truth.roi as [number, number, number, number];
    for (const roi of [{ x, y, w, h }, undefined]) {
      const o = { videoPath: testMediaFile('cfr-ramp', 'run', 'clip.mp4'), maxGridRows: 40, ...(roi ? { roi } : {}) };
      const clip = await measureClip(await openClip(o), o);
      const g = clip.grid;
      expect(g.tracked).toBeDefined();
      expect(boxSumSeries(g, sparkBox(g, clip.geom ? clip.geom.b1 : clip.beamRect))).not.toBeNull();
      expect(boxSumSeries(g, keepOutBox(g, clip.beamRect)!)).not.toBeNull();
    }
  }, 60_000);
});
