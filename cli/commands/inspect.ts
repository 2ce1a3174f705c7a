/**
 * `kerrtrace inspect VIDEO [--json]`: what the video says about itself (size as displayed, frame
 * count and rate, variable frame rate, colour tags) and how kerrtrace will decode it.
 */
import type { Command } from 'commander';
import { action } from '../action.js';
import { decodingFor } from '../../src/core/camera/decodingFor.js';
import { isKerrError } from '../../src/errors.js';
import type { ProbeResult } from '../../src/media/probe.js';

interface InspectCliOptions {
  json?: boolean;
}

const ms = (s: number): string => `${(s * 1000).toFixed(1)} ms`;
const fps = (x: number | null): string => (x === null ? 'unknown' : `${Number(x.toFixed(3))} fps`);

/** The decoding analyze would use, or why it would refuse the file (inspect shows, never refuses). */
function decodingOrRefusal(info: ProbeResult['info']): ReturnType<typeof decodingFor> | { refused: string } {
  try {
    return decodingFor(info);
  } catch (e) {
    if (isKerrError(e) && e.code === 'UNSUPPORTED_ENCODING') return { refused: e.oneLine() };
    throw e;
  }
}

/** The human-readable report. */
export function inspectText(probe: ProbeResult): string {
  const { info } = probe;
  const chosen = decodingOrRefusal(info);
  const rows: Array<[string, string]> = [];
  rows.push(['file', info.path]);
  rows.push(['container', `${info.container}, codec ${info.codec}`]);
  const stored = info.rotationDeg === 0 ? '' : ` (stored ${info.codedWidth}x${info.codedHeight}, rotated ${info.rotationDeg}° clockwise for display)`;
  rows.push(['frame size', `${info.width}x${info.height} as displayed${stored}`]);
  rows.push(['frames', `${info.frameCount}${info.frameCountCounted ? ' (counted: the container does not say)' : ''}`]);
  const intervals = probe.frameIntervalS;
  const spread = intervals ? `; frame intervals ${ms(intervals.min)} to ${ms(intervals.max)}, median ${ms(intervals.median)}` : '';
  rows.push(['frame rate', `${fps(info.nominalFps)} nominal, ${fps(info.meanFps)} mean, ${info.variableFrameRate ? 'VARIABLE' : 'constant'}${spread}`]);
  rows.push(['duration', `${info.durationS.toFixed(3)} s, starting at ${info.startTimeS.toFixed(3)} s`]);
  rows.push(['frame times', probe.timeSource === 'pts' ? 'container presentation timestamps' : probe.timeSource === 'dts' ? 'container decoding timestamps' : 'nominal rate (no timestamps in the file)']);
  rows.push(['pixels', `${info.pixelFormat}, ${info.bitDepth}-bit`]);
  rows.push(['colour tags', `range ${info.colourRange}, transfer ${info.colourTransfer}, primaries ${info.colourPrimaries}, matrix ${info.colourMatrix}`]);
  if ('refused' in chosen) rows.push(['decoding', `REFUSED: ${chosen.refused}`]);
  else rows.push(['decoding', `${chosen.range} range, ${chosen.matrix} matrix, ${chosen.transfer} transfer, clipped at code ${chosen.clipCode}`]);
  const notes = [...probe.notes, ...('refused' in chosen ? [] : chosen.notes)];
  const width = Math.max(...rows.map(([k]) => k.length));
  const lines = rows.map(([k, v]) => `${k.padEnd(width)}  ${v}`);
  for (const n of notes) lines.push(`${'note'.padEnd(width)}  ${n}`);
  return `${lines.join('\n')}\n`;
}

/** The --json report: the VideoInfo fields plus timing and decoding. */
export function inspectJson(probe: ProbeResult): Record<string, unknown> {
  const chosen = decodingOrRefusal(probe.info);
  if ('refused' in chosen) {
    return { ...probe.info, frameIntervalS: probe.frameIntervalS, frameTimeSource: probe.timeSource, endsEarly: probe.endsEarly, decoding: null, decodingRefused: chosen.refused, notes: [...probe.notes] };
  }
  const { notes: decodingNotes, ...decoding } = chosen;
  return {
    ...probe.info,
    frameIntervalS: probe.frameIntervalS,
    frameTimeSource: probe.timeSource,
    endsEarly: probe.endsEarly,
    decoding,
    notes: [...probe.notes, ...decodingNotes],
  };
}

export function register(program: Command): void {
  program
    .command('inspect')
    .description('show what a video says about itself: size, frames, frame rate (variable or not), colour tags, and how it will be decoded')
    .argument('<video>', 'video file from the camera')
    .option('--json', 'print JSON instead of text')
    .action(action(async (video: string, c: InspectCliOptions) => {
      const { probeMedia } = await import('../../src/media/probe.js'); // loads only when the command runs
      const probe = await probeMedia(video);
      process.stdout.write(c.json ? `${JSON.stringify(inspectJson(probe), null, 2)}\n` : inspectText(probe));
    }));
}
