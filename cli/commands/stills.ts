/**
 * `kerrtrace stills FOLDER`: a Kerr measurement from photos taken at known voltages. Parses and
 * checks options (mm → m once, here), refuses an existing --out before reading any photo, reads
 * the series (src/stills/readStillsSeries.ts), fits it (src/stills/fitStillsSeries.ts), prints a
 * summary or JSON and, with --out, writes stills.csv and stills.json whole or not at all.
 */
import type { Command } from 'commander';
import { join } from 'node:path';
import { action } from '../action.js';
import { toolVersion } from '../toolVersion.js';
import { KerrError } from '../../src/errors.js';
import type { Rect, TransferName } from '../../src/media/types.js';
import { parseRect } from '../../src/measure/rect.js';
import { parseTransfer } from '../../src/core/camera/transfer.js';
import { checkOutputDir, stageOutputDir } from '../../src/io/outputDir.js';
import { sha256File } from '../../src/io/sha256File.js';
import { parseNumberOption } from '../../src/design/parseNumberOption.js';
import { readStillsSeries, type StillsOptions } from '../../src/stills/readStillsSeries.js';
import { fitStillsSeries } from '../../src/stills/fitStillsSeries.js';
import { formatStillsSummary } from '../../src/stills/formatStillsSummary.js';
import { stillsCsv } from '../../src/stills/stillsCsv.js';
import { stillsRecord } from '../../src/stills/stillsRecord.js';

interface StillsCliOptions {
  volts?: string;
  lengthMm?: string;
  effectiveLengthMm?: string;
  gapMm?: string;
  polariserAngleDeg?: string;
  roi?: string;
  darkRoi?: string;
  referenceRoi?: string;
  transfer?: string;
  out?: string;
  force?: boolean;
  json?: boolean;
}

function required(text: string | undefined, option: string, what: string): string {
  if (text === undefined) throw new KerrError('BAD_ARGUMENT', `no ${what} was given`, { path: option, hint: `Give it with ${option}` });
  return text;
}

/** Registers the `stills` command. */
export function register(program: Command): void {
  program
    .command('stills')
    .description('Kerr constant and half-wave voltage from a folder of photos taken at known voltages (JPEG, PNG, TIFF).')
    .argument('<folder>', 'folder holding the photos')
    .option('--volts <csv>', 'CSV with a file column and a voltage column (default: voltages from the file names, e.g. step07_12.5kV.jpg)')
    .option('--length-mm <L>', 'electrode length along the beam, mm')
    .option('--effective-length-mm <L>', 'optical effective length, mm (default the electrode length)')
    .option('--gap-mm <d>', 'electrode gap, mm')
    .option('--polariser-angle-deg <deg>', 'polariser angle to the field, degrees (crossed analyser)', '45')
    .option('--roi <x,y,w,h>', 'beam region in pixels (default: the whole photo)')
    .option('--dark-roi <x,y,w,h>', 'a region with no beam: its level is subtracted')
    .option('--reference-roi <x,y,w,h>', 'a region of constant brightness (grey card) to track exposure when EXIF is missing')
    .option('--transfer <name>', 'srgb, bt709, linear or gamma:G (default: srgb for 8-bit and PNG, linear for 16-bit TIFF)')
    .option('--out <dir>', 'write stills.csv and stills.json into this folder')
    .option('--force', 'replace an existing --out folder')
    .option('--json', 'print the JSON record instead of the summary')
    .action(
      action(async (folder: string, o: StillsCliOptions) => {
        // Settings first, checked where they enter.
        const lengthM = parseNumberOption(required(o.lengthMm, '--length-mm', 'electrode length'), '--length-mm', 'electrode length in mm', 'positive') * 1e-3;
        const gapM = parseNumberOption(required(o.gapMm, '--gap-mm', 'electrode gap'), '--gap-mm', 'electrode gap in mm', 'positive') * 1e-3;
        const effectiveLengthM = o.effectiveLengthMm === undefined ? lengthM : parseNumberOption(o.effectiveLengthMm, '--effective-length-mm', 'effective length in mm', 'positive') * 1e-3;
        const polariserAngleDeg = parseNumberOption(o.polariserAngleDeg ?? '45', '--polariser-angle-deg', 'angle in degrees', 'finite');
        const opts: StillsOptions = {};
        if (o.volts !== undefined) opts.voltsPath = o.volts;
        const rect = (text: string | undefined, option: string): Rect | undefined => (text === undefined ? undefined : parseRect(text, option));
        const roi = rect(o.roi, '--roi');
        const darkRoi = rect(o.darkRoi, '--dark-roi');
        const referenceRoi = rect(o.referenceRoi, '--reference-roi');
        if (roi) opts.roi = roi;
        if (darkRoi) opts.darkRoi = darkRoi;
        if (referenceRoi) opts.referenceRoi = referenceRoi;
        const transfer: TransferName | undefined = o.transfer === undefined ? undefined : parseTransfer(o.transfer, '--transfer');
        if (transfer) opts.transfer = transfer;
        if (o.out !== undefined) checkOutputDir(o.out, o.force === true, [folder, ...(o.volts ? [o.volts] : [])]);

        // The work.
        const series = await readStillsSeries(folder, opts);
        const fit = fitStillsSeries({ voltageV: series.voltageV, intensity: series.intensity, clippedFraction: series.clippedFraction, effectiveLengthM, gapM, polariserAngleDeg });
        const cell = { lengthM, effectiveLengthM, gapM, polariserAngleDeg };
        const needRecord = o.json === true || o.out !== undefined;
        const record = needRecord
          ? stillsRecord({
            series,
            fit,
            folder,
            createdAt: new Date().toISOString(),
            toolVersion: toolVersion(),
            options: { ...o },
            cell,
            inputs: {
              photos: await Promise.all(series.files.map(async (f) => ({ path: join(folder, f), sha256: await sha256File(join(folder, f)) }))),
              volts: o.volts === undefined ? null : { path: o.volts, sha256: await sha256File(o.volts) },
            },
          })
          : null;

        if (o.out !== undefined && record !== null) {
          const staged = stageOutputDir(o.out, o.force === true);
          try {
            staged.write('stills.csv', stillsCsv(series, fit));
            staged.write('stills.json', `${JSON.stringify(record, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n`);
            staged.commit();
          } catch (err) {
            staged.abandon();
            throw err;
          }
        }
        if (o.json === true && record !== null) {
          process.stdout.write(`${JSON.stringify(record, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n`);
        } else {
          process.stdout.write(formatStillsSummary(series, fit, { folder, effectiveLengthM, gapM, polariserAngleDeg }));
          if (o.out !== undefined) process.stdout.write(`\nWrote ${join(o.out, 'stills.csv')} and ${join(o.out, 'stills.json')}\n`);
        }
      }),
    );
}
