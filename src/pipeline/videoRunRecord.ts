/**
 * The run record (result.json) of a video run, assembled whole in one place from the stages of
 * analyze: the measurement (camera, regions), the exclusions (frames, events), the sync, the one
 * fit and what derives from it, the budget and gates, the figures and the pictures. The clock,
 * the versions, the input hashes and the file list come in as arguments; nothing is read from
 * the environment here and the record is not changed after it is built.
 * It gathers the video parts and hands them to the one builder photo runs use too
 * (src/result/buildRunRecord.ts), which gives B and V_π the budget's combined standard uncertainty
 * and the quarter-wave voltage V_π/√2.
 * @example videoRunRecord({ ... }).kerrConstant → { value: 2.4e-12, stdErr: 3e-14, unit: 'm/V^2' }
 */
import { basename } from 'node:path';
import { quantity, type Quantity } from '../quantity.js';
import type { RunEvent, RunResult, RunWarning } from '../result/schema.js';
import { buildRunRecord } from '../result/buildRunRecord.js';
import type { Rect, VideoInfo, CameraDecoding } from '../media/types.js';
import type { SurroundGeometry } from '../core/regions/localSurround.js';
import type { VoltageLog } from '../io/voltageLog.js';
import type { AnalyzeOptions } from './analyze.js';
import type { RunCell } from './runCell.js';
import type { SyncedRun } from './syncRun.js';
import type { FittedRun } from './fitRun.js';
import type { DerivedFigures } from './derivedFigures.js';
import type { BudgetAndGates } from './budgetAndGates.js';
import type { RunTrace } from './runTrace.js';
import type { RunFigures } from './runFigures.js';

export interface RunProvenance {
  /** ISO-8601 time the run started. */
  createdAt: string;
  toolVersion: string;
  ffmpegVersion: string | null;
  nodeVersion: string;
  inputs: RunResult['inputs'];
  files: Record<string, string>;
}

export interface VideoRunRecordInput {
  o: AnalyzeOptions;
  provenance: RunProvenance;
  clip: { info: VideoInfo; decoding: CameraDecoding; beamRect: Rect; beamAuto: boolean; geom: SurroundGeometry | undefined; haveSurround: boolean };
  cell: RunCell;
  log: VoltageLog;
  bitsPerPixel: number;
  openLevelUsed: boolean;
  synced: SyncedRun;
  fitted: FittedRun;
  derived: DerivedFigures;
  budget: BudgetAndGates;
  trace: RunTrace;
  events: RunEvent[];
  figures: RunFigures;
  haloToCoreRatio?: Quantity;
  /** Every warning of the run, in the order the stages gave them. */
  warnings: RunWarning[];
}

function meanSd(a: Float64Array): Quantity {
  let s = 0;
  for (const x of a) s += x;
  const m = s / a.length;
  let v = 0;
  for (const x of a) v += (x - m) ** 2;
  return quantity(m, a.length > 1 ? Math.sqrt(v / (a.length - 1)) : undefined, '°C');
}

function regions(r: VideoRunRecordInput): RunResult['regions'] {
  const { o, clip } = r;
  return {
    beam: clip.beamRect, beamAuto: clip.beamAuto,
    ...(o.darkRoi ? { dark: o.darkRoi } : {}),
    ...(!o.darkRoi && clip.haveSurround && clip.geom ? { surround: clip.geom.b1 } : {}),
    ...(o.referenceRoi ? { reference: o.referenceRoi } : {}),
  };
}

function fitRecord(r: VideoRunRecordInput): RunResult['fit'] {
  const { fit } = r.fitted;
  return {
    converged: fit.converged, iterations: fit.iterations, reason: fit.reason, residualRms: fit.residualRms, degreesOfFreedom: fit.degreesOfFreedom,
    starts: fit.starts, robust: r.o.robust === false ? 'none' : 'huber', residualAutocorrelation: fit.residualAutocorrelation,
    errorInflation: fit.errorInflation, effectiveFrames: fit.effectiveFrames, startResults: fit.startResults, residualOverFrameNoise: fit.residualRms / r.budget.frameNoise,
  };
}

function scatter(r: VideoRunRecordInput): NonNullable<RunResult['scatter']> {
  return { ...(r.haloToCoreRatio ? { haloToCoreRatio: r.haloToCoreRatio } : {}), ...r.figures.scatter };
}

export function videoRunRecord(r: VideoRunRecordInput): RunResult {
  const { o, provenance: p, clip, cell, log, fitted, derived, budget, synced } = r;
  const { fit } = fitted;
  return buildRunRecord({
    label: o.label ?? basename(o.videoPath), createdAt: p.createdAt, source: 'video',
    tool: { name: 'kerrtrace', version: p.toolVersion, ffmpegVersion: p.ffmpegVersion, node: p.nodeVersion },
    inputs: p.inputs,
    options: { ...o },
    cell: { lengthM: cell.lengthM, effectiveLengthM: cell.effectiveLengthM, gapM: cell.gapM, polariserAngleDeg: cell.polariserAngleDeg, electrodeHeightM: cell.electrodeHeightM, wavelengthNm: o.wavelengthNm ?? null },
    camera: { width: clip.info.width, height: clip.info.height, fps: clip.info.meanFps, variableFrameRate: clip.info.variableFrameRate, transfer: clip.decoding.transfer, range: clip.decoding.range, bitsPerPixel: r.bitsPerPixel },
    regions: regions(r),
    figures: {
      kerrConstant: fit.kerrConstant, halfWaveVoltage: fit.halfWaveVoltage,
      syncOffset: quantity(synced.offsetS, budget.offsetStdErrS, 's'),
      floorFraction: derived.floorFraction, contrastRatio: derived.contrastRatio,
    },
    uncertainty: budget.uncertainty, validity: budget.validity,
    identifiable: fit.identifiable,
    identifiability: { ampVpiCorrelation: fit.ampVpiCorrelation, relStdErrB: fit.relStdErrB, maxVoltageOverHalfWave: fit.maxVoltageOverHalfWave, openLevelUsed: r.openLevelUsed },
    model: {
      darkLevel: 0, floorLevel: fit.floorLevel, amplitude: fit.amplitude, kerrConstant: fit.kerrConstant, effectiveLengthM: cell.effectiveLengthM, gapM: cell.gapM,
      polariserAngleDeg: cell.polariserAngleDeg, staticRetardanceRad: cell.staticRetardanceRad ?? 0,
    },
    fit: fitRecord(r), linearised: derived.linearised, sync: synced.sync,
    frames: { total: r.trace.trace.length, used: r.trace.usedCount, excluded: r.trace.excludedCounts },
    events: r.events,
    log: { rows: log.rows, spanS: log.timeS[log.rows - 1]! - log.timeS[0]!, currentColumn: log.currentA !== null, temperatureC: log.temperatureC ? meanSd(log.temperatureC) : null },
    warnings: r.warnings,
    extras: {
      scatter: scatter(r),
      ...(r.figures.hysteresis ? { hysteresis: r.figures.hysteresis } : {}),
      ...(r.figures.conductivity ? { conductivity: r.figures.conductivity } : {}),
      ...(derived.channels ? { channels: derived.channels } : {}),
      cameraResponse: derived.cameraResponse,
      ...(derived.floorFractionTerms ? { floorFractionTerms: derived.floorFractionTerms } : {}),
    },
    files: p.files,
  });
}
