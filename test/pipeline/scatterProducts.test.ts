import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { Jimp } from 'jimp';
import { computeScatterProducts } from '../../src/pipeline/scatterProducts.js';
import { fitKerrCurve } from '../../src/core/fit/fitKerrCurve.js';
import type { AnalyzeOutput } from '../../src/pipeline/analyze.js';
import type { VideoInfo } from '../../src/media/types.js';
import type { RunEvent, RunResult, TraceRow } from '../../src/result/schema.js';
import type { VoltageLog } from '../../src/io/voltageLog.js';
import { detectFlashes } from '../../src/core/events/detectFlashes.js';
import { crossedTransmission } from '../../src/core/physics/kerr.js';
import { quantity } from '../../src/quantity.js';
import { ffmpegPath } from '../../src/media/ffmpegPaths.js';
import { buildRunFixture } from '../fixtures/results/buildRunFixture.js';
import { parseScenario } from '../../src/sim/scenario.js';
import { simulateRun } from '../../src/sim/simulate.js';
import { analyzeRun } from '../../src/pipeline/analyze.js';
import { makeSyntheticRun, type SyntheticOptions } from '../core/scatter/syntheticRun.js';

const GAP_M = 0.005;
const LENGTH_M = 0.05;

let dir = '';
let video = '';

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'kerrtrace-scatter-'));
  video = join(dir, 'run.mp4');
  // a 20 s, 192×144, 5 fps stand-in video (the synthetic grid is 384×288 px: the overlay scales)
  const r = spawnSync(ffmpegPath(), ['-v', 'error', '-y', '-f', 'lavfi', '-i', 'testsrc=s=192x144:r=5:d=20', '-c:v', 'libx264', '-pix_fmt', 'yuv420p', video]);
  expect(r.status).toBe(0);
});
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

/**
 * What analyze hands over, built from a synthetic run: sparks from the flash detector, the Kerr
 * fit on the remaining frames, positive fit outliers marked as particles (one event per frame),
 * the trace, the modulation term with the fitted V_π.
 */
