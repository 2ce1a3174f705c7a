/**
 * Compares two or more runs, in the order given: every compared figure of every run with its
 * uncertainty, the change between consecutive runs (changeBetween: difference, relative change,
 * z-score), a cautious plain-language verdict per pair, and warnings about differences in the
 * conditions. Pure arithmetic: no files, no clock.
 *
 * Rules:
 * - Runs of different cells (length, effective length or gap differing by more than 1 ppm) are
 *   refused unless `allowDifferentCells`; then they are compared with a warning.
 * - Different wavelength, temperature (beyond max(1 °C, 2σ)), frame size, frame rate (> 1 %),
 *   transfer or range give warnings; a missing temperature too.
 * - A figure that depends on separating B from brightness is withheld for a run whose
 *   `identifiable` is false, and its changes are "not comparable".
 * - |z| < 2: "did not change within its uncertainty"; 2 ≤ |z| < 3: "probably rose/fell";
 *   |z| ≥ 3: "rose/fell". Without uncertainties the change is reported but not judged.
 * Throws KerrError BAD_ARGUMENT for fewer than two runs, labels that do not match the runs
 * (count, empty, duplicate), or different cells without `allowDifferentCells`.
 * @example compareRuns([before, after], ['before', 'after']).verdicts[0]
 *   → "From before to after: the floor fraction fell by 62% ± 3%; the Kerr constant did not change within its uncertainty (z = 0.3)."
 */
import { cancellingTerms, runToRunQuantity } from './runToRunQuantity.js';
import { KerrError } from '../errors.js';
import type { Quantity } from '../quantity.js';
import { FIGURES, formatFigure, type FigureDefinition } from '../report/figureCatalogue.js';
import { formatMeasured } from '../report/formatMeasured.js';
import type { InputFile, RunResult, RunWarning } from '../result/schema.js';
import { changeBetween } from './changeBetween.js';
import { COMPARISON_SCHEMA_VERSION, type ChangeVerdict, type Comparison, type ComparedRun, type FigureChange, type FigureSeries } from './comparison.js';

export interface CompareOptions {
  allowDifferentCells?: boolean;
  /** The result files the runs were read from, in the same order (for provenance). */
  sources?: (InputFile | null)[];
}

/** Figures whose change is a signed difference, not a ratio. */
const ABSOLUTE_ONLY = new Set(['hysteresisDifference']);
const GEOMETRY_TOLERANCE = 1e-6;

export function compareRuns(results: readonly RunResult[], labels: readonly string[], options: CompareOptions = {}): Comparison {
  if (results.length < 2) {
    throw new KerrError('BAD_ARGUMENT', `expected at least two results to compare but received ${results.length}`, { hint: 'Give two or more result.json files or run folders' });
  }
  if (labels.length !== results.length) {
    throw new KerrError('BAD_ARGUMENT', `expected one label per run (${results.length}) for --label but received ${labels.length}`, { path: '--label', hint: 'Give --label once for every run, or not at all' });
  }
  labels.forEach((l, i) => {
    if (l.trim() === '') throw new KerrError('BAD_ARGUMENT', `expected a non-empty label for run ${i + 1} for --label but received ""`, { path: '--label', hint: 'Give each run a short name' });
    if (labels.indexOf(l) !== i) throw new KerrError('BAD_ARGUMENT', `expected different labels for --label but received ${JSON.stringify(l)} twice`, { path: '--label', hint: 'Give each run its own name' });
  });
  const allowDifferentCells = options.allowDifferentCells ?? false;
  const warnings: RunWarning[] = [];
  const sameCell = checkGeometry(results, labels, allowDifferentCells, warnings);
  const cancelling = sameCell ? cancellingTerms(results) : [];
  if (cancelling.length > 0) {
    warnings.push({ code: 'terms-cancel', message: `The runs share one cell, so the ${cancelling.join(', ')} terms of the uncertainty budget are the same in each and cancel in the changes below; each run's figure keeps its full uncertainty.` });
  }
  checkConditions(results, labels, warnings);

  const runs: ComparedRun[] = results.map((r, i) => ({
    label: labels[i]!,
    source: options.sources?.[i] ?? null,
    resultLabel: r.label,
    createdAt: r.createdAt,
    identifiable: r.identifiable,
    cell: { ...r.cell },
    camera: { ...r.camera },
    temperatureC: r.log.temperatureC,
    inputs: r.inputs,
    warningCount: r.warnings.length,
  }));

  const figures: FigureSeries[] = [];
  for (const def of FIGURES) {
    if (!def.compared) continue;
    const values = results.map((r) => finiteOrNull(def.read(r)));
    if (values.every((v) => v === null)) continue;
    const withheld = results.map((r) => def.identifiable && !r.identifiable);
    figures.push({ key: def.key, name: def.name, unit: def.siUnit, values, withheld });
  }

  const changes: FigureChange[] = [];
  const verdicts: string[] = [];
  for (let i = 1; i < results.length; i++) {
    const pairTexts: string[] = [];
    for (const series of figures) {
      const def = FIGURES.find((f) => f.key === series.key)!;
      const forChange = { ...series, values: series.values.map((q, k) => runToRunQuantity(results[k]!, series.key, sameCell, q)) };
      const change = figureChange(def, forChange, i - 1, i, labels);
      if (change === null) continue;
      changes.push(change);
      pairTexts.push(change.text);
    }
    verdicts.push(`From ${labels[i - 1]} to ${labels[i]}: ${pairTexts.length > 0 ? pairTexts.join('; ') : 'no figure is reported by both runs'}.`);
  }
  return { schemaVersion: COMPARISON_SCHEMA_VERSION, kind: 'kerrtrace-comparison', runs, figures, changes, verdicts, warnings, allowDifferentCells };
}

