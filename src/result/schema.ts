/**
 * The shape of result.json, written by `analyze` (and `stills`), read by `compare` and the reports.
 * One source of truth for the type. Every physical number is a Quantity {value, stdErr?, unit?},
 * SI units; where a bare number is used its unit is in the field name.
 */
import type { Quantity } from '../quantity.js';
import type { Rect } from '../core/regions/rect.js';
import type { InputName } from '../core/inputName.js';

// The vocabularies of warnings and left-out frames (lists with meanings in their own files).
export type { WarningCode } from './warningCode.js';
export type { ExclusionReason } from './exclusionReason.js';
import type { UncertaintyBudget } from '../core/uncertainty/uncertaintyBudget.js';
import type { FloorFractionTerms } from '../core/figures/floorFraction.js';

/**
 * 2: kerrConstant.stdErr and halfWaveVoltage.stdErr are the combined standard uncertainties of the
 * budget in `uncertainty` (version 1 had the statistical error alone); `validity` added.
 */
export const RESULT_SCHEMA_VERSION = 2;

/** Result schema versions `compare` still reads (1 lacks `uncertainty` and `validity`). */
export const READABLE_RESULT_SCHEMA_VERSIONS: readonly number[] = [1, 2];

/** A gate a run failed before its figures could be trusted (see docs/analyze.md, "Gates"). */
export interface RunGateFailure {
  /** Stable code, e.g. "residual-excess", "fit-not-converged", "sync-ambiguous". */
  gate: string;
  message: string;
  /** The user's inputs the message asks to give or check (e.g. ["openLevel"]); absent when none. */
  inputs?: InputName[];
}

export interface RunWarning {
  /**
   * Stable code, e.g. "exposure-drift", "clipping", "sync-ambiguous", "not-identifiable": one of
   * `WarningCode` (src/result/warningCode.ts, with meanings). Typed `string` because a result read
   * back from disk may hold any text; writers should build their codes as `WarningCode`.
   */
  code: string;
  message: string;
  /** Anchor of the matching section in docs/recording-a-run.md, e.g. "lock-exposure". */
  guideSection?: string;
  /** The user's inputs the message asks to give or check (e.g. ["gap", "length"]); absent when none. */
  inputs?: InputName[];
}

export interface RunEvent {
  kind: 'spark' | 'particle' | 'clipped' | 'exposure-jump';
  frameIndex: number;
  timeS: number;
  /** Size of the excursion in robust standard deviations (or clipped fraction for "clipped"). */
  size: number;
}

export interface InputFile {
  path: string;
  sha256: string;
}

export interface FitModelParams {
  /** Dark-subtracted model: I = I_floor + I_amp·sin²(2θ)·sin²(δ/2) (+ I_dark when no dark region). */
  darkLevel: number; // linear units, subtracted before the fit (0 when not measured)
  floorLevel: Quantity; // I_floor (linear units)
  amplitude: Quantity; // I_amp (linear units)
  kerrConstant: Quantity; // m/V^2
  effectiveLengthM: number;
  gapM: number;
  polariserAngleDeg: number;
  staticRetardanceRad: number;
}

export interface RunResult {
  schemaVersion: 1 | typeof RESULT_SCHEMA_VERSION;
  kind: 'kerrtrace-run';
  label: string;
  createdAt: string; // ISO-8601
  /** "video" for analyze, "stills" for the photo-series command. */
  source: 'video' | 'stills';
  tool: { name: 'kerrtrace'; version: string; ffmpegVersion: string | null; node: string };
  inputs: { video?: InputFile; volts?: InputFile; openVideo?: InputFile; stills?: InputFile[]; baseline?: InputFile; cameraProfile?: InputFile };
  options: Record<string, unknown>;
  cell: {
    lengthM: number;
    effectiveLengthM: number;
    gapM: number;
    polariserAngleDeg: number;
    electrodeHeightM: number | null;
    wavelengthNm: number | null;
  };
  camera: {
    width: number;
    height: number;
    fps: number | null;
    variableFrameRate: boolean;
    transfer: string;
    range: string;
    /** File bits per pixel per frame (size·8/(frames·width·height)); low values mean starved compression (version 2). */
    bitsPerPixel?: number;
  };
  regions: { beam: Rect; beamAuto: boolean; dark?: Rect; surround?: Rect; reference?: Rect };

  // Headline figures (required by the analyze interface)
  kerrConstant: Quantity; // m/V^2
  halfWaveVoltage: Quantity; // V
  syncOffset: Quantity; // s, video time minus log time of the same instant
  floorFraction: Quantity; // I_floor / I_amp
  contrastRatio: Quantity; // highest / lowest fitted dark-subtracted intensity over the recorded range
  quarterWaveVoltage: Quantity; // V

  /**
   * Uncertainty budget (GUM): each term, the combined standard uncertainty (= the stdErr of
   * kerrConstant and halfWaveVoltage) and the expanded uncertainty (k = 2). Absent in version 1.
   */
  uncertainty?: { kerrConstant: UncertaintyBudget; halfWaveVoltage: UncertaintyBudget };
  /**
   * Whether the figures passed every gate. A run that fails one is still written, marked not valid
   * with its reasons, and `analyze` exits 3. Absent in version 1.
   */
  validity?: { valid: boolean; failures: RunGateFailure[] };

