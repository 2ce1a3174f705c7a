/**
 * Scatter products of an analysed run: the static/modulated maps (PNG figures and float32 files),
 * the regions found on them drawn on a video frame, the scatter figures (halo-to-core ratio,
 * particle-event rate, floor flicker, and with a baseline run the polariser-leak and scatter
 * floors), new events (particle spikes grouped per event, exposure jumps), an exposure-drift
 * check, the up/down (hysteresis) comparison and the liquid's resistivity from the current column.
 *
 * The halo-to-core ratio divides by the core's modulation amplitude in luminance: the maps'
 * grey-luma units are scaled by `gridLuminanceScale`, read on the rectangles whose combination is
 * the fit's beam intensity (beam minus surround, from `out.measured`; without it κ = 1).
 *
 * Orchestration only: the maths is in src/core/scatter (one idea per file, each documented with
 * its formula); this file reads the voltage log when it needs the current column and asks ffmpeg
 * for one frame. It writes nothing: the caller stores `files` and `images` beside result.json and
 * copies the figures into RunResult (`scatter`, `hysteresis`, `conductivity`, events, warnings).
 * Frames in `refitExclusions` are used frames that turned out to be particle spikes or exposure
 * jumps: the caller should fit again without them.
 *
 * Throws KerrError NOT_IDENTIFIABLE when the modulation term does not vary (no maps can be made),
 * BAD_RESULT for a baseline that is not a kerrtrace run result. Problems that only weaken one
 * product (no beam on the maps, no frame from the video, a branch that cannot be fitted) become
 * warnings.
 * @example const sp = await computeScatterProducts(out, { videoPath: 'run1.mp4' }); sp.scatter.haloToCoreRatio
 */
import { KerrError, isKerrError } from '../errors.js';
import type { RunEvent, RunResult, RunWarning } from '../result/schema.js';
import type { VoltageLog } from '../io/voltageLog.js';
import { readVoltageLog } from '../io/readVoltageLog.js';
import type { AnalyzeOutput } from './analyze.js';
import { fitKerrCurve } from '../core/fit/fitKerrCurve.js';
import { modulationMaps, type ModulationMaps } from '../core/scatter/modulationMaps.js';
import { regionsFromMaps, type ScatterRegions } from '../core/scatter/regionsFromMaps.js';
import { haloToCoreRatio } from '../core/scatter/haloToCoreRatio.js';
import { gridLuminanceScale } from '../core/scatter/gridLuminanceScale.js';
import { surroundWeights } from '../core/regions/localSurround.js';
import type { Rect } from '../media/types.js';
import { detectParticleEvents } from '../core/scatter/detectParticleEvents.js';
import { percentileSorted } from '../core/stats/percentileSorted.js';
import { floorFlicker } from '../core/scatter/floorFlicker.js';
import { baselineFloor } from '../core/scatter/baselineFloor.js';
import { exposureDrift } from '../core/scatter/exposureDrift.js';
import { detectExposureJumps } from '../core/scatter/detectExposureJumps.js';
import { outsideBoxSeries } from '../core/scatter/boxSeries.js';
import { referenceGain } from '../core/scatter/referenceGain.js';
import { hysteresis as fitHysteresis, type BranchFitter } from '../core/scatter/hysteresis.js';
import { hysteresisVerdict } from '../core/scatter/hysteresisVerdict.js';
import { interpolateLog } from '../core/signal/interpolateLog.js';
import { liquidResistivity } from '../core/scatter/resistivity.js';
import { growCellBox, rectToCellBox, cellBoxArea, type CellBox } from '../core/regions/cellGeometry.js';
import { renderMapPng } from '../maps/renderMapPng.js';
import { encodeMapFiles } from '../maps/encodeMapFiles.js';
import { renderRegionOverlay, type OverlayRegion } from '../maps/renderRegionOverlay.js';
import { renderLinearGreyPng } from '../maps/renderLinearGreyPng.js';
import { grabFramePng } from '../media/grabFrame.js';

