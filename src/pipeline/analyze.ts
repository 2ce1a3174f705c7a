/**
 * The analyze job's options and its entry point for callers that want the figures without the
 * pictures (scripts/accuracy, tests): video + voltage log → Kerr constant, half-wave voltage,
 * floor, contrast, sync offset, as one RunResult.
 *
 * Data flows one way (docs/analyze.md, "Data flow"): measure the clip once (measureClip) →
 * correct exposure (correctedSeries) → decide every frame exclusion (frameExclusions) → sync
 * (syncRun, which adds log-gap and outside-log) → one fit (fitRun) → derived figures, budget and
 * gates → figures and, with maps, pictures → one record (videoRunRecord). runAnalysis wires it;
 * analyzeWithProducts adds the pictures; finishRun writes the folder.
 */
import { existsSync, statSync } from 'node:fs';
import { basename, dirname, extname, join, resolve } from 'node:path';
import { KerrError, invalid } from '../errors.js';
import type { Rect, TransferName, VideoInfo, CameraDecoding } from '../media/types.js';
import type { VoltageLog } from '../io/voltageLog.js';
import type { KerrCurveFit } from '../core/fit/fitKerrCurve.js';
import type { RunResult, TraceRow } from '../result/schema.js';
import { checkPlausibleGeometry } from './checkPlausibleGeometry.js';
import { missingPathText } from '../io/missingPathText.js';
import type { GridStore } from './measureClip.js';
import { runAnalysis } from './runAnalysis.js';

export { OPEN_TURNING_MARGIN_S } from './frameExclusions.js';
export { DEFAULT_VOLTS_ACCURACY_PERCENT } from './budgetAndGates.js';

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
  /** Whole-grid rows of the block store before it is bounded (measureClip's maxGridRows); for tests. */
  maxGridRows?: number;
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

/** Progress and the facts of the run's surroundings, kept apart from the measurement options. */
export interface AnalyzeHooks {
  onProgress?: (stage: string, done: number, total: number) => void;
  toolVersion: string;
  ffmpegVersion: string | null;
  /** Node.js version recorded with the result (default: the running one, read once at the start). */
  nodeVersion?: string;
  /** The run's start time (default: the clock, read once at the start). */
  startedAt?: Date;
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
  /** Every input file of the run (the output folder may never be, hold or lie inside one). */
  inputPaths: string[];
}

/** The whole analysis without maps or a report: the figures, the trace, the record. */
export async function analyzeRun(o: AnalyzeOptions, hooks: AnalyzeHooks): Promise<AnalyzeOutput> {
  return (await runAnalysis(o, hooks, { products: false, report: false })).out;
}
