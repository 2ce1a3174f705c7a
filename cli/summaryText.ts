/**
 * The few lines `analyze` and `stills` print when a run is written: the headline figures with
 * their standard errors, how the voltage was matched to the light, how many frames (or photos)
 * the fit used and why the others were left out, the warnings, and the output folder.
 * A video run shows its sync offset ("(given)" when set with --offset-s); a photo series
 * (result.source "stills") has no second clock, so that line says so instead, and counts photos.
 * When B cannot be told apart from brightness (result.identifiable false) no number is printed for
 * it or for V_π. Pure; never throws.
 * @example summaryText(result, 'run.kerrtrace').startsWith(`kerrtrace: ${result.label}\n`) === true
 */
import { formatQuantity } from '../src/quantity.js';
import type { RunResult } from '../src/result/schema.js';
import { withFlags } from './flagNames.js';

/** Width of the name column, so the values line up. */
const NAME_WIDTH = 21;

export function summaryText(r: RunResult, dir: string): string {
  const stills = r.source === 'stills';
  const lines: string[] = [];
  const row = (name: string, value: string): void => {
    lines.push(`  ${name.padEnd(NAME_WIDTH)}${value}`);
  };
  lines.push(`kerrtrace: ${r.label}`);
  if (r.identifiable) {
    row('Kerr constant B', formatQuantity(r.kerrConstant));
    row('half-wave voltage', formatQuantity(r.halfWaveVoltage));
  } else {
    row('Kerr constant B', 'not identifiable from this sweep (see warnings)');
  }
  if (r.uncertainty && r.identifiable) {
    const b = r.uncertainty.kerrConstant;
    const big = [...b.terms].filter((t) => t.relative > 0).sort((x, y) => y.relative - x.relative).map((t) => `${t.name} ${(100 * t.relative).toPrecision(2)}%`);
    row('uncertainty of B', `${(100 * b.relativeCombined).toPrecision(2)}% standard, ±${(100 * b.coverageFactor * b.relativeCombined).toPrecision(2)}% expanded (k = ${b.coverageFactor}): ${big.join(', ')}`);
  }
  row('floor fraction', formatQuantity(r.floorFraction));
  row('contrast ratio', formatQuantity(r.contrastRatio));
  if (stills) {
    row('sync offset', 'none: each photo carries its voltage (no clock to synchronise)');
  } else {
    row('sync offset', `${formatQuantity(r.syncOffset)}${r.sync.manual ? ' (given)' : ''}`);
  }
  const excluded = Object.entries(r.frames.excluded);
  const leftOut = excluded.length > 0 ? ` (left out: ${excluded.map(([reason, n]) => `${n} ${reason}`).join(', ')})` : '';
  row(stills ? 'photos used' : 'frames used', `${r.frames.used} of ${r.frames.total}${leftOut}`);
  if (r.channels) {
    row('B by channel', `R ${formatQuantity(r.channels.r)}, G ${formatQuantity(r.channels.g)}, B ${formatQuantity(r.channels.b)}`);
    row('', `(${r.channels.note})`);
  }
  for (const w of r.warnings) lines.push(`  warning: ${withFlags(w.message, w.inputs)}`);
  if (r.validity && !r.validity.valid) for (const f of r.validity.failures) lines.push(`  NOT VALID (${f.gate}): ${withFlags(f.message, f.inputs)}`);
  lines.push(`  files: ${dir}`);
  return `${lines.join('\n')}\n`;
}
