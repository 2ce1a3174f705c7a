/**
 * `kerrtrace stills FOLDER --length-mm L --gap-mm D [--volts MAP.csv] [...]`: a Kerr measurement
 * from photos taken at known voltages, written like an analyze run (result.json with source
 * "stills", trace.csv, report.html, summary.md, plots/, regions.png, stills.csv).
 * The amplitude is fixed by --open-level (a number) or --open-photo (measured like the series).
 * Order: parse and check every option (mm → m once, here), refuse an existing output folder
 * before any photo is read, read the series (src/stills/readStillsSeries.ts), hash the inputs,
 * build the run (src/stills/stillsRunResult.ts), write the folder whole or not at all
 * (writeRunDir), then print the photo table and the summary (cli/summaryText.ts) or result.json.
 * Heavy modules (sharp, exifr through the reader, vega through the report) are imported inside
 * the action, after the options are checked.
 */
import type { Command } from 'commander';
import { basename, dirname, join, resolve } from 'node:path';
import { action } from '../action.js';
import { makeProgress } from '../progress.js';
import { summaryText } from '../summaryText.js';
import { toolVersion } from '../toolVersion.js';
import { KerrError, invalid, isKerrError } from '../../src/errors.js';
import type { Rect, TransferName } from '../../src/media/types.js';
import { checkOutputDir } from '../../src/io/outputDir.js';
import { parseNumberOption, parseRectOption, parseTransferOption } from '../optionParsers.js';
import type { InputFile } from '../../src/result/schema.js';
import type { StillsOptions } from '../../src/stills/readStillsSeries.js';

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
    .option('--length-mm <L>', 'electrode length along the beam, mm')
    .option('--gap-mm <d>', 'electrode gap, mm')
    .option('--out <dir>', 'output folder (default: <folder name>.kerrtrace beside the photo folder)')
    .option('--force', 'replace an existing output folder')
    .option('--roi <x,y,w,h>', 'beam region in pixels (default: the whole photo)')
    .option('--dark-roi <x,y,w,h>', 'a region with no beam: its level is subtracted')
    .option('--reference-roi <x,y,w,h>', 'a region of constant brightness (grey card) to track exposure when EXIF is missing')
    .option('--open-photo <file>', 'a photo with the analyser parallel and no field, same camera position: its level fixes the amplitude')
    .option('--open-level <X>', 'open level in the linear units of trace.csv (fixes the amplitude)')
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
        // Settings first, checked where they enter.
        const lengthMm = parseNumberOption(required(o.lengthMm, '--length-mm', 'electrode length'), '--length-mm', 'a positive electrode length in mm', 'positive');
        const gapMm = parseNumberOption(required(o.gapMm, '--gap-mm', 'electrode gap'), '--gap-mm', 'a positive electrode gap in mm', 'positive');
        const effectiveLengthMm = o.effectiveLengthMm === undefined ? lengthMm : parseNumberOption(o.effectiveLengthMm, '--effective-length-mm', 'a positive effective length in mm', 'positive');
        if (effectiveLengthMm < lengthMm) {
          throw invalid(`an effective length at least the electrode length (${lengthMm} mm)`, '--effective-length-mm', o.effectiveLengthMm, 'Fringe fields only lengthen the cell');
        }
        const polariserAngleDeg = parseNumberOption(o.polariserAngleDeg ?? '45', '--polariser-angle-deg', 'an angle in degrees');
        const staticRetardanceRad = o.staticRetardanceRad === undefined ? undefined : parseNumberOption(o.staticRetardanceRad, '--static-retardance-rad', 'a retardance in rad');
        const openLevel = o.openLevel === undefined ? undefined : parseNumberOption(o.openLevel, '--open-level', 'a positive open level in the linear units of trace.csv', 'positive');
        if (openLevel !== undefined && o.openPhoto !== undefined) {
          throw new KerrError('BAD_ARGUMENT', 'give at most one of --open-level and --open-photo', { path: '--open-photo', hint: 'They are two ways to give the same open level' });
        }
        const rect = (text: string | undefined, option: string): Rect | undefined => (text === undefined ? undefined : parseRectOption(text, option));
        const roi = rect(o.roi, '--roi');
        const darkRoi = rect(o.darkRoi, '--dark-roi');
        const referenceRoi = rect(o.referenceRoi, '--reference-roi');
        const transfer: TransferName | undefined = o.transfer === undefined ? undefined : parseTransferOption(o.transfer, '--transfer');
        if (o.label !== undefined && o.label.trim() === '') throw invalid('a non-empty label', '--label', o.label);
        const outDir = o.out ?? defaultStillsOutDir(folder);
        checkOutputDir(outDir, o.force === true, [folder, ...(o.volts !== undefined ? [o.volts] : []), ...(o.openPhoto !== undefined ? [o.openPhoto] : [])]);

        // The work. The image, EXIF, fitting and plot libraries load only now, so that
        // `kerrtrace --help` and the other commands start quickly.
        const [
          { default: sharp }, { readStillsSeries }, { stillsRunResult }, { stillsCsv }, { stillsRegionOverlay },
          { formatPhotoTable }, { sha256File }, { writeRunDir, jsonSafe }, { writeRunReport },
        ] = await Promise.all([
          import('sharp'),
          import('../../src/stills/readStillsSeries.js'),
          import('../../src/stills/stillsRunResult.js'),
          import('../../src/stills/stillsCsv.js'),
          import('../../src/stills/stillsRegionOverlay.js'),
          import('../../src/stills/formatPhotoTable.js'),
          import('../../src/io/sha256File.js'),
          import('../../src/pipeline/writeRun.js'),
          import('../../src/report/writeRunReport.js'),
        ]);
        const readOptions: StillsOptions = {};
        if (o.volts !== undefined) readOptions.voltsPath = o.volts;
        if (roi) readOptions.roi = roi;
        if (darkRoi) readOptions.darkRoi = darkRoi;
        if (referenceRoi) readOptions.referenceRoi = referenceRoi;
        if (transfer) readOptions.transfer = transfer;
        if (transfer && o.cameraProfile !== undefined) throw new KerrError('BAD_ARGUMENT', 'give --transfer or --camera-profile, not both', { path: '--camera-profile', hint: 'A camera profile replaces the transfer curve' });
        const { readCameraProfile } = await import('../../src/io/cameraProfile.js');
        const cameraProfile = o.cameraProfile !== undefined ? { path: o.cameraProfile, profile: await readCameraProfile(o.cameraProfile) } : undefined;
        if (cameraProfile) readOptions.response = cameraProfile.profile.response;
        if (o.openPhoto !== undefined) readOptions.openPhotoPath = o.openPhoto;
        const progress = makeProgress('reading photos', o.quiet === true || o.json === true);
        let series;
        try {
          series = await readStillsSeries(folder, { ...readOptions, onProgress: (done, total) => progress.update(done, total) });
        } finally {
          progress.stop();
        }
        const amplitude = openLevel ?? series.openPhoto?.intensity;
        const stills: InputFile[] = [];
        for (const f of series.files) stills.push({ path: join(folder, f), sha256: await sha256File(join(folder, f)) });
        const run = stillsRunResult({
          series,
          cell: { lengthM: lengthMm * 1e-3, effectiveLengthM: effectiveLengthMm * 1e-3, gapM: gapMm * 1e-3, polariserAngleDeg },
          fitOptions: {
            robust: o.robust !== false,
            ...(amplitude !== undefined ? { openLevel: amplitude } : {}),
            ...(staticRetardanceRad !== undefined ? { staticRetardanceRad } : {}),
          },
          label: o.label ?? basename(resolve(folder)),
          createdAt: new Date().toISOString(),
          tool: { name: 'kerrtrace', version: toolVersion(), ffmpegVersion: null, node: process.version },
          inputs: {
            stills, ...(o.volts !== undefined ? { volts: { path: o.volts, sha256: await sha256File(o.volts) } } : {}),
            ...(cameraProfile ? { cameraProfile: { path: cameraProfile.path, sha256: await sha256File(cameraProfile.path) } } : {}),
          },
          options: {
            folder, lengthMm, gapMm, effectiveLengthMm, polariserAngleDeg, robust: o.robust !== false,
            ...(o.volts !== undefined ? { voltsPath: o.volts } : {}),
            ...(roi ? { roi } : {}), ...(darkRoi ? { darkRoi } : {}), ...(referenceRoi ? { referenceRoi } : {}),
            ...(transfer ? { transfer } : {}), ...(openLevel !== undefined ? { openLevel } : {}),
            ...(staticRetardanceRad !== undefined ? { staticRetardanceRad } : {}),
            ...(o.label !== undefined ? { label: o.label } : {}),
            ...(series.openPhoto
              ? { openPhoto: { path: series.openPhoto.path, sha256: await sha256File(series.openPhoto.path), level: series.openPhoto.intensity, exposureRelative: series.openPhoto.exposureRelative } }
              : {}),
            imageDecoder: `sharp ${sharp.versions.sharp ?? 'unknown'} (libvips ${sharp.versions.vips})`,
          },
        });
        const { result, trace } = run;
        const { stillsCameraResponse } = await import('../../src/stills/stillsCameraResponse.js');
        const response = stillsCameraResponse(result, trace, {
          transfer: series.transfers[0] ?? 'srgb', transferFromOption: transfer !== undefined, ...(cameraProfile ? { profile: cameraProfile } : {}),
        }, amplitude);
        result.cameraResponse = response.record;
        result.warnings.push(...response.warnings);
        if (cameraProfile) result.options.cameraProfile = cameraProfile.path;

        // regions.png is a convenience: a photo that will not decode again only costs the picture.
        let regionsPng: Buffer | undefined;
        try {
          regionsPng = await stillsRegionOverlay(folder, series, trace.map((r) => r.used));
        } catch (err) {
          if (!isKerrError(err)) throw err;
          result.warnings.push({ code: 'overlay-photo', message: `regions.png was not drawn: ${err.message}` });
        }
        const written = await writeRunDir(outDir, o.force === true, {
          inputs: [folder, ...(o.volts !== undefined ? [o.volts] : []), ...(o.openPhoto !== undefined ? [o.openPhoto] : [])],
          result,
          trace,
          extraFiles: { 'stills.csv': stillsCsv(series), ...(regionsPng ? { 'regions.png': regionsPng } : {}) },
          ...(o.report !== false
            ? { writeReports: async (dir, r) => (await writeRunReport(dir, { result: r, trace, ...(regionsPng ? { images: { frameWithRegionsPng: regionsPng } } : {}) })).files }
            : {}),
        });
        if (o.json === true) {
          process.stdout.write(`${JSON.stringify(result, jsonSafe, 2)}\n`);
        } else {
          process.stdout.write(`${formatPhotoTable(series, trace)}\n`);
          process.stdout.write(summaryText(result, written));
        }
      }),
    );
}