function analyzeLike(o: SyntheticOptions, extra: { reference?: boolean; currentColumn?: boolean; electrodeHeightM?: number | null; markOutliers?: boolean } = {}) {
  const run = makeSyntheticRun(o);
  const { frames, gridWidth: gw, gridHeight: gh, stepPx: step } = run;
  const cells = gw * gh;
  const frameMean = new Float64Array(frames);
  for (let f = 0; f < frames; f++) { let s = 0; for (let c = 0; c < cells; c++) s += run.grid[f * cells + c]!; frameMean[f] = s / cells; }
  const flashes = detectFlashes(frameMean);
  const excluded: (string | null)[] = Array.from(flashes.flags, (x) => (x ? 'spark' : null));
  const events: RunEvent[] = [];
  for (let f = 0; f < frames; f++) if (flashes.flags[f]) events.push({ kind: 'spark', frameIndex: f, timeS: run.timesS[f]!, size: flashes.z[f]! });
  const idx: number[] = [];
  for (let f = 0; f < frames; f++) if (!excluded[f]) idx.push(f);
  const fit = fitKerrCurve({
    voltageV: Float64Array.from(idx, (f) => run.voltageV[f]!), intensity: Float64Array.from(idx, (f) => run.intensity[f]!),
    effectiveLengthM: LENGTH_M, gapM: GAP_M, polariserAngleDeg: 45,
  });
  idx.forEach((f, k) => {
    if (!fit.outliers[k] || extra.markOutliers === false) return;
    const r = run.intensity[f]! - fit.predict(run.voltageV[f]!);
    excluded[f] = r > 0 ? 'particle' : 'outlier';
    if (r > 0) events.push({ kind: 'particle', frameIndex: f, timeS: run.timesS[f]!, size: r / fit.residualRms });
  });
  const vpi = fit.halfWaveVoltage.value;
  const modulation = Float64Array.from(run.voltageV, (v) => crossedTransmission(Math.PI / 4, Math.PI * (v / vpi) ** 2));
  const usable = Uint8Array.from(excluded, (e) => (e ? 0 : 1));
  const trace: TraceRow[] = Array.from({ length: frames }, (_, f) => {
    const model = fit.predict(run.voltageV[f]!);
    return { frameIndex: f, timeS: run.timesS[f]!, voltageV: run.voltageV[f]!, intensity: run.intensity[f]!, model, residual: run.intensity[f]! - model, used: !excluded[f], excludedReason: excluded[f] ?? null };
  });
  const base = buildRunFixture().result;
  const floorFraction = quantity(fit.floorLevel.value / fit.amplitude.value, (fit.floorLevel.stdErr! / fit.amplitude.value));
  const card = o.card;
  const result: RunResult = {
    ...base,
    options: { videoPath: video, voltsPath: join(dir, 'volts.csv') },
    cell: { ...base.cell, lengthM: LENGTH_M, effectiveLengthM: LENGTH_M, gapM: GAP_M, polariserAngleDeg: 45, electrodeHeightM: extra.electrodeHeightM ?? null },
    camera: { ...base.camera, width: gw * step, height: gh * step },
    regions: {
      beam: { x: run.beamBox.x0 * step, y: run.beamBox.y0 * step, w: 5 * step, h: 5 * step }, beamAuto: true,
      ...(extra.reference && card ? { reference: { x: card.x0 * step, y: card.y0 * step, w: (card.x1 - card.x0 + 1) * step, h: (card.y1 - card.y0 + 1) * step } } : {}),
    },
    floorFraction,
    model: { ...base.model, floorLevel: fit.floorLevel, amplitude: fit.amplitude, kerrConstant: fit.kerrConstant, effectiveLengthM: LENGTH_M, gapM: GAP_M, polariserAngleDeg: 45, staticRetardanceRad: 0 },
    fit: { ...base.fit, robust: 'huber' },
    events: events.sort((a, b) => a.frameIndex - b.frameIndex),
    log: { ...base.log, currentColumn: extra.currentColumn ?? false },
    warnings: [],
  };
  const info = { path: video, width: gw * step, height: gh * step, startTimeS: 0 } as VideoInfo;
  const out: AnalyzeOutput = {
    result, trace, grid: { data: run.grid, frames, gridWidth: gw, gridHeight: gh, step },
    frameTimesS: run.timesS, intensity: run.intensity, modulation, usable, fit, info,
    decoding: { range: 'limited', matrix: 'bt709', transfer: 'srgb', clipCode: 254 },
    // not used by the scatter stage when gain and log are passed in
    gain: run.gain, log: undefined as never, measured: undefined as never,
  };
  return { out, run, fit, flashes };
}

function refit(run: ReturnType<typeof makeSyntheticRun>, keep: (f: number) => boolean) {
  const idx: number[] = [];
  for (let f = 0; f < run.frames; f++) if (keep(f)) idx.push(f);
  const fit = fitKerrCurve({ voltageV: Float64Array.from(idx, (f) => run.voltageV[f]!), intensity: Float64Array.from(idx, (f) => run.intensity[f]!), effectiveLengthM: LENGTH_M, gapM: GAP_M, polariserAngleDeg: 45, robust: false });
  return { ratio: fit.floorLevel.value / fit.amplitude.value, err: fit.floorLevel.stdErr! / fit.amplitude.value };
}