export interface ScatterProductsOptions {
  /** A run of the polarisers without the cell (or with a clean reference liquid). */
  baseline?: RunResult;
  videoPath: string;
  /** Exposure gain per frame as used by analyze; recomputed from result.regions.reference when absent. */
  gain?: Float64Array;
  /** The voltage log; read from result.options.voltsPath when absent and needed (current column). */
  log?: VoltageLog;
}

export interface AutoRegions {
  core: OverlayRegion['rect'];
  haloInner: OverlayRegion['rect'];
  haloOuter: OverlayRegion['rect'];
  dark: OverlayRegion['rect'] | null;
  reference: OverlayRegion['rect'] | null;
}

export interface ScatterProducts {
  scatter: NonNullable<RunResult['scatter']>;
  hysteresis?: NonNullable<RunResult['hysteresis']>;
  conductivity?: NonNullable<RunResult['conductivity']>;
  extraEvents: RunEvent[];
  refitExclusions: number[];
  warnings: RunWarning[];
  /** 'maps/static.png', 'maps/modulated.png', 'maps/static.f32', 'maps/modulated.f32', 'maps/maps.json', 'regions.png'. */
  files: Record<string, Uint8Array>;
  images: { frameWithRegionsPng: Buffer; staticMapPng: Buffer; modulatedMapPng: Buffer };
  /** Regions found on the maps, video pixels (null when no beam stood out on the maps). */
  autoRegions: AutoRegions | null;
  /** Up/down comparison details, also when it could not be made (then `note` says why). */
  hysteresisDetail: { framesUp: number; framesDown: number; framesHeld: number; note?: string };
}

function percentile(values: Float32Array, q: number): number {
  return percentileSorted(Float64Array.from(values).filter(Number.isFinite).sort(), q);
}

/**
 * The beam intensity of analyze as Σ w_k·mean(rect_k): the beam rectangle minus the surround
 * (the dark region, or the two-ring extrapolation). Null without the measured state (then the
 * maps' units are taken as they are).
 */
function beamIntensityTerms(out: AnalyzeOutput): { rect: Rect; weight: number }[] | null {
  const m = (out as Partial<AnalyzeOutput>).measured;
  if (!m) return null;
  const terms = [{ rect: m.beamRect, weight: 1 }];
  if (m.o.darkRoi) terms.push({ rect: m.o.darkRoi, weight: -1 });
  else if (m.haveSurround && m.geom) {
    const c = surroundWeights(m.geom).coefficients;
    terms.push({ rect: m.geom.a0, weight: -c[1] }, { rect: m.geom.a1, weight: -c[2] }, { rect: m.geom.b1, weight: -c[3] });
  }
  return terms;
}

function rectText(r: { x: number; y: number; w: number; h: number }): string {
  return `${r.x},${r.y},${r.w},${r.h}`;
}

