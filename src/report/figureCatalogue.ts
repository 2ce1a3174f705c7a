/**
 * The figures a run reports, in one list shared by the run report, summary.md and `compare`:
 * how to read each one from a RunResult, its name in plain words, and the unit it is shown in.
 * Results store SI numbers ("m/V^2", "V", "s", ratios); display units only scale them
 * (kV = V/1000, % = ratio·100). The Kerr constant is shown in m/V² (SI), with cm/V² beside it
 * where tables use that convention (1 m/V² = 100 cm/V²).
 * `identifiable: true` marks figures that depend on telling the Kerr constant apart from the
 * light level (B, Vπ, Vπ/√2, floor fraction); when a run's `identifiable` is false these are not
 * shown as numbers. `read` returns null for a figure the run does not have (no scatter figures
 * without maps, no sync offset for a photo series).
 * @example FIGURES.find((f) => f.key === 'halfWaveVoltage')?.display === { scale: 1e-3, unit: 'kV' }
 */
import type { Quantity } from '../quantity.js';
import type { RunResult } from '../result/schema.js';
import { formatMeasured } from './formatMeasured.js';

export type FigureKey =
  | 'kerrConstant'
  | 'halfWaveVoltage'
  | 'quarterWaveVoltage'
  | 'floorFraction'
  | 'contrastRatio'
  | 'syncOffset'
  | 'haloToCoreRatio'
  | 'particleEventRate'
  | 'floorFlicker'
  | 'polariserLeakFraction'
  | 'scatterFloorFraction'
  | 'hysteresisDifference'
  | 'resistivity'
  | 'temperature';

export interface FigureDisplay {
  /** Multiply the stored SI value by this to get the displayed number. */
  scale: number;
  unit: string;
  scientific?: boolean;
}

export interface FigureDefinition {
  key: FigureKey;
  name: string;
  /** The name in running text, e.g. "the Kerr constant". */
  phrase: string;
  /** One line saying what the number means. */
  meaning: string;
  /** SI unit of the stored value ("" for ratios). */
  siUnit: string;
  display: FigureDisplay;
  /** Needs B told apart from brightness (see RunResult.identifiable). */
  identifiable: boolean;
  /** Part of the cell or liquid (compared between runs), rather than of the recording. */
  compared: boolean;
  /** Higher is better, lower is better, or neither: used only for wording verdicts. */
  better: 'higher' | 'lower' | 'neither';
  read: (r: RunResult) => Quantity | null;
}

