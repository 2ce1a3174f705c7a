/**
 * Built-in table of published Kerr constants for common cell liquids, used by
 * `kerrtrace design --liquid NAME`. Every value carries its unit convention, the wavelength and
 * temperature it applies to (null where the source does not say), its source, and
 * `fromMemory: true` where the value is quoted from general tables without a document at hand.
 *
 * Values and sources exactly as listed in docs/references.md:
 * - nitrobenzene: B = 2.4e-12 m/V² (2.4e-10 cm/V²), about 589 nm, room temperature,
 *   J. Lux "Electro-optical theory" web notes; relative permittivity about 35 at 20 °C
 *   (handbook tables, from memory).
 * - nitrotoluene: B = 1.37e-12 m/V² (general tables, from memory).
 * - water: sources disagree, kept as a range 4.4e-14 m/V² (Lux notes) to 9.4e-14 m/V² (other
 *   tables, from memory).
 *
 * Convention: B in m/V² (SI) with Δn = λ·B·E²; tables in cm/V² are 100 times larger numbers.
 * Pure data; `findLiquid` throws KerrError BAD_ARGUMENT for an unknown name, listing the known ones.
 * @example findLiquid('Nitrobenzene').kerrConstants[0].valueMPerV2 === 2.4e-12
 */
import { KerrError } from '../errors.js';

export interface KerrConstantEntry {
  /** B in m/V² (SI convention, Δn = λ·B·E²). */
  valueMPerV2: number;
  /** How the source states it, e.g. "2.4e-10 cm/V^2". */
  asPublished: string;
  wavelengthNm: number | null;
  /** Free text where the source gives no number, e.g. "room temperature". */
  temperature: string;
  source: string;
  fromMemory: boolean;
}

export interface PermittivityEntry {
  relative: number;
  temperature: string;
  source: string;
  fromMemory: boolean;
}

export interface LiquidEntry {
  name: string;
  /** One value, or two when published sources disagree (the low end first). */
  kerrConstants: KerrConstantEntry[];
  /** Sources disagree and the table keeps a range rather than choosing. */
  disputed: boolean;
  relativePermittivity: PermittivityEntry | null;
  /** Hazard note for the design calculator's output (not a substitute for the safety data sheet). */
  hazard: string;
}

export const LIQUIDS: readonly LiquidEntry[] = [
  {
    name: 'nitrobenzene',
    kerrConstants: [
      {
        valueMPerV2: 2.4e-12,
        asPublished: '2.4e-10 cm/V^2',
        wavelengthNm: 589,
        temperature: 'room temperature',
        source: 'J. Lux, "Electro-optical theory" web notes (high-voltage pages); also general tables, from memory',
        fromMemory: false,
      },
    ],
    disputed: false,
    relativePermittivity: {
      relative: 35,
      temperature: '20 °C',
      source: 'handbook tables, from memory',
      fromMemory: true,
    },
    hazard: 'nitrobenzene is toxic, is absorbed through the skin and its vapour is harmful; it is also combustible',
  },
  {
    name: 'nitrotoluene',
    kerrConstants: [
      {
        valueMPerV2: 1.37e-12,
        asPublished: '1.37e-12 m/V^2',
        wavelengthNm: null,
        temperature: 'not stated',
        source: 'general tables, from memory',
        fromMemory: true,
      },
    ],
    disputed: false,
    relativePermittivity: null,
    hazard: 'nitrotoluenes are toxic and absorbed through the skin; they are also combustible',
  },
  {
    name: 'water',
    kerrConstants: [
      {
        valueMPerV2: 4.4e-14,
        asPublished: '4.4e-14 m/V^2',
        wavelengthNm: null,
        temperature: 'not stated',
        source: 'J. Lux, "Electro-optical theory" web notes',
        fromMemory: false,
      },
      {
        valueMPerV2: 9.4e-14,
        asPublished: '9.4e-14 m/V^2',
        wavelengthNm: null,
        temperature: 'not stated',
        source: 'other tables, from memory',
        fromMemory: true,
      },
    ],
    disputed: true,
    relativePermittivity: null,
    hazard: 'water conducts as soon as it is not very pure: expect leakage current and heating at high voltage',
  },
];

/** Known liquid names, in table order. */
export function liquidNames(): string[] {
  return LIQUIDS.map((l) => l.name);
}

/** Looks a liquid up by name (case and surrounding spaces ignored). */
export function findLiquid(name: string, option = '--liquid'): LiquidEntry {
  const key = name.trim().toLowerCase();
  const found = LIQUIDS.find((l) => l.name === key);
  if (found === undefined) {
    throw new KerrError('BAD_ARGUMENT', `unknown liquid ${JSON.stringify(name)} for ${option}`, {
      path: option,
      hint: `Known liquids: ${liquidNames().join(', ')}; for any other liquid give --kerr-constant (m/V^2) or --kerr-constant-cm (cm/V^2)`,
    });
  }
  return found;
}