describe('computeScatterProducts on a synthetic run with floor, halo, particles and sparks', () => {
  const particles = [80, 170, 265, 350, 440, 515];
  const sparks = [60, 230, 400];
  let made: ReturnType<typeof analyzeLike>;
  let sp: Awaited<ReturnType<typeof computeScatterProducts>>;
  beforeAll(async () => {
    // analyze here has not marked the particle frames (as with --no-robust): they are all new
    made = analyzeLike({ seed: 91, particleFrames: particles, sparkFrames: sparks, particleLength: 6 }, { markOutliers: false });
    sp = await computeScatterProducts(made.out, { videoPath: video });
  });

  it('recovers the planted halo-to-core ratio within 20 %', () => {
    // the truth's definition (src/sim/truth.ts) on the block grid: mean planted halo over the band
    // just outside the 5 % footprint, w = max(r₅₀, 2 blocks) wide, minus the least halo, over A
    const { run } = made;
    const { gridWidth: w, gridHeight: h } = run;
    const foot: [number, number][] = [];
    let core = 0, far = Infinity;
    for (let y = 0; y < h; y++) {
      for (let x = 0; x < w; x++) {
        if (run.beam(x, y) >= 0.05) foot.push([x, y]);
        if (run.beam(x, y) >= 0.5) core++;
        far = Math.min(far, run.halo(x, y));
      }
    }
    const width = Math.max(Math.sqrt(core / Math.PI), 2);
    let sum = 0, n = 0;
    for (let y = 0; y < h; y++) {
      for (let x = 0; x < w; x++) {
        if (run.beam(x, y) >= 0.05 || !foot.some(([fx, fy]) => (x - fx) ** 2 + (y - fy) ** 2 <= width * width + 1e-9)) continue;
        sum += run.halo(x, y); n++;
      }
    }
    const truth = (sum / n - far) / run.options.amplitude;
    const got = sp.scatter.haloToCoreRatio!.value;
    expect(Math.abs(got - truth) / truth).toBeLessThan(0.2);
  });

  it('counts particle events within ±1 of those planted and sparks within ±1', () => {
    const rate = sp.scatter.particleEventRate!;
    const events = (rate.value * 20) / 60; // the judged span is the 20 s run
    expect(Math.abs(events - particles.length)).toBeLessThanOrEqual(1.05);
    expect(Math.abs(made.flashes.count - sparks.length)).toBeLessThanOrEqual(1);
    // events analyze had not seen are new, one per passage, each at a planted particle
    const news = sp.extraEvents.filter((x) => x.kind === 'particle');
    expect(Math.abs(news.length - particles.length)).toBeLessThanOrEqual(1);
    for (const e of news) expect(particles.some((p) => e.frameIndex >= p && e.frameIndex < p + 6)).toBe(true);
    expect(sp.extraEvents.filter((x) => x.kind === 'exposure-jump')).toEqual([]);
    for (const f of sp.refitExclusions) expect(particles.some((p) => f >= p && f < p + 6)).toBe(true);
  });

  it('adds no particle event that analyze already listed, but still counts it in the rate', async () => {
    const marked = analyzeLike({ seed: 91, particleFrames: particles, sparkFrames: sparks, particleLength: 6 });
    expect(marked.out.result.events.filter((e) => e.kind === 'particle').length).toBeGreaterThan(particles.length);
    const again = await computeScatterProducts(marked.out, { videoPath: video });
    const seen = new Set(marked.out.result.events.filter((e) => e.kind === 'particle').map((e) => e.frameIndex));
    for (const e of again.extraEvents) expect(seen.has(e.frameIndex)).toBe(false);
    expect(Math.abs((again.scatter.particleEventRate!.value * 20) / 60 - particles.length)).toBeLessThanOrEqual(1.05);
  });

  it('leaves the floor fraction as a clean run gives it once particle frames and sparks are left out', () => {
    const { run } = made;
    const excluded = new Set([...sp.refitExclusions, ...made.out.result.events.map((e) => e.frameIndex)]);
    const after = refit(run, (f) => !excluded.has(f));
    const clean = analyzeLike({ seed: 91, particleFrames: [], sparkFrames: [] });
    const truth = refit(clean.run, () => true);
    expect(Math.abs(after.ratio - truth.ratio)).toBeLessThan(3 * Math.hypot(after.err, truth.err) + 1e-4);
    // every refit exclusion is a frame the fit had used
    for (const f of sp.refitExclusions) expect(made.out.usable[f]).toBe(1);
  });

  it('reports floor flicker and an up/down comparison that is not flagged, and no exposure warning', () => {
    expect(sp.scatter.floorFlicker!.value).toBeGreaterThan(0);
    expect(sp.hysteresis).toBeDefined();
    expect(sp.hysteresis!.flagged).toBe(false);
    expect(sp.warnings.map((w) => w.code)).not.toContain('exposure-drift');
    expect(sp.conductivity).toBeUndefined();
  });

  it('returns decodable map figures, float32 maps with their header, and the region overlay', async () => {
    expect(Object.keys(sp.files).sort()).toEqual(['maps/maps.json', 'maps/modulated.f32', 'maps/modulated.png', 'maps/static.f32', 'maps/static.png', 'regions.png']);
    const { gridWidth, gridHeight } = made.run;
    expect(sp.files['maps/static.f32']!.length).toBe(4 * gridWidth * gridHeight);
    const header = JSON.parse(new TextDecoder().decode(sp.files['maps/maps.json']));
    expect([header.width, header.height, header.stepPx]).toEqual([gridWidth, gridHeight, 8]);
    for (const png of [sp.images.staticMapPng, sp.images.modulatedMapPng, sp.images.frameWithRegionsPng]) {
      const meta = await sharp(png).metadata();
      expect(meta.format).toBe('png');
      expect((await Jimp.read(png)).bitmap.width).toBe(meta.width);
    }
    // the overlay is drawn on the real (192×144) frame, enlarged 4× for legibility
    expect((await sharp(sp.images.frameWithRegionsPng).metadata()).width).toBe(4 * 192);
    expect(sp.warnings.map((w) => w.code)).not.toContain('overlay-frame');
  });
});

