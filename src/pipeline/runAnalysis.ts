/**
 * The analyze job wired stage by stage, each frame decoded once, each exclusion decided once, one
 * fit, one record (docs/analyze.md, "Data flow"):
 *
 *   measure   probe, read the log, decode and measure the clip once, correct exposure, find
 *             sparks, decide every exclusion that needs no sync, the open level
 *   fit       sync (+ log-gap, outside-log), the one fit, derived figures, budget and gates,
 *             trace, figures (particle rate, flicker, baseline split, up/down, resistivity)
 *   pictures  maps, regions and the halo-to-core ratio, only when asked (--no-maps skips them
 *             and nothing else: every other figure is the same either way)
 *   record    the file list, the input hashes (started with the run, awaited here), the record
 *
 * The clock and the Node version are read once at the start unless the hooks give them.
 * Throws the stages' KerrErrors (bad options, unreadable inputs, no overlap, a fit that fails).
 */
import { statSync } from 'node:fs';
import { KerrError } from '../errors.js';
import { readVoltageLog } from '../io/readVoltageLog.js';
import { checkLogUnits } from '../core/signal/checkLogUnits.js';
import { checkRegionsApart } from '../core/gates/checkRegionsApart.js';
import { surroundWeights } from '../core/regions/localSurround.js';
import type { InputFile, RunResult, RunWarning } from '../result/schema.js';
import type { Rect } from '../media/types.js';
import { checkAnalyzeOptions, type AnalyzeHooks, type AnalyzeOptions, type AnalyzeOutput } from './analyze.js';
import { measureClip, openClip, type ClipMeasurement } from './measureClip.js';
import { correctedSeries, type CorrectedSeries } from './correctedSeries.js';
import { findSparks } from './findSparks.js';
import { preSyncExclusions, type FrameExclusions } from './frameExclusions.js';
import { openLevel, type OpenLevel } from './openLevel.js';
import { runCell } from './runCell.js';
import { syncRun } from './syncRun.js';
import { fitRun } from './fitRun.js';
import { derivedFigures } from './derivedFigures.js';
import { budgetAndGates } from './budgetAndGates.js';
import { runTrace } from './runTrace.js';
import { runFigures, checkBaseline } from './runFigures.js';
import { mapProducts, startFrameGrab, MAP_FILES, type FrameGrab, type MapProducts } from './mapProducts.js';
import { runFiles } from './runFiles.js';
import { startInputHashes } from './inputHashes.js';
import { videoRunRecord } from './videoRunRecord.js';
import { showFrame } from './showFrame.js';
import type { VoltageLog } from '../io/voltageLog.js';

export interface RunAnalysisOptions {
  /** A run of the polarisers without the cell (or with a clean liquid), to split the floor. */
  baseline?: RunResult;
  /** Where the baseline was read from and its hash (recorded as an input). */
  baselineSource?: InputFile;
  /** Make the maps and the regions picture (default true; false: --no-maps). */
  products?: boolean;
  /** The folder will get the report (default true; decides RunResult.files). */
  report?: boolean;
}

export interface AnalyzedRun {
  out: AnalyzeOutput;
  /** The pictures (null with --no-maps or without an identifiable V_π). */
  products: MapProducts | null;
}

interface Measured {
  log: VoltageLog;
  clip: ClipMeasurement;
  series: CorrectedSeries;
  exclusions: FrameExclusions;
  open: OpenLevel;
  vAbsMax: number;
  bitsPerPixel: number;
}

async function readLog(o: AnalyzeOptions, durationS: number): Promise<{ log: VoltageLog; vAbsMax: number }> {
  const log = await readVoltageLog(o.voltsPath);
  let vAbsMax = 0;
  for (const v of log.voltageV) vAbsMax = Math.max(vAbsMax, Math.abs(v));
  checkLogUnits({ timeS: log.timeS, voltageV: log.voltageV, timeColumn: log.columns.time, videoDurationS: durationS, gapM: o.gapMm * 1e-3, file: o.voltsPath });
  if (!(vAbsMax > 0)) {
    throw new KerrError('NOT_IDENTIFIABLE', `the voltage log ${o.voltsPath} never leaves zero`, { path: '--volts', hint: 'Check the voltage column and its unit, or record a sweep' });
  }
  return { log, vAbsMax };
}

