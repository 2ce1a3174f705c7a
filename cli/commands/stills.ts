/**
 * `kerrtrace stills FOLDER --length-mm L --gap-mm D [--volts MAP.csv] [...]`: a Kerr measurement
 * from photos taken at known voltages, written like an analyze run (result.json with source
 * "stills", trace.csv, report.html, summary.md, plots/, regions.png, stills.csv).
 * The amplitude is fixed by --open-level (a number) or --open-photo (measured like the series).
 * This file only parses and checks the options and wires them: the job itself is
 * src/stills/runStills.ts (output folder checked before any photo is read, series read, inputs
 * hashed, the record built once, the folder written whole or not at all). Then it prints the
 * photo table and the summary (cli/summaryText.ts) or result.json, and exits 3 (NOT_VALID) when
 * the run failed a gate (the result is kept, marked not valid).
 * Heavy modules (sharp, exifr through the reader, vega through the report) are imported inside
 * the action, after the options are checked.
 */
import type { Command } from 'commander';
import { basename, dirname, join, resolve } from 'node:path';
import { action } from '../action.js';
import { makeProgress } from '../progress.js';
import { summaryText } from '../summaryText.js';
import { toolVersion } from '../toolVersion.js';
import { KerrError, invalid } from '../../src/errors.js';
import type { Rect, TransferName } from '../../src/media/types.js';
import { parseNumberOption, parsePercentOption, parseRectOption, parseToleranceOption, parseTransferOption } from '../optionParsers.js';
import { checkStillsOptions, type RunStillsOptions } from '../../src/stills/stillsRunOptions.js';

interface StillsCliOptions {
  volts?: string;
  lengthMm?: string;
  effectiveLengthMm?: string;
  gapMm?: string;
  polariserAngleDeg?: string;
  staticRetardanceRad?: string;
  roi?: string;
  darkRoi?: string;
  referenceRoi?: string;
  transfer?: string;
  cameraProfile?: string;
  openLevel?: string;
  openPhoto?: string;
  voltsAccuracy?: string;
  label?: string;
  out?: string;
  force?: boolean;
  json?: boolean;
  quiet?: boolean;
  robust?: boolean;
  report?: boolean;
}

function required(text: string | undefined, option: string, what: string): string {
  if (text === undefined) throw new KerrError('BAD_ARGUMENT', `no ${what} was given`, { path: option, hint: `Give it with ${option}` });
  return text;
}

/** Default output folder: beside the photo folder, "<folder name>.kerrtrace". */
export function defaultStillsOutDir(folder: string): string {
  const abs = resolve(folder);
  return join(dirname(abs), `${basename(abs)}.kerrtrace`);
}

