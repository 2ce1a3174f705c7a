/**
 * Electrical and optical design figures of a parallel-plate liquid Kerr cell for one Kerr
 * constant. Pure: numbers in, numbers out; SI units throughout.
 *
 * Formulas (Kerr law Δn = λ·B·E², field E = V/d between plates, see src/core/physics/kerr.ts):
 * - half-wave voltage V_π = d/√(2·B·L_eff); quarter-wave voltage V_π/√2;
 * - half-wave field E_π = V_π/d = 1/√(2·B·L_eff), quarter-wave field E_π/√2 = 1/(2·√(B·L_eff))
 *   (note: the field needed does not depend on the gap, only on B and the length);
 * - capacitance of parallel plates C = ε0·εr·L·h/d (L electrode length, h electrode height,
 *   fringe capacitance neglected), ε0 = 8.8541878128e-12 F/m (CODATA 2018);
 * - stored energy at half-wave ½·C·V_π², stored charge C·V_π;
 * - RC charging through the source resistance: τ = R·C, 10–90 % rise ln(9)·τ ≈ 2.2·τ;
 * - mean charging current for a linear rise to V_π in t_rise: I = C·V_π/t_rise;
 * - breakdown margin = breakdown field / half-wave field (default breakdown field: air at sea
 *   level, 3 kV/mm = 3e6 V/m, common practice); below 1 a warning, below 2 a caution;
 * - inverse: the effective length that makes a target voltage the half-wave voltage,
 *   L_eff = d²/(2·B·V²).
 * Worked checks (test/design/designCell.test.ts): nitrobenzene 2.4e-10 cm/V² at 30 kV/cm needs
 * L ≈ 2.3 cm (J. Lux, "Electro-optical theory" web notes); B = 2.2e-10 cm/V², l = 10 cm gives
 * the quarter-wave field ≈ 1.1e4 V/cm (Irodov, Problems in General Physics).
 *
 * Throws KerrError BAD_ARGUMENT (via `invalid`) for a non-positive or non-finite input, naming
 * the command-line option it came from.
 * @example designCell({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM: 0.005 }).halfWaveVoltage
 *   // { value: 10206.2, unit: 'V' }
 */
import { invalid } from '../errors.js';
import { quantity, type Quantity } from '../quantity.js';
import { halfWaveFieldVPerM, halfWaveVoltageV, quarterWaveFieldVPerM } from '../core/physics/kerr.js';

/** Vacuum permittivity ε0 in F/m (CODATA 2018). */
export const VACUUM_PERMITTIVITY_F_PER_M = 8.8541878128e-12;

/** Dielectric strength of air at sea level, 3 kV/mm (common practice). */
export const AIR_BREAKDOWN_V_PER_M = 3e6;

/** 10–90 % rise of a first-order (RC) step response, in units of τ: ln 9 ≈ 2.197. */
export const RISE_10_90_PER_TAU = Math.log(9);

export interface CellDesignInput {
  kerrConstantMPerV2: number;
  /** Electrode length along the beam (sets the capacitance). */
  lengthM: number;
  /** Optical effective length (fringe fields lengthen it); default lengthM. */
  effectiveLengthM?: number;
  gapM: number;
  electrodeHeightM?: number;
  relativePermittivity?: number;
  sourceResistanceOhm?: number;
  riseTimeS?: number;
  /** Default AIR_BREAKDOWN_V_PER_M. */
  breakdownFieldVPerM?: number;
  /** Where the breakdown field came from, for the output. */
  breakdownBasis?: string;
  targetVoltageV?: number;
}

export type MarginLevel = 'ok' | 'caution' | 'warning';

export interface CellDesign {
  kerrConstant: Quantity; // m/V^2
  length: Quantity; // m
  effectiveLength: Quantity; // m
  gap: Quantity; // m
  electrodeHeight: Quantity | null; // m
  relativePermittivity: Quantity | null;
  halfWaveVoltage: Quantity; // V
  quarterWaveVoltage: Quantity; // V
  halfWaveField: Quantity; // V/m
  quarterWaveField: Quantity; // V/m
  capacitance: Quantity | null; // F
  storedEnergy: Quantity | null; // J at V_π
  storedCharge: Quantity | null; // C at V_π
  rcChargingTime: Quantity | null; // s, τ = R·C
  rcRiseTime10To90: Quantity | null; // s, ln 9·τ
  peakCurrent: Quantity | null; // A, C·V_π/t_rise
  breakdown: {
    field: Quantity; // V/m
    basis: string;
    margin: Quantity; // breakdown field / half-wave field
    level: MarginLevel;
  };
  /** Present when a target voltage was given. */
  target: {
    voltage: Quantity; // V
    effectiveLengthForHalfWave: Quantity; // m
    field: Quantity; // V/m at the target voltage
    breakdownMargin: Quantity;
    level: MarginLevel;
  } | null;
  warnings: string[];
  notes: string[];
}

