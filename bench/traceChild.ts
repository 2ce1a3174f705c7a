/**
 * Benchmark helper run as a separate Node process: traces a video with the same pipeline as
 * `kerrtrace trace` and prints one JSON line with frames, seconds and the process's peak resident
 * memory (VmHWM, kB), and the CPU seconds of the work (itself plus ffmpeg
 * and ffprobe). A separate process so the peak belongs to this work alone.
 *
 * Usage: node dist/bench/traceChild.js VIDEO REGIONS_JSON [MAX_FRAMES|all] [whole]
 * (`whole`: send whole frames through one pipe instead of one crop per region).
 */
import { traceVideo, type TraceOptions } from '../src/pipeline/trace.js';
import type { Rect } from '../src/media/types.js';
import { childrenCpuS, selfCpuS } from './cpuTime.js';
import { peakRssKb } from './peakRss.js';

const [video, regionsJson, maxFramesText, mode] = process.argv.slice(2);
if (!video || !regionsJson) {
  process.stderr.write('usage: traceChild VIDEO REGIONS_JSON [MAX_FRAMES|all] [whole]\n');
  process.exit(2);
}
const regions = JSON.parse(regionsJson) as Rect[];
const opts: TraceOptions = { regions };
if (maxFramesText && maxFramesText !== 'all') opts.maxFrames = Number(maxFramesText);
if (mode === 'whole') opts.cropToRegions = false;
const start = process.hrtime.bigint();
const cpuStartS = selfCpuS() + childrenCpuS();
try {
  const trace = await traceVideo(video, opts);
  const seconds = Number(process.hrtime.bigint() - start) / 1e9;
  const cpuS = selfCpuS() + childrenCpuS() - cpuStartS; // this process plus ffmpeg and ffprobe
  process.stdout.write(`${JSON.stringify({ frames: trace.frames, seconds, cpuS, maxRssKb: peakRssKb(), crops: trace.crops.length })}\n`);
} catch (e) {
  process.stdout.write(`${JSON.stringify({ error: e instanceof Error ? e.message : String(e) })}\n`);
  process.exitCode = 1;
}
