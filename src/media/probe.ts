/**
 * Reads what a video file says about itself, with ffprobe: container, codec, displayed size
 * (rotation metadata applied), frame count, nominal and mean frame rate, whether the frame rate
 * varies, duration, start time, pixel format and bit depth, and the colour tags (range, transfer,
 * primaries, matrix). It also lists every video packet's timestamp (demuxing only, no decoding) to
 * get each frame's presentation time, to count frames when the container does not, and to judge
 * variable frame rate from the spread of the intervals.
 *
 * Frame times: the packets' presentation timestamps (pts) sorted ascending, in seconds, exactly as
 * the container stores them (not shifted to start at 0); decoders output one frame per packet in
 * presentation order, so frame k has the k-th smallest pts. Packets flagged for discard (edit
 * lists) are left out. Fallbacks, each with a note: decoding timestamps (dts) when pts are
 * missing; the nominal rate when the stream has no timestamps at all (raw H.264 files).
 *
 * Frame count: the frames a full decode delivers (packets not cut by an edit list); for a file whose
 * data ends early, the count its index lists. A disagreement with the container's nb_frames is
 * explained in the notes. Mean frame rate: (n − 1)/(t_last − t_first) over the frame times.
 *
 * Variable frame rate: more than 1 % of the intervals (and at least two) differ from the median
 * interval by more than 5 % of it plus one tick of the stream's time base.
 *
 * Rotation: the `rotate` tag (clockwise degrees) when present, else the display-matrix side data
 * (ffprobe reports its counter-clockwise angle, so clockwise = −rotation), rounded to 0/90/180/270.
 *
 * @throws KerrError FILE_NOT_FOUND (no such file), NOT_A_VIDEO (a folder, an empty file, a still
 *   image, a file ffprobe cannot read, or one with no video stream), TRUNCATED_MEDIA (an MP4/MOV
 *   whose index is missing because the recording was cut short), FFMPEG_MISSING.
 * @example const info = await probeVideo('run1.mp4'); // { width: 1920, height: 1080, nominalFps: 30, ... }
 */
import { open, stat } from 'node:fs/promises';
import { KerrError } from '../errors.js';
import { ffprobePath, locate } from './ffmpegPaths.js';
import { runProcess, type ProcessOutcome } from './runProcess.js';
import type { ColourRange, VideoInfo } from './types.js';
import { missingPathText } from '../io/missingPathText.js';

export type FrameTimeSource = 'pts' | 'dts' | 'nominal-rate';

export interface ProbeResult {
  info: VideoInfo;
  /** Presentation time of each frame in order, seconds, from the container's timestamps. */
  frameTimesS: Float64Array;
  timeSource: FrameTimeSource;
  /** Absolute index of the video stream in the file (for ffmpeg's -map 0:N). */
  streamIndex: number;
  /** Frames a full decode should deliver: packets found, or the container's count when the data ends early. */
  expectedFrames: number;
  /**
   * Presentation times of the keyframes (packets flagged K), seconds, ascending; empty when the
   * container marks none. A seek decodes from the keyframe at or before the time asked for.
   */
  keyframeTimesS: Float64Array;
  /** True when the file's data stops before its index says it should (cut or interrupted recording). */
  endsEarly: boolean;
  /** Smallest, median and largest interval between consecutive frames, s (null below 2 frames). */
  frameIntervalS: { min: number; median: number; max: number } | null;
  /** Things the user should know (guesses, fallbacks, damage). */
  notes: string[];
  ffprobeVersion: string;
}

interface FfprobeStream {
  index: number;
  codec_type?: string;
  codec_name?: string;
  width?: number;
  height?: number;
  pix_fmt?: string;
  bits_per_raw_sample?: string;
  color_range?: string;
  color_space?: string;
  color_transfer?: string;
  color_primaries?: string;
  r_frame_rate?: string;
  avg_frame_rate?: string;
  time_base?: string;
  start_time?: string;
  duration?: string;
  nb_frames?: string;
  disposition?: { attached_pic?: number };
  tags?: Record<string, string>;
  side_data_list?: Array<{ side_data_type?: string; rotation?: number | string }>;
}

interface FfprobeOutput {
  streams?: FfprobeStream[];
  format?: { format_name?: string; duration?: string; start_time?: string };
}

const STILL_IMAGE_FORMATS = /(^|,)(image2|[a-z0-9]+_pipe|gif|webp)(,|$)/;

/** Parses "30000/1001" → 29.97; null for "0/0", missing or non-positive rates. */
export function parseRate(text: string | undefined): number | null {
  if (!text) return null;
  const [num, den] = text.split('/').map(Number);
  if (num === undefined || !Number.isFinite(num)) return null;
  const value = den === undefined ? num : num / den;
  return Number.isFinite(value) && value > 0 ? value : null;
}

