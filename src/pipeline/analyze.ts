/**
 * The analyze pipeline: video + voltage log → Kerr constant, half-wave voltage, floor, contrast,
 * sync offset, written as result.json + trace.csv (+ reports where available).
 *
 * Data flows one way: probe → one decoding pass (frame times, a decimated luminance grid of every
 * frame, full-resolution means of the user's regions) → beam and surround → exposure and dark
 * correction → flash detection → sync search → Kerr fit → result record. The grid pass also feeds
 * the static/modulated maps. Only this file and the CLI touch files and processes; the maths lives
 * in src/core.
 */
import { existsSync, statSync } from 'node:fs';
import { basename, dirname, extname, join, resolve } from 'node:path';
import { KerrError, invalid, isKerrError } from '../errors.js';
import { quantity, type Quantity } from '../quantity.js';
import type { Rect, VideoInfo, CameraDecoding, TransferName } from '../media/types.js';
import { cameraResponseRecord } from './cameraResponseRecord.js';
import { checkCameraResponse } from '../core/fit/checkCameraResponse.js';
import type { CameraProfile } from '../io/cameraProfile.js';
import { measureClip, openClip, type GridStore } from './measureClip.js';
import { exposureGains } from '../measure/exposure.js';
import { readVoltageLog } from '../io/readVoltageLog.js';
import type { VoltageLog } from '../io/voltageLog.js';
import { interpolateAt } from '../core/signal/interpolate.js';
import { checkOpenLevel } from '../core/gates/checkOpenLevel.js';
import { checkRegionsApart } from '../core/gates/checkRegionsApart.js';
import { checkLogUnits } from '../core/signal/checkLogUnits.js';
import { interpolateLog, GAP_FACTOR } from '../core/signal/interpolateLog.js';
import { findSyncOffset } from '../core/sync/findSyncOffset.js';
import type { SurroundGeometry } from '../core/regions/localSurround.js';
import { detectFlashes } from '../core/events/detectFlashes.js';
import { detectParticleEvents } from '../core/scatter/detectParticleEvents.js';
import { median } from '../core/fit/robustScale.js';
import { voltageNoiseV } from '../core/signal/voltageNoise.js';
import { interpolationUncertaintyV } from '../core/signal/interpolationUncertainty.js';
import { fitKerrCurve, type KerrCurveFit } from '../core/fit/fitKerrCurve.js';
import { linearisedCrossCheck } from '../core/fit/linearisedCrossCheck.js';
import { linearisedDisagreement } from '../core/fit/linearisedDisagreement.js';
import { runUncertainty } from './runUncertainty.js';
import { syncOffsetUncertaintyS } from '../core/uncertainty/syncOffsetUncertainty.js';
import { checkPlausibleGeometry } from './checkPlausibleGeometry.js';
import { runGates } from '../core/gates/runGates.js';
import { frameNoise } from '../core/gates/frameNoise.js';
import { LIQUIDS } from '../data/liquids.js';
import { RESULT_SCHEMA_VERSION, type RunResult, type RunWarning, type TraceRow, type RunEvent } from '../result/schema.js';
import { missingPathText } from '../io/missingPathText.js';

export interface AnalyzeOptions {
  videoPath: string;
  voltsPath: string;
  lengthMm: number;
  gapMm: number;
  effectiveLengthMm?: number;
  polariserAngleDeg?: number;
  staticRetardanceRad?: number;
  roi?: Rect;
  darkRoi?: Rect;
  referenceRoi?: Rect;
  offsetS?: number;
  openWindowS?: [number, number];
  openVideoPath?: string;
  openLevel?: number;
  /** ± limit of a given open level (same units; rectangular, u = T/√3); absent: not given. */
  openLevelTolerance?: number;
  transfer?: TransferName;
  electrodeHeightMm?: number;
  label?: string;
  robust?: boolean;
  /** Wavelength of the light, nm (recorded with the result; B depends on it). */
  wavelengthNm?: number;
  /** 'rgb': also fit the red, green and blue channels separately (white-light sources). */
  channels?: 'rgb';
  /** A camera response profile (kerrtrace calibrate-camera) to use instead of the transfer curve. */
  cameraProfilePath?: string;
  /** Logger accuracy, ± percent of reading (default 1, common practice; docs/uncertainty.md). */
  voltsAccuracyPercent?: number;
  /** Tolerances (± limits) of the electrode length and gap, mm (default 0: not given). */
  lengthToleranceMm?: number;
  gapToleranceMm?: number;
  /** Relative standard uncertainty the camera response puts on B, when a response check gave one. */
  cameraResponseRel?: number;
}

/**
 * Frames within this many seconds either side of --open-window are left out of the sync and the fit
 * (reason "open-turning"): turning an analyser by hand between parallel and crossed takes about a
 * second, and those frames are neither (this tool's documented margin).
 */
export const OPEN_TURNING_MARGIN_S = 1.5;

/** Default logger accuracy, ± percent of reading: a typical high-voltage divider and meter (common practice). */
export const DEFAULT_VOLTS_ACCURACY_PERCENT = 1;

export interface AnalyzeHooks {
  onProgress?: (stage: string, done: number, total: number) => void;
  toolVersion: string;
  ffmpegVersion: string | null;
}

