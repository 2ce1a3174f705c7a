/**
 * The uncertainty budget of the Kerr constant B and the half-wave voltage V_π, GUM style
 * (JCGM 100:2008, "Evaluation of measurement data — Guide to the expression of uncertainty in
 * measurement"): each input's relative standard uncertainty times its sensitivity exponent, the
 * terms combined in quadrature (§5.1.2, uncorrelated inputs; for a product of powers the relative
 * form §5.1.6 applies), and the expanded uncertainty U = k·u_c with k = 2 (§6.2, about 95 % for a
 * near-normal result).
 *
 * Model: B = d²/(2·L_eff·V_π²), V_π measured in the logger's volts. So
 *   u_r(V_π)² = u_r,stat² + u_r,sync² + u_r,ramp² + u_r,open² + u_r,V²     (+ (½·u_r,cam)² + (½·u_r,comp)² when given)
 *   u_r(B)²   = (2·u_r,stat)² + (2·u_r,sync)² + (2·u_r,ramp)² + (2·u_r,open)² + (2·u_r,V)² + (2·u_r(d))² + u_r(L)² + u_r,cam² + u_r,comp²
 * where u_r,stat is V_π's statistical relative error (correlated residuals accounted for),
 * u_r,sync the change of V_π when the sync offset moves by its standard uncertainty,
 * u_r,ramp the systematic that rising and falling ramps show by disagreeing beyond their
 * statistics (a Type B estimate from varied conditions, GUM §4.3; 0 when they agree),
 * u_r,open the change of V_π when a given open level (the amplitude held fixed) moves by its
 * standard uncertainty (present only when an open level was used),
 * u_r,V the voltage calibration (a logger reading wrong by a factor scales V_π by that factor),
 * u_r(d), u_r(L) the gap and length tolerances, and u_r,cam the camera-response term on B (from
 * the response check of the camera work, when it ran), and u_r,comp the compression term on B
 * (compressionTerm.ts; video only).
 *
 * Terms that belong to the instrument and the cell, not to the run — voltage calibration, gap,
 * length — are the same for every run of one cell with one logger: they cancel in the ratio of a
 * before/after of that cell (`sharedWithinCell`). Pure; throws nothing (negative or non-finite
 * inputs are treated as absent and their term is 0 with the note saying so).
 * @example kerrUncertaintyBudget({ kerrConstant: 2.2e-12, halfWaveVoltageV: 9800, statisticalRel: 0.001,
 *   syncRel: 0.0005, voltageCalibrationRel: 0.00577, gapRel: 0.0072, lengthRel: 0.0014 })
 *   .kerrConstant.relativeCombined ≈ 0.0186
 */
export type UncertaintyTermName = 'statistical' | 'sync' | 'ramp-consistency' | 'open-level' | 'voltage-calibration' | 'gap' | 'length' | 'camera-response' | 'compression';

export interface UncertaintyTerm {
  name: UncertaintyTermName;
  /** Relative standard uncertainty of the input quantity (dimensionless). */
  inputRelative: number;
  /** Sensitivity exponent: the figure goes as input^sensitivity. */
  sensitivity: number;
  /** |sensitivity|·inputRelative: this term's relative standard uncertainty on the figure. */
  relative: number;
  /** Same for every run of one cell with one instrument (cancels in a before/after of that cell). */
  sharedWithinCell: boolean;
  /** How the input's uncertainty was obtained. */
  note: string;
}

export interface UncertaintyBudget {
  value: number;
  unit: string;
  terms: UncertaintyTerm[];
  /** Statistical term alone (fit with correlated residuals), absolute. */
  statisticalStdErr: number;
  /** Combined standard uncertainty u_c, absolute and relative. */
  combinedStdErr: number;
  relativeCombined: number;
  /** Relative combined uncertainty of the terms that do not cancel between runs of one cell. */
  relativeRunToRun: number;
  coverageFactor: number;
  /** U = k·u_c, absolute. */
  expandedUncertainty: number;
}

export interface BudgetInput {
  kerrConstant: number;
  halfWaveVoltageV: number;
  /** Relative statistical standard error of V_π. */
  statisticalRel: number;
  /** Relative change of V_π for a 1σ change of the sync offset (0 when the offset was given). */
  syncRel: number;
  syncNote?: string;
  /**
   * Relative systematic on V_π shown by rising and falling ramps disagreeing beyond their
   * statistics (compression lag, space charge, drift): √max(0, (ΔV_π/2)² − σ(ΔV_π/2)²)/V_π. 0 when
   * not measurable.
   */
  rampRel?: number;
  rampNote?: string;
  /**
   * Relative change of V_π for a 1σ change of the open level the amplitude was held at; with
   * `openLevelNote` the term is listed (0 when the open level's uncertainty is not given), without
   * it (no open level used) it is left out.
   */
  openLevelRel?: number;
  openLevelNote?: string;
  /** Relative standard uncertainty of the logger's voltage reading. */
  voltageCalibrationRel: number;
  voltageCalibrationNote?: string;
  gapRel: number;
  gapNote?: string;
  lengthRel: number;
  lengthNote?: string;
  /** Relative standard uncertainty that the camera response puts on B (optional). */
  cameraResponseRel?: number;
  cameraResponseNote?: string;
  /** Relative standard uncertainty that lossy video coding puts on B (optional; compressionTerm.ts). */
  compressionRel?: number;
  compressionNote?: string;
}

