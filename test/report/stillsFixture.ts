/**
 * A stills-like run for report tests: the physics fixture of buildRunFixture re-dressed as a photo
 * series the way stillsRunResult fills a result (source "stills", no video input, one input per
 * photo, every photo with a voltage, clipped photos as the only left-out reason and event, no
 * second clock so the sync is manual with no search curve, no frame rate, full-range photos,
 * options.timeBasis and options.voltageSource as the stills command records them).
 */
import type { RunEvent } from '../../src/result/schema.js';
import { buildRunFixture, type RunFixture, type RunFixtureOptions } from '../fixtures/results/buildRunFixture.js';

export function stillsRunFixture(timeBasis: 'photo-index' | 'exif-capture-time', options: RunFixtureOptions = {}): RunFixture {
  // 12 s at 2 "frames" per second: 24 photos along the fixture's up/down sweep.
  const base = buildRunFixture({ durationS: 12, fps: 2, ...options });
  const trace = base.trace
    .filter((row) => row.voltageV !== null)
    .map((row, i) => ({
      ...row,
      frameIndex: i,
      timeS: timeBasis === 'exif-capture-time' ? 7 * i : i, // EXIF: a photo every 7 s; else name order
      excludedReason: row.excludedReason === null ? null : 'clipped',
    }));
  const clipped = trace.filter((row) => !row.used);
  const events: RunEvent[] = clipped.map((row) => ({ kind: 'clipped', frameIndex: row.frameIndex, timeS: row.timeS, size: 0.12 }));
  const r = base.result;
  r.source = 'stills';
  r.tool.ffmpegVersion = null;
  r.inputs = { stills: trace.map((row) => ({ path: `photos/step${String(row.frameIndex).padStart(2, '0')}.jpg`, sha256: 'b7d2'.repeat(16) })) };
  r.regions = { beam: { x: 140, y: 100, w: 40, h: 30 }, beamAuto: false, dark: { x: 8, y: 8, w: 30, h: 30 } };
  r.options = { folder: 'photos', lengthMm: 50, gapMm: 5, roi: r.regions.beam, darkRoi: r.regions.dark, voltageSource: 'file-names', exposureBasis: 'exif', timeBasis };
  r.camera = { width: 320, height: 240, fps: null, variableFrameRate: false, transfer: 'srgb', range: 'full' };
  r.syncOffset = { value: 0, unit: 's' };
  r.sync = { manual: true, offsetS: 0, sharpnessS: null, ambiguous: false, curve: { offsetS: [], score: [] } };
  r.frames = { total: trace.length, used: trace.length - clipped.length, excluded: clipped.length > 0 ? { clipped: clipped.length } : {} };
  r.events = events;
  r.log = { rows: trace.length, spanS: timeBasis === 'exif-capture-time' ? 7 * (trace.length - 1) : 0, currentColumn: false, temperatureC: null };
  delete r.scatter;
  return { result: r, trace };
}
