/**
 * Everything `kerrtrace design` prints: decides which Kerr constant(s) to use (an explicit value
 * in m/V², one in cm/V² converted by ×1e-2, or the built-in liquid table, which may hold a range
 * when sources disagree), runs `designCell` for each, and gathers the unit convention, sources,
 * warnings, notes and the safety cautions. Pure.
 *
 * Rules: exactly one of --kerr-constant / --kerr-constant-cm, or --liquid (an explicit value then
 * overrides the liquid's B while its permittivity is still used unless --permittivity is given).
 * Without --length-mm a target voltage is required: the cell is then laid out at the effective
 * length that makes the target the half-wave voltage (L = d²/(2·B·V²)).
 * Throws KerrError BAD_ARGUMENT for a missing Kerr constant, both constants at once, an unknown
 * liquid (listing the known ones), a missing gap or length, or any non-positive number.
 * @example designCellReport({ liquid: 'nitrobenzene', lengthM: 0.05, gapM: 0.005 }).cases[0].design.halfWaveVoltage.value // ≈ 10206
 */
import { KerrError } from '../errors.js';
import { cmPerV2ToMPerV2 } from '../core/physics/kerr.js';
import { findLiquid, LIQUIDS, type LiquidEntry } from '../data/liquids.js';
import { designCell, type CellDesign, type CellDesignInput } from './designCell.js';
import { SAFETY_CAUTIONS, SAFETY_DEFERENCE, type SafetyCaution } from '../safety/cautions.js';

export interface DesignRequest {
  kerrConstantMPerV2?: number;
  kerrConstantCmPerV2?: number;
  liquid?: string;
  lengthM?: number;
  effectiveLengthM?: number;
  gapM?: number;
  electrodeHeightM?: number;
  relativePermittivity?: number;
  sourceResistanceOhm?: number;
  riseTimeS?: number;
  breakdownFieldVPerM?: number;
  targetVoltageV?: number;
}

export interface DesignCase {
  /** e.g. "B = 2.4e-12 m/V^2" or "low end (Lux notes)". */
  label: string;
  kerrConstantMPerV2: number;
  /** How B was given: "--kerr-constant (m/V^2)", "--kerr-constant-cm 2.4e-10 cm/V^2 × 1e-2", or the liquid table. */
  kerrConstantOrigin: string;
  source: string | null;
  fromMemory: boolean;
  wavelengthNm: number | null;
  temperature: string | null;
  design: CellDesign;
}

export interface DesignReport {
  kind: 'kerrtrace-design';
  /** Unit convention of every Kerr constant shown. */
  convention: string;
  liquid: { name: string; disputed: boolean; hazard: string; permittivitySource: string | null; permittivityFromMemory: boolean | null } | null;
  cases: DesignCase[];
  warnings: string[];
  notes: string[];
  /** The trade's safety cautions (src/safety/cautions.ts), always included. */
  cautions: SafetyCaution[];
  /** The sentence deferring to local codes, safety data sheets and licensed practice. */
  deference: string;
}

const SI_CONVENTION = 'Kerr constant B in m/V^2 (SI), defined by Δn = λ·B·E²; tables in cm/V^2 quote numbers 100 times larger';

function largestTabulatedB(): { name: string; value: number } {
  let best = { name: '', value: 0 };
  for (const l of LIQUIDS) for (const k of l.kerrConstants) if (k.valueMPerV2 > best.value) best = { name: l.name, value: k.valueMPerV2 };
  return best;
}

