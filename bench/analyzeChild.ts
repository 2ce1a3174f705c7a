/**
 * Benchmark helper run as a separate Node process: the analyze job with maps and scatter figures
 * (analyzeWithProducts) on a simulated run folder (clip.mp4, volts.csv), printing one JSON line with
 * frames, seconds, CPU seconds (itself plus ffmpeg and ffprobe), peak resident memory (VmHWM, kB),
 * B, the map size and how many decodes of the clip it started (progress restarts at frame 1).
 * A separate process so the peak memory belongs to this run alone.
 *
 * Usage: node dist/bench/analyzeChild.js RUN_DIR LENGTH_MM GAP_MM [x,y,w,h|auto]
 */
import { join } from 'node:path';
import { analyzeWithProducts } from '../src/pipeline/analyzeWithProducts.js';
import { childrenCpuS, selfCpuS } from './cpuTime.js';
import { peakRssKb } from './peakRss.js';

const [dir, lengthText, gapText, roiText] = process.argv.slice(2);
if (!dir || !lengthText || !gapText) {
  process.stderr.write('usage: analyzeChild RUN_DIR LENGTH_MM GAP_MM [x,y,w,h|auto]\n');
  process.exit(2);
}
const roiParts = roiText && roiText !== 'auto' ? roiText.split(',').map(Number) : null;
const start = process.hrtime.bigint();
const cpuStartS = selfCpuS() + childrenCpuS();
let decodes = 0;
try {
  const { out, products } = await analyzeWithProducts(
    {
      videoPath: join(dir, 'clip.mp4'), voltsPath: join(dir, 'volts.csv'), lengthMm: Number(lengthText), gapMm: Number(gapText),
      ...(roiParts ? { roi: { x: roiParts[0]!, y: roiParts[1]!, w: roiParts[2]!, h: roiParts[3]! } } : {}),
    },
    { toolVersion: 'bench', ffmpegVersion: null, onProgress: (_stage, done) => { if (done === 1) decodes++; } },
  );
  if (!products) throw new Error('no maps were made');
  const seconds = Number(process.hrtime.bigint() - start) / 1e9;
  const cpuS = selfCpuS() + childrenCpuS() - cpuStartS;
  process.stdout.write(`${JSON.stringify({
    frames: out.result.frames.total, seconds, cpuS, maxRssKb: peakRssKb(), decodes,
    B: out.result.kerrConstant.value, maps: `${out.grid.gridWidth}×${out.grid.gridHeight}`,
  })}\n`);
} catch (e) {
  process.stdout.write(`${JSON.stringify({ error: e instanceof Error ? e.message : String(e) })}\n`);
  process.exitCode = 1;
}