export const FIGURES: readonly FigureDefinition[] = [
  {
    key: 'kerrConstant', phrase: 'the Kerr constant', name: 'Kerr constant B', meaning: 'Δn = λ·B·E²; SI convention (1 m/V² = 100 cm/V²)',
    siUnit: 'm/V²', display: { scale: 1, unit: 'm/V²', scientific: true }, identifiable: true, compared: true, better: 'neither',
    read: (r) => r.kerrConstant,
  },
  {
    key: 'halfWaveVoltage', phrase: 'the half-wave voltage', name: 'Half-wave voltage Vπ', meaning: 'voltage for half-wave retardance across this cell: Vπ = d/√(2·B·L_eff)',
    siUnit: 'V', display: { scale: 1e-3, unit: 'kV' }, identifiable: true, compared: true, better: 'neither',
    read: (r) => r.halfWaveVoltage,
  },
  {
    key: 'quarterWaveVoltage', phrase: 'the quarter-wave voltage', name: 'Quarter-wave voltage', meaning: 'Vπ/√2: the voltage for circular polarisation',
    siUnit: 'V', display: { scale: 1e-3, unit: 'kV' }, identifiable: true, compared: false, better: 'neither',
    read: (r) => r.quarterWaveVoltage,
  },
  {
    key: 'floorFraction', phrase: 'the floor fraction', name: 'Floor fraction', meaning: 'closed-shutter leak I_floor / I_amp',
    siUnit: '', display: { scale: 100, unit: '%' }, identifiable: true, compared: true, better: 'lower',
    read: (r) => r.floorFraction,
  },
  {
    key: 'contrastRatio', phrase: 'the contrast ratio', name: 'Contrast ratio', meaning: 'highest / lowest fitted intensity over the recorded range',
    siUnit: '', display: { scale: 1, unit: ': 1' }, identifiable: false, compared: true, better: 'higher',
    read: (r) => r.contrastRatio,
  },
  {
    key: 'syncOffset', phrase: 'the sync offset', name: 'Sync offset', meaning: 'video time minus log time of the same instant',
    siUnit: 's', display: { scale: 1, unit: 's' }, identifiable: false, compared: false, better: 'neither',
    // A photo series has no second clock: each photo carries its voltage, so there is no offset to show.
    read: (r) => (r.source === 'stills' ? null : r.syncOffset),
  },
  {
    key: 'haloToCoreRatio', phrase: 'the halo-to-core ratio', name: 'Halo-to-core ratio', meaning: 'static light around the beam relative to the beam core',
    siUnit: '', display: { scale: 1, unit: '' }, identifiable: false, compared: true, better: 'lower',
    read: (r) => r.scatter?.haloToCoreRatio ?? null,
  },
  {
    key: 'particleEventRate', phrase: 'the particle event rate', name: 'Particle events', meaning: 'short bright spikes from particles crossing the beam',
    siUnit: '1/min', display: { scale: 1, unit: 'per minute' }, identifiable: false, compared: true, better: 'lower',
    read: (r) => r.scatter?.particleEventRate ?? null,
  },
  {
    key: 'floorFlicker', phrase: 'the floor flicker', name: 'Floor flicker', meaning: 'relative standard deviation of the zero-field floor',
    siUnit: '', display: { scale: 100, unit: '%' }, identifiable: false, compared: true, better: 'lower',
    read: (r) => r.scatter?.floorFlicker ?? null,
  },
  {
    key: 'polariserLeakFraction', phrase: 'the polariser leak', name: 'Polariser leak', meaning: 'part of the floor explained by the polariser pair',
    siUnit: '', display: { scale: 100, unit: '%' }, identifiable: false, compared: true, better: 'lower',
    read: (r) => r.scatter?.polariserLeakFraction ?? null,
  },
  {
    key: 'scatterFloorFraction', phrase: 'the scatter floor', name: 'Scatter floor', meaning: 'part of the floor from light scattered in the liquid',
    siUnit: '', display: { scale: 100, unit: '%' }, identifiable: false, compared: true, better: 'lower',
    read: (r) => r.scatter?.scatterFloorFraction ?? null,
  },
  {
    key: 'hysteresisDifference', phrase: 'the up/down sweep difference', name: 'Up/down sweep difference', meaning: 'Kerr constant from up-ramps minus down-ramps (space charge in impure liquids)',
    siUnit: 'm/V²', display: { scale: 1, unit: 'm/V²', scientific: true }, identifiable: true, compared: true, better: 'neither',
    read: (r) => r.hysteresis?.difference ?? null,
  },
  {
    key: 'resistivity', phrase: 'the resistivity', name: 'Liquid resistivity', meaning: 'ρ = V·A/(I·d) from the logged current',
    siUnit: 'Ω·m', display: { scale: 1, unit: 'Ω·m', scientific: true }, identifiable: false, compared: true, better: 'higher',
    read: (r) => (r.conductivity?.readable ? r.conductivity.resistivity : null),
  },
  {
    key: 'temperature', phrase: 'the temperature', name: 'Liquid temperature', meaning: 'from the voltage log (B falls as temperature rises)',
    siUnit: '°C', display: { scale: 1, unit: '°C' }, identifiable: false, compared: false, better: 'neither',
    read: (r) => r.log.temperatureC,
  },
];

/** The definition of one figure; throws a plain Error for an unknown key (a programming error). */
export function figure(key: FigureKey): FigureDefinition {
  const f = FIGURES.find((d) => d.key === key);
  if (!f) throw new Error(`unknown figure ${key}`);
  return f;
}

/** "10.21 ± 0.05 kV": value and standard error in the figure's display unit. */
export function formatFigure(def: FigureDefinition, q: Quantity): string {
  const { scale, unit } = def.display;
  const opts = def.display.scientific === undefined ? {} : { scientific: def.display.scientific };
  const text = formatMeasured(q.value * scale, q.stdErr === undefined ? undefined : q.stdErr * scale, opts);
  return unit === '' ? text : `${text} ${unit}`;
}