  /** False when I_amp and V_π cannot be told apart (sweep too low, no open level): B is then not reported as a number. */
  identifiable: boolean;
  identifiability: { ampVpiCorrelation: number; relStdErrB: number; maxVoltageOverHalfWave: number; openLevelUsed: boolean };

  model: FitModelParams;
  fit: {
    converged: boolean;
    iterations: number;
    reason: string;
    residualRms: number;
    degreesOfFreedom: number;
    starts: number;
    robust: 'huber' | 'none';
    /** Lag-1 autocorrelation of the residuals and the factor by which every standard error was widened for it. */
    residualAutocorrelation: number;
    errorInflation: number;
    /** Effective number of independent frames behind V_π (version 2). */
    effectiveFrames?: number;
    /** Every start's final residual and status (version 2). */
    startResults?: { rss: number; converged: boolean; reason: string; halfWaveV: number }[];
    /** Residual RMS over the frame-to-frame noise of the intensity (version 2; see the residual gate). */
    residualOverFrameNoise?: number;
  };
  /** Classic reduction: V² against 2·arcsin√T on the first branch. */
  linearised: { kerrConstant: Quantity; points: number; agreesWithFit: boolean; zScore: number } | null;
  sync: {
    manual: boolean;
    offsetS: number;
    /** Width of the optimum: mean distance either side at which the agreement (R²) drops by 0.01, s. */
    sharpnessS: number | null;
    ambiguous: boolean;
    /** Agreement (e.g. R² of the model) against trial offset, for the report's sync plot. */
    curve: { offsetS: number[]; score: number[] };
  };
  /** Frames counted by reason left out; keys are `ExclusionReason`s (src/result/exclusionReason.ts). */
  frames: { total: number; used: number; excluded: Record<string, number> };
  events: RunEvent[];
  log: { rows: number; spanS: number; currentColumn: boolean; temperatureC: Quantity | null };
  scatter?: {
    haloToCoreRatio?: Quantity;
    particleEventRate?: Quantity; // per minute
    floorFlicker?: Quantity; // relative std of the zero-field floor
    polariserLeakFraction?: Quantity;
    scatterFloorFraction?: Quantity;
  };
  hysteresis?: { up: Quantity; down: Quantity; difference: Quantity; zScore: number; flagged: boolean };
  conductivity?: { resistivity: Quantity; joulePower: Quantity; readable: boolean; note?: string };
  channels?: { r: Quantity; g: Quantity; b: Quantity; note: string };
  /**
   * Which camera response turned code values into light, and the run's own check of it
   * (docs/camera-response.md). `check.standardUncertainty` is the named uncertainty term
   * "cameraResponse" for the uncertainty budget (m/V², a standard uncertainty of B).
   */
  cameraResponse?: CameraResponseRecord;
  /**
   * The floor fraction's uncertainty terms, each a standard uncertainty of the fraction
   * (core/figures/floorFraction: fit, camera response, surround, compression for video); their
   * root sum of squares is floorFraction.stdErr. Absent in older results.
   */
  floorFractionTerms?: FloorFractionTerms;
  warnings: RunWarning[];
  /** Files written beside result.json, relative names. */
  files: Record<string, string>;
}

/** The camera response a run used and its check (see RunResult.cameraResponse). */
export interface CameraResponseRecord {
  /** 'tags': the transfer the file declares; 'option': --transfer; 'profile': a measured camera profile. */
  route: 'tags' | 'option' | 'profile';
  /** The transfer curve in use (with a profile: what the tags said, recorded only). */
  transfer: string;
  matrix: string;
  bitDepth: number;
  profile?: {
    path: string;
    createdAt: string;
    camera: Record<string, string>;
    /** RMS of the profile's own fit, relative to its full light range. */
    residualRms: number;
    /** Code values the profile was measured over (outside: extended linearly). */
    codeRange: [number, number];
  };
  check: {
    checked: boolean;
    reason: string | null;
    gamma: { value: number; stdErr: number };
    kerrConstantAtGamma: { value: number; stdErr: number; unit: 'm/V^2' };
    relativeShiftB: number;
    standardUncertainty: { value: number; unit: 'm/V^2' };
    departs: boolean;
    /** RMS error of γ = 1 under what is known of γ (the floor fraction's camera-response term uses it); absent in older results. */
    gammaUncertainty?: number;
  };
}

/** One row of trace.csv (and the in-memory trace handed to the report). */
export interface TraceRow {
  frameIndex: number;
  timeS: number; // video time
  voltageV: number | null; // log interpolated at (timeS − offset); null outside the log
  intensity: number; // measured, linear units, dark-subtracted and exposure-normalised
  model: number | null;
  residual: number | null;
  used: boolean;
  excludedReason: string | null; // an ExclusionReason (src/result/exclusionReason.ts): "outside-log", "spark", "particle", "clipped", ...
}
