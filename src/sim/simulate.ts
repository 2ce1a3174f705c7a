/**
 * Runs a bench scenario and writes a synthetic recording with known truth:
 *   DIR/clip.mp4     H.264 clip rendered frame by frame (render.ts → encodeClip.ts)
 *   DIR/volts.csv    the voltage logger's file (voltageLogWriter.ts)
 *   DIR/truth.json   the planted parameters and the figures an analysis should recover (truth.ts)
 *   DIR/scenario.json a copy of the scenario as given
 *
 * Order of work: check the output folder under the output policy (src/io/outputDir.ts: never over
 * an input such as the scenario file, `force` only over a folder kerrtrace wrote, or one that holds
 * nothing but these four files) and find ffmpeg before any rendering; render and encode into the
 * staging folder; check the clip's packet times with ffprobe against the planned frame times; only
 * then move the folder into place whole. A failure removes the staging folder, so DIR never holds
 * a half-written run.
 * Same scenario and seed → the same raw frames (their SHA-256 is recorded in truth.json).
 *
 * Throws KerrError FILE_EXISTS, FFMPEG_MISSING, FFMPEG_FAILED (and BAD_SCENARIO from the scenario).
 * @example await simulateRun(parseScenario(json, 'ramp.json'), 'out/ramp', { onProgress: (d, n) => {} })
 */