export function designCellReport(request: DesignRequest): DesignReport {
  const warnings: string[] = [];
  const notes: string[] = [];
  if (request.kerrConstantMPerV2 !== undefined && request.kerrConstantCmPerV2 !== undefined) {
    throw new KerrError('BAD_ARGUMENT', 'both --kerr-constant (m/V^2) and --kerr-constant-cm (cm/V^2) were given', {
      path: '--kerr-constant',
      hint: 'Give the Kerr constant once, in the unit your source uses',
    });
  }
  const liquid: LiquidEntry | null = request.liquid === undefined ? null : findLiquid(request.liquid);
  if (request.kerrConstantMPerV2 === undefined && request.kerrConstantCmPerV2 === undefined && liquid === null) {
    throw new KerrError('BAD_ARGUMENT', 'no Kerr constant was given', {
      path: '--kerr-constant',
      hint: 'Give --kerr-constant in m/V^2, --kerr-constant-cm in cm/V^2, or --liquid NAME from the built-in table (nitrobenzene, nitrotoluene, water)',
    });
  }
  if (request.gapM === undefined) {
    throw new KerrError('BAD_ARGUMENT', 'no electrode gap was given', { path: '--gap-mm', hint: 'Give the distance between the electrodes with --gap-mm' });
  }
  if (request.lengthM === undefined && request.effectiveLengthM === undefined && request.targetVoltageV === undefined) {
    throw new KerrError('BAD_ARGUMENT', 'no electrode length was given', {
      path: '--length-mm',
      hint: 'Give the electrode length with --length-mm, or a --target-voltage-v to get the length needed',
    });
  }

  // Which Kerr constant(s)?
  type Choice = Omit<DesignCase, 'design'>;
  const choices: Choice[] = [];
  let convention = SI_CONVENTION;
  if (request.kerrConstantMPerV2 !== undefined || request.kerrConstantCmPerV2 !== undefined) {
    const fromCm = request.kerrConstantCmPerV2 !== undefined;
    const bMPerV2 = fromCm ? cmPerV2ToMPerV2(request.kerrConstantCmPerV2!) : request.kerrConstantMPerV2!;
    const origin = fromCm
      ? `--kerr-constant-cm ${request.kerrConstantCmPerV2} cm/V^2, converted ×1e-2 to m/V^2`
      : '--kerr-constant, in m/V^2';
    if (fromCm) convention = `${SI_CONVENTION}; the value was entered in cm/V^2 (${request.kerrConstantCmPerV2} cm/V^2) and converted`;
    choices.push({ label: `B = ${bMPerV2.toPrecision(3)} m/V^2`, kerrConstantMPerV2: bMPerV2, kerrConstantOrigin: origin, source: null, fromMemory: false, wavelengthNm: null, temperature: null });
    if (liquid !== null) notes.push(`the Kerr constant given overrides the table value for ${liquid.name}; the table is used only for the permittivity`);
    const largest = largestTabulatedB();
    if (Number.isFinite(bMPerV2) && bMPerV2 > 10 * largest.value) {
      warnings.push(`B = ${bMPerV2.toPrecision(3)} m/V^2 is more than 10 times the largest value in the built-in table (${largest.name}, ${largest.value} m/V^2); if your source quotes cm/V^2, give it with --kerr-constant-cm`);
    }
  } else if (liquid !== null) {
    liquid.kerrConstants.forEach((k, i) => {
      const end = liquid.disputed ? (i === 0 ? 'low end' : 'high end') : null;
      choices.push({
        label: end === null ? `${liquid.name}` : `${liquid.name}, ${end}`,
        kerrConstantMPerV2: k.valueMPerV2,
        kerrConstantOrigin: `built-in table: ${liquid.name}, published as ${k.asPublished}`,
        source: k.source + (k.fromMemory ? ' (from memory)' : ''),
        fromMemory: k.fromMemory,
        wavelengthNm: k.wavelengthNm,
        temperature: k.temperature,
      });
    });
    if (liquid.disputed) {
      const values = liquid.kerrConstants.map((k) => `${k.valueMPerV2} m/V^2 (${k.source})`).join(' and ');
      warnings.push(`published Kerr constants of ${liquid.name} disagree: ${values}; both ends are shown; measure your own liquid`);
    }
    if (liquid.kerrConstants.some((k) => k.fromMemory)) notes.push(`a Kerr constant of ${liquid.name} comes from general tables quoted from memory; check it against a document before relying on it`);
    notes.push('Kerr constants depend on wavelength and fall as temperature rises: the table values apply near the wavelength and temperature shown');
  }

  // Permittivity: explicit, else the liquid's.
  let relativePermittivity = request.relativePermittivity;
  let permittivitySource: string | null = null;
  let permittivityFromMemory: boolean | null = null;
  if (relativePermittivity === undefined && liquid?.relativePermittivity) {
    relativePermittivity = liquid.relativePermittivity.relative;
    permittivitySource = `${liquid.relativePermittivity.source}, ${liquid.relativePermittivity.temperature}`;
    permittivityFromMemory = liquid.relativePermittivity.fromMemory;
  } else if (relativePermittivity === undefined && liquid !== null) {
    notes.push(`the built-in table has no permittivity for ${liquid.name}; give --permittivity for the capacitance`);
  }
  if (request.breakdownFieldVPerM === undefined) {
    notes.push('breakdown strength defaults to air at sea level, 3 kV/mm (common practice); give --breakdown-kv-per-mm for your liquid and construction');
  }
  if (request.lengthM === undefined && request.effectiveLengthM !== undefined) {
    notes.push('no --length-mm: the electrode length is taken equal to the effective length (it sets the capacitance)');
  } else if (request.lengthM === undefined) {
    notes.push('no --length-mm: each design is laid out at the effective length that makes the target voltage the half-wave voltage');
  }

  const cases: DesignCase[] = choices.map((choice) => {
    const lengthM = request.lengthM ?? request.effectiveLengthM ?? (request.gapM! * request.gapM!) / (2 * choice.kerrConstantMPerV2 * request.targetVoltageV! * request.targetVoltageV!);
    const input: CellDesignInput = { kerrConstantMPerV2: choice.kerrConstantMPerV2, lengthM, gapM: request.gapM! };
    if (request.effectiveLengthM !== undefined) input.effectiveLengthM = request.effectiveLengthM;
    if (request.electrodeHeightM !== undefined) input.electrodeHeightM = request.electrodeHeightM;
    if (relativePermittivity !== undefined) input.relativePermittivity = relativePermittivity;
    if (request.sourceResistanceOhm !== undefined) input.sourceResistanceOhm = request.sourceResistanceOhm;
    if (request.riseTimeS !== undefined) input.riseTimeS = request.riseTimeS;
    if (request.breakdownFieldVPerM !== undefined) {
      input.breakdownFieldVPerM = request.breakdownFieldVPerM;
      input.breakdownBasis = 'as given with --breakdown-kv-per-mm';
    }
    if (request.targetVoltageV !== undefined) input.targetVoltageV = request.targetVoltageV;
    return { ...choice, design: designCell(input) };
  });

  // Case warnings and notes, once each, prefixed by the case when there are several.
  for (const c of cases) {
    const prefix = cases.length > 1 ? `${c.label}: ` : '';
    for (const w of c.design.warnings) warnings.push(prefix + w);
    for (const n of c.design.notes) if (!notes.includes(n)) notes.push(n);
  }
  if (liquid !== null) notes.push(`hazard: ${liquid.hazard}`);

  return {
    kind: 'kerrtrace-design',
    convention,
    liquid: liquid === null ? null : { name: liquid.name, disputed: liquid.disputed, hazard: liquid.hazard, permittivitySource, permittivityFromMemory },
    cases,
    warnings,
    notes,
    cautions: SAFETY_CAUTIONS.map((c) => ({ ...c })),
    deference: SAFETY_DEFERENCE,
  };
}