export const COVERAGE_FACTOR = 2;

const clean = (x: number | undefined): number => (x !== undefined && Number.isFinite(x) && x > 0 ? x : 0);

function term(name: UncertaintyTermName, inputRelative: number, sensitivity: number, sharedWithinCell: boolean, note: string): UncertaintyTerm {
  const r = clean(inputRelative);
  return { name, inputRelative: r, sensitivity, relative: Math.abs(sensitivity) * r, sharedWithinCell, note };
}

function combine(value: number, unit: string, terms: UncertaintyTerm[]): UncertaintyBudget {
  const rel = Math.sqrt(terms.reduce((s, t) => s + t.relative ** 2, 0));
  const runToRun = Math.sqrt(terms.filter((t) => !t.sharedWithinCell).reduce((s, t) => s + t.relative ** 2, 0));
  const stat = terms.find((t) => t.name === 'statistical')?.relative ?? 0;
  const combined = Math.abs(value) * rel;
  return {
    value, unit, terms,
    statisticalStdErr: Math.abs(value) * stat,
    combinedStdErr: combined,
    relativeCombined: rel,
    relativeRunToRun: runToRun,
    coverageFactor: COVERAGE_FACTOR,
    expandedUncertainty: COVERAGE_FACTOR * combined,
  };
}

export function kerrUncertaintyBudget(i: BudgetInput): { kerrConstant: UncertaintyBudget; halfWaveVoltage: UncertaintyBudget } {
  const statNote = 'least-squares fit, widened for residuals correlated between frames (effective number of independent frames)';
  const syncNote = i.syncNote ?? 'V_π refitted at the sync offset ± its standard uncertainty';
  const vNote = i.voltageCalibrationNote ?? 'logger accuracy, percent of reading';
  const gNote = i.gapNote ?? 'gap tolerance';
  const lNote = i.lengthNote ?? 'length tolerance';
  const camNote = i.cameraResponseNote ?? 'camera response check';
  const rampNote = i.rampNote ?? 'rising and falling ramps not compared';
  const hasCam = i.cameraResponseRel !== undefined;
  const hasOpen = i.openLevelNote !== undefined;
  const hasComp = i.compressionRel !== undefined;
  const compNote = i.compressionNote ?? 'lossy video coding';
  const vpiTerms = [
    term('statistical', i.statisticalRel, 1, false, statNote),
    term('sync', i.syncRel, 1, false, syncNote),
    term('ramp-consistency', clean(i.rampRel), 1, false, rampNote),
    ...(hasOpen ? [term('open-level', clean(i.openLevelRel), 1, false, i.openLevelNote!)] : []),
    term('voltage-calibration', i.voltageCalibrationRel, 1, true, vNote),
    ...(hasCam ? [term('camera-response', clean(i.cameraResponseRel) / 2, 1, false, camNote)] : []),
    ...(hasComp ? [term('compression', clean(i.compressionRel) / 2, 1, false, compNote)] : []),
  ];
  const bTerms = [
    term('statistical', i.statisticalRel, -2, false, statNote),
    term('sync', i.syncRel, -2, false, syncNote),
    term('ramp-consistency', clean(i.rampRel), -2, false, rampNote),
    ...(hasOpen ? [term('open-level', clean(i.openLevelRel), -2, false, i.openLevelNote!)] : []),
    term('voltage-calibration', i.voltageCalibrationRel, -2, true, vNote),
    term('gap', i.gapRel, 2, true, gNote),
    term('length', i.lengthRel, -1, true, lNote),
    ...(hasCam ? [term('camera-response', clean(i.cameraResponseRel), 1, false, camNote)] : []),
    ...(hasComp ? [term('compression', clean(i.compressionRel), 1, false, compNote)] : []),
  ];
  return { kerrConstant: combine(i.kerrConstant, 'm/V^2', bTerms), halfWaveVoltage: combine(i.halfWaveVoltageV, 'V', vpiTerms) };
}

/**
 * Relative standard uncertainty of a quantity known to lie within ±halfWidth of its value
 * (a tolerance or an accuracy specification), taken as a rectangular distribution:
 * u = a/√3 (JCGM 100:2008 §4.3.7). Returns 0 for a zero or missing half-width.
 * @example rectangularRelative(0.05, 4) ≈ 0.00722
 */
export function rectangularRelative(halfWidth: number | undefined, value: number): number {
  if (!(halfWidth !== undefined && halfWidth > 0 && value > 0)) return 0;
  return halfWidth / Math.sqrt(3) / value;
}