import { createHash } from 'node:crypto';
import { readFile, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { KerrError } from '../errors.js';
import { environmentError } from '../io/environmentError.js';
import { checkOutputDir, stageOutputDir, type StagedDir } from '../io/outputDir.js';
import { locate } from '../media/ffmpegPaths.js';
import { halfWaveVoltageV } from '../core/physics/kerr.js';
import { isHdrTransfer, openClipEncoder, probePacketTimesS, type ClipEncoder } from './encodeClip.js';
import { yuv420p10FromRgb } from './yuv420p10FromRgb.js';
import { nextGain, wantedGain } from './exposure.js';
import { frameTimes } from './frameTimes.js';
import { makeRng } from './rng.js';
import { exposeFrame, renderRadiance } from './render.js';
import { rationalRate, type Scenario } from './scenario.js';
import { prepareScene } from './scene.js';
import { makeCodeEncoder } from './transfer.js';
import { buildTruth, type FrameRecord } from './truth.js';
import { formatVoltageLog } from './voltageLogWriter.js';

export interface SimulateOptions {
  /** Replace an existing folder that kerrtrace wrote (or that holds only the four files). */
  force?: boolean;
  /** The run's inputs (the scenario file): the output may never be, hold or lie inside one. */
  inputs?: string[];
  /** Called after each frame is rendered and queued for encoding. */
  onProgress?: (done: number, total: number) => void;
}

export interface SimulateSummary {
  outDir: string;
  files: { clip: string; volts: string; truth: string; scenario: string };
  frameCount: number;
  durationS: number;
  variableFrameRate: boolean;
  halfWaveVoltageV: number;
  logRows: number;
  rawFramesSha256: string;
  truth: Record<string, unknown>;
}

export const OUTPUT_FILES = ['clip.mp4', 'volts.csv', 'truth.json', 'scenario.json'] as const;

/** Largest allowed gap between a planned frame time and the clip's packet time, s. */
const FRAME_TIME_TOLERANCE_S = 5e-4;

export async function simulateRun(scenario: Scenario, outDir: string, opts: SimulateOptions = {}): Promise<SimulateSummary> {
  const policy = { force: opts.force === true, inputs: opts.inputs ?? [], writtenEarlier: onlySimulatorFiles };
  checkOutputDir(outDir, policy);
  const ffmpegVersion = locate('ffmpeg').version;
  locate('ffprobe');

  const staged: StagedDir = stageOutputDir(outDir, policy);
  const tmp = staged.path;
  const target = staged.target;
  let encoder: ClipEncoder | null = null;
  try {
    const { camera } = scenario;
    const root = makeRng(scenario.seed);
    const clock = frameTimes(camera.timing, scenario.durationS, root.split('clock'));
    const scene = prepareScene(scenario, clock, root);
    const hdr = isHdrTransfer(camera.transfer);
    const codes = makeCodeEncoder(camera.toneCurve ?? camera.transfer, hdr ? 10 : 8);
    const variable = camera.timing.kind === 'variable';
    const rational = camera.timing.kind === 'constant' ? camera.timing.rational : rationalRate(camera.timing.tickHz);
    const clipPath = join(tmp, 'clip.mp4');
    encoder = openClipEncoder({
      outPath: clipPath,
      widthPx: camera.widthPx,
      heightPx: camera.heightPx,
      transfer: camera.transfer,
      crf: camera.crf,
      rate: { kind: variable ? 'variable' : 'constant', rational },
    });

    const count = clock.timesS.length;
    const work = new Float32Array(camera.widthPx * camera.heightPx * 3);
    const frame = hdr ? new Uint16Array(work.length) : new Uint8Array(work.length);
    const yuv = hdr ? new Uint16Array((camera.widthPx * camera.heightPx * 3) / 2) : null;
    const previous = variable ? new Uint8Array(frame.byteLength) : null;
    const hash = createHash('sha256');
    const frames: FrameRecord[] = [];
    const auto = camera.autoExposure;
    let gain = camera.gain;
    for (let k = 0; k < count; k++) {
      const timeS = clock.timesS[k]!;
      const radiance = renderRadiance(scene, k, timeS, work);
      if (auto && k === 0) gain = wantedGain(auto, radiance.meanRadiance);
      const exposure = exposeFrame(work, gain, camera, root.split('frame', k), codes, frame);
      const frameBytes = Buffer.from(frame.buffer, frame.byteOffset, frame.byteLength);
      hash.update(frameBytes);
      if (previous) {
        if (k > 0 && frameBytes.equals(previous)) {
          throw new KerrError('BAD_SCENARIO', `frames ${k - 1} and ${k} came out identical, so a variable-frame-rate clip cannot keep them apart`, {
            hint: 'Raise camera.readNoise or camera.photonsPerFullScale so consecutive frames differ',
          });
        }
        previous.set(frameBytes);
      }
      const repeats = variable && k + 1 < count ? clock.ticks![k + 1]! - clock.ticks![k]! : 1;
      if (yuv) yuv420p10FromRgb(frame as Uint16Array, camera.widthPx, camera.heightPx, yuv);
      await encoder.write(yuv ?? frame, repeats);
      frames.push({ voltageV: radiance.voltageV, gain, clippedCount: exposure.clippedCount });
      if (auto && k + 1 < count) gain = nextGain(auto, gain, radiance.meanRadiance, clock.timesS[k + 1]! - timeS);
      opts.onProgress?.(k + 1, count);
    }
    await encoder.finish();
    encoder = null;
    checkFrameTimes(probePacketTimesS(clipPath), clock.timesS, variable);

    const log = formatVoltageLog(scenario, root.split('logger'));
    const rawFramesSha256 = hash.digest('hex');
    const truth = buildTruth({
      scene,
      clock,
      frames,
      log,
      rawFramesSha256,
      generator: { name: 'kerrtrace simulate', version: await packageVersion(), ffmpegVersion },
    });
    await writeFile(join(tmp, 'volts.csv'), log.text, 'utf8');
    await writeFile(join(tmp, 'truth.json'), `${JSON.stringify(truth, null, 2)}\n`, 'utf8');
    await writeFile(join(tmp, 'scenario.json'), `${JSON.stringify(scenario.sourceJson, null, 2)}\n`, 'utf8');

    staged.commit();
    const { cell } = scenario;
    return {
      outDir: target,
      files: {
        clip: join(target, 'clip.mp4'),
        volts: join(target, 'volts.csv'),
        truth: join(target, 'truth.json'),
        scenario: join(target, 'scenario.json'),
      },
      frameCount: count,
      durationS: scenario.durationS,
      variableFrameRate: variable,
      halfWaveVoltageV: halfWaveVoltageV(cell.kerrConstantMPerV2, cell.effectiveLengthM, cell.gapM),
      logRows: log.rows,
      rawFramesSha256,
      truth,
    };
  } catch (err) {
    encoder?.abort();
    staged.abandon();
    throw environmentError(err, outDir, 'writing') ?? err;
  }
}

/** A folder holding nothing but the simulator's files was written by an earlier `simulate`. */
function onlySimulatorFiles(entries: string[]): boolean {
  return entries.length > 0 && entries.every((e) => (OUTPUT_FILES as readonly string[]).includes(e));
}

function checkFrameTimes(packetTimesS: number[], plannedS: Float64Array, variable: boolean): void {
  const hint = variable
    ? 'Raise camera.readNoise so consecutive frames differ, or use a constant camera.frameRateHz'
    : 'Check the bundled ffmpeg (kerrtrace --version)';
  if (packetTimesS.length !== plannedS.length) {
    throw new KerrError('FFMPEG_FAILED', `the encoded clip holds ${packetTimesS.length} frames where ${plannedS.length} were rendered`, { hint });
  }
  for (let k = 0; k < plannedS.length; k++) {
    if (Math.abs(packetTimesS[k]! - plannedS[k]!) > FRAME_TIME_TOLERANCE_S) {
      throw new KerrError('FFMPEG_FAILED', `frame ${k} of the encoded clip is at ${packetTimesS[k]} s where ${plannedS[k]} s was planned`, { hint });
    }
  }
}

async function packageVersion(): Promise<string> {
  const here = dirname(fileURLToPath(import.meta.url));
  for (const p of [join(here, '..', '..', 'package.json'), join(here, '..', '..', '..', 'package.json')]) {
    try {
      const pkg = JSON.parse(await readFile(p, 'utf8')) as { name?: string; version?: string };
      if (pkg.name === 'kerrtrace' && pkg.version) return pkg.version;
    } catch {
      // try the next location
    }
  }
  return 'unknown';
}