export interface AnalyzeOutput {
  result: RunResult;
  trace: TraceRow[];
  grid: GridStore;
  frameTimesS: Float64Array;
  /** Dark-subtracted, exposure-normalised beam intensity per frame. */
  intensity: Float64Array;
  /** Modulation term per frame, T(V) with the fitted V_π (NaN outside the log). */
  modulation: Float64Array;
  usable: Uint8Array;
  fit: KerrCurveFit;
  info: VideoInfo;
  decoding: CameraDecoding;
  /** Exposure gain per frame (1 without a reference region). */
  gain: Float64Array;
  log: VoltageLog;
  /** The measured state, to fit again with more frames left out. */
  measured: MeasuredRun;
}

const MM = 1e-3;

function positive(value: number | undefined, what: string, option: string): number {
  if (value === undefined || !Number.isFinite(value) || value <= 0) throw invalid(`a positive ${what}`, option, value);
  return value;
}

/** Checks everything that can be checked before decoding starts. */
export function checkAnalyzeOptions(o: AnalyzeOptions): void {
  for (const [p, opt] of [[o.videoPath, 'VIDEO'], [o.voltsPath, '--volts']] as const) {
    if (!existsSync(p)) throw new KerrError('FILE_NOT_FOUND', missingPathText(p, `${p} does not exist`), { path: opt, hint: 'Check the path' });
    if (!statSync(p).isFile()) throw new KerrError('FILE_NOT_FOUND', `${p} is not a file`, { path: opt, hint: 'Give the path of a file' });
  }
  positive(o.lengthMm, 'electrode length in mm', '--length-mm');
  positive(o.gapMm, 'electrode gap in mm', '--gap-mm');
  checkPlausibleGeometry(o.lengthMm, o.gapMm);
  if (o.voltsAccuracyPercent !== undefined && !(o.voltsAccuracyPercent >= 0 && o.voltsAccuracyPercent < 50)) throw invalid('a logger accuracy from 0 to 50 percent of reading', '--volts-accuracy', o.voltsAccuracyPercent);
  if (o.lengthToleranceMm !== undefined && !(o.lengthToleranceMm >= 0 && o.lengthToleranceMm < o.lengthMm)) throw invalid(`a length tolerance from 0 to below the length (${o.lengthMm} mm)`, '--length-mm', o.lengthToleranceMm);
  if (o.gapToleranceMm !== undefined && !(o.gapToleranceMm >= 0 && o.gapToleranceMm < o.gapMm)) throw invalid(`a gap tolerance from 0 to below the gap (${o.gapMm} mm)`, '--gap-mm', o.gapToleranceMm);
  if (o.effectiveLengthMm !== undefined) {
    positive(o.effectiveLengthMm, 'effective length in mm', '--effective-length-mm');
    if (o.effectiveLengthMm < o.lengthMm) {
      throw invalid(`an effective length at least the electrode length (${o.lengthMm} mm)`, '--effective-length-mm', o.effectiveLengthMm, 'Fringe fields only lengthen the cell');
    }
  }
  if (o.electrodeHeightMm !== undefined) positive(o.electrodeHeightMm, 'electrode height in mm', '--electrode-height-mm');
  if (o.wavelengthNm !== undefined && !(o.wavelengthNm >= 200 && o.wavelengthNm <= 2000)) throw invalid('a wavelength between 200 and 2000 nm', '--wavelength-nm', o.wavelengthNm);
  const opens = [o.openWindowS, o.openVideoPath, o.openLevel].filter((x) => x !== undefined).length;
  if (opens > 1) throw new KerrError('BAD_ARGUMENT', 'give at most one of --open-window, --open-video and --open-level', { hint: 'They are three ways to give the same open level' });
  if (o.openWindowS && !(o.openWindowS[1] > o.openWindowS[0])) throw invalid('START:END with END after START (seconds)', '--open-window', o.openWindowS.join(':'));
  if (o.openVideoPath !== undefined && resolve(o.openVideoPath) === resolve(o.videoPath)) throw new KerrError('BAD_ARGUMENT', `the open video ${o.openVideoPath} is the run's own clip`, { path: '--open-video', hint: 'Give a separate clip recorded with the analyser parallel and no field, or --open-window START:END for a part of this clip' });
  if (o.openVideoPath !== undefined && !existsSync(o.openVideoPath)) throw new KerrError('FILE_NOT_FOUND', missingPathText(o.openVideoPath, `${o.openVideoPath} does not exist`), { path: '--open-video', hint: 'Check the path' });
  if (o.openLevel !== undefined && !(o.openLevel > 0)) throw invalid('a positive open level in linear units', '--open-level', o.openLevel);
  if (o.openLevelTolerance !== undefined && !(o.openLevelTolerance >= 0 && o.openLevelTolerance < (o.openLevel ?? Infinity))) throw invalid('a tolerance from 0 to below the open level', '--open-level', o.openLevelTolerance);
  if (o.cameraProfilePath !== undefined) {
    if (o.transfer !== undefined) throw new KerrError('BAD_ARGUMENT', 'give --transfer or --camera-profile, not both', { hint: 'A camera profile replaces the transfer curve' });
    if (!existsSync(o.cameraProfilePath)) throw new KerrError('FILE_NOT_FOUND', `${o.cameraProfilePath} does not exist`, { path: '--camera-profile', hint: 'Check the path of the camera profile' });
  }
}

/** Default output folder: beside the video, "<name>.kerrtrace". */
export function defaultOutDir(videoPath: string): string {
  const abs = resolve(videoPath);
  return join(dirname(abs), `${basename(abs, extname(abs))}.kerrtrace`);
}

export async function analyzeRun(o: AnalyzeOptions, hooks: AnalyzeHooks): Promise<AnalyzeOutput> {
  return fitMeasuredRun(await measureRun(o, hooks));
}