async function measureStage(o: AnalyzeOptions, hooks: AnalyzeHooks): Promise<Measured> {
  const opened = await openClip(o);
  const { log, vAbsMax } = await readLog(o, opened.probe.info.durationS);
  const clip = await measureClip(opened, o, hooks);
  checkRegionsApart({ beam: clip.beamRect, beamOption: o.roi ? '--roi' : 'found automatically', ...(o.darkRoi ? { dark: o.darkRoi } : {}), ...(o.referenceRoi ? { reference: o.referenceRoi } : {}) });
  const series = correctedSeries(clip, o);
  const logIntervalS = log.rows > 1 ? (log.timeS[log.rows - 1]! - log.timeS[0]!) / (log.rows - 1) : undefined;
  const exclusions = preSyncExclusions({
    clip, series, sparks: findSparks(clip), referenceGiven: o.referenceRoi !== undefined,
    ...(o.openWindowS ? { openWindowS: o.openWindowS } : {}), ...(logIntervalS !== undefined ? { logIntervalS } : {}),
  });
  const open = openLevel({
    ...(o.openLevel !== undefined ? { openLevel: o.openLevel } : {}), ...(o.openLevelTolerance !== undefined ? { openLevelTolerance: o.openLevelTolerance } : {}),
    ...(o.openWindowS ? { openWindowS: o.openWindowS } : {}), ...(o.openVideoPath !== undefined ? { openVideoPath: o.openVideoPath } : {}),
    openWindowLevels: exclusions.openWindowLevels, openVideoLevels: clip.openVideoLevels,
    times: clip.times, intensity: series.intensity, excluded: exclusions.excluded,
  });
  const bitsPerPixel = (statSync(o.videoPath).size * 8) / (clip.nFrames * clip.info.width * clip.info.height);
  return { log, clip, series, exclusions, open, vAbsMax, bitsPerPixel };
}

function fitStage(m: Measured, o: AnalyzeOptions, baseline: RunResult | undefined) {
  const { clip, series, log } = m;
  const cell = runCell(o);
  const synced = syncRun({ times: clip.times, intensity: series.intensity, log, excluded: m.exclusions.excluded, ...(o.offsetS !== undefined ? { offsetS: o.offsetS } : {}) });
  const excluded = synced.excluded;
  const events = m.exclusions.events;
  const fitted = fitRun({
    cell, voltage: synced.voltage, voltageSigmaV: synced.voltageSigmaV, intensity: series.intensity, excluded,
    openLevel: m.open.level, vpiHint: synced.vpiHint, vAbsMax: m.vAbsMax, robust: o.robust !== false,
  });
  const derived = derivedFigures({
    fitted, cell, openLevel: m.open.level, decoding: clip.decoding, bitDepth: clip.info.bitDepth, transferFromOption: o.transfer !== undefined, bitsPerPixel: m.bitsPerPixel,
    ...(clip.cameraProfile ? { cameraProfile: clip.cameraProfile } : {}), ...(series.channelIntensity ? { channelIntensity: series.channelIntensity } : {}),
  });
  const budget = budgetAndGates({
    fitted, synced, excluded, cell, open: m.open, times: clip.times, intensity: series.intensity, cameraResponse: derived.cameraResponse, bitsPerPixel: m.bitsPerPixel,
    ...(o.voltsAccuracyPercent !== undefined ? { voltsAccuracyPercent: o.voltsAccuracyPercent } : {}), ...(o.cameraResponseRel !== undefined ? { cameraResponseRel: o.cameraResponseRel } : {}),
  });
  const trace = runTrace({ fit: fitted.fit, cell, times: clip.times, voltage: synced.voltage, intensity: series.intensity, excluded });
  const figures = runFigures({
    fit: fitted.fit, cell, times: clip.times, voltage: synced.voltage, intensity: series.intensity, modulation: trace.modulation, used: trace.used,
    particleRate: m.exclusions.particleRate, floorFraction: derived.floorFraction, syncOffset: { value: synced.offsetS, ...(budget.offsetStdErrS !== undefined ? { stdErr: budget.offsetStdErrS } : {}) },
    voltageAt: synced.voltageAt, log, ...(baseline ? { baseline } : {}), bitsPerPixel: m.bitsPerPixel,
  });
  return { cell, synced, events, fitted, derived, budget, trace, figures };
}

type Fitted = ReturnType<typeof fitStage>;

/** The rectangles and weights whose sum is the beam intensity: beam minus dark region or rings. */
function beamTerms(clip: ClipMeasurement, o: AnalyzeOptions): { rect: Rect; weight: number }[] {
  const terms = [{ rect: clip.beamRect, weight: 1 }];
  if (o.darkRoi) terms.push({ rect: o.darkRoi, weight: -1 });
  else if (clip.haveSurround && clip.geom) {
    const c = surroundWeights(clip.geom).coefficients;
    terms.push({ rect: clip.geom.a0, weight: -c[1]! }, { rect: clip.geom.a1, weight: -c[2]! }, { rect: clip.geom.b1, weight: -c[3]! });
  }
  return terms;
}

