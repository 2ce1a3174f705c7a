/**
 * Benchmark cases for the analyze job (the project's issue: the whole analyze run with maps stays
 * within 1.3× the time of decoding the clip once). The clip is simulated bench footage with known
 * truth (1920×1080, 30 fps, 30 s, a noisy sensor, made once by the project's simulator and kept in bench/.cache/),
 * so the analysis does real work: sync, fit, maps, scatter figures. Each analyze runs in a child
 * process (bench/analyzeChild.ts) so its peak memory is its own; (g) runs a 5-minute concatenation
 * of the same run once, to show how memory grows with clip length.
 */
import { execFile } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { ffmpegPath } from '../src/media/ffmpegPaths.js';
import { parseScenario } from '../src/sim/scenario.js';
import { simulateRun } from '../src/sim/simulate.js';
import type { Rect } from '../src/media/types.js';
import { childrenCpuS } from './cpuTime.js';
import type { BenchCase, CaseOutcome } from './timeIt.js';
import { runChildReport, type ChildReport } from './childReport.js';

const execFileAsync = promisify(execFile);
const here = dirname(fileURLToPath(import.meta.url)); // dist/bench

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

/** ffmpeg decodes every frame and throws it away: the ceiling the ratios are measured against. */
export async function decodeToNull(clip: string, frames: number): Promise<CaseOutcome> {
  const before = childrenCpuS();
  await execFileAsync(ffmpegPath(), ['-hide_banner', '-nostdin', '-v', 'error', '-i', clip, '-map', '0:v:0', '-vsync', '0', '-f', 'null', '-']);
  return { frames, cpuS: childrenCpuS() - before };
}

/** The analyze job in a child process (bench/analyzeChild.ts): time, CPU, peak RSS and the decodes it started. */
async function analyzeInChild(dir: string, roi: Rect | undefined): Promise<CaseOutcome> {
  const r = await runChildReport([join(here, 'analyzeChild.js'), dir, '50', '5', roi ? `${roi.x},${roi.y},${roi.w},${roi.h}` : 'auto']) as ChildReport & { decodes?: number; B?: number; maps?: string };
  return {
    frames: r.frames, seconds: r.seconds, ...(typeof r.cpuS === 'number' ? { cpuS: r.cpuS } : {}),
    extra: { B: `${(r.B ?? NaN).toExponential(3)} m/V^2`, maps: r.maps ?? '?', decodes: String(r.decodes ?? '?'), 'peak RSS': `${((r.maxRssKb ?? 0) / 1024).toFixed(0)} MB` },
  };
}

/**
 * A 5-minute run made from the 30 s one without re-encoding: the clip ten times through ffmpeg's
 * concat demuxer (`-c copy`), and the voltage log's rows repeated with times shifted by the clip's
 * length (the shared end/start row kept once). Made once, kept in bench/.cache/.
 */
export async function longBenchRun(cacheDir: string, shortDir: string, copies = 10): Promise<{ dir: string; frames: number }> {
  const dir = join(cacheDir, `sim-1080p-${copies * 30}s`);
  const shortTruth = JSON.parse(readFileSync(join(shortDir, 'truth.json'), 'utf8')) as { frameCount: number };
  const frames = shortTruth.frameCount * copies;
  if (existsSync(join(dir, 'volts.csv'))) return { dir, frames };
  process.stdout.write(`making the ${copies * 30} s analyze benchmark run (once, by concatenation): ${dir}\n`);
  const partial = `${dir}.partial`;
  rmSync(partial, { recursive: true, force: true });
  mkdirSync(partial, { recursive: true });
  const list = join(partial, 'list.txt');
  writeFileSync(list, Array.from({ length: copies }, () => `file '${join(shortDir, 'clip.mp4').replace(/'/g, "'\\''")}'`).join('\n') + '\n');
  await execFileAsync(ffmpegPath(), ['-hide_banner', '-nostdin', '-v', 'error', '-y', '-f', 'concat', '-safe', '0', '-i', list, '-c', 'copy', join(partial, 'clip.mp4')]);
  rmSync(list);
  const lines = readFileSync(join(shortDir, 'volts.csv'), 'utf8').trim().split('\n');
  const header = lines[0]!;
  const rows = lines.slice(1).map((l) => l.split(',').map(Number) as [number, number]);
  const spanS = shortTruth.frameCount / 30;
  const out: string[] = [header];
  for (let k = 0; k < copies; k++) {
    for (const [t, v] of rows) {
      if (k > 0 && t === 0) continue; // the previous copy's last row is at the same time
      out.push(`${(t + k * spanS).toFixed(4)},${v}`);
    }
  }
  writeFileSync(join(partial, 'volts.csv'), `${out.join('\n')}\n`);
  renameSync(partial, dir);
  return { dir, frames };
}

export function analyzeCases(dir: string, roi: Rect, frames: number, repeats: number, long?: { dir: string; frames: number }): BenchCase[] {
  const clip = join(dir, 'clip.mp4');
  const cases: BenchCase[] = [
    { name: '(d) ffmpeg decode to null, 1080p sim', run: () => decodeToNull(clip, frames), repeats },
    { name: '(e) analyze with maps, --roi, 1080p sim', run: () => analyzeInChild(dir, roi), repeats },
    { name: '(f) analyze with maps, beam found, 1080p sim', run: () => analyzeInChild(dir, undefined), repeats },
  ];
  if (long) cases.push({ name: '(g) analyze with maps, beam found, 5 min', run: () => analyzeInChild(long.dir, undefined) });
  return cases;
}
