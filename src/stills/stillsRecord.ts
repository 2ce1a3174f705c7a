/**
 * The JSON record of a stills run (stills.json, also printed by `kerrtrace stills --json`): cell
 * geometry, options, one entry per photo, the fit's figures as Quantities {value, stdErr?, unit?}
 * in SI units, warnings and notes. When the fit cannot tell B apart from brightness
 * (`identifiable: false`) the Kerr constant and half-wave voltage are null, not misleading numbers.
 * Pure: the caller supplies the clock (createdAt) and the inputs' hashes.
 * @example stillsRecord({ series, fit, folder: 'run1', ... }).fit?.kerrConstant // { value: 2.4e-12, stdErr: 3e-14, unit: 'm/V^2' }
 */
import type { Quantity } from '../quantity.js';
import type { InputFile } from '../result/schema.js';
import type { StillsSeries } from './readStillsSeries.js';
import type { StillsFit } from './fitStillsSeries.js';

export const STILLS_RECORD_VERSION = 1;

export interface StillsRecordInput {
  series: StillsSeries;
  fit: StillsFit;
  folder: string;
  createdAt: string;
  toolVersion: string;
  options: Record<string, unknown>;
  cell: { lengthM: number; effectiveLengthM: number; gapM: number; polariserAngleDeg: number };
  inputs: { photos: InputFile[]; volts: InputFile | null };
}

export interface StillsRecord {
  schemaVersion: typeof STILLS_RECORD_VERSION;
  kind: 'kerrtrace-stills';
  createdAt: string;
  tool: { name: 'kerrtrace'; version: string };
  folder: string;
  inputs: StillsRecordInput['inputs'];
  options: Record<string, unknown>;
  cell: StillsRecordInput['cell'];
  camera: { width: number; height: number; transfers: string[]; bitDepths: number[] };
  regions: { beam: StillsSeries['roi']; beamIsWholePhoto: boolean };
  exposureBasis: StillsSeries['exposureBasis'];
  voltageSource: StillsSeries['voltageSource'];
  photos: Array<{
    file: string;
    voltageV: number;
    intensity: number;
    roiLinear: number;
    darkLinear: number | null;
    referenceLinear: number | null;
    exposureRelative: number;
    clippedFraction: number;
    used: boolean;
    excludedReason: string | null;
    model: number | null;
  }>;
  leftOut: StillsSeries['leftOut'];
  fit: {
    identifiable: boolean;
    kerrConstant: Quantity | null;
    halfWaveVoltage: Quantity | null;
    floorLevel: Quantity;
    amplitude: Quantity;
    floorFraction: Quantity | null;
    identifiability: { ampVpiCorrelation: number; relStdErrB: number; maxVoltageOverHalfWave: number };
    converged: boolean;
    iterations: number;
    reason: string;
    residualRms: number;
    degreesOfFreedom: number;
    starts: number;
    photosUsed: number;
    excluded: Record<string, number>;
  } | null;
  noFitReason: string | null;
  warnings: string[];
  notes: string[];
}

const finiteOrNull = (x: number | undefined): number | null => (x !== undefined && Number.isFinite(x) ? x : null);

export function stillsRecord(r: StillsRecordInput): StillsRecord {
  const { series, fit } = r;
  const f = fit.fit;
  return {
    schemaVersion: STILLS_RECORD_VERSION,
    kind: 'kerrtrace-stills',
    createdAt: r.createdAt,
    tool: { name: 'kerrtrace', version: r.toolVersion },
    folder: r.folder,
    inputs: r.inputs,
    options: r.options,
    cell: r.cell,
    camera: { width: series.width, height: series.height, transfers: series.transfers, bitDepths: series.bitDepths },
    regions: { beam: series.roi, beamIsWholePhoto: series.roiIsWholeFrame },
    exposureBasis: series.exposureBasis,
    voltageSource: series.voltageSource,
    photos: series.files.map((file, i) => ({
      file,
      voltageV: series.voltageV[i]!,
      intensity: series.intensity[i]!,
      roiLinear: series.roiLinear[i]!,
      darkLinear: finiteOrNull(series.darkLinear?.[i]),
      referenceLinear: finiteOrNull(series.referenceLinear?.[i]),
      exposureRelative: series.exposureRelative[i]!,
      clippedFraction: series.clippedFraction[i]!,
      used: fit.used[i] === 1,
      excludedReason: fit.excludedReason[i] ?? null,
      model: finiteOrNull(fit.model[i]),
    })),
    leftOut: series.leftOut,
    fit: f === null ? null : {
      identifiable: f.identifiable,
      kerrConstant: f.identifiable ? f.kerrConstant : null,
      halfWaveVoltage: f.identifiable ? f.halfWaveVoltage : null,
      floorLevel: f.floorLevel,
      amplitude: f.amplitude,
      floorFraction: fit.floorFraction,
      identifiability: { ampVpiCorrelation: f.ampVpiCorrelation, relStdErrB: f.relStdErrB, maxVoltageOverHalfWave: f.maxVoltageOverHalfWave },
      converged: f.converged,
      iterations: f.iterations,
      reason: f.reason,
      residualRms: f.residualRms,
      degreesOfFreedom: f.degreesOfFreedom,
      starts: f.starts,
      photosUsed: fit.used.reduce((a, b) => a + b, 0),
      excluded: fit.excluded,
    },
    noFitReason: fit.noFitReason,
    warnings: series.warnings,
    notes: series.notes,
  };
}