/** Probe, decode once, find the beam and surround, correct exposure, detect sparks, sync. */
export async function measureRun(o: AnalyzeOptions, hooks: AnalyzeHooks): Promise<MeasuredRun> {
  checkAnalyzeOptions(o);
  const warnings: RunWarning[] = [];
  const warn = (code: string, message: string, guideSection?: string) => {
    warnings.push(guideSection ? { code, message, guideSection } : { code, message });
  };
  const opened = await openClip(o);
  const log: VoltageLog = await readVoltageLog(o.voltsPath);
  let vAbsMax = 0;
  for (const v of log.voltageV) vAbsMax = Math.max(vAbsMax, Math.abs(v));
  checkLogUnits({ timeS: log.timeS, voltageV: log.voltageV, timeColumn: log.columns.time, videoDurationS: opened.probe.info.durationS, gapM: o.gapMm * MM, file: o.voltsPath });
  if (!(vAbsMax > 0)) {
    throw new KerrError('NOT_IDENTIFIABLE', `the voltage log ${o.voltsPath} never leaves zero`, { path: '--volts', hint: 'Check the voltage column and its unit, or record a sweep' });
  }

  const clip = await measureClip(opened, o, hooks);
  warnings.push(...clip.warnings);
  const { info, decoding, cameraProfile, times, nFrames, grid, beamRect, beamAuto, geom, haveSurround } = clip;
  const cells = grid.gridWidth * grid.gridHeight;
  const beamRaw = clip.beam.luma;
  const beamClipped = clip.beam.clipped;
  const surroundRaw = clip.background.luma;

  // ---- flashes: whole-frame brightness jumps ----
  const frameMean = new Float64Array(nFrames);
  for (let f = 0; f < nFrames; f++) {
    let s = 0;
    const off = f * cells;
    for (let c = 0; c < cells; c++) s += grid.data[off + c]!;
    frameMean[f] = s / cells;
  }
  const flashes = detectFlashes(frameMean);
  const events: RunEvent[] = [];
  for (let f = 0; f < nFrames; f++) if (flashes.flags[f]) events.push({ kind: 'spark', frameIndex: f, timeS: times[f]!, size: flashes.z[f]! });

  checkRegionsApart({ beam: beamRect, beamOption: o.roi ? '--roi' : 'found automatically', ...(o.darkRoi ? { dark: o.darkRoi } : {}), ...(o.referenceRoi ? { reference: o.referenceRoi } : {}) });

  // ---- flashes again, now on the light outside the beam and its rings ----
  {
    const outer = geom ? geom.b1 : beamRect;
    const cx0 = Math.floor(outer.x / grid.step), cy0 = Math.floor(outer.y / grid.step);
    const cx1 = Math.min(grid.gridWidth - 1, Math.ceil((outer.x + outer.w) / grid.step) - 1);
    const cy1 = Math.min(grid.gridHeight - 1, Math.ceil((outer.y + outer.h) / grid.step) - 1);
    const inside = Math.max(0, cx1 - cx0 + 1) * Math.max(0, cy1 - cy0 + 1);
    if (cells - inside >= 16) {
      for (let f = 0; f < nFrames; f++) {
        let sIn = 0;
        const off = f * cells;
        for (let y = cy0; y <= cy1; y++) for (let x = cx0; x <= cx1; x++) sIn += grid.data[off + y * grid.gridWidth + x]!;
        frameMean[f] = (frameMean[f]! * cells - sIn) / (cells - inside);
      }
      const again = detectFlashes(frameMean);
      flashes.flags.set(again.flags);
      flashes.z.set(again.z);
      flashes.count = again.count;
      events.length = 0;
      for (let f = 0; f < nFrames; f++) if (flashes.flags[f]) events.push({ kind: 'spark', frameIndex: f, timeS: times[f]!, size: flashes.z[f]! });
    }
  }

  // ---- exposure gain from a reference region (minus the dark region when one is given) ----
  let gain: Float64Array = new Float64Array(nFrames).fill(1);
  if (o.referenceRoi) {
    try {
      gain = exposureGains(clip.referenceLuma!, clip.darkLuma).gains;
    } catch (err) {
      if (!isKerrError(err)) throw err;
      warn('reference-dark', 'the reference region is never brighter than the dark level, so exposure could not be corrected from it; put it on a lit grey card', 'lock-exposure');
    }
  }

  // ---- corrected intensity and exclusions ----
  const intensity = new Float64Array(nFrames);
  const excluded: (string | null)[] = new Array(nFrames).fill(null);
  for (let f = 0; f < nFrames; f++) {
    intensity[f] = (beamRaw[f]! - (haveSurround ? surroundRaw[f]! : 0)) / gain[f]!;
    if (!Number.isFinite(gain[f]!)) excluded[f] = 'no-reference';
    else if (flashes.flags[f]) excluded[f] = 'spark';
    else if (beamClipped[f]! > 0.01) excluded[f] = 'clipped';
  }
  const clippedFrames = excluded.filter((e) => e === 'clipped').length;
  if (clippedFrames > 0) {
    for (let f = 0; f < nFrames; f++) if (excluded[f] === 'clipped') events.push({ kind: 'clipped', frameIndex: f, timeS: times[f]!, size: beamClipped[f]! });
    warn('clipping', `${clippedFrames} frames have more than 1% clipped pixels in the beam and were left out; defocus the spot, add an ND filter or lower the exposure`, 'avoid-clipping');
  }

  // ---- per-channel intensities (--channels rgb) ----
  let channelIntensity: MeasuredRun['channelIntensity'];
  if (o.channels === 'rgb') {
    const channel = (k: 'r' | 'g' | 'b'): Float64Array => Float64Array.from(clip.beam[k], (v, f) => (v - clip.background[k][f]!) / gain[f]!);
    channelIntensity = { r: channel('r'), g: channel('g'), b: channel('b') };
  }

  // open window frames
  let openLevel: number | undefined = o.openLevel;
  // Standard uncertainty of the open level: a given ±T as a rectangular limit (T/√3); a measured
  // one as the standard error of a median, √(π/2)·s/√n (normal frames).
  let openLevelStdErr: number | undefined = o.openLevelTolerance !== undefined ? o.openLevelTolerance / Math.sqrt(3) : undefined;
  let openLevelNote = o.openLevelTolerance !== undefined ? `--open-level ±${o.openLevelTolerance} (rectangular, /√3)` : 'no tolerance given with --open-level (X±T)';
  const medianStdErr = (vals: number[]): number => {
    const mean = vals.reduce((s, x) => s + x, 0) / vals.length;
    const sd = Math.sqrt(vals.reduce((s, x) => s + (x - mean) ** 2, 0) / Math.max(1, vals.length - 1));
    return Math.sqrt(Math.PI / 2) * sd / Math.sqrt(vals.length);
  };
  if (o.openWindowS) {
    const [a, b] = o.openWindowS;
    const vals: number[] = [];
    for (let f = 0; f < nFrames; f++) {
      if (times[f]! >= a && times[f]! <= b) {
        if (!excluded[f]) vals.push(intensity[f]!);
        excluded[f] = 'open-window';
      } else if (times[f]! >= a - OPEN_TURNING_MARGIN_S && times[f]! <= b + OPEN_TURNING_MARGIN_S && !excluded[f]) {
        // the analyser being turned to or from parallel: neither open nor crossed
        excluded[f] = 'open-turning';
      }
    }
    if (vals.length < 3) throw new KerrError('BAD_ARGUMENT', `the open window ${a}–${b} s holds only ${vals.length} usable frame${vals.length === 1 ? '' : 's'}, at least 3 are needed (the video runs ${times[0]!.toFixed(2)}–${times[nFrames - 1]!.toFixed(2)} s)`, { path: '--open-window', hint: 'Give START:END in seconds of this video where the analyser was parallel' });
    openLevel = median(vals);
    openLevelStdErr = medianStdErr(vals);
    openLevelNote = `median of ${vals.length} open-window frames`;
  }
  if (clip.openVideoLevels) {
    const vals = clip.openVideoLevels;
    openLevel = median(vals);
    openLevelStdErr = medianStdErr(vals);
    openLevelNote = `median of ${vals.length} open-video frames`;
  }

  if (openLevel !== undefined) {
    checkOpenLevel(openLevel, intensity, excluded.map((e) => !e), o.openWindowS ? '--open-window' : o.openVideoPath ? '--open-video' : '--open-level');
  }

  // ---- sync ----
  const usableForSync = new Uint8Array(nFrames);
  for (let f = 0; f < nFrames; f++) usableForSync[f] = excluded[f] ? 0 : 1;
  let offsetS: number;
  let sync: RunResult['sync'];
  let vpiHint: number | undefined;
  let offsetStdErrS: number | undefined;
  if (o.offsetS !== undefined) {
    offsetS = o.offsetS;
    sync = { manual: true, offsetS, sharpnessS: null, ambiguous: false, curve: { offsetS: [], score: [] } };
  } else {
    const s = findSyncOffset({ frameTimesS: times, intensity, logTimeS: log.timeS, logVoltageV: log.voltageV, usable: usableForSync });
    offsetS = s.offsetS;
    vpiHint = s.vpiGuessV;
    sync = { manual: false, offsetS, sharpnessS: s.sharpnessS ?? null, ambiguous: s.ambiguous, curve: s.curve };
    offsetStdErrS = s.offsetStdErrS ?? undefined;
    for (const m of s.warnings) warn(s.ambiguous && /equally/.test(m) ? 'sync-ambiguous' : 'sync', m, 'sync');
  }

  // ---- voltage at each frame ----
  const query = new Float64Array(nFrames);
  for (let f = 0; f < nFrames; f++) query[f] = times[f]! - offsetS;
  // Monotone cubic where the log is smooth, straight lines at steps, nothing across dropouts.
  const logNoiseV = voltageNoiseV(log.voltageV);
  const voltageAt = (q: Float64Array): Float64Array => (log.rows >= 2 ? interpolateLog(log.timeS, log.voltageV, q, logNoiseV).valueV : interpolateAt(log.timeS, log.voltageV, q));
  const reading = log.rows >= 2 ? interpolateLog(log.timeS, log.voltageV, query, logNoiseV) : { valueV: interpolateAt(log.timeS, log.voltageV, query), gap: new Uint8Array(nFrames) };
  const voltage = reading.valueV;
  let inLog = 0;
  let inGaps = 0;
  for (let f = 0; f < nFrames; f++) {
    if (reading.gap[f]) { if (!excluded[f]) { excluded[f] = 'log-gap'; inGaps++; } } else if (!Number.isFinite(voltage[f]!)) { if (!excluded[f]) excluded[f] = 'outside-log'; } else inLog++;
  }
  if (inGaps > 0) warn('log-gap', `${inGaps} frames fall in gaps of the voltage log (intervals longer than ${GAP_FACTOR}× the median sample interval) and were left out rather than bridged`, 'voltage-log');
  if (inLog < 10) {
    throw new KerrError('NO_OVERLAP', `the voltage log (${log.timeS[0]!.toFixed(2)}–${log.timeS[log.rows - 1]!.toFixed(2)} s) and the video (${times[0]!.toFixed(2)}–${times[nFrames - 1]!.toFixed(2)} s) overlap in only ${inLog} frame${inLog === 1 ? '' : 's'} with offset ${offsetS.toFixed(3)} s`, { path: '--volts', hint: 'Check that the log belongs to this video, or give the right --offset-s' });
  }

  return {
    o, hooks, info, decoding, log, grid, times, nFrames, intensity, gain, voltage, query, vAbsMax, openLevel, openLevelStdErr, openLevelNote,
    offsetS, offsetStdErrS, sync, vpiHint, beamRect, beamAuto, geom, haveSurround, voltageAt,
    excluded: excluded.slice(), events: events.slice(), warnings: warnings.slice(),
    ...(channelIntensity ? { channelIntensity } : {}),
    ...(cameraProfile ? { cameraProfile } : {}),
  };
}

