/**
 * `kerrtrace analyze VIDEO --volts CSV --length-mm L --gap-mm D [...]`: the main job.
 */
import type { Command } from 'commander';
import { action } from '../action.js';
import { KerrError, invalid } from '../../src/errors.js';
import type { AnalyzeOptions } from '../../src/pipeline/analyze.js';
import { checkOutputDir } from '../../src/io/outputDir.js';
import { makeProgress } from '../progress.js';
import { toolVersionInfo } from '../versions.js';
import { summaryText } from '../summaryText.js';
import { parseNumberOption, parsePercentOption, parseRectOption, parseToleranceOption, parseTransferOption, parseWindowOption } from '../optionParsers.js';
import { withFlags } from '../flagNames.js';

export interface AnalyzeCliOptions {
  volts?: string; lengthMm?: string; gapMm?: string; out?: string; roi?: string; darkRoi?: string; referenceRoi?: string;
  offsetS?: string; openWindow?: string; openVideo?: string; openLevel?: string; effectiveLengthMm?: string;
  polariserAngleDeg?: string; staticRetardanceRad?: string; transfer?: string; electrodeHeightMm?: string; label?: string;
  json?: boolean; force?: boolean; quiet?: boolean; robust?: boolean; report?: boolean; maps?: boolean; baseline?: string; channels?: string; wavelengthNm?: string; cameraProfile?: string; voltsAccuracy?: string;
}

export function toAnalyzeOptions(video: string, c: AnalyzeCliOptions): AnalyzeOptions {
  if (!c.volts) throw new KerrError('BAD_ARGUMENT', 'the voltage log is missing', { path: '--volts', hint: 'Give it with --volts FILE.csv' });
  if (c.lengthMm === undefined) throw new KerrError('BAD_ARGUMENT', 'the electrode length is missing', { path: '--length-mm', hint: 'Give it with --length-mm L (mm)' });
  if (c.gapMm === undefined) throw new KerrError('BAD_ARGUMENT', 'the electrode gap is missing', { path: '--gap-mm', hint: 'Give it with --gap-mm D (mm)' });
  const length = parseToleranceOption(c.lengthMm, '--length-mm', 'a positive electrode length in mm');
  const gap = parseToleranceOption(c.gapMm, '--gap-mm', 'a positive electrode gap in mm');
  const o: AnalyzeOptions = {
    videoPath: video,
    voltsPath: c.volts,
    lengthMm: length.value,
    gapMm: gap.value,
  };
  if (length.tolerance !== undefined) o.lengthToleranceMm = length.tolerance;
  if (gap.tolerance !== undefined) o.gapToleranceMm = gap.tolerance;
  if (c.voltsAccuracy !== undefined) o.voltsAccuracyPercent = parsePercentOption(c.voltsAccuracy, '--volts-accuracy', 'a logger accuracy in percent of reading (e.g. 1)');
  if (c.effectiveLengthMm !== undefined) o.effectiveLengthMm = parseNumberOption(c.effectiveLengthMm, '--effective-length-mm', 'an effective length in mm');
  if (c.polariserAngleDeg !== undefined) o.polariserAngleDeg = parseNumberOption(c.polariserAngleDeg, '--polariser-angle-deg', 'an angle in degrees');
  if (c.staticRetardanceRad !== undefined) o.staticRetardanceRad = parseNumberOption(c.staticRetardanceRad, '--static-retardance-rad', 'a retardance in rad');
  if (c.roi !== undefined) o.roi = parseRectOption(c.roi, '--roi');
  if (c.darkRoi !== undefined) o.darkRoi = parseRectOption(c.darkRoi, '--dark-roi');
  if (c.referenceRoi !== undefined) o.referenceRoi = parseRectOption(c.referenceRoi, '--reference-roi');
  if (c.offsetS !== undefined) o.offsetS = parseNumberOption(c.offsetS, '--offset-s', 'an offset in seconds');
  if (c.openWindow !== undefined) o.openWindowS = parseWindowOption(c.openWindow, '--open-window');
  if (c.openVideo !== undefined) o.openVideoPath = c.openVideo;
  if (c.openLevel !== undefined) {
    const level = parseToleranceOption(c.openLevel, '--open-level', 'a positive open level in linear units', 'linear units');
    o.openLevel = level.value;
    if (level.tolerance !== undefined) o.openLevelTolerance = level.tolerance;
  }
  if (c.transfer !== undefined) o.transfer = parseTransferOption(c.transfer, '--transfer');
  if (c.cameraProfile !== undefined) o.cameraProfilePath = c.cameraProfile;
  if (c.electrodeHeightMm !== undefined) o.electrodeHeightMm = parseNumberOption(c.electrodeHeightMm, '--electrode-height-mm', 'an electrode height in mm');
  if (c.label !== undefined) o.label = c.label;
  if (c.wavelengthNm !== undefined) o.wavelengthNm = parseNumberOption(c.wavelengthNm, '--wavelength-nm', 'a wavelength in nm');
  if (c.robust === false) o.robust = false;
  if (c.channels !== undefined) {
    if (c.channels !== 'rgb') throw invalid('rgb (fit the red, green and blue channels separately)', '--channels', c.channels);
    o.channels = 'rgb';
  }
  return o;
}