describe('computeScatterProducts: exposure, baseline, conductivity, fall-backs', () => {
  it('warns about exposure drift without a reference, pointing at the guide, and suggests the card', async () => {
    const card = { x0: 40, y0: 2, x1: 46, y1: 8, level: 0.3 };
    const { out } = analyzeLike({ seed: 92, durationS: 12, card, gain: (t) => 1 + 0.15 * Math.sin(t / 2) });
    const sp = await computeScatterProducts(out, { videoPath: video });
    const w = sp.warnings.find((x) => x.code === 'exposure-drift');
    expect(w).toBeDefined();
    expect(w!.guideSection).toBe('lock-exposure');
    expect(w!.message).toMatch(/lock exposure or put a constant reference card in view and give --reference-roi/i);
    expect(w!.message).toMatch(/could serve as the reference/);
    expect(sp.autoRegions!.reference).not.toBeNull();
  });

  it('does not warn when a reference region corrects the exposure', async () => {
    const card = { x0: 40, y0: 2, x1: 46, y1: 8, level: 0.3 };
    const { out } = analyzeLike({ seed: 92, durationS: 12, card, gain: (t) => 1 + 0.15 * Math.sin(t / 2) }, { reference: true });
    const sp = await computeScatterProducts(out, { videoPath: video });
    expect(sp.warnings.map((x) => x.code)).not.toContain('exposure-drift');
    const header = JSON.parse(new TextDecoder().decode(sp.files['maps/maps.json']));
    expect(header.exposureCorrected).toBe(true);
  });

  it('finds an exposure jump, lists it as an event and asks for the frame to be left out', async () => {
    const { out } = analyzeLike({ seed: 93, durationS: 12, ambient: 0.05, gain: (_t, f) => (f >= 200 ? 0.85 : 1) });
    const sp = await computeScatterProducts(out, { videoPath: video });
    const jumps = sp.extraEvents.filter((e) => e.kind === 'exposure-jump');
    expect(jumps.map((e) => e.frameIndex)).toEqual([200]);
    expect(sp.refitExclusions).toContain(200);
    expect(sp.warnings.map((x) => x.code)).toContain('exposure-drift');
  });

  it('splits the floor with a baseline run and fills the conductivity from the current column', async () => {
    const { out } = analyzeLike({ seed: 94, durationS: 12 }, { currentColumn: true, electrodeHeightM: 0.01 });
    const baseline = { ...out.result, floorFraction: quantity(0.002, 0.0002) };
    // planted: ρ = 5e8 ohm·m → R = ρ·d/A = 5e8·0.005/(0.05·0.01) = 5e9 ohm
    const voltageV = Float64Array.from({ length: 100 }, (_, k) => 120 * k);
    const log = { timeS: Float64Array.from(voltageV, (_, k) => k), voltageV, currentA: Float64Array.from(voltageV, (v) => v / 5e9), temperatureC: null } as unknown as VoltageLog;
    const sp = await computeScatterProducts(out, { videoPath: video, baseline, log });
    expect(sp.scatter.polariserLeakFraction!.value).toBe(0.002);
    expect(sp.scatter.scatterFloorFraction!.value).toBeCloseTo(out.result.floorFraction.value - 0.002, 12);
    expect(sp.conductivity!.readable).toBe(true);
    // hand calculation from the formula ρ = V·A/(I·d) at the highest row
    const vHigh = 120 * 99;
    expect(sp.conductivity!.resistivity.value / ((vHigh * 0.05 * 0.01) / ((vHigh / 5e9) * 0.005))).toBeCloseTo(1, 9);
  });

  it('asks for the electrode height when the log has a current column but the height is unknown', async () => {
    const { out } = analyzeLike({ seed: 95, durationS: 8 }, { currentColumn: true });
    const sp = await computeScatterProducts(out, { videoPath: video });
    expect(sp.conductivity).toBeUndefined();
    expect(sp.warnings.find((w) => w.code === 'no-electrode-height')!.message).toMatch(/--electrode-height-mm/);
  });

  it('draws the regions on a picture rebuilt from the maps when no frame can be taken from the video', async () => {
    const { out } = analyzeLike({ seed: 96, durationS: 8 });
    const sp = await computeScatterProducts(out, { videoPath: join(dir, 'gone.mp4') });
    expect(sp.warnings.map((w) => w.code)).toContain('overlay-frame');
    expect((await sharp(sp.images.frameWithRegionsPng).metadata()).width).toBe(2 * out.grid.gridWidth * out.grid.step);
  });

  it('flags a planted up/down difference', async () => {
    const { out } = analyzeLike({ seed: 97, halfWaveDownV: 10500 });
    const sp = await computeScatterProducts(out, { videoPath: video });
    expect(sp.hysteresis!.flagged).toBe(true);
    expect(sp.warnings.map((w) => w.code)).toContain('hysteresis');
  });

  it('refuses a baseline that is not a run result', async () => {
    const { out } = analyzeLike({ seed: 98, durationS: 6 });
    await expect(computeScatterProducts(out, { videoPath: video, baseline: { kind: 'something-else' } as unknown as RunResult })).rejects.toThrow(/not a kerrtrace run result/);
  });
});

