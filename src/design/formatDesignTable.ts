/**
 * The human-readable table of `kerrtrace design`: one row per figure, one value column per Kerr
 * constant case (two when published values disagree), values with engineering prefixes (kV, pF,
 * mJ, ns...) and fields in kV/mm with kV/cm beside (tables use both), then warnings, notes and
 * the safety cautions. Pure: returns the text; the command prints it.
 * @example formatDesignTable(designCellReport({ kerrConstantMPerV2: 2.4e-12, lengthM: 0.05, gapM: 0.005 }))
 *   // contains "half-wave voltage       10.2 kV"
 */
import type { Quantity } from '../quantity.js';
import type { CellDesign } from './designCell.js';
import type { DesignReport } from './designCellReport.js';

const PREFIXES: Array<[number, string]> = [
  [1e9, 'G'], [1e6, 'M'], [1e3, 'k'], [1, ''], [1e-3, 'm'], [1e-6, 'µ'], [1e-9, 'n'], [1e-12, 'p'], [1e-15, 'f'],
];

/** 10206 V → "10.2 kV"; 3.1e-11 F → "31 pF". Three significant figures. */
export function withPrefix(value: number, unit: string): string {
  if (!Number.isFinite(value)) return `${value} ${unit}`;
  if (value === 0) return `0 ${unit}`;
  const abs = Math.abs(value);
  for (const [scale, prefix] of PREFIXES) {
    if (abs >= scale * 0.9995) return `${Number((value / scale).toPrecision(3))} ${prefix}${unit}`;
  }
  return `${value.toExponential(2)} ${unit}`;
}

const sig = (x: number, digits = 3): string => String(Number(x.toPrecision(digits)));

function field(q: Quantity | null): string {
  if (q === null) return '—';
  return `${sig(q.value / 1e6)} kV/mm (${sig(q.value / 1e5)} kV/cm)`;
}
function lengthMm(q: Quantity | null): string {
  return q === null ? '—' : `${sig(q.value * 1e3, 4)} mm`;
}
function pref(q: Quantity | null): string {
  return q === null ? '—' : withPrefix(q.value, q.unit ?? '');
}
function plain(q: Quantity | null): string {
  return q === null ? '—' : sig(q.value);
}
function marginText(margin: Quantity, level: string): string {
  return `${sig(margin.value)}×${level === 'ok' ? '' : level === 'caution' ? ' (caution: < 2)' : ' (WARNING: < 1)'}`;
}

type Row = [string, (d: CellDesign) => string];

const ROWS: Row[] = [
  ['Kerr constant B', (d) => `${d.kerrConstant.value.toPrecision(3)} m/V^2`],
  ['electrode length', (d) => lengthMm(d.length)],
  ['effective length', (d) => lengthMm(d.effectiveLength)],
  ['gap', (d) => lengthMm(d.gap)],
  ['electrode height', (d) => lengthMm(d.electrodeHeight)],
  ['relative permittivity', (d) => plain(d.relativePermittivity)],
  ['half-wave voltage', (d) => pref(d.halfWaveVoltage)],
  ['quarter-wave voltage', (d) => pref(d.quarterWaveVoltage)],
  ['half-wave field', (d) => field(d.halfWaveField)],
  ['quarter-wave field', (d) => field(d.quarterWaveField)],
  ['capacitance', (d) => pref(d.capacitance)],
  ['stored energy at V_pi', (d) => pref(d.storedEnergy)],
  ['stored charge at V_pi', (d) => pref(d.storedCharge)],
  ['RC time constant', (d) => pref(d.rcChargingTime)],
  ['10-90% rise (ln9·RC)', (d) => pref(d.rcRiseTime10To90)],
  ['charging current', (d) => pref(d.peakCurrent)],
  ['breakdown field', (d) => field(d.breakdown.field)],
  ['breakdown margin', (d) => marginText(d.breakdown.margin, d.breakdown.level)],
];

const TARGET_ROWS: Row[] = [
  ['target voltage', (d) => pref(d.target?.voltage ?? null)],
  ['eff. length for V_pi', (d) => lengthMm(d.target?.effectiveLengthForHalfWave ?? null)],
  ['field at target', (d) => field(d.target?.field ?? null)],
  ['margin at target', (d) => (d.target ? marginText(d.target.breakdownMargin, d.target.level) : '—')],
];

function wrap(text: string, indent: string, width = 96): string {
  const words = text.split(' ');
  const lines: string[] = [];
  let line = '';
  for (const w of words) {
    if (line.length > 0 && indent.length + line.length + 1 + w.length > width) {
      lines.push(line);
      line = w;
    } else line = line.length > 0 ? `${line} ${w}` : w;
  }
  if (line.length > 0) lines.push(line);
  return lines.map((l, i) => (i === 0 ? l : indent + l)).join('\n');
}

export function formatDesignTable(report: DesignReport): string {
  const out: string[] = [];
  out.push('Kerr cell design (parallel plates)');
  out.push(wrap(`Convention: ${report.convention}.`, '  '));
  for (const c of report.cases) {
    const where = [c.wavelengthNm !== null ? `${c.wavelengthNm} nm` : null, c.temperature].filter((x) => x !== null && x !== 'not stated');
    const src = c.source !== null ? `; source: ${c.source}` : '';
    out.push(wrap(`${c.label}: ${c.kerrConstantOrigin}${where.length ? ` (${where.join(', ')})` : ''}${src}`, '  '));
  }
  if (report.liquid?.permittivitySource) out.push(wrap(`relative permittivity from the table: ${report.liquid.permittivitySource}`, '  '));
  out.push('');

  const rows = report.cases.some((c) => c.design.target !== null) ? [...ROWS, ...TARGET_ROWS] : ROWS;
  const header = ['', ...(report.cases.length > 1 ? report.cases.map((c) => c.label) : ['value'])];
  const body = rows.map(([label, get]) => [label, ...report.cases.map((c) => get(c.design))]);
  const table = [header, ...body];
  const widths = header.map((_, col) => Math.max(...table.map((r) => r[col]!.length)));
  for (const r of table) out.push(r.map((cell, col) => cell.padEnd(widths[col]!)).join('   ').trimEnd());

  if (report.warnings.length > 0) {
    out.push('', 'Warnings:');
    for (const w of report.warnings) out.push(`  ! ${wrap(w, '    ')}`);
  }
  if (report.notes.length > 0) {
    out.push('', 'Notes:');
    for (const n of report.notes) out.push(`  - ${wrap(n, '    ')}`);
  }
  out.push('', 'Safety:');
  for (const c of report.cautions) out.push(`  * ${wrap(`${c.title}: ${c.text}`, '    ')}`);
  out.push(`  ${wrap(report.deference, '  ')}`);
  return `${out.join('\n')}\n`;
}