export function register(program: Command): void {
  program
    .command('analyze')
    .description('measure the Kerr constant, half-wave voltage, floor and contrast from a video and its voltage log')
    .argument('<video>', 'the recording (any format ffmpeg reads)')
    .option('--volts <csv>', 'voltage log CSV (see docs/voltage-log.md)')
    .option('--length-mm <L>', 'electrode length along the beam, mm, optionally with its tolerance: 40±0.1')
    .option('--gap-mm <D>', 'electrode gap, mm, optionally with its tolerance: 4±0.05')
    .option('--volts-accuracy <P>', 'voltage logger accuracy, ± percent of reading (default 1)')
    .option('--out <dir>', 'output folder (default: <video name>.kerrtrace beside the video)')
    .option('--force', 'replace an existing output folder')
    .option('--roi <x,y,w,h>', 'beam region in pixels of the displayed frame (default: found automatically)')
    .option('--dark-roi <x,y,w,h>', 'background region (default: an annulus just outside the beam)')
    .option('--reference-roi <x,y,w,h>', 'region of constant true brightness, used to correct exposure changes')
    .option('--offset-s <S>', 'video time minus log time of the same instant, s (default: found automatically)')
    .option('--open-window <START:END>', 'seconds of this video with the analyser parallel and no field')
    .option('--open-video <file>', 'a clip with the analyser parallel and no field, same camera settings')
    .option('--open-level <X>', 'open level in the linear units of trace.csv, optionally ±tolerance (e.g. 0.42±0.01)')
    .option('--effective-length-mm <LE>', 'effective length including fringe fields, mm (default: --length-mm)')
    .option('--polariser-angle-deg <A>', 'polariser angle to the field, degrees (default 45)')
    .option('--static-retardance-rad <R>', 'known zero-field retardance of the cell windows, rad (default 0)')
    .option('--transfer <name>', 'camera transfer: srgb, bt709, hlg, pq, gamma:G or linear (default: from the video metadata)')
    .option('--camera-profile <file>', 'camera response profile from `kerrtrace calibrate-camera`, used instead of the transfer curve')
    .option('--electrode-height-mm <H>', 'electrode height across the beam, mm (for resistivity)')
    .option('--label <text>', 'a name for this run in reports and comparisons')
    .option('--wavelength-nm <nm>', 'wavelength of the light, nm (recorded; compare warns when runs differ)')
    .option('--channels <rgb>', 'also fit B in the red, green and blue channels separately (white light)')
    .option('--no-robust', 'least squares without Huber down-weighting (the voltage-uncertainty weights stay)')
    .option('--baseline <result>', 'result.json (or its folder) of the polarisers without the cell or with a clean liquid, to split the floor')
    .option('--no-maps', 'skip the pictures: static/modulated maps, regions.png and the halo-to-core ratio (every other figure is unchanged)')
    .option('--no-report', 'skip report.html, plots and summary.md')
    .option('--json', 'print result.json instead of the summary')
    .option('--quiet', 'no progress bar')
    .action(action(async (video: string, c: AnalyzeCliOptions) => {
      const o = toAnalyzeOptions(video, c);
      // The pipeline, image and plot libraries load only when the command runs, so that
      // `kerrtrace --help` and the other commands start quickly.
      const { checkAnalyzeOptions, defaultOutDir } = await import('../../src/pipeline/analyze.js');
      checkAnalyzeOptions(o);
      const outDir = c.out ?? defaultOutDir(video);
      // Every input, links resolved: the output may never be, hold or lie inside one of them.
      checkOutputDir(outDir, c.force === true, [video, o.voltsPath, ...(c.openVideo !== undefined ? [c.openVideo] : []), ...(c.baseline !== undefined ? [c.baseline] : [])]);
      const [{ analyzeWithProducts }, { finishRun }, { readRunResult }] = await Promise.all([
        import('../../src/pipeline/analyzeWithProducts.js'),
        import('../../src/pipeline/finishRun.js'),
        import('../../src/compare/readRunResult.js'),
      ]);
      const progress = makeProgress('decoding', c.quiet === true || c.json === true);
      const versions = toolVersionInfo();
      const baseline = c.baseline ? await readRunResult(c.baseline) : undefined;
      let run;
      try {
        run = await analyzeWithProducts(o, { ...versions, nodeVersion: process.version, startedAt: new Date(), onProgress: (_s, d, t) => progress.update(d, t) }, {
          ...(baseline ? { baseline: baseline.result, baselineSource: baseline.source } : {}),
          products: c.maps !== false,
          report: c.report !== false,
        });
      } finally {
        progress.stop();
      }
      const { out } = run;
      const validity = out.result.validity;
      const written = await finishRun(run, { outDir, force: c.force === true });
      if (c.json) {
        process.stdout.write(`${JSON.stringify(out.result, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n`);
      } else {
        process.stdout.write(summaryText(out.result, written));
      }
      if (validity && !validity.valid) {
        // The run is written (marked not valid) so it can be inspected; its figures are not to be used.
        throw new KerrError('NOT_VALID', `the run failed ${validity.failures.length === 1 ? 'a check' : `${validity.failures.length} checks`}: ${validity.failures.map((f) => withFlags(f.message, f.inputs)).join('; ')}`, { hint: `The result is kept in ${written}, marked not valid; see docs/analyze.md, "Gates"` });
      }
    }));
}
