/**
 * Makes small test clips with ffmpeg's lavfi sources (testsrc, testsrc2, color...): constant or
 * variable frame rate, rotation metadata, colour tags, truncated copies. Also runs ffprobe for
 * reference values. Clips go into a temporary folder that `tempDir()` creates and removes.
 *
 * Notes on the bundled ffmpeg (a 2018 static build, ~4.1): `-vsync` rather than `-fps_mode`;
 * rotation metadata survives only a stream copy (`-c copy -metadata:s:v:0 rotate=R`), so rotated
 * clips are encoded first and then copied.
 *
 * @example
 * const tmp = await tempDir('media');
 * const clip = await makeClip(tmp.dir, 'vfr.mp4', { width: 160, height: 120, vfr: true });
 * await tmp.cleanup();
 */
import { execFile } from 'node:child_process';
import { mkdtemp, rm, stat, truncate, copyFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { ffmpegPath, ffprobePath } from '../../src/media/ffmpegPaths.js';

const run = promisify(execFile);

export interface ClipSpec {
  width?: number;
  height?: number;
  fps?: number;
  durationS?: number;
  /** lavfi source name (default testsrc2) or a full lavfi source graph when it contains '='. */
  source?: string;
  /** Extra filters after the source (e.g. "noise=alls=20:allf=t"). */
  filters?: string;
  /** Irregular timestamps: true for a built-in pattern, or a setpts expression in frames of 1/fps. */
  vfr?: boolean | string;
  /** Clockwise display rotation written as metadata (0, 90, 180, 270). */
  rotate?: number;
  /** Keep only this fraction of the file's bytes (a cut-short recording). */
  truncateFraction?: number;
  /** MP4 index at the front (default true), so a truncated copy still probes. */
  faststart?: boolean;
  /** Colour tags written into the stream (libx264 VUI). */
  tags?: { range?: 'tv' | 'pc'; matrix?: string; transfer?: string; primaries?: string };
  /** Colour matrix used for the RGB→YUV conversion of the source (scale filter's out_color_matrix). */
  convertMatrix?: 'bt709' | 'bt601';
  crf?: number;
  /** Output pixel format (default yuv420p). */
  pixFmt?: string;
}

/** Irregular frame times: frame n shown at (n + ⌊n/3⌋ + ⌊n²/40⌋)/fps (gaps of 1, 2 and more frames). */
export const DEFAULT_VFR_EXPRESSION = 'N+floor(N/3)+floor(N*N/40)';

export async function tempDir(prefix: string): Promise<{ dir: string; cleanup: () => Promise<void> }> {
  const dir = await mkdtemp(join(tmpdir(), `kerrtrace-${prefix}-`));
  return { dir, cleanup: () => rm(dir, { recursive: true, force: true }) };
}

export async function ffmpeg(args: string[]): Promise<void> {
  await run(ffmpegPath(), ['-hide_banner', '-nostdin', '-v', 'error', '-y', ...args], { maxBuffer: 64 * 1024 * 1024 });
}

export async function ffprobe(args: string[]): Promise<string> {
  const { stdout } = await run(ffprobePath(), ['-v', 'error', ...args], { maxBuffer: 256 * 1024 * 1024 });
  return stdout;
}

export async function makeClip(dir: string, name: string, spec: ClipSpec = {}): Promise<string> {
  const width = spec.width ?? 160;
  const height = spec.height ?? 120;
  const fps = spec.fps ?? 30;
  const durationS = spec.durationS ?? 2;
  const sourceName = spec.source ?? 'testsrc2';
  const source = sourceName.includes('=') ? sourceName : `${sourceName}=size=${width}x${height}:rate=${fps}:duration=${durationS}`;
  const filters: string[] = [];
  if (spec.filters) filters.push(spec.filters);
  if (spec.vfr) {
    const expression = spec.vfr === true ? DEFAULT_VFR_EXPRESSION : spec.vfr;
    filters.push(`setpts='(${expression})/(${fps}*TB)'`);
  }
  const pixFmt = spec.pixFmt ?? 'yuv420p';
  const outRange = spec.tags?.range === 'pc' ? 'pc' : 'tv';
  filters.push(`scale=out_color_matrix=${spec.convertMatrix ?? 'bt709'}:out_range=${outRange}`, `format=${pixFmt}`);
  const path = join(dir, name);
  const encoded = spec.rotate ? join(dir, `unrotated-${name}`) : path;
  const args = ['-f', 'lavfi', '-i', source, '-vf', filters.join(','), '-c:v', 'libx264', '-preset', 'veryfast', '-crf', String(spec.crf ?? 18), '-pix_fmt', pixFmt];
  if (spec.vfr) args.push('-vsync', 'vfr');
  if (spec.tags?.range) args.push('-color_range', spec.tags.range);
  if (spec.tags?.matrix) args.push('-colorspace', spec.tags.matrix);
  if (spec.tags?.transfer) args.push('-color_trc', spec.tags.transfer);
  if (spec.tags?.primaries) args.push('-color_primaries', spec.tags.primaries);
  if (spec.faststart !== false && name.endsWith('.mp4')) args.push('-movflags', '+faststart');
  args.push(encoded);
  await ffmpeg(args);
  if (spec.rotate) {
    const copyArgs = ['-i', encoded, '-c', 'copy', '-metadata:s:v:0', `rotate=${spec.rotate}`];
    if (spec.faststart !== false) copyArgs.push('-movflags', '+faststart');
    await ffmpeg([...copyArgs, path]);
  }
  if (spec.truncateFraction !== undefined) {
    const full = join(dir, `full-${name}`);
    await copyFile(path, full);
    const { size } = await stat(path);
    await truncate(path, Math.floor(size * spec.truncateFraction));
  }
  return path;
}

/** ffprobe's per-frame presentation times (decoding the stream): the reference for frame timing. */
export async function ffprobeFrameTimes(path: string): Promise<number[]> {
  const out = await ffprobe(['-select_streams', 'v:0', '-show_entries', 'frame=pts_time,best_effort_timestamp_time', '-of', 'json', path]);
  const frames = (JSON.parse(out) as { frames: Array<{ pts_time?: string; best_effort_timestamp_time?: string }> }).frames;
  return frames.map((f) => Number(f.pts_time ?? f.best_effort_timestamp_time));
}

/** ffprobe's stream and format facts as JSON. */
export async function ffprobeStreams(path: string): Promise<{
  streams: Array<Record<string, unknown> & { width: number; height: number; nb_frames?: string; r_frame_rate: string; duration?: string; side_data_list?: Array<{ rotation?: number }> }>;
  format: Record<string, unknown> & { duration?: string; format_name: string };
}> {
  return JSON.parse(await ffprobe(['-of', 'json', '-show_streams', '-show_format', '-select_streams', 'v:0', path]));
}

/** Frames ffprobe actually decodes (`-count_frames`). */
export async function ffprobeDecodedFrameCount(path: string): Promise<number> {
  const out = await ffprobe(['-count_frames', '-select_streams', 'v:0', '-show_entries', 'stream=nb_read_frames', '-of', 'default=nw=1:nk=1', path]);
  return Number(out.trim());
}

/**
 * Exports frame `index` (presentation order) as a PNG of code values, converted by ffmpeg's scaler
 * with the given matrix and range, nearest-neighbour chroma (as the region meter does) and exact
 * rounding: an independent decoder path for checks.
 */
export async function exportFramePng(path: string, index: number, out: string, opts: { matrix: 'bt709' | 'bt601'; range: 'tv' | 'pc' }): Promise<string> {
  const convert = `scale=in_color_matrix=${opts.matrix}:in_range=${opts.range}:out_range=pc:flags=neighbor+accurate_rnd+full_chroma_int+bitexact`;
  await ffmpeg(['-i', path, '-vf', `select=eq(n\\,${index}),${convert},format=rgb24`, '-vsync', '0', '-frames:v', '1', out]);
  return out;
}