const OPTION: Record<string, [string, string]> = {
  kerrConstantMPerV2: ['--kerr-constant', 'Kerr constant in m/V^2'],
  lengthM: ['--length-mm', 'electrode length'],
  effectiveLengthM: ['--effective-length-mm', 'effective length'],
  gapM: ['--gap-mm', 'electrode gap'],
  electrodeHeightM: ['--electrode-height-mm', 'electrode height'],
  relativePermittivity: ['--permittivity', 'relative permittivity (at least 1)'],
  sourceResistanceOhm: ['--source-resistance-ohm', 'source resistance in ohm'],
  riseTimeS: ['--rise-time-ns', 'rise time'],
  breakdownFieldVPerM: ['--breakdown-kv-per-mm', 'breakdown field'],
  targetVoltageV: ['--target-voltage-v', 'target voltage in V'],
};

function checkPositive(name: keyof typeof OPTION, value: number | undefined): void {
  if (value === undefined) return;
  const [option, what] = OPTION[name]!;
  if (!(Number.isFinite(value) && value > 0)) throw invalid(`a positive ${what}`, option, value);
}

function marginLevel(margin: number): MarginLevel {
  if (margin < 1) return 'warning';
  if (margin < 2) return 'caution';
  return 'ok';
}

const kvPerMm = (fieldVPerM: number): string => `${Number((fieldVPerM / 1e6).toPrecision(3))} kV/mm`;