function finiteNumber(text: string | number | undefined): number | null {
  if (text === undefined || text === 'N/A' || text === '') return null;
  const v = Number(text);
  return Number.isFinite(v) ? v : null;
}

function rotationClockwiseDeg(stream: FfprobeStream): number {
  let clockwise = 0;
  const tag = finiteNumber(stream.tags?.rotate);
  if (tag !== null) {
    clockwise = tag;
  } else {
    const matrix = stream.side_data_list?.find((s) => s.rotation !== undefined);
    const ccw = finiteNumber(matrix?.rotation);
    if (ccw !== null) clockwise = -ccw;
  }
  return ((Math.round(clockwise / 90) * 90) % 360 + 360) % 360;
}

function bitDepthOf(stream: FfprobeStream): number {
  const raw = finiteNumber(stream.bits_per_raw_sample);
  if (raw !== null && raw > 0) return raw;
  const m = /p(\d+)(le|be)?$/.exec(stream.pix_fmt ?? '');
  return m ? Number(m[1]) : 8;
}

function rangeOf(stream: FfprobeStream): ColourRange | 'unknown' {
  if (stream.color_range === 'tv' || stream.color_range === 'mpeg') return 'limited';
  if (stream.color_range === 'pc' || stream.color_range === 'jpeg') return 'full';
  if ((stream.pix_fmt ?? '').startsWith('yuvj')) return 'full';
  return 'unknown';
}

async function looksLikeIsoMedia(path: string): Promise<boolean> {
  const handle = await open(path, 'r');
  try {
    const head = Buffer.alloc(12);
    const { bytesRead } = await handle.read(head, 0, 12, 0);
    return bytesRead >= 8 && head.toString('latin1', 4, 8) === 'ftyp';
  } finally {
    await handle.close();
  }
}

async function checkFile(path: string): Promise<number> {
  let size: number;
  try {
    const s = await stat(path);
    if (s.isDirectory()) {
      throw new KerrError('NOT_A_VIDEO', `${path} is a folder, not a video file`, { path, hint: 'Give the path of the video file itself' });
    }
    size = s.size;
  } catch (e) {
    if (e instanceof KerrError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT' || code === 'ENOTDIR' || code === 'ELOOP') {
      throw new KerrError('FILE_NOT_FOUND', missingPathText(path, `no file at ${path}`), { path, hint: 'Check the spelling and the folder, or give the full path to the video' });
    }
    throw new KerrError('NOT_A_VIDEO', `cannot read ${path} (${code ?? String(e)})`, { path, hint: 'Check that the file exists and that you may read it' });
  }
  if (size === 0) {
    throw new KerrError('NOT_A_VIDEO', `${path} is empty (0 bytes)`, { path, hint: 'The recording was not saved completely; copy it again from the camera' });
  }
  return size;
}

/**
 * The input argument for ffmpeg/ffprobe: the `file:` protocol prefix makes a local path that
 * contains a colon or starts with a dash read as a plain file.
 */
export function ffmpegInput(path: string): string {
  return `file:${path}`;
}

function lastLine(text: string, path: string): string {
  const lines = text.split('\n')
    .map((l) => l.replace(/^\[[^\]]*\]\s*/, '').split(`${ffmpegInput(path)}: `).join('').trim())
    .filter(Boolean);
  return lines[lines.length - 1] ?? 'no message';
}

interface PacketTimes {
  pts: number[];
  dts: number[];
  /** pts of the packets flagged K (keyframes). */
  keyPts: number[];
  ptsComplete: boolean;
  dtsComplete: boolean;
  count: number;
  discarded: number;
  endsEarly: boolean;
}

/**
 * The packet list of every video stream, started beside the stream probe (it does not wait for the
 * stream's index; readPackets keeps the chosen stream's lines). Never rejects: a failure comes
 * back as the error, for the caller to throw only if the stream probe succeeded.
 */
function startPacketList(path: string, signal: AbortSignal | undefined): Promise<ProcessOutcome | { error: unknown }> {
  const args = ['-v', 'error', '-select_streams', 'v', '-show_entries', 'packet=stream_index,pts_time,dts_time,flags', '-of', 'compact=p=0', ffmpegInput(path)];
  return runProcess(ffprobePath(), args, signal === undefined ? {} : { signal }).catch((error: unknown) => ({ error }));
}