function finiteOrNull(q: Quantity | null): Quantity | null {
  return q !== null && Number.isFinite(q.value) ? q : null;
}

function figureChange(def: FigureDefinition, series: FigureSeries, from: number, to: number, labels: readonly string[]): FigureChange | null {
  const a = series.values[from] ?? null;
  const b = series.values[to] ?? null;
  if (a === null || b === null) return null;
  const name = def.phrase;
  const base = { key: def.key, name: def.name, fromRun: from, toRun: to };
  if (series.withheld[from] || series.withheld[to]) {
    const which = series.withheld[from] ? labels[from] : labels[to];
    return { ...base, change: null, relativeChange: null, zScore: null, verdict: 'not-comparable', text: `${name} cannot be compared (run ${which} could not separate B from brightness)` };
  }
  const { change, relativeChange, zScore } = changeBetween(a, b, !ABSOLUTE_ONLY.has(def.key));
  const amount = relativeChange !== null
    ? `${formatMeasured(Math.abs(relativeChange.value) * 100, relativeChange.stdErr === undefined ? undefined : relativeChange.stdErr * 100, { scientific: false })}%`
    : formatFigure(def, { value: Math.abs(change.value), ...(change.stdErr === undefined ? {} : { stdErr: change.stdErr }) });
  let verdict: ChangeVerdict;
  let text: string;
  if (zScore === null) {
    verdict = 'not-comparable';
    text = `${name} went from ${formatFigure(def, a)} to ${formatFigure(def, b)}, but without uncertainties the change cannot be judged`;
  } else if (Math.abs(zScore) < 2) {
    verdict = 'no-change';
    text = `${name} did not change within its uncertainty (z = ${zScore.toFixed(1)})`;
  } else {
    verdict = change.value > 0 ? 'rose' : 'fell';
    const hedge = Math.abs(zScore) < 3 ? 'probably ' : '';
    text = `${name} ${hedge}${verdict} by ${amount} (z = ${zScore.toFixed(1)})`;
  }
  return { ...base, change, relativeChange, zScore, verdict, text };
}

function differs(a: number, b: number): boolean {
  return Math.abs(a - b) > GEOMETRY_TOLERANCE * Math.max(Math.abs(a), Math.abs(b));
}

