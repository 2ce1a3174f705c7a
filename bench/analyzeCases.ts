/**
 * Benchmark cases for the analyze job (the project's issue: the whole analyze run with maps stays
 * within 1.3× the time of decoding the clip once). The clip is simulated bench footage with known
 * truth (1920×1080, 30 fps, 30 s, a noisy sensor, made once by the project's simulator and kept in bench/.cache/),
 * so the analysis does real work: sync, fit, maps, scatter figures.
 */
import { execFile } from 'node:child_process';
import { existsSync, readFileSync, renameSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { ffmpegPath } from '../src/media/ffmpegPaths.js';
import { parseScenario } from '../src/sim/scenario.js';
import { simulateRun } from '../src/sim/simulate.js';
import { analyzeWithProducts } from '../src/pipeline/analyzeWithProducts.js';
import type { Rect } from '../src/media/types.js';
import { childrenCpuS, selfCpuS } from './cpuTime.js';
import type { BenchCase, CaseOutcome } from './timeIt.js';

const execFileAsync = promisify(execFile);

const SCENARIO = {
  label: 'benchmark: 1080p ramps with a dirty liquid and a noisy phone sensor',
  seed: 99,
  cell: { kerrConstantMPerV2: 2.4e-12, lengthMm: 50, gapMm: 5, liquidBreakdownKvPerMm: 6 },
  light: { profile: 'gaussian', sigmaPx: 30, centreXPx: 1000, centreYPx: 560, wavelengthNm: 532, amplitude: 0.6 },
  dirt: { scatterFloor: 0.008, haloPeak: 0.005, haloSigmaPx: 200, particles: { count: 4, durationS: 0.4, brightness: 0.5, sizePx: 3 }, sparks: { count: 2 } },
  // A phone-like noisy sensor, so that the clip costs about as much to decode as real footage.
  camera: { widthPx: 1920, heightPx: 1080, frameRateHz: 30, ambient: 0.03, photonsPerFullScale: 1500, readNoise: 0.006, crf: 20 },
  drive: { segments: [
    { kind: 'hold', durationS: 2 }, { kind: 'ramp', toHalfWaveFraction: 1.1, durationS: 8 }, { kind: 'ramp', toV: 0, durationS: 8 },
    { kind: 'hold', durationS: 2 }, { kind: 'ramp', toHalfWaveFraction: 0.8, durationS: 4 }, { kind: 'ramp', toV: 0, durationS: 4 }, { kind: 'hold', durationS: 2 },
  ] },
  logger: { sampleRateHz: 10, noiseV: 10, clockOffsetS: 0.6 },
};

export async function analyzeBenchClip(cacheDir: string): Promise<{ dir: string; roi: Rect; frames: number }> {
  const dir = join(cacheDir, 'sim-1080p-30s');
  if (!existsSync(join(dir, 'truth.json'))) {
    process.stdout.write(`rendering the analyze benchmark clip with the simulator (once): ${dir}\n`);
    const partial = `${dir}.partial`;
    rmSync(partial, { recursive: true, force: true });
    await simulateRun(parseScenario(SCENARIO, 'benchmark scenario'), partial, { force: true });
    renameSync(partial, dir);
  }
  const truth = JSON.parse(readFileSync(join(dir, 'truth.json'), 'utf8')) as { roi: number[]; frameCount: number };
  const [x, y, w, h] = truth.roi as [number, number, number, number];
  return { dir, roi: { x, y, w, h }, frames: truth.frameCount };
}

async function decodeToNull(clip: string, frames: number): Promise<CaseOutcome> {
  const before = childrenCpuS();
  await execFileAsync(ffmpegPath(), ['-hide_banner', '-nostdin', '-v', 'error', '-i', clip, '-map', '0:v:0', '-vsync', '0', '-f', 'null', '-']);
  return { frames, cpuS: childrenCpuS() - before };
}

async function analyze(dir: string, roi: Rect | undefined): Promise<CaseOutcome> {
  const before = selfCpuS() + childrenCpuS();
  const { out, products } = await analyzeWithProducts(
    { videoPath: join(dir, 'clip.mp4'), voltsPath: join(dir, 'volts.csv'), lengthMm: 50, gapMm: 5, ...(roi ? { roi } : {}) },
    { toolVersion: 'bench', ffmpegVersion: null },
  );
  if (!products) throw new Error('no maps were made');
  return {
    frames: out.result.frames.total,
    cpuS: selfCpuS() + childrenCpuS() - before,
    extra: { B: `${out.result.kerrConstant.value.toExponential(3)} m/V^2`, maps: `${out.grid.gridWidth}×${out.grid.gridHeight}` },
  };
}

export function analyzeCases(dir: string, roi: Rect, frames: number, repeats: number): BenchCase[] {
  const clip = join(dir, 'clip.mp4');
  return [
    { name: '(d) ffmpeg decode to null, 1080p sim', run: () => decodeToNull(clip, frames), repeats },
    { name: '(e) analyze with maps, --roi, 1080p sim', run: () => analyze(dir, roi), repeats },
    { name: '(f) analyze with maps, beam found, 1080p sim', run: () => analyze(dir, undefined), repeats },
  ];
}
