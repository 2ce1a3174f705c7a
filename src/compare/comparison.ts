/**
 * The shape of comparison.json, written by `kerrtrace compare` and returned by compareRuns.
 * Figures keep SI values (as in result.json); display units live in src/report/figureCatalogue.ts.
 * Every change is between consecutive runs (run i−1 → run i).
 */
import type { Quantity } from '../quantity.js';
import type { FigureKey } from '../report/figureCatalogue.js';
import type { InputFile, RunResult, RunWarning } from '../result/schema.js';

export const COMPARISON_SCHEMA_VERSION = 1;

export interface ComparedRun {
  label: string;
  /** The result file this run came from (path and SHA-256), when read from disk. */
  source: InputFile | null;
  resultLabel: string;
  createdAt: string;
  identifiable: boolean;
  cell: RunResult['cell'];
  camera: RunResult['camera'];
  temperatureC: Quantity | null;
  inputs: RunResult['inputs'];
  warningCount: number;
}

export interface FigureSeries {
  key: FigureKey;
  name: string;
  /** SI unit of the values ("" for ratios). */
  unit: string;
  /** One entry per run; null when the run does not report this figure. */
  values: (Quantity | null)[];
  /** True where the run could not separate B from brightness, so the value is not used. */
  withheld: boolean[];
}

export type ChangeVerdict = 'rose' | 'fell' | 'no-change' | 'not-comparable';

export interface FigureChange {
  key: FigureKey;
  name: string;
  fromRun: number;
  toRun: number;
  /** b − a with σ = √(σa² + σb²) (SI unit of the figure). */
  change: Quantity | null;
  /** b/a − 1 with first-order σ; null where a relative change means nothing (a = 0, or a signed difference). */
  relativeChange: Quantity | null;
  /** (b − a)/√(σa² + σb²); null without both uncertainties. */
  zScore: number | null;
  verdict: ChangeVerdict;
  /** Plain words, e.g. "the floor fraction fell by 62% ± 9%". */
  text: string;
}

export interface Comparison {
  schemaVersion: typeof COMPARISON_SCHEMA_VERSION;
  kind: 'kerrtrace-comparison';
  runs: ComparedRun[];
  figures: FigureSeries[];
  changes: FigureChange[];
  /** One sentence per consecutive pair of runs. */
  verdicts: string[];
  warnings: RunWarning[];
  allowDifferentCells: boolean;
}