export async function computeScatterProducts(out: AnalyzeOutput, opts: ScatterProductsOptions): Promise<ScatterProducts> {
  const { result, grid, frameTimesS: times, intensity, modulation, usable, fit, trace } = out;
  const frames = grid.frames;
  const { gridWidth: gw, gridHeight: gh, step } = grid;
  const warnings: RunWarning[] = [];
  const warn = (code: string, message: string, guideSection?: string) => {
    warnings.push(guideSection ? { code, message, guideSection } : { code, message });
  };
  if (opts.baseline !== undefined && (opts.baseline === null || opts.baseline.kind !== 'kerrtrace-run')) {
    throw new KerrError('BAD_RESULT', 'the baseline is not a kerrtrace run result', { path: '--baseline', hint: 'Give the result.json that `kerrtrace analyze` wrote for the baseline run' });
  }

  // ---- exposure gain and maps ----
  const givenReference = result.regions.reference;
  const gain = opts.gain ?? (givenReference ? referenceGain(grid.data, frames, gw, gh, step, givenReference) ?? undefined : undefined);
  const maps: ModulationMaps = modulationMaps({ grid: grid.data, frames, gridWidth: gw, gridHeight: gh, modulation, usable, ...(gain ? { gain } : {}) });
  if (maps.modulationSpan < 0.05) {
    warn('maps-weak', `the modulation term spans only ${maps.modulationSpan.toFixed(3)} over the frames used, so the static and modulated maps are noisy; sweep to a larger fraction of the half-wave voltage if the cell allows it safely`, 'sweep');
  }
  let regions: ScatterRegions | null = null;
  try {
    regions = regionsFromMaps(maps, { stepPx: step });
  } catch (err) {
    if (!isKerrError(err)) throw err;
    warn('maps-no-beam', `${err.message}; the halo-to-core ratio is not reported`);
  }

  // ---- frame classes from analyze ----
  const spark = new Uint8Array(frames);
  const clipped = new Uint8Array(frames);
  const knownParticle = new Uint8Array(frames);
  for (const e of result.events) {
    if (e.frameIndex < 0 || e.frameIndex >= frames) continue;
    if (e.kind === 'spark') spark[e.frameIndex] = 1;
    else if (e.kind === 'clipped') clipped[e.frameIndex] = 1;
    else if (e.kind === 'particle') knownParticle[e.frameIndex] = 1;
  }

  // ---- background level, exposure drift and jumps ----
  const beamBox = rectToCellBox(result.regions.beam, step, gw, gh);
  let keepOut: CellBox | null = regions ? regions.keepOut : beamBox ? growCellBox(beamBox, Math.max(2, Math.ceil((beamBox.x1 - beamBox.x0 + 1) / 2)), gw, gh) : null;
  if (keepOut && cellBoxArea(keepOut) >= gw * gh) keepOut = beamBox;
  const rawLevel = keepOut && cellBoxArea(keepOut) < gw * gh ? outsideBoxSeries(grid.data, maps.frameMean, gw, gh, keepOut) : Float64Array.from(maps.frameMean);
  const level = gain ? rawLevel.map((v, f) => (gain[f]! > 0 ? v / gain[f]! : NaN)) : rawLevel;
  const notSpark = Uint8Array.from(spark, (s, f) => (s || clipped[f] ? 0 : 1));
  const drift = exposureDrift({ level, modulation, include: notSpark });
  const jumps = detectExposureJumps({ level: drift.driveFreeLevel, skip: Uint8Array.from(notSpark, (k) => 1 - k) });
  const jumpFrame = new Uint8Array(frames);
  for (const j of jumps) jumpFrame[j.frameIndex] = 1;
  // Only a reference region corrects exposure: without one, say so (exposure-drift), never that
  // jumps "remain after the reference correction".
  const haveReference = givenReference !== undefined;
  if (!haveReference && (drift.drifting || jumps.length > 0)) {
    const parts: string[] = [];
    if (drift.drifting) parts.push(`the background outside the beam varies by ${((drift.ratio - 1) * 100).toFixed(0)}% (95th/5th percentile) without following the drive`);
    if (jumps.length > 0) parts.push(`its level jumps ${jumps.length} time${jumps.length > 1 ? 's' : ''} (first at ${times[jumps[0]!.frameIndex]!.toFixed(2)} s)`);
    const candidate = regions?.reference ? ` A bright steady area at ${rectText(regions.reference.rect)} (x,y,w,h px) could serve as the reference.` : '';
    warn('exposure-drift', `${parts.join(' and ')}: the camera's exposure changed during the run, which biases the floor and the Kerr fit. Lock exposure or put a constant reference card in view and give --reference-roi.${candidate}`, 'lock-exposure');
  } else if (haveReference && jumps.length > 0) {
    warn('exposure-jump', `${jumps.length} sudden exposure change${jumps.length > 1 ? 's' : ''} remain after the reference correction; ${jumps.length > 1 ? 'those frames are' : 'that frame is'} left out of the fit`, 'lock-exposure');
  }

  // ---- particle spikes ----
  const model = Float64Array.from(trace, (row) => (row.model === null ? NaN : row.model));
  const candidate = Uint8Array.from(trace, (row, f) =>
    row.voltageV !== null && (row.excludedReason === null || row.excludedReason === 'particle' || row.excludedReason === 'outlier') && !jumpFrame[f] ? 1 : 0);
  const logIntervalS = result.log.rows > 1 && result.log.spanS > 0 ? result.log.spanS / (result.log.rows - 1) : undefined;
  const particles = detectParticleEvents({ intensity, model, candidate, timesS: times, ...(logIntervalS !== undefined ? { logIntervalS } : {}) });

  // ---- events and exclusions ----
  const extraEvents: RunEvent[] = [];
  const exclusions = new Set<number>();
  for (const e of particles.events) {
    let known = false;
    for (let f = e.firstFrame; f <= e.lastFrame; f++) {
      if (knownParticle[f]) known = true;
      if (usable[f]) exclusions.add(f);
    }
    if (!known) extraEvents.push({ kind: 'particle', frameIndex: e.peakFrame, timeS: e.peakTimeS, size: e.size });
  }
  for (const j of jumps) {
    extraEvents.push({ kind: 'exposure-jump', frameIndex: j.frameIndex, timeS: times[j.frameIndex]!, size: j.size });
    if (usable[j.frameIndex]) exclusions.add(j.frameIndex);
  }
  extraEvents.sort((a, b) => a.frameIndex - b.frameIndex);
  const refitExclusions = Array.from(exclusions).sort((a, b) => a - b);
  const clean = Uint8Array.from(usable, (u, f) => (u && !exclusions.has(f) ? 1 : 0));

  // ---- scatter figures ----
  const scatter: NonNullable<RunResult['scatter']> = {};
  // The maps are in the grid's grey-luma units; the beam intensity of the fit (region meter) is
  // luminance. Their ratio on the beam region puts the core amplitude in the halo's unit.
  const terms = beamIntensityTerms(out);
  const lumaScale = terms === null ? null : gridLuminanceScale({
    modulatedMap: maps.modulatedMap, modulatedStdErr: maps.modulatedStdErr, gridWidth: gw, gridHeight: gh, stepPx: step,
    terms, intensity, modulation, usable,
  });
  const halo = regions ? haloToCoreRatio(maps, regions, {
    ...(lumaScale ? { coreScale: lumaScale } : {}),
    floorFraction: result.floorFraction.value,
  }) : null;
  if (halo) scatter.haloToCoreRatio = halo.ratio;
  else if (regions) warn('no-far-dark', 'the beam leaves no dark area far from it on the maps, so the halo-to-core ratio is not reported; frame the cell with some dark background around it', 'camera-still');
  if (Number.isFinite(particles.ratePerMinute.value)) scatter.particleEventRate = particles.ratePerMinute;
  const flicker = floorFlicker({ intensity, modulation, amplitude: fit.amplitude.value, include: clean });
  if (flicker) scatter.floorFlicker = flicker.flicker;
  if (opts.baseline) {
    const split = baselineFloor(result.floorFraction, opts.baseline.floorFraction);
    scatter.polariserLeakFraction = split.polariserLeakFraction;
    scatter.scatterFloorFraction = split.scatterFloorFraction;
    if (Math.abs(opts.baseline.cell.polariserAngleDeg - result.cell.polariserAngleDeg) > 1) {
      warn('baseline-mismatch', `the baseline run had the polariser at ${opts.baseline.cell.polariserAngleDeg}° but this run at ${result.cell.polariserAngleDeg}°, so their floors are not comparable`);
    }
  }

  // ---- up/down comparison ----
  const voltage = Float64Array.from(trace, (row) => (row.voltageV === null ? NaN : row.voltageV));
  const branchFitter: BranchFitter = (v, i) => fitKerrCurve({
      voltageV: v, intensity: i,
      effectiveLengthM: result.model.effectiveLengthM, gapM: result.model.gapM, polariserAngleDeg: result.model.polariserAngleDeg,
      staticRetardanceRad: result.model.staticRetardanceRad,
      openLevel: fit.amplitude.value,
      halfWaveGuessesV: [fit.halfWaveVoltage.value],
      onlyGivenStarts: true, // each branch lies near the full fit
      // outliers and events are already left out (`clean`); plain least squares keeps this quick
      robust: false,
    });
  const hyst = fitHysteresis({
    voltageV: voltage, intensity, include: clean, timesS: times,
    fitBranch: branchFitter,
  });

  // A difference the sync offset's uncertainty alone could open is not hysteresis.
  if (hyst.result && result.syncOffset.stdErr !== undefined && result.syncOffset.stdErr > 0 && opts.log && opts.log.rows >= 2) {
    const log = opts.log;
    const u = result.syncOffset.stdErr;
    const diffAt = (sign: number): number => {
      const v = interpolateLog(log.timeS, log.voltageV, Float64Array.from(times, (t) => t - (result.syncOffset.value + sign * u))).valueV;
      const h = fitHysteresis({ voltageV: v, intensity, include: clean, timesS: times, fitBranch: branchFitter });
      return h.result ? h.result.difference.value : NaN;
    };
    const verdict = hysteresisVerdict(hyst.result, diffAt(1), diffAt(-1));
    hyst.result = { up: verdict.up, down: verdict.down, difference: verdict.difference, zScore: verdict.zScore, flagged: verdict.flagged };
  }
  const hysteresisDetail = { framesUp: hyst.framesUp, framesDown: hyst.framesDown, framesHeld: hyst.framesHeld, ...(hyst.note ? { note: hyst.note } : {}) };
  if (hyst.result?.flagged) {
    const rel = (100 * hyst.result.difference.value) / ((hyst.result.up.value + hyst.result.down.value) / 2);
    warn('hysteresis', `the Kerr constant differs between rising and falling voltage by ${rel.toFixed(1)}% (${Math.abs(hyst.result.zScore).toFixed(1)} standard errors): the liquid may conduct (space charge) or its temperature drifted; check its purity and dryness`, 'sweep');
  } else if (!hyst.result && hyst.note) {
    warn('hysteresis-not-measured', `up- and down-sweeps could not be compared: ${hyst.note}`, 'sweep');
  }

  // ---- conductivity ----
  let conductivity: NonNullable<RunResult['conductivity']> | undefined;
  const hasCurrent = opts.log ? opts.log.currentA !== null : result.log.currentColumn;
  if (hasCurrent) {
    if (result.cell.electrodeHeightM === null) {
      warn('no-electrode-height', 'the voltage log has a current column; give --electrode-height-mm to get the liquid\'s resistivity');
    } else {
      const voltsPath = (result.options as { voltsPath?: unknown }).voltsPath;
      let log: VoltageLog | null = opts.log ?? null;
      if (!log && typeof voltsPath === 'string') log = await readVoltageLog(voltsPath);
      if (log?.currentA) {
        const r = liquidResistivity({ voltageV: log.voltageV, currentA: log.currentA, lengthM: result.cell.lengthM, electrodeHeightM: result.cell.electrodeHeightM, gapM: result.cell.gapM });
        conductivity = { resistivity: r.resistivity, joulePower: r.joulePower, readable: r.readable, ...(r.note ? { note: r.note } : {}) };
      } else {
        warn('no-current', 'the voltage log could not be read again for its current column, so the resistivity is not reported');
      }
    }
  }

  // ---- figures and files ----
  // The frame with the most modulated light shows where the beam is.
  let showFrame = -1;
  for (let f = 0; f < frames; f++) if (usable[f] && Number.isFinite(modulation[f]!) && (showFrame < 0 || modulation[f]! > modulation[showFrame]!)) showFrame = f;
  if (showFrame < 0) showFrame = frames >> 1;
  const startS = Number.isFinite(out.info.startTimeS) ? out.info.startTimeS : 0;
  // ffmpeg seeks and decodes while the maps are rendered.
  // (Settled into a value at once, so a failure is never left as an unhandled rejection.)
  const grabbed: Promise<{ png: Buffer } | { error: unknown }> = grabFramePng(opts.videoPath, Math.max(0, times[showFrame]! - startS))
    .then((png) => ({ png }), (error: unknown) => ({ error }));

  const exposureNote = gain ? ', exposure-corrected' : '';
  const staticHigh = Math.max(percentile(maps.staticMap, 0.995), 1e-6);
  const staticLow = Math.min(0, percentile(maps.staticMap, 0.005));
  const modHigh = Math.max(percentile(maps.modulatedMap, 1), 1e-6);
  const modLow = Math.min(0, percentile(maps.modulatedMap, 0.005));
  const [staticFig, modulatedFig] = await Promise.all([renderMapPng(maps.staticMap, gw, gh, {
    title: 'Static light: floor, scatter halo and ambient',
    unit: `intercept of the regression on the modulation term; linear units, 1 = full-scale white${exposureNote}`,
    stepPx: step,
    range: [staticLow, staticHigh > staticLow ? staticHigh : staticLow + 1e-6],
    note: `${maps.framesUsed} frames`,
  }), renderMapPng(maps.modulatedMap, gw, gh, {
    title: 'Modulated light: the Kerr-switched beam',
    unit: `slope of the regression on the modulation term (= modulation amplitude); linear units${exposureNote}`,
    stepPx: step,
    range: [modLow, modHigh > modLow ? modHigh : modLow + 1e-6],
    note: `${maps.framesUsed} frames`,
  })]);

  const overlay: OverlayRegion[] = [{ kind: 'beam', label: 'beam (fit)', rect: result.regions.beam }];
  let autoRegions: AutoRegions | null = null;
  if (regions) {
    overlay.push({ kind: 'halo', label: 'halo', rect: regions.halo.outerRect, innerRect: regions.halo.innerRect });
    overlay.push({ kind: 'core', label: 'core', rect: regions.core.rect });
    if (regions.dark) overlay.push({ kind: 'dark', label: 'far dark', rect: regions.dark.rect });
    autoRegions = {
      core: regions.core.rect, haloInner: regions.halo.innerRect, haloOuter: regions.halo.outerRect,
      dark: regions.dark?.rect ?? null, reference: regions.reference?.rect ?? null,
    };
  }
  if (givenReference) overlay.push({ kind: 'reference', label: 'reference (given)', rect: givenReference });
  else if (regions?.reference) overlay.push({ kind: 'reference', label: 'reference candidate', rect: regions.reference.rect });

  let framePng: Buffer;
  let rebuilt = false;
  let caption = `frame ${showFrame} at ${times[showFrame]!.toFixed(2)} s`;
  const frameOrError = await grabbed;
  if ('png' in frameOrError) {
    framePng = frameOrError.png;
  } else {
    const err = frameOrError.error;
    if (!isKerrError(err)) throw err;
    warn('overlay-frame', `regions are drawn on a picture rebuilt from the maps because no frame could be taken from the video (${err.message})`);
    const open = new Float32Array(gw * gh);
    const mShow = Number.isFinite(modulation[showFrame]!) ? modulation[showFrame]! : maps.modulationMean;
    for (let c = 0; c < open.length; c++) open[c] = maps.staticMap[c]! + maps.modulatedMap[c]! * mShow;
    framePng = await renderLinearGreyPng(open, gw, gh, step);
    rebuilt = true;
    caption = `picture rebuilt from the maps (static + modulated × ${mShow.toFixed(2)})`;
  }
  const frameWithRegionsPng = await renderRegionOverlay(framePng, overlay, rebuilt ? { caption } : { sourceWidth: result.camera.width, sourceHeight: result.camera.height, caption });

  const files: Record<string, Uint8Array> = {
    'maps/static.png': staticFig.png,
    'maps/modulated.png': modulatedFig.png,
    ...encodeMapFiles({ width: gw, height: gh, stepPx: step, staticMap: maps.staticMap, modulatedMap: maps.modulatedMap, framesUsed: maps.framesUsed, exposureCorrected: gain !== undefined }),
    'regions.png': frameWithRegionsPng,
  };

  return {
    scatter,
    ...(hyst.result ? { hysteresis: hyst.result } : {}),
    ...(conductivity ? { conductivity } : {}),
    extraEvents,
    refitExclusions,
    warnings,
    files,
    images: { frameWithRegionsPng, staticMapPng: staticFig.png, modulatedMapPng: modulatedFig.png },
    autoRegions,
    hysteresisDetail,
  };
}