describe('computeScatterProducts after a simulated recording and the analyze pipeline', () => {
  it('recovers the simulator\'s halo, particles, sparks and resistivity', async () => {
    // A small dirty-liquid run of our own, rendered by `kerrtrace simulate` (src/sim): white light,
    // Gaussian spot, halo, 4 particles, 2 sparks, a current column from ρ = 2e8 ohm·m.
    const scenario = parseScenario({
      label: 'scatter products end to end', seed: 5,
      cell: { kerrConstantMPerV2: 2.4e-12, lengthMm: 40, gapMm: 4, extinctionRatio: 5000, liquidBreakdownKvPerMm: 5, resistivityOhmM: 2e8, electrodeHeightMm: 10 },
      light: { profile: 'gaussian', sigmaPx: 8, centreXPx: 110, centreYPx: 90, white: true, amplitude: 0.5 },
      dirt: { scatterFloor: 0.004, haloPeak: 0.01, haloSigmaPx: 60, particles: { count: 4, durationS: 0.4, brightness: 0.25, sizePx: 1.5 }, sparks: { timesS: [3.02, 7.51], brightness: 0.5 } },
      camera: { widthPx: 240, heightPx: 180, frameRateHz: 20, ambient: 0.01, photonsPerFullScale: 10000, readNoise: 0.0015, crf: 18 },
      drive: { segments: [{ kind: 'hold', durationS: 1 }, { kind: 'ramp', toHalfWaveFraction: 1.1, durationS: 4 }, { kind: 'ramp', toV: 0, durationS: 4 }, { kind: 'hold', durationS: 1 }] },
      logger: { sampleRateHz: 10, clockOffsetS: 0.3, currentUnit: 'uA', currentNoiseA: 1e-8 },
    }, 'scatter-e2e.json');
    const runDir = join(dir, 'sim');
    await simulateRun(scenario, runDir);
    const truth = JSON.parse((await import('node:fs')).readFileSync(join(runDir, 'truth.json'), 'utf8'));
    const clip = join(runDir, 'clip.mp4');
    const out = await analyzeRun({ videoPath: clip, voltsPath: join(runDir, 'volts.csv'), lengthMm: 40, gapMm: 4, electrodeHeightMm: 10 }, { toolVersion: 'test', ffmpegVersion: null });
    const sp = await computeScatterProducts(out, { videoPath: clip });
    // halo: the simulator's haloToCoreRatio (planted halo in the band just outside the beam, above
    // the far corner, over A), within 20 %
    expect(Math.abs(sp.scatter.haloToCoreRatio!.value / truth.haloToCoreRatio - 1)).toBeLessThan(0.2);
    // particles that cross the beam while the log runs, within ±1
    const logStartS = truth.offsetS;
    const planted = truth.particles.filter((p: { endS: number }) => p.endS > logStartS).length;
    const spanS = out.frameTimesS[out.frameTimesS.length - 1]! - logStartS;
    expect(Math.abs((sp.scatter.particleEventRate!.value * spanS) / 60 - planted)).toBeLessThanOrEqual(1.2);
    expect(Math.abs(out.result.events.filter((e) => e.kind === 'spark').length - truth.sparks.length)).toBeLessThanOrEqual(1);
    // resistivity from the current column: the planted ρ within 3 %
    expect(sp.conductivity!.readable).toBe(true);
    expect(Math.abs(sp.conductivity!.resistivity.value / 2e8 - 1)).toBeLessThan(0.03);
    expect(sp.hysteresis!.flagged).toBe(false);
    expect(sp.warnings.map((w) => w.code)).not.toContain('exposure-drift');
    // the core found on the maps contains the planted beam centre
    const core = sp.autoRegions!.core;
    expect(110 >= core.x && 110 < core.x + core.w && 90 >= core.y && 90 < core.y + core.h).toBe(true);
  });

  it('reads the halo of a red top-hat beam in luminance: the grey-luma maps would put it 1.5× too high', async () => {
    // A 633 nm (red) top-hat under the BT.709 curve, measured with --roi: the grid behind the maps
    // reads the bright red core about 0.6× its luminance, the region meter reads luminance. Our own
    // scenario, kept small: 160×120, 20 fps, 5 s.
    const scenario = parseScenario({
      label: 'red top-hat halo', seed: 8,
      cell: { kerrConstantMPerV2: 1.8e-12, lengthMm: 45, gapMm: 4.5, extinctionRatio: 2000, liquidBreakdownKvPerMm: 6 },
      light: { profile: 'tophat', radiusPx: 10, edgePx: 1.5, centreXPx: 80, centreYPx: 60, wavelengthNm: 633, amplitude: 0.6 },
      dirt: { scatterFloor: 0.015, haloPeak: 0.01, haloSigmaPx: 40 },
      camera: { widthPx: 160, heightPx: 120, frameRateHz: 20, ambient: 0.01, transfer: 'bt709', crf: 18 },
      drive: { segments: [{ kind: 'hold', durationS: 0.5 }, { kind: 'ramp', toHalfWaveFraction: 1, durationS: 2 }, { kind: 'ramp', toV: 0, durationS: 2 }, { kind: 'hold', durationS: 0.5 }] },
      logger: { sampleRateHz: 10, clockOffsetS: 0.2 },
    }, 'red-tophat.json');
    const runDir = join(dir, 'red');
    await simulateRun(scenario, runDir);
    const truth = JSON.parse((await import('node:fs')).readFileSync(join(runDir, 'truth.json'), 'utf8'));
    const clip = join(runDir, 'clip.mp4');
    const [x, y, w, h] = truth.roi as number[];
    const out = await analyzeRun({ videoPath: clip, voltsPath: join(runDir, 'volts.csv'), lengthMm: 45, gapMm: 4.5, roi: { x: x!, y: y!, w: w!, h: h! } }, { toolVersion: 'test', ffmpegVersion: null });
    const sp = await computeScatterProducts(out, { videoPath: clip, gain: out.gain });
    expect(Math.abs(sp.scatter.haloToCoreRatio!.value / truth.haloToCoreRatio - 1)).toBeLessThan(0.15);
  });
});