async function readPackets(listing: Promise<ProcessOutcome | { error: unknown }>, streamIndex: number): Promise<PacketTimes> {
  const r = await listing;
  if ('error' in r) throw r.error;
  const pts: number[] = [];
  const dts: number[] = [];
  const keyPts: number[] = [];
  let ptsComplete = true, dtsComplete = true, count = 0, discarded = 0;
  for (const line of r.stdout.split('\n')) {
    if (!line.includes('pts_time=')) continue;
    const fields: Record<string, string> = {};
    for (const kv of line.trim().split('|')) {
      const eq = kv.indexOf('=');
      if (eq > 0) fields[kv.slice(0, eq)] = kv.slice(eq + 1);
    }
    if (fields.stream_index !== String(streamIndex)) continue;
    if ((fields.flags ?? '').includes('D')) { discarded++; continue; } // cut by an edit list
    count++;
    const p = finiteNumber(fields.pts_time);
    const d = finiteNumber(fields.dts_time);
    if (p === null) ptsComplete = false; else pts.push(p);
    if (p !== null && (fields.flags ?? '').includes('K')) keyPts.push(p);
    if (d === null) dtsComplete = false; else dts.push(d);
  }
  const endsEarly = /partial file|truncat/i.test(r.stderr);
  return { pts, dts, keyPts, ptsComplete, dtsComplete, count, discarded, endsEarly };
}

function intervalStats(sorted: Float64Array): { min: number; median: number; max: number; intervals: Float64Array } | null {
  if (sorted.length < 2) return null;
  const intervals = new Float64Array(sorted.length - 1);
  for (let i = 1; i < sorted.length; i++) intervals[i - 1] = sorted[i]! - sorted[i - 1]!;
  const ordered = Float64Array.from(intervals).sort();
  const mid = ordered.length >> 1;
  const median = ordered.length % 2 ? ordered[mid]! : 0.5 * (ordered[mid - 1]! + ordered[mid]!);
  return { min: ordered[0]!, median, max: ordered[ordered.length - 1]!, intervals };
}

/** True when more than 1 % (and at least 2) of the intervals stray from the median by > 5 % + one tick. */
export function isVariableFrameRate(intervals: Float64Array, medianS: number, tickS: number): boolean {
  const tolerance = 0.05 * medianS + tickS;
  let irregular = 0;
  for (const d of intervals) if (Math.abs(d - medianS) > tolerance) irregular++;
  return irregular >= 2 && irregular > 0.01 * intervals.length;
}