/** Everything measured from the clip and the log before the fit; the fit can run on it more than once. */
export interface MeasuredRun {
  o: AnalyzeOptions;
  hooks: AnalyzeHooks;
  info: VideoInfo;
  decoding: CameraDecoding;
  log: VoltageLog;
  grid: GridStore;
  times: Float64Array;
  nFrames: number;
  /** Beam minus surround, divided by the exposure gain. */
  intensity: Float64Array;
  /** Exposure gain per frame (1 without a reference region). */
  gain: Float64Array;
  voltage: Float64Array;
  /** The log's voltage at log times (NaN where the log cannot tell), the same rule as `voltage`. */
  voltageAt: (logTimesS: Float64Array) => Float64Array;
  query: Float64Array;
  vAbsMax: number;
  openLevel: number | undefined;
  /** Standard uncertainty of the open level (undefined: not given) and how it was obtained. */
  openLevelStdErr: number | undefined;
  openLevelNote: string;
  offsetS: number;
  offsetStdErrS: number | undefined;
  sync: RunResult['sync'];
  vpiHint: number | undefined;
  beamRect: Rect;
  beamAuto: boolean;
  geom: SurroundGeometry | undefined;
  haveSurround: boolean;
  excluded: (string | null)[];
  events: RunEvent[];
  warnings: RunWarning[];
  /** Beam minus surround per colour channel, exposure-corrected (only with channels: 'rgb'). */
  channelIntensity?: { r: Float64Array; g: Float64Array; b: Float64Array };
  /** The camera profile used instead of the transfer curve, with its path. */
  cameraProfile?: { path: string; profile: CameraProfile };
}

