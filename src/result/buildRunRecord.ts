/**
 * The one builder of a run record (result.json, `RunResult`) for video and photo runs: every part
 * is passed in, already computed, and the record is assembled whole, once; nothing is read back
 * or patched afterwards. The builder itself reads no clock, process or file: the caller passes
 * the time of the run (`createdAt`), the tool versions and the input hashes.
 *
 * What it derives, so that every source states them the same way:
 * - kerrConstant and halfWaveVoltage: the fit's values with the combined standard uncertainty of
 *   the budget (`uncertainty.*.combinedStdErr`, GUM), units "m/V^2" and "V";
 * - quarterWaveVoltage = V_π/√2 with σ/√2 (the retardance goes as V², so π/2 is reached at
 *   V_π/√2);
 * - events in frame order (a copy), warnings and files copied.
 * Schema: src/result/schema.ts (RESULT_SCHEMA_VERSION). Pure; throws nothing.
 * @example const result = buildRunRecord({ label: 'run1', createdAt, source: 'stills', tool, inputs, ... });
 */
import { quantity, type Quantity } from '../quantity.js';
import { RESULT_SCHEMA_VERSION, type FitModelParams, type RunEvent, type RunResult, type RunWarning } from './schema.js';

export interface RunFigures {
  /** B from the fit (its statistical error is replaced by the budget's combined one). */
  kerrConstant: Quantity;
  /** V_π from the fit (likewise). */
  halfWaveVoltage: Quantity;
  syncOffset: Quantity;
  floorFraction: Quantity;
  contrastRatio: Quantity;
}

export interface RunRecordParts {
  label: string;
  /** ISO-8601 time of the run, from the caller's clock. */
  createdAt: string;
  source: RunResult['source'];
  tool: RunResult['tool'];
  inputs: RunResult['inputs'];
  options: Record<string, unknown>;
  cell: RunResult['cell'];
  camera: RunResult['camera'];
  regions: RunResult['regions'];
  figures: RunFigures;
  uncertainty: NonNullable<RunResult['uncertainty']>;
  validity: NonNullable<RunResult['validity']>;
  identifiable: boolean;
  identifiability: RunResult['identifiability'];
  model: FitModelParams;
  fit: RunResult['fit'];
  linearised: RunResult['linearised'];
  sync: RunResult['sync'];
  frames: RunResult['frames'];
  events: readonly RunEvent[];
  log: RunResult['log'];
  warnings: readonly RunWarning[];
  files?: Record<string, string>;
  /** Optional sections some sources have. */
  extras?: Pick<RunResult, 'scatter' | 'hysteresis' | 'conductivity' | 'channels' | 'cameraResponse' | 'floorFractionTerms'>;
}

export function buildRunRecord(p: RunRecordParts): RunResult {
  const kerrConstant = quantity(p.figures.kerrConstant.value, p.uncertainty.kerrConstant.combinedStdErr, 'm/V^2');
  const halfWaveVoltage = quantity(p.figures.halfWaveVoltage.value, p.uncertainty.halfWaveVoltage.combinedStdErr, 'V');
  return {
    schemaVersion: RESULT_SCHEMA_VERSION,
    kind: 'kerrtrace-run',
    label: p.label,
    createdAt: p.createdAt,
    source: p.source,
    tool: p.tool,
    inputs: p.inputs,
    options: p.options,
    cell: p.cell,
    camera: p.camera,
    regions: p.regions,
    kerrConstant,
    halfWaveVoltage,
    uncertainty: p.uncertainty,
    validity: p.validity,
    quarterWaveVoltage: quantity(halfWaveVoltage.value / Math.SQRT2, (halfWaveVoltage.stdErr ?? NaN) / Math.SQRT2, 'V'),
    syncOffset: p.figures.syncOffset,
    floorFraction: p.figures.floorFraction,
    contrastRatio: p.figures.contrastRatio,
    identifiable: p.identifiable,
    identifiability: p.identifiability,
    model: p.model,
    fit: p.fit,
    linearised: p.linearised,
    sync: p.sync,
    frames: p.frames,
    events: [...p.events].sort((a, b) => a.frameIndex - b.frameIndex),
    log: p.log,
    warnings: [...p.warnings],
    ...(p.extras ?? {}),
    files: { ...(p.files ?? {}) },
  };
}