/** Throws for different cells unless allowed; returns whether every run used the same cell. */
function checkGeometry(results: readonly RunResult[], labels: readonly string[], allow: boolean, warnings: RunWarning[]): boolean {
  let same = true;
  const first = results[0]!.cell;
  const fields: [keyof RunResult['cell'] & ('lengthM' | 'effectiveLengthM' | 'gapM'), string][] = [
    ['lengthM', 'length'], ['effectiveLengthM', 'effective length'], ['gapM', 'gap'],
  ];
  for (let i = 1; i < results.length; i++) {
    const cell = results[i]!.cell;
    for (const [field, words] of fields) {
      if (!differs(first[field], cell[field])) continue;
      same = false;
      const text = `the runs were made with different cells: ${words} ${formatMeasured(first[field] * 1000)} mm in ${labels[0]} but ${formatMeasured(cell[field] * 1000)} mm in ${labels[i]}`;
      if (!allow) {
        throw new KerrError('BAD_ARGUMENT', text, { path: '--allow-different-cells', hint: 'Compare runs of the same cell, or add --allow-different-cells to compare them anyway (the Kerr constant stays comparable; the half-wave voltage and floor do not)' });
      }
      warnings.push({ code: 'different-cells', message: `${text[0]!.toUpperCase()}${text.slice(1)}; compared anyway because --allow-different-cells was given. The Kerr constant stays comparable; the half-wave voltage, floor and contrast depend on the cell.` });
    }
  }
  return same;
}

function checkConditions(results: readonly RunResult[], labels: readonly string[], warnings: RunWarning[]): void {
  const first = results[0]!;
  const missingTemperature: string[] = [];
  results.forEach((r, i) => {
    if (r.log.temperatureC === null) missingTemperature.push(labels[i]!);
    if (!r.identifiable) {
      warnings.push({ code: 'not-identifiable', message: `In ${labels[i]} the Kerr constant could not be separated from brightness, so B, Vπ and the floor fraction of that run are not compared.`, guideSection: 'open-level' });
    }
    if (r.warnings.length > 0) {
      warnings.push({ code: 'run-warnings', message: `${labels[i]} carries ${r.warnings.length} warning${r.warnings.length === 1 ? '' : 's'} of its own (${r.warnings.map((w) => w.code).join(', ')}); see its run report.` });
    }
  });
  for (let i = 1; i < results.length; i++) {
    const r = results[i]!;
    const a = first.cell.wavelengthNm;
    const b = r.cell.wavelengthNm;
    if (a !== b && (a === null || b === null || Math.abs(a - b) > 0.5)) {
      warnings.push({ code: 'different-wavelength', message: `The light differs: ${a === null ? 'unknown' : `${a} nm`} in ${labels[0]} but ${b === null ? 'unknown' : `${b} nm`} in ${labels[i]}. The Kerr constant depends on wavelength, so a change may come from the light rather than the liquid.` });
    }
    const ta = first.log.temperatureC;
    const tb = r.log.temperatureC;
    if (ta !== null && tb !== null) {
      const combined = Math.hypot(ta.stdErr ?? 0, tb.stdErr ?? 0);
      if (Math.abs(ta.value - tb.value) > Math.max(1, 2 * combined)) {
        warnings.push({ code: 'different-temperature', message: `The liquid was at ${formatMeasured(ta.value)} °C in ${labels[0]} but ${formatMeasured(tb.value)} °C in ${labels[i]}. The Kerr constant of polar liquids falls as they warm, so part of any change may be temperature.`, guideSection: 'temperature' });
      }
    }
    const ca = first.camera;
    const cb = r.camera;
    const camera: string[] = [];
    if (ca.width !== cb.width || ca.height !== cb.height) camera.push(`frame size ${ca.width}×${ca.height} vs ${cb.width}×${cb.height}`);
    if ((ca.fps === null) !== (cb.fps === null) || (ca.fps !== null && cb.fps !== null && Math.abs(ca.fps - cb.fps) > 0.01 * Math.max(ca.fps, cb.fps))) {
      camera.push(`frame rate ${ca.fps ?? 'unknown'} vs ${cb.fps ?? 'unknown'} fps`);
    }
    if (ca.transfer !== cb.transfer) camera.push(`transfer ${ca.transfer} vs ${cb.transfer}`);
    if (ca.range !== cb.range) camera.push(`range ${ca.range} vs ${cb.range}`);
    if (camera.length > 0) {
      warnings.push({ code: 'different-camera', message: `The camera settings differ between ${labels[0]} and ${labels[i]} (${camera.join('; ')}). Brightness-based figures (floor, contrast, scatter) may shift with the camera rather than the cell.`, guideSection: 'lock-exposure' });
    }
  }
  if (missingTemperature.length > 0) {
    warnings.push({ code: 'temperature-missing', message: `No temperature was recorded for ${missingTemperature.join(', ')}, so a temperature difference between runs cannot be ruled out.`, guideSection: 'temperature' });
  }
}
