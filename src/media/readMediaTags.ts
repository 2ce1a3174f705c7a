/**
 * The container's and the video stream's metadata tags as ffprobe reports them (format_tags and
 * stream_tags: make, model, software, encoder, creation_time, com.apple.quicktime.* ...), merged,
 * stream tags first. Used to record which camera and settings a calibration came from.
 * Edge module (runs ffprobe). @throws KerrError FFMPEG_MISSING; an unreadable file gives {}.
 * @example await readMediaTags('cal.mov') // { 'com.apple.quicktime.model': 'iPhone 15', creation_time: '...' }
 */
import { ffprobePath } from './ffmpegPaths.js';
import { ffmpegInput } from './probe.js';
import { runProcess } from './runProcess.js';

export async function readMediaTags(path: string): Promise<Record<string, string>> {
  const r = await runProcess(ffprobePath(), ['-v', 'error', '-of', 'json', '-show_entries', 'format_tags:stream_tags', '-select_streams', 'v:0', ffmpegInput(path)]);
  if (r.code !== 0) return {};
  try {
    const parsed = JSON.parse(r.stdout) as { format?: { tags?: Record<string, unknown> }; streams?: Array<{ tags?: Record<string, unknown> }> };
    const out: Record<string, string> = {};
    for (const tags of [parsed.streams?.[0]?.tags ?? {}, parsed.format?.tags ?? {}]) {
      for (const [k, v] of Object.entries(tags)) if (typeof v === 'string' && !(k in out)) out[k] = v;
    }
    return out;
  } catch {
    return {};
  }
}
