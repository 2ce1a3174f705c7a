/**
 * The whole `kerrtrace stills` job, after the command line has parsed the options: check the
 * settings and the output folder (before any photo is read), read the series
 * (readStillsSeries), read the camera profile, hash every input, draw regions.png, build the run
 * record once (stillsRunResult, src/result/buildRunRecord) and write the folder whole or not at
 * all (writeRunDir: result.json, trace.csv, stills.csv, regions.png, and the report unless
 * `report` is false). The caller passes the clock (`createdAt`) and the tool versions; nothing is
 * printed here. A run that fails a gate is still written (marked not valid): the caller decides
 * the exit code from `result.validity`.
 * Edge module: reads the photos and inputs, writes the output folder.
 * @throws KerrError for bad settings (BAD_ARGUMENT), an output folder it may not write
 *   (FILE_EXISTS, UNSAFE), and whatever the reader, the fit and the writer throw.
 * @example const run = await runStills({ folder: 'run1', lengthMm: 50, gapMm: 5, outDir: 'run1.kerrtrace' }, { createdAt, tool });
 */
import { join } from 'node:path';
import sharp from 'sharp';
import { isKerrError } from '../errors.js';
import type { InputFile, RunResult, RunWarning, TraceRow } from '../result/schema.js';
import { checkOutputDir } from '../io/outputDir.js';
import { sha256File } from '../io/sha256File.js';
import { readCameraProfile, type CameraProfile } from '../io/cameraProfile.js';
import { writeRunDir } from '../pipeline/writeRun.js';
import { writeRunReport } from '../report/writeRunReport.js';
import { readStillsSeries, type StillsOptions, type StillsSeries } from './readStillsSeries.js';
import { photoExclusions } from './fitStillsSeries.js';
import { stillsRunResult } from './stillsRunResult.js';
import { stillsRegionOverlay } from './stillsRegionOverlay.js';
import { stillsCsv } from './stillsCsv.js';
import { checkStillsOptions, stillsInputs, type RunStillsOptions } from './stillsRunOptions.js';

export type { RunStillsOptions } from './stillsRunOptions.js';

export interface RunStillsContext {
  /** ISO-8601 time of the run (the caller's clock). */
  createdAt: string;
  tool: RunResult['tool'];
  onProgress?: (done: number, total: number) => void;
}

export interface StillsRunOutput {
  result: RunResult;
  trace: TraceRow[];
  series: StillsSeries;
  /** The folder written. */
  written: string;
}

async function readSeries(o: RunStillsOptions, profile: CameraProfile | undefined, onProgress?: (done: number, total: number) => void): Promise<StillsSeries> {
  const r: StillsOptions = {
    ...(o.voltsPath !== undefined ? { voltsPath: o.voltsPath } : {}), ...(o.roi ? { roi: o.roi } : {}), ...(o.darkRoi ? { darkRoi: o.darkRoi } : {}),
    ...(o.referenceRoi ? { referenceRoi: o.referenceRoi } : {}), ...(o.transfer ? { transfer: o.transfer } : {}),
    ...(profile ? { response: profile.response } : {}), ...(o.openPhotoPath !== undefined ? { openPhotoPath: o.openPhotoPath } : {}),
    ...(onProgress ? { onProgress } : {}),
  };
  return readStillsSeries(o.folder, r);
}

/** regions.png: a convenience, so a photo that will not decode again only costs the picture (and a warning). */
async function drawRegions(folder: string, series: StillsSeries, warnings: RunWarning[]): Promise<Buffer | undefined> {
  const { used } = photoExclusions({ ...series, preExcluded: series.unreadable.map((u) => (u === null ? null : 'unreadable')) });
  try {
    return await stillsRegionOverlay(folder, series, Array.from(used, (u) => u === 1));
  } catch (err) {
    if (!isKerrError(err)) throw err;
    warnings.push({ code: 'overlay-photo', message: `regions.png was not drawn: ${err.message}` });
    return undefined;
  }
}

export async function runStills(o: RunStillsOptions, ctx: RunStillsContext): Promise<StillsRunOutput> {
  checkStillsOptions(o);
  checkOutputDir(o.outDir, o.force, stillsInputs(o));
  const profile = o.cameraProfilePath !== undefined ? { path: o.cameraProfilePath, profile: await readCameraProfile(o.cameraProfilePath) } : undefined;
  const series = await readSeries(o, profile?.profile, ctx.onProgress);
  const hash = async (path: string): Promise<InputFile> => ({ path, sha256: await sha256File(path) });
  const stills: InputFile[] = [];
  for (const f of series.files) stills.push(await hash(join(o.folder, f)));
  const edgeWarnings: RunWarning[] = [];
  const regionsPng = await drawRegions(o.folder, series, edgeWarnings);
  const openLevel = o.openLevel ?? series.openPhoto?.intensity;
  const openLevelSource = o.openLevel !== undefined
    ? { option: '--open-level', stdErr: o.openLevelTolerance !== undefined ? o.openLevelTolerance / Math.sqrt(3) : undefined, note: o.openLevelTolerance !== undefined ? `--open-level ±${o.openLevelTolerance} (rectangular, /√3)` : 'no tolerance given with --open-level (X±T)' }
    : series.openPhoto ? { option: '--open-photo', stdErr: undefined, note: 'one open photo: its uncertainty is not estimated' } : undefined;
  const { result, trace } = stillsRunResult({
    series,
    cell: { lengthM: o.lengthMm * 1e-3, effectiveLengthM: o.effectiveLengthMm * 1e-3, gapM: o.gapMm * 1e-3, polariserAngleDeg: o.polariserAngleDeg },
    fitOptions: { robust: o.robust, ...(openLevel !== undefined ? { openLevel } : {}), ...(o.staticRetardanceRad !== undefined ? { staticRetardanceRad: o.staticRetardanceRad } : {}) },
    ...(openLevelSource ? { openLevelSource } : {}),
    budget: { ...(o.voltsAccuracyPercent !== undefined ? { voltsAccuracyPercent: o.voltsAccuracyPercent } : {}), gapToleranceM: (o.gapToleranceMm ?? 0) * 1e-3, lengthToleranceM: (o.lengthToleranceMm ?? 0) * 1e-3 },
    response: { transfer: series.transfers[0] ?? 'srgb', transferFromOption: o.transfer !== undefined, ...(profile ? { profile } : {}) },
    label: o.label, createdAt: ctx.createdAt, tool: ctx.tool,
    inputs: { stills, ...(o.voltsPath !== undefined ? { volts: await hash(o.voltsPath) } : {}), ...(profile ? { cameraProfile: await hash(profile.path) } : {}) },
    options: {
      ...o.asGiven,
      ...(series.openPhoto ? { openPhoto: { ...(await hash(series.openPhoto.path)), level: series.openPhoto.intensity, exposureRelative: series.openPhoto.exposureRelative } } : {}),
      ...(profile ? { cameraProfile: profile.path } : {}),
      imageDecoder: `sharp ${sharp.versions.sharp ?? 'unknown'} (libvips ${sharp.versions.vips})`,
    },
    edgeWarnings,
  });
  const written = await writeRunDir(o.outDir, o.force, {
    inputs: stillsInputs(o), result, trace,
    extraFiles: { 'stills.csv': stillsCsv(series), ...(regionsPng ? { 'regions.png': regionsPng } : {}) },
    ...(o.report ? { writeReports: async (dir, r) => (await writeRunReport(dir, { result: r, trace, ...(regionsPng ? { images: { frameWithRegionsPng: regionsPng } } : {}) })).files } : {}),
  });
  return { result, trace, series, written };
}