/**
 * The fit and everything derived from it, on a measured run. `extraExclusions` (frame index →
 * reason, e.g. particle passages or exposure jumps found later) are left out as well.
 */
export function fitMeasuredRun(m: MeasuredRun, extraExclusions: ReadonlyMap<number, string> = new Map(), extraEvents: RunEvent[] = []): AnalyzeOutput {
  const { o, hooks, info, decoding, log, grid, times, nFrames, intensity, voltage, query, vAbsMax, openLevel, offsetS, offsetStdErrS, sync, vpiHint, beamRect, beamAuto, geom, haveSurround } = m;
  const excluded = m.excluded.slice();
  for (const [f, why] of extraExclusions) if (!excluded[f]) excluded[f] = why;
  const events = [...m.events, ...extraEvents];
  const warnings = m.warnings.slice();
  const warn = (code: string, message: string, guideSection?: string) => {
    warnings.push(guideSection ? { code, message, guideSection } : { code, message });
  };
  // ---- fit ----
  const useIdx: number[] = [];
  for (let f = 0; f < nFrames; f++) if (!excluded[f]) useIdx.push(f);
  const vFit = Float64Array.from(useIdx, (f) => voltage[f]!);
  const iFit = Float64Array.from(useIdx, (f) => intensity[f]!);
  let vSpread = 0;
  for (const v of vFit) vSpread = Math.max(vSpread, Math.abs(v));
  if (vSpread < 0.02 * vAbsMax || vSpread === 0) {
    throw new KerrError('NOT_IDENTIFIABLE', 'the voltage stays at zero in the frames that overlap the video', { path: '--volts', hint: 'Record a sweep while filming, or check --offset-s' });
  }
  const lengthM = o.lengthMm * MM;
  const effectiveLengthM = (o.effectiveLengthMm ?? o.lengthMm) * MM;
  const gapM = o.gapMm * MM;
  const polariserAngleDeg = o.polariserAngleDeg ?? 45;
  const fitInput = {
    effectiveLengthM, gapM, polariserAngleDeg,
    ...(o.staticRetardanceRad !== undefined ? { staticRetardanceRad: o.staticRetardanceRad } : {}),
    ...(openLevel !== undefined ? { openLevel } : {}),
    ...(vpiHint !== undefined ? { halfWaveGuessesV: [vpiHint] } : {}),
    robust: o.robust !== false,
  };
  const sigmaAll = interpolationUncertaintyV(log.timeS, log.voltageV, query, voltageNoiseV(log.voltageV));
  const sFit = Float64Array.from(useIdx, (f) => sigmaAll[f]!);
  let fit = fitKerrCurve({ voltageV: vFit, intensity: iFit, voltageSigmaV: sFit, ...fitInput });
  // Particle passages: short positive excursions above the model, judged against the local noise
  // (which grows with brightness); left out, then the fit runs again without them. A cleaner fit
  // can reveal passages the first one hid, so this repeats (at most three rounds).
  const logIntervalS = log.rows > 1 ? (log.timeS[log.rows - 1]! - log.timeS[0]!) / (log.rows - 1) : undefined;
  let fitIdx = useIdx.map((_f, k) => k); // positions in vFit/iFit/sFit still used
  for (let round = 0; round < 3; round++) {
    const particles = detectParticleEvents({
      intensity: Float64Array.from(fitIdx, (k) => iFit[k]!),
      model: Float64Array.from(fitIdx, (k) => fit.predict(vFit[k]!)),
      candidate: new Uint8Array(fitIdx.length).fill(1),
      timesS: Float64Array.from(fitIdx, (k) => times[useIdx[k]!]!),
      ...(logIntervalS !== undefined ? { logIntervalS } : {}),
    });
    if (particles.events.length === 0) break;
    const flagged = new Uint8Array(fitIdx.length);
    for (const e of particles.events) {
      for (let j = e.firstFrame; j <= e.lastFrame; j++) flagged[j] = 1;
      events.push({ kind: 'particle', frameIndex: useIdx[fitIdx[e.peakFrame]!]!, timeS: e.peakTimeS, size: e.size });
    }
    for (let j = 0; j < fitIdx.length; j++) if (flagged[j]) excluded[useIdx[fitIdx[j]!]!] = 'particle';
    fitIdx = fitIdx.filter((_k, j) => !flagged[j]);
    // a refit near the solution just found: start from it (and the sync's guess) only
    fit = fitKerrCurve({
      voltageV: Float64Array.from(fitIdx, (k) => vFit[k]!), intensity: Float64Array.from(fitIdx, (k) => iFit[k]!),
      voltageSigmaV: Float64Array.from(fitIdx, (k) => sFit[k]!), ...fitInput,
      halfWaveGuessesV: [fit.halfWaveVoltage.value, ...(vpiHint !== undefined ? [vpiHint] : [])], onlyGivenStarts: true,
    });
  }
  useIdx.splice(0, useIdx.length, ...fitIdx.map((k) => useIdx[k]!));
  const vUsed = Float64Array.from(useIdx, (f) => voltage[f]!);
  const iUsed = Float64Array.from(useIdx, (f) => intensity[f]!);
  if (!fit.identifiable) {
    warn('not-identifiable', `the sweep reaches only about ${(fit.maxVoltageOverHalfWave * 100).toFixed(0)}% of the half-wave voltage, so brightness and half-wave voltage trade off (correlation ${fit.ampVpiCorrelation.toFixed(3)}, relative error of B ${(fit.relStdErrB * 100).toFixed(0)}%). Record an open level (analyser parallel, no field: --open-window, --open-video or --open-level) or sweep higher if the cell allows it safely`, 'open-level');
  }
  if (!fit.converged) warn('fit-not-converged', `the fit stopped without converging (${fit.reason})`);

  // ---- derived figures ----
  const amp = fit.amplitude;
  const floor = fit.floorLevel;
  const floorFraction = amp.value > 0
    ? quantity(floor.value / amp.value, Math.abs(floor.value / amp.value) * Math.hypot((floor.stdErr ?? 0) / (floor.value || 1), (amp.stdErr ?? 0) / amp.value))
    : quantity(NaN);
  let vMinUsed = Infinity, vMaxUsed = 0;
  for (const v of vUsed) { vMinUsed = Math.min(vMinUsed, Math.abs(v)); vMaxUsed = Math.max(vMaxUsed, Math.abs(v)); }
  let hi = -Infinity, lo = Infinity;
  for (let k = 0; k <= 400; k++) {
    const v = vMinUsed + ((vMaxUsed - vMinUsed) * k) / 400;
    const m = fit.predict(v);
    hi = Math.max(hi, m); lo = Math.min(lo, m);
  }
  // Error by first-order propagation from the floor and amplitude errors (their correlation
  // ignored): I = I_floor + I_amp·t, so σ_I² = σ_floor² + t²·σ_amp², t = (I − I_floor)/I_amp.
  const sigmaAt = (level: number): number => {
    const t = amp.value > 0 ? (level - floor.value) / amp.value : 0;
    return Math.sqrt((floor.stdErr ?? 0) ** 2 + (t * (amp.stdErr ?? 0)) ** 2);
  };
  const contrastRatio = lo > 0
    ? quantity(hi / lo, (hi / lo) * Math.hypot(sigmaAt(hi) / hi, sigmaAt(lo) / lo))
    : quantity(Infinity);
  if (!(lo > 0)) warn('floor-not-positive', 'the fitted floor is at or below the surround level, so the contrast ratio is unbounded; check the dark and beam regions', 'camera-still');

  // linearised reduction on the first branch, compared with the fit
  const linearised = linearisedCrossCheck({
    voltageV: vUsed, intensity: iUsed, outliers: fit.outliers,
    floorLevel: floor.value, amplitude: amp.value, halfWaveVoltageV: fit.halfWaveVoltage.value,
    polariserAngleDeg, gapM, effectiveLengthM, fitKerrConstant: fit.kerrConstant,
  });
  const disagreement = linearisedDisagreement(linearised, fit.kerrConstant, fit.identifiable);
  if (disagreement !== null) warn('linearised-disagrees', disagreement);

  // ---- the camera response, checked against the physics (docs/camera-response.md) ----
  const response = cameraResponseRecord({
    decoding, bitDepth: info.bitDepth, transferFromOption: o.transfer !== undefined,
    ...(m.cameraProfile ? { profile: m.cameraProfile } : {}),
    check: checkCameraResponse({
      voltageV: vUsed, intensity: iUsed, used: Uint8Array.from(fit.outliers, (x) => 1 - x),
      fit: { floor: floor.value, amplitude: amp.value, halfWaveVoltageV: fit.halfWaveVoltage.value },
      polariserAngleDeg, ...(o.staticRetardanceRad !== undefined ? { staticRetardanceRad: o.staticRetardanceRad } : {}),
      ...(openLevel !== undefined ? { openLevel } : {}),
      effectiveLengthM, gapM, kerrConstant: fit.kerrConstant.value, kerrStdErr: fit.kerrConstant.stdErr ?? 0, errorInflation: fit.errorInflation,
    }),
  });
  warnings.push(...response.warnings);

  // ---- per-channel fits ----
  let channels: RunResult['channels'];
  if (m.channelIntensity) {
    const ci = m.channelIntensity;
    const vpi0 = fit.halfWaveVoltage.value;
    const one = (series: Float64Array): Quantity => {
      try {
        // The open level is a luminance figure, so each channel fits its own amplitude.
        const channelInput = { ...fitInput };
        delete channelInput.openLevel;
        const f = fitKerrCurve({
          voltageV: vUsed, intensity: Float64Array.from(useIdx, (i) => series[i]!),
          voltageSigmaV: Float64Array.from(useIdx, (i) => sigmaAll[i]!), ...channelInput,
          // a channel's V_π lies near the luminance fit's (dispersion is tens of per cent at most)
          halfWaveGuessesV: [vpi0, 0.8 * vpi0, 1.25 * vpi0], onlyGivenStarts: true,
        });
        return f.identifiable ? f.kerrConstant : quantity(NaN, undefined, 'm/V^2');
      } catch {
        return quantity(NaN, undefined, 'm/V^2');
      }
    };
    channels = {
      r: one(ci.r), g: one(ci.g), b: one(ci.b),
      note: 'each camera channel is a broad band of wavelengths, so these are band averages of B (the Kerr constant varies with wavelength); a channel with too little light gives no number',
    };
  }

  // ---- trace and modulation term ----
  const trace: TraceRow[] = [];
  const modulation = new Float64Array(nFrames);
  const used = new Uint8Array(nFrames);
  const vpi = fit.halfWaveVoltage.value;
  const staticHalf = (o.staticRetardanceRad ?? 0) / 2;
  const angleFactor = Math.sin((2 * polariserAngleDeg * Math.PI) / 180) ** 2;
  const excludedCounts: Record<string, number> = {};
  for (let f = 0; f < nFrames; f++) {
    const v = voltage[f]!;
    const has = Number.isFinite(v);
    const model = has ? fit.predict(v) : null;
    modulation[f] = has ? angleFactor * Math.sin((Math.PI / 2) * (v / vpi) ** 2 + staticHalf) ** 2 : NaN;
    used[f] = excluded[f] ? 0 : 1;
    if (excluded[f]) excludedCounts[excluded[f]!] = (excludedCounts[excluded[f]!] ?? 0) + 1;
    trace.push({
      frameIndex: f, timeS: times[f]!, voltageV: has ? v : null, intensity: intensity[f]!, model,
      residual: model === null ? null : intensity[f]! - model, used: !excluded[f], excludedReason: excluded[f] ?? null,
    });
  }
  const usedCount = nFrames - Object.values(excludedCounts).reduce((a, b) => a + b, 0);

  const temperature = log.temperatureC ? meanSd(log.temperatureC) : null;
  // ---- uncertainty budget and gates ----
  const bitsPerPixel = (statSync(o.videoPath).size * 8) / (nFrames * info.width * info.height);
  // The run's own response check: the correction it would make to B is not applied, so its size
  // (and the check's own scatter) enters the budget as the camera-response term (GUM 3.2.4 / F.2.4.5:
  // an uncorrected known effect is carried as an uncertainty). An explicit option wins.
  const responseU = response.record.check.standardUncertainty.value / fit.kerrConstant.value;
  const cameraResponseRel = o.cameraResponseRel ?? (responseU !== undefined && Number.isFinite(responseU) && responseU > 0 ? responseU : undefined);
  const offsetU = syncOffsetUncertaintyS(offsetStdErrS, fit.errorInflation, times);
  const uncertainty = runUncertainty({
    fit,
    fitInput: { ...fitInput, intensity: iUsed, voltageSigmaV: Float64Array.from(useIdx, (f) => sigmaAll[f]!), onlyGivenStarts: true },
    voltageAtOffset: (off) => m.voltageAt(Float64Array.from(useIdx, (f) => times[f]! - off)),
    offsetS, offsetStdErrS: offsetU,
    voltsAccuracyPercent: o.voltsAccuracyPercent ?? DEFAULT_VOLTS_ACCURACY_PERCENT,
    gapM, gapToleranceM: (o.gapToleranceMm ?? 0) * MM,
    lengthM: effectiveLengthM, lengthToleranceM: (o.lengthToleranceMm ?? 0) * MM,
    ...(cameraResponseRel !== undefined ? { cameraResponseRel } : {}),
    ...(openLevel !== undefined ? { openLevel: { stdErr: m.openLevelStdErr, note: m.openLevelNote } } : {}),
    ...(o.cameraResponseRel === undefined && cameraResponseRel !== undefined && !response.record.check.checked
      ? { cameraResponseNote: `no response check (sweep below 0.8·V_π, no open level): B refitted at γ = 1 ± ${response.record.check.gamma.stdErr} (prior)` } : {}),
    frames: { voltageV: voltage, intensity, include: Uint8Array.from(excluded, (e) => (e ? 0 : 1)), timesS: times },
  });
  const noiseOfFrames = frameNoise(Float64Array.from(useIdx, (f) => intensity[f]!));
  const liquidRange = liquidKerrRange();
  const gates = runGates({
    kerrConstant: fit.kerrConstant.value, kerrConstantStdErr: uncertainty.kerrConstant.combinedStdErr,
    halfWaveVoltageV: fit.halfWaveVoltage.value, halfWaveStdErrV: uncertainty.halfWaveVoltage.combinedStdErr,
    converged: fit.converged, fitReason: fit.reason, identifiable: fit.identifiable, maxVoltageOverHalfWave: fit.maxVoltageOverHalfWave,
    ampVpiCorrelation: fit.ampVpiCorrelation, relStdErrB: fit.relStdErrB,
    residualRms: fit.intensityNoise, signalAmplitude: fit.amplitude.value, frameNoise: noiseOfFrames, bitsPerPixel, syncAmbiguous: sync.ambiguous, plausibleRangeMPerV2: liquidRange,
  });
  warnings.push(...gates.warnings);
  const kerrQ: Quantity = quantity(fit.kerrConstant.value, uncertainty.kerrConstant.combinedStdErr, 'm/V^2');
  const vpiQ: Quantity = quantity(fit.halfWaveVoltage.value, uncertainty.halfWaveVoltage.combinedStdErr, 'V');
  const result: RunResult = {
    schemaVersion: RESULT_SCHEMA_VERSION,
    kind: 'kerrtrace-run',
    label: o.label ?? basename(o.videoPath),
    createdAt: new Date().toISOString(),
    source: 'video',
    tool: { name: 'kerrtrace', version: hooks.toolVersion, ffmpegVersion: hooks.ffmpegVersion, node: process.version },
    inputs: {},
    options: { ...o },
    cell: { lengthM, effectiveLengthM, gapM, polariserAngleDeg, electrodeHeightM: o.electrodeHeightMm !== undefined ? o.electrodeHeightMm * MM : null, wavelengthNm: o.wavelengthNm ?? null },
    camera: { width: info.width, height: info.height, fps: info.meanFps, variableFrameRate: info.variableFrameRate, transfer: decoding.transfer, range: decoding.range, bitsPerPixel },
    regions: {
      beam: beamRect, beamAuto,
      ...(o.darkRoi ? { dark: o.darkRoi } : {}),
      ...(!o.darkRoi && haveSurround && geom ? { surround: geom.b1 } : {}),
      ...(o.referenceRoi ? { reference: o.referenceRoi } : {}),
    },
    kerrConstant: kerrQ,
    halfWaveVoltage: vpiQ,
    uncertainty,
    validity: { valid: gates.failures.length === 0, failures: gates.failures },
    quarterWaveVoltage: quantity(vpiQ.value / Math.SQRT2, (vpiQ.stdErr ?? NaN) / Math.SQRT2, 'V'),
    syncOffset: quantity(offsetS, offsetU, 's'),
    floorFraction,
    contrastRatio,
    identifiable: fit.identifiable,
    identifiability: { ampVpiCorrelation: fit.ampVpiCorrelation, relStdErrB: fit.relStdErrB, maxVoltageOverHalfWave: fit.maxVoltageOverHalfWave, openLevelUsed: openLevel !== undefined },
    model: {
      darkLevel: 0, floorLevel: floor, amplitude: amp, kerrConstant: fit.kerrConstant, effectiveLengthM, gapM, polariserAngleDeg,
      staticRetardanceRad: o.staticRetardanceRad ?? 0,
    },
    fit: { converged: fit.converged, iterations: fit.iterations, reason: fit.reason, residualRms: fit.residualRms, degreesOfFreedom: fit.degreesOfFreedom, starts: fit.starts, robust: o.robust === false ? 'none' : 'huber', residualAutocorrelation: fit.residualAutocorrelation, errorInflation: fit.errorInflation, effectiveFrames: fit.effectiveFrames, startResults: fit.startResults, residualOverFrameNoise: fit.residualRms / noiseOfFrames },
    linearised,
    sync,
    frames: { total: nFrames, used: usedCount, excluded: excludedCounts },
    events: events.sort((a, b) => a.frameIndex - b.frameIndex),
    log: { rows: log.rows, spanS: log.timeS[log.rows - 1]! - log.timeS[0]!, currentColumn: log.currentA !== null, temperatureC: temperature },
    warnings: [...log.warnings.map((message) => ({ code: 'voltage-log', message })), ...warnings],
    ...(channels ? { channels } : {}),
    cameraResponse: response.record,
    files: {},
  };
  return { result, trace, grid, frameTimesS: times, intensity, modulation, usable: used, fit, info, decoding, gain: m.gain, log, measured: m };
}

/** [lowest, highest] Kerr constant in the built-in liquid table, m/V². */
function liquidKerrRange(): [number, number] {
  let lo = Infinity, hi = 0;
  for (const l of LIQUIDS) for (const k of l.kerrConstants) { lo = Math.min(lo, k.valueMPerV2); hi = Math.max(hi, k.valueMPerV2); }
  return [lo, hi];
}

function meanSd(a: Float64Array): Quantity {
  let s = 0;
  for (const x of a) s += x;
  const m = s / a.length;
  let v = 0;
  for (const x of a) v += (x - m) ** 2;
  return quantity(m, a.length > 1 ? Math.sqrt(v / (a.length - 1)) : undefined, '°C');
}
