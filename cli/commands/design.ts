/**
 * `kerrtrace design`: the cell design calculator. Parses options (converting mm, kV/mm and ns to
 * SI once, here), calls the pure `designCellReport`, prints a table or JSON.
 */
import type { Command } from 'commander';
import { action } from '../action.js';
import { designCellReport, type DesignRequest } from '../../src/design/designCellReport.js';
import { formatDesignTable } from '../../src/design/formatDesignTable.js';
import { parseNumberOption } from '../optionParsers.js';
import { liquidNames } from '../../src/data/liquids.js';

interface DesignOptions {
  kerrConstant?: string;
  kerrConstantCm?: string;
  liquid?: string;
  lengthMm?: string;
  effectiveLengthMm?: string;
  gapMm?: string;
  electrodeHeightMm?: string;
  permittivity?: string;
  sourceResistanceOhm?: string;
  riseTimeNs?: string;
  breakdownKvPerMm?: string;
  targetVoltageV?: string;
  json?: boolean;
}

function toRequest(o: DesignOptions): DesignRequest {
  const r: DesignRequest = {};
  const num = (text: string | undefined, option: string, what: string, scale: number): number | undefined =>
    text === undefined ? undefined : parseNumberOption(text, option, `a positive ${what}`, 'positive') * scale;
  const set = <K extends keyof DesignRequest>(key: K, value: DesignRequest[K] | undefined): void => {
    if (value !== undefined) r[key] = value;
  };
  set('kerrConstantMPerV2', num(o.kerrConstant, '--kerr-constant', 'Kerr constant in m/V^2', 1));
  set('kerrConstantCmPerV2', num(o.kerrConstantCm, '--kerr-constant-cm', 'Kerr constant in cm/V^2', 1));
  set('liquid', o.liquid);
  set('lengthM', num(o.lengthMm, '--length-mm', 'electrode length in mm', 1e-3));
  set('effectiveLengthM', num(o.effectiveLengthMm, '--effective-length-mm', 'effective length in mm', 1e-3));
  set('gapM', num(o.gapMm, '--gap-mm', 'electrode gap in mm', 1e-3));
  set('electrodeHeightM', num(o.electrodeHeightMm, '--electrode-height-mm', 'electrode height in mm', 1e-3));
  set('relativePermittivity', num(o.permittivity, '--permittivity', 'relative permittivity', 1));
  set('sourceResistanceOhm', num(o.sourceResistanceOhm, '--source-resistance-ohm', 'source resistance in ohm', 1));
  set('riseTimeS', num(o.riseTimeNs, '--rise-time-ns', 'rise time in ns', 1e-9));
  set('breakdownFieldVPerM', num(o.breakdownKvPerMm, '--breakdown-kv-per-mm', 'breakdown field in kV/mm', 1e6));
  set('targetVoltageV', num(o.targetVoltageV, '--target-voltage-v', 'target voltage in V', 1));
  return r;
}

/** Registers the `design` command. */
export function register(program: Command): void {
  program
    .command('design')
    .description('plan a cell: half-wave voltage, fields, capacitance, charging and breakdown margin (prints safety cautions)')
    .option('--kerr-constant <B>', 'Kerr constant in m/V^2 (SI)')
    .option('--kerr-constant-cm <B>', 'Kerr constant in cm/V^2 (older tables); converted ×1e-2')
    .option('--liquid <name>', `take B (and permittivity where known) from the built-in table: ${liquidNames().join(', ')}`)
    .option('--length-mm <L>', 'electrode length along the beam, mm')
    .option('--effective-length-mm <L>', 'optical effective length, mm (fringe fields; default the electrode length)')
    .option('--gap-mm <d>', 'electrode gap, mm')
    .option('--electrode-height-mm <h>', 'electrode height across the beam, mm (for the capacitance)')
    .option('--permittivity <er>', "liquid's relative permittivity (for the capacitance)")
    .option('--source-resistance-ohm <R>', 'output resistance of the supply or pulser, ohm (RC charging time)')
    .option('--rise-time-ns <t>', 'wanted voltage rise time, ns (charging current)')
    .option('--breakdown-kv-per-mm <E>', 'breakdown strength to compare against, kV/mm (default air, 3 kV/mm)')
    .option('--target-voltage-v <V>', 'a half-wave voltage you want: prints the effective length needed')
    .option('--json', 'print JSON instead of a table')
    .action(
      action((opts: DesignOptions) => {
        const report = designCellReport(toRequest(opts));
        process.stdout.write(opts.json ? `${JSON.stringify(report, null, 2)}\n` : formatDesignTable(report));
      }),
    );
}