async function pictureStage(m: Measured, f: Fitted, o: AnalyzeOptions, frame: FrameGrab | undefined): Promise<MapProducts> {
  const { clip } = m;
  return mapProducts({
    videoPath: o.videoPath, grid: clip.grid, times: clip.times, startTimeS: clip.info.startTimeS, camera: { width: clip.info.width, height: clip.info.height },
    intensity: m.series.intensity, modulation: f.trace.modulation, used: f.trace.used, beam: clip.beamRect, beamTerms: beamTerms(clip, o),
    // gains exist only with a reference region (without one they are all 1 and correct nothing)
    ...(o.referenceRoi ? { gain: m.series.gain, reference: o.referenceRoi } : {}),
    floorFraction: f.derived.floorFraction.value, exposureDrifted: m.exclusions.warnings.some((w) => w.code === 'exposure-drift'),
    ...(frame ? { frame } : {}),
  });
}

const NO_MAPS: RunWarning = { code: 'no-maps', message: 'no maps or scatter figures: the half-wave voltage is not identifiable from this sweep, so the modulation term is unknown' };

export async function runAnalysis(o: AnalyzeOptions, hooks: AnalyzeHooks, p: RunAnalysisOptions = {}): Promise<AnalyzedRun> {
  checkAnalyzeOptions(o);
  checkBaseline(p.baseline);
  const createdAt = (hooks.startedAt ?? new Date()).toISOString();
  const nodeVersion = hooks.nodeVersion ?? process.version;
  const inputPaths = { video: o.videoPath, volts: o.voltsPath, ...(o.openVideoPath !== undefined ? { openVideo: o.openVideoPath } : {}), ...(o.cameraProfilePath !== undefined ? { cameraProfile: o.cameraProfilePath } : {}) };
  const hashes = startInputHashes(inputPaths);
  const m = await measureStage(o, hooks);
  const wantMaps = p.products !== false;
  // The frame for regions.png is taken from the video beside the fit (the other core is free).
  const frame = wantMaps ? startFrameGrab(o.videoPath, m.clip.times, m.clip.info.startTimeS, showFrame(m.series.intensity, m.exclusions.excluded, m.clip.times, m.clip.keyframeTimesS)) : undefined;
  const f = fitStage(m, o, p.baseline);
  // Maps need a modulation term that varies; a run whose V_π is not identifiable has none.
  const products = wantMaps && f.fitted.fit.identifiable ? await pictureStage(m, f, o, frame) : null;
  const mapWarnings = products ? products.warnings : wantMaps ? [NO_MAPS] : [];
  const files = runFiles({ extraFiles: products ? [...MAP_FILES] : [], report: p.report !== false, trace: f.trace.trace, linearised: f.derived.linearised, syncCurvePoints: Math.min(f.synced.sync.curve.offsetS.length, f.synced.sync.curve.score.length) });
  const inputs = { ...(await hashes.done()), ...(p.baselineSource ? { baseline: p.baselineSource } : {}) };
  const warnings = [
    ...m.log.warnings.map((message) => ({ code: 'voltage-log', message })), ...m.clip.warnings, ...m.series.warnings, ...m.exclusions.warnings,
    ...f.synced.warnings, ...f.fitted.warnings, ...f.derived.warnings, ...f.budget.warnings, ...f.figures.warnings, ...mapWarnings,
  ];
  const result = videoRunRecord({
    o, provenance: { createdAt, toolVersion: hooks.toolVersion, ffmpegVersion: hooks.ffmpegVersion, nodeVersion, inputs, files },
    clip: m.clip, cell: f.cell, log: m.log, bitsPerPixel: m.bitsPerPixel, openLevelUsed: m.open.level !== undefined,
    synced: f.synced, fitted: f.fitted, derived: f.derived, budget: f.budget, trace: f.trace, events: f.events, figures: f.figures,
    ...(products?.haloToCoreRatio ? { haloToCoreRatio: products.haloToCoreRatio } : {}), warnings,
  });
  const out: AnalyzeOutput = {
    result, trace: f.trace.trace, grid: m.clip.grid, frameTimesS: m.clip.times, intensity: m.series.intensity, modulation: f.trace.modulation,
    usable: f.trace.used, fit: f.fitted.fit, info: m.clip.info, decoding: m.clip.decoding, gain: m.series.gain, log: m.log,
    inputPaths: [...Object.values(inputPaths), ...(p.baselineSource ? [p.baselineSource.path] : [])],
  };
  return { out, products };
}