/** Full probe: stream facts, frame times and notes. */
export async function probeMedia(path: string, opts: { signal?: AbortSignal } = {}): Promise<ProbeResult> {
  await checkFile(path);
  const ffprobe = locate('ffprobe');
  const args = ['-v', 'error', '-of', 'json', '-show_format', '-show_streams', ffmpegInput(path)];
  const listing = startPacketList(path, opts.signal);
  const r = await runProcess(ffprobe.path, args, opts.signal === undefined ? {} : { signal: opts.signal });
  if (r.code !== 0) {
    if (/moov atom not found/i.test(r.stderr) && (await looksLikeIsoMedia(path))) {
      throw new KerrError('TRUNCATED_MEDIA', `${path} is an MP4/MOV file without its index (moov box): the recording was cut short or not finalised`, {
        path,
        hint: 'Copy the file again from the camera; if the camera stopped abruptly, a repair tool for MP4 files may recover it',
      });
    }
    throw new KerrError('NOT_A_VIDEO', `${path} could not be read as a video (ffprobe: ${lastLine(r.stderr, path)})`, {
      path,
      hint: 'Give a video file from the camera (MP4, MOV, MKV...); for photos use `kerrtrace stills`',
    });
  }
  let parsed: FfprobeOutput;
  try {
    parsed = JSON.parse(r.stdout) as FfprobeOutput;
  } catch {
    throw new KerrError('FFMPEG_FAILED', `ffprobe gave unreadable output for ${path}`, { path, hint: 'Check the ffprobe installation (`kerrtrace --version`)' });
  }
  const format = parsed.format ?? {};
  const stream = (parsed.streams ?? []).find((s) => s.codec_type === 'video' && !s.disposition?.attached_pic);
  if (!stream) {
    throw new KerrError('NOT_A_VIDEO', `${path} has no video stream (audio only or data)`, { path, hint: 'Give the camera\'s video file' });
  }
  if (STILL_IMAGE_FORMATS.test(format.format_name ?? '')) {
    throw new KerrError('NOT_A_VIDEO', `${path} is a still image (${format.format_name}), not a video`, {
      path,
      hint: 'For a series of photos use `kerrtrace stills FOLDER`',
    });
  }
  const notes: string[] = [];
  const packets = await readPackets(listing, stream.index);

  const nbFrames = finiteNumber(stream.nb_frames);
  const containerCount = nbFrames !== null && nbFrames > 0 ? Math.round(nbFrames) : null;
  const endsEarly = packets.endsEarly;
  if (endsEarly) {
    notes.push(`the file's data ends early: ${packets.count} frames present${containerCount !== null ? ` of the ${containerCount} its index lists` : ''}`);
  } else if (containerCount !== null && containerCount !== packets.count) {
    notes.push(`the container lists ${containerCount} frames but ${packets.count} are shown (${packets.discarded > 0 ? `${packets.discarded} cut by its edit list` : 'the rest are not presented'})`);
  }
  // What a full decode delivers; when the data is cut short, what it should have delivered.
  const expectedFrames = endsEarly && containerCount !== null ? containerCount : packets.count;
  const frameCount = expectedFrames;

  const nominalFps = parseRate(stream.r_frame_rate);
  const tickS = parseRate(stream.time_base) ?? 0;
  let timeSource: FrameTimeSource;
  let frameTimesS: Float64Array;
  if (packets.ptsComplete && packets.pts.length > 0) {
    timeSource = 'pts';
    frameTimesS = Float64Array.from(packets.pts).sort();
  } else if (packets.dtsComplete && packets.dts.length > 0) {
    timeSource = 'dts';
    frameTimesS = Float64Array.from(packets.dts).sort();
    notes.push('the container has no presentation timestamps; frame times come from decoding timestamps');
  } else {
    timeSource = 'nominal-rate';
    const rate = nominalFps ?? parseRate(stream.avg_frame_rate) ?? 30;
    const start = finiteNumber(stream.start_time) ?? 0;
    frameTimesS = new Float64Array(packets.count);
    for (let i = 0; i < packets.count; i++) frameTimesS[i] = start + i / rate;
    notes.push(`the stream carries no timestamps (raw elementary stream); frame times assume a constant ${rate} fps. Remux into MP4/MKV with the camera's timing if you have it`);
  }

  const stats = intervalStats(frameTimesS);
  const variableFrameRate = stats !== null && timeSource !== 'nominal-rate' && isVariableFrameRate(stats.intervals, stats.median, tickS);

  const firstTime = frameTimesS.length > 0 ? frameTimesS[0]! : 0;
  const startTimeS = finiteNumber(stream.start_time) ?? finiteNumber(format.start_time) ?? firstTime;
  let durationS = finiteNumber(stream.duration) ?? finiteNumber(format.duration);
  if (durationS === null || durationS <= 0) {
    durationS = stats !== null ? frameTimesS[frameTimesS.length - 1]! - firstTime + stats.median : 0;
  }
  // Mean rate of the timestamps: (n − 1) frames over the span from first to last frame.
  const spanS = frameTimesS.length > 1 ? frameTimesS[frameTimesS.length - 1]! - firstTime : 0;
  const meanFps = spanS > 0 ? (frameTimesS.length - 1) / spanS : durationS > 0 ? frameCount / durationS : null;

  const codedWidth = stream.width ?? 0;
  const codedHeight = stream.height ?? 0;
  if (!(codedWidth > 0 && codedHeight > 0)) {
    throw new KerrError('NOT_A_VIDEO', `${path} has a video stream without a frame size`, { path, hint: 'The file may be damaged; copy it again from the camera' });
  }
  if (frameCount === 0) {
    throw new KerrError('NOT_A_VIDEO', `${path} has a video stream with no frames`, { path, hint: 'The recording holds no pictures; record again' });
  }
  const rotationDeg = rotationClockwiseDeg(stream);
  const swap = rotationDeg === 90 || rotationDeg === 270;

  const info: VideoInfo = {
    path,
    container: format.format_name ?? 'unknown',
    codec: stream.codec_name ?? 'unknown',
    width: swap ? codedHeight : codedWidth,
    height: swap ? codedWidth : codedHeight,
    codedWidth,
    codedHeight,
    rotationDeg,
    frameCount,
    frameCountCounted: containerCount === null,
    nominalFps,
    meanFps,
    variableFrameRate,
    durationS,
    startTimeS,
    pixelFormat: stream.pix_fmt ?? 'unknown',
    bitDepth: bitDepthOf(stream),
    colourRange: rangeOf(stream),
    colourTransfer: stream.color_transfer ?? 'unknown',
    colourPrimaries: stream.color_primaries ?? 'unknown',
    colourMatrix: stream.color_space ?? 'unknown',
  };
  return {
    info,
    frameTimesS,
    timeSource,
    streamIndex: stream.index,
    expectedFrames,
    keyframeTimesS: Float64Array.from(packets.keyPts).sort(),
    endsEarly,
    frameIntervalS: stats === null ? null : { min: stats.min, median: stats.median, max: stats.max },
    notes,
    ffprobeVersion: ffprobe.version,
  };
}

/** The stream facts only (what `kerrtrace inspect` prints). */
export async function probeVideo(path: string): Promise<VideoInfo> {
  return (await probeMedia(path)).info;
}