export function designCell(input: CellDesignInput): CellDesign {
  for (const key of Object.keys(OPTION)) checkPositive(key, (input as unknown as Record<string, number | undefined>)[key]);
  if (input.relativePermittivity !== undefined && input.relativePermittivity < 1) {
    throw invalid('a relative permittivity of at least 1', '--permittivity', input.relativePermittivity, 'Relative permittivity is 1 for vacuum and larger for any liquid (about 35 for nitrobenzene)');
  }
  const warnings: string[] = [];
  const notes: string[] = [];
  const bMPerV2 = input.kerrConstantMPerV2;
  const lengthM = input.lengthM;
  const effectiveLengthM = input.effectiveLengthM ?? lengthM;
  const gapM = input.gapM;
  if (effectiveLengthM < lengthM) {
    warnings.push(`the effective length (${effectiveLengthM * 1e3} mm) is shorter than the electrode length (${lengthM * 1e3} mm); fringe fields usually make it longer, so check the numbers`);
  }

  const halfWaveV = halfWaveVoltageV(bMPerV2, effectiveLengthM, gapM);
  const quarterWaveV = halfWaveV / Math.SQRT2;
  const halfWaveFieldV = halfWaveFieldVPerM(bMPerV2, effectiveLengthM);
  const quarterWaveFieldV = quarterWaveFieldVPerM(bMPerV2, effectiveLengthM);

  // Capacitance and what follows from it.
  let capacitanceF: number | null = null;
  if (input.electrodeHeightM !== undefined && input.relativePermittivity !== undefined) {
    const plateAreaM2 = lengthM * input.electrodeHeightM;
    capacitanceF = (VACUUM_PERMITTIVITY_F_PER_M * input.relativePermittivity * plateAreaM2) / gapM;
  } else {
    const missing = [input.electrodeHeightM === undefined ? '--electrode-height-mm' : null, input.relativePermittivity === undefined ? '--permittivity (or a --liquid with a tabulated permittivity)' : null].filter((m) => m !== null);
    notes.push(`capacitance, stored energy and charging figures need ${missing.join(' and ')}`);
  }
  const storedEnergyJ = capacitanceF === null ? null : 0.5 * capacitanceF * halfWaveV * halfWaveV;
  const storedChargeC = capacitanceF === null ? null : capacitanceF * halfWaveV;
  let tauS: number | null = null;
  if (capacitanceF !== null && input.sourceResistanceOhm !== undefined) tauS = input.sourceResistanceOhm * capacitanceF;
  else if (capacitanceF !== null) notes.push('the RC charging time needs --source-resistance-ohm');
  const riseS = tauS === null ? null : RISE_10_90_PER_TAU * tauS;
  let peakCurrentA: number | null = null;
  if (capacitanceF !== null && input.riseTimeS !== undefined) {
    peakCurrentA = (capacitanceF * halfWaveV) / input.riseTimeS;
    if (riseS !== null && riseS > input.riseTimeS) {
      notes.push(`through the given source resistance the 10-90% rise takes ${Number((riseS * 1e9).toPrecision(3))} ns, longer than the requested ${Number((input.riseTimeS * 1e9).toPrecision(3))} ns`);
    }
  } else if (capacitanceF !== null) notes.push('the charging current needs --rise-time-ns');

  // Breakdown margin at half-wave.
  const breakdownVPerM = input.breakdownFieldVPerM ?? AIR_BREAKDOWN_V_PER_M;
  const breakdownBasis = input.breakdownBasis ?? (input.breakdownFieldVPerM === undefined ? 'air at sea level (common practice)' : 'as given');
  const margin = breakdownVPerM / halfWaveFieldV;
  const level = marginLevel(margin);
  const lowerFieldAdvice = 'a longer cell (the half-wave field falls as 1/sqrt(length)) or a liquid with a larger Kerr constant lowers the field needed; the gap does not change it';
  if (level === 'warning') {
    warnings.push(`this cell would need more field than the stated breakdown strength: half-wave needs ${kvPerMm(halfWaveFieldV)}, breakdown is ${kvPerMm(breakdownVPerM)} (${breakdownBasis}); ${lowerFieldAdvice}`);
  } else if (level === 'caution') {
    warnings.push(`caution: the half-wave field (${kvPerMm(halfWaveFieldV)}) is within a factor 2 of the stated breakdown strength (${kvPerMm(breakdownVPerM)}, ${breakdownBasis}); ${lowerFieldAdvice}`);
  }

  // Inverse: length for a target half-wave voltage.
  let target: CellDesign['target'] = null;
  if (input.targetVoltageV !== undefined) {
    const targetV = input.targetVoltageV;
    const neededLengthM = (gapM * gapM) / (2 * bMPerV2 * targetV * targetV);
    const targetFieldVPerM = targetV / gapM;
    const targetMargin = breakdownVPerM / targetFieldVPerM;
    const targetLevel = marginLevel(targetMargin);
    target = {
      voltage: quantity(targetV, undefined, 'V'),
      effectiveLengthForHalfWave: quantity(neededLengthM, undefined, 'm'),
      field: quantity(targetFieldVPerM, undefined, 'V/m'),
      breakdownMargin: quantity(targetMargin),
      level: targetLevel,
    };
    // When the cell is laid out at the target (same operating point) the half-wave warning already says it.
    const sameOperatingPoint = Math.abs(targetFieldVPerM - halfWaveFieldV) <= 1e-9 * halfWaveFieldV;
    if (sameOperatingPoint) {
      // nothing more to say
    } else if (targetLevel === 'warning') {
      warnings.push(`at the target voltage the field (${kvPerMm(targetFieldVPerM)}) exceeds the stated breakdown strength (${kvPerMm(breakdownVPerM)}): a wider gap lowers the field at this voltage but needs a longer cell (the length grows as the gap squared), and a liquid with a larger Kerr constant needs less field; never exceed the rating of the supply or the cell`);
    } else if (targetLevel === 'caution') {
      warnings.push(`caution: at the target voltage the field (${kvPerMm(targetFieldVPerM)}) is within a factor 2 of the stated breakdown strength (${kvPerMm(breakdownVPerM)})`);
    }
  }

  const q = (value: number | null, unit?: string): Quantity | null => (value === null ? null : quantity(value, undefined, unit));
  return {
    kerrConstant: quantity(bMPerV2, undefined, 'm/V^2'),
    length: quantity(lengthM, undefined, 'm'),
    effectiveLength: quantity(effectiveLengthM, undefined, 'm'),
    gap: quantity(gapM, undefined, 'm'),
    electrodeHeight: q(input.electrodeHeightM ?? null, 'm'),
    relativePermittivity: q(input.relativePermittivity ?? null),
    halfWaveVoltage: quantity(halfWaveV, undefined, 'V'),
    quarterWaveVoltage: quantity(quarterWaveV, undefined, 'V'),
    halfWaveField: quantity(halfWaveFieldV, undefined, 'V/m'),
    quarterWaveField: quantity(quarterWaveFieldV, undefined, 'V/m'),
    capacitance: q(capacitanceF, 'F'),
    storedEnergy: q(storedEnergyJ, 'J'),
    storedCharge: q(storedChargeC, 'C'),
    rcChargingTime: q(tauS, 's'),
    rcRiseTime10To90: q(riseS, 's'),
    peakCurrent: q(peakCurrentA, 'A'),
    breakdown: { field: quantity(breakdownVPerM, undefined, 'V/m'), basis: breakdownBasis, margin: quantity(margin), level },
    target,
    warnings,
    notes,
  };
}