/** Registers the `stills` command. */
export function register(program: Command): void {
  program
    .command('stills')
    .description('measure the Kerr constant and half-wave voltage from a folder of photos taken at known voltages (JPEG, PNG, TIFF)')
    .argument('<folder>', 'folder holding the photos')
    .option('--volts <csv>', 'CSV with a file column and a voltage column (default: voltages from the file names, e.g. step07_12.5kV.jpg)')
    .option('--length-mm <L>', 'electrode length along the beam, mm, optionally with its tolerance: 40±0.1')
    .option('--gap-mm <d>', 'electrode gap, mm, optionally with its tolerance: 4±0.05')
    .option('--volts-accuracy <P>', 'accuracy of the voltages given, ± percent of reading (default 1)')
    .option('--out <dir>', 'output folder (default: <folder name>.kerrtrace beside the photo folder)')
    .option('--force', 'replace an existing output folder')
    .option('--roi <x,y,w,h>', 'beam region in pixels (default: found automatically as the area that varies most across the photos)')
    .option('--dark-roi <x,y,w,h>', 'a region with no beam: its level is subtracted (default: the local surround from two rings around the beam)')
    .option('--reference-roi <x,y,w,h>', 'a region of constant brightness (grey card) to track exposure when EXIF is missing')
    .option('--open-photo <file>', 'a photo with the analyser parallel and no field, same camera position: its level fixes the amplitude')
    .option('--open-level <X>', 'open level in the linear units of trace.csv (fixes the amplitude), optionally with its tolerance: 0.42±0.01')
    .option('--effective-length-mm <L>', 'optical effective length, mm (default: --length-mm)')
    .option('--polariser-angle-deg <deg>', 'polariser angle to the field, degrees, analyser crossed (default 45)')
    .option('--static-retardance-rad <R>', 'known zero-field retardance of the cell windows, rad (default 0)')
    .option('--transfer <name>', 'srgb, bt709, linear or gamma:G (default: srgb for 8-bit and PNG, linear for 16-bit TIFF)')
    .option('--camera-profile <file>', 'camera response profile from `kerrtrace calibrate-camera`, used instead of the transfer curve')
    .option('--label <text>', 'a name for this run in reports and comparisons (default: the folder name)')
    .option('--no-robust', 'plain least squares instead of Huber weighting')
    .option('--no-report', 'skip report.html, plots and summary.md')
    .option('--json', 'print result.json instead of the summary')
    .option('--quiet', 'no progress bar')
    .action(
      action(async (folder: string, o: StillsCliOptions) => {
        // Settings first, checked where they enter (mm stay mm here; runStills converts once).
        const length = parseToleranceOption(required(o.lengthMm, '--length-mm', 'electrode length'), '--length-mm', 'a positive electrode length in mm');
        const gap = parseToleranceOption(required(o.gapMm, '--gap-mm', 'electrode gap'), '--gap-mm', 'a positive electrode gap in mm');
        const lengthMm = parseNumberOption(String(length.value), '--length-mm', 'a positive electrode length in mm', 'positive');
        const gapMm = parseNumberOption(String(gap.value), '--gap-mm', 'a positive electrode gap in mm', 'positive');
        const effectiveLengthMm = o.effectiveLengthMm === undefined ? lengthMm : parseNumberOption(o.effectiveLengthMm, '--effective-length-mm', 'a positive effective length in mm', 'positive');
        const polariserAngleDeg = parseNumberOption(o.polariserAngleDeg ?? '45', '--polariser-angle-deg', 'an angle in degrees', 'finite');
        const staticRetardanceRad = o.staticRetardanceRad === undefined ? undefined : parseNumberOption(o.staticRetardanceRad, '--static-retardance-rad', 'a retardance in rad', 'finite');
        const open = o.openLevel === undefined ? undefined : parseToleranceOption(o.openLevel, '--open-level', 'a positive open level in the linear units of trace.csv', 'linear units');
        const openLevel = open === undefined ? undefined : parseNumberOption(String(open.value), '--open-level', 'a positive open level in the linear units of trace.csv', 'positive');
        const voltsAccuracyPercent = o.voltsAccuracy === undefined ? undefined : parsePercentOption(o.voltsAccuracy, '--volts-accuracy', 'a voltage meter accuracy in percent of reading (e.g. 1)');
        const rect = (text: string | undefined, option: string): Rect | undefined => (text === undefined ? undefined : parseRectOption(text, option));
        const roi = rect(o.roi, '--roi');
        const darkRoi = rect(o.darkRoi, '--dark-roi');
        const referenceRoi = rect(o.referenceRoi, '--reference-roi');
        const transfer: TransferName | undefined = o.transfer === undefined ? undefined : parseTransferOption(o.transfer, '--transfer');
        if (o.label !== undefined && o.label.trim() === '') throw invalid('a non-empty label', '--label', o.label);
        const robust = o.robust !== false;
        const options: RunStillsOptions = {
          folder, lengthMm, gapMm, effectiveLengthMm, polariserAngleDeg, robust,
          label: o.label ?? basename(resolve(folder)), outDir: o.out ?? defaultStillsOutDir(folder), force: o.force === true, report: o.report !== false,
          ...(length.tolerance !== undefined ? { lengthToleranceMm: length.tolerance } : {}), ...(gap.tolerance !== undefined ? { gapToleranceMm: gap.tolerance } : {}),
          ...(o.volts !== undefined ? { voltsPath: o.volts } : {}), ...(roi ? { roi } : {}), ...(darkRoi ? { darkRoi } : {}), ...(referenceRoi ? { referenceRoi } : {}),
          ...(transfer ? { transfer } : {}), ...(o.cameraProfile !== undefined ? { cameraProfilePath: o.cameraProfile } : {}),
          ...(openLevel !== undefined ? { openLevel } : {}), ...(open?.tolerance !== undefined ? { openLevelTolerance: open.tolerance } : {}),
          ...(o.openPhoto !== undefined ? { openPhotoPath: o.openPhoto } : {}), ...(staticRetardanceRad !== undefined ? { staticRetardanceRad } : {}),
          ...(voltsAccuracyPercent !== undefined ? { voltsAccuracyPercent } : {}),
          asGiven: {
            folder, lengthMm, gapMm, effectiveLengthMm, polariserAngleDeg, robust,
            ...(length.tolerance !== undefined ? { lengthToleranceMm: length.tolerance } : {}), ...(gap.tolerance !== undefined ? { gapToleranceMm: gap.tolerance } : {}),
            ...(o.volts !== undefined ? { voltsPath: o.volts } : {}),
            ...(roi ? { roi } : {}), ...(darkRoi ? { darkRoi } : {}), ...(referenceRoi ? { referenceRoi } : {}),
            ...(transfer ? { transfer } : {}), ...(openLevel !== undefined ? { openLevel } : {}), ...(open?.tolerance !== undefined ? { openLevelTolerance: open.tolerance } : {}),
            ...(staticRetardanceRad !== undefined ? { staticRetardanceRad } : {}), ...(voltsAccuracyPercent !== undefined ? { voltsAccuracyPercent } : {}),
            ...(o.label !== undefined ? { label: o.label } : {}),
          },
        };
        checkStillsOptions(options);

        // The work. The image, EXIF, fitting and plot libraries load only now, so that
        // `kerrtrace --help` and the other commands start quickly.
        const [{ runStills }, { formatPhotoTable }, { jsonSafe }] = await Promise.all([
          import('../../src/stills/runStills.js'),
          import('../../src/stills/formatPhotoTable.js'),
          import('../../src/pipeline/writeRun.js'),
        ]);
        const progress = makeProgress('reading photos', o.quiet === true || o.json === true);
        let run;
        try {
          run = await runStills(options, {
            createdAt: new Date().toISOString(),
            tool: { name: 'kerrtrace', version: toolVersion(), ffmpegVersion: null, node: process.version },
            onProgress: (done, total) => progress.update(done, total),
          });
        } finally {
          progress.stop();
        }
        const { result, trace, series, written } = run;
        if (o.json === true) {
          process.stdout.write(`${JSON.stringify(result, jsonSafe, 2)}\n`);
        } else {
          process.stdout.write(`${formatPhotoTable(series, trace)}\n`);
          process.stdout.write(summaryText(result, written));
        }
        const validity = result.validity;
        if (validity && !validity.valid) {
          // The run is written (marked not valid) so it can be inspected; its figures are not to be used.
          throw new KerrError('NOT_VALID', `the run failed ${validity.failures.length === 1 ? 'a check' : `${validity.failures.length} checks`}: ${validity.failures.map((f) => f.message).join('; ')}`, { hint: `The result is kept in ${written}, marked not valid; see docs/stills.md, "Gates"` });
        }
      }),
    );
}
