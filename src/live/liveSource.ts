/**
 * The camera or stream behind the live view, read through ffmpeg. One ffmpeg child at a time:
 *   ffmpeg [-re] [-ss POS] [-f FORMAT] -i INPUT
 *     -map 0:v:0 -vf showinfo[,scale] -vsync passthrough -f rawvideo -pix_fmt yuv420p pipe:1
 *     [-map 0:v:0 -c copy -f matroska RECORDING]
 * Raw planar YUV 4:2:0 frames come through stdout (scaled down to at most `maxWidth` pixels
 * across), each frame's presentation time through the showinfo lines on stderr. While recording,
 * the same ffmpeg copies the compressed stream into a Matroska file without re-encoding; starting
 * or stopping a recording restarts the child with or without that output (a file source resumes
 * where it was, so the view jumps by at most a keyframe interval).
 *
 * The child is stopped gracefully ("q" on stdin, so a recording is finalised), killed after 5 s
 * if it does not go, and always reaped: `stop()` resolves once it has exited.
 * Edge module: processes. Errors: KerrError FILE_NOT_FOUND (no such device or file),
 * FFMPEG_FAILED (ffmpeg could not open or read the input; the message names the input and
 * quotes ffmpeg's last error line).
 */
import { spawn, type ChildProcessWithoutNullStreams } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { KerrError } from '../errors.js';
import { ffmpegPath, ffprobePath } from '../media/ffmpegPaths.js';

export interface SourceSpec {
  /** What to hand ffmpeg's -i. */
  input: string;
  /** ffmpeg input format (-f), e.g. v4l2; null to let ffmpeg guess. */
  format: string | null;
  /** A file played at its own frame rate (-re), as if it were live. */
  file: boolean;
  /** How to name the input in messages: "camera /dev/video0", "stream rtsp://…", "clip run.mp4". */
  label: string;
}

export interface SourceInfo {
  width: number;
  height: number;
  /** Size of the frames delivered (≤ maxWidth across, even). */
  liveWidth: number;
  liveHeight: number;
  nominalFps: number | null;
  pixelFormat: string;
  colourRange: 'limited' | 'full' | 'unknown';
  colourMatrix: string;
  colourTransfer: string;
  codec: string;
  durationS: number | null;
}

/** Decides how to open an input named on the command line. */
export function sourceSpec(input: string, opts: { file: boolean; format?: string }): SourceSpec {
  if (opts.file) return { input, format: opts.format ?? null, file: true, label: `clip ${input}` };
  if (/^[a-z][a-z0-9+.-]*:\/\//i.test(input)) return { input, format: opts.format ?? null, file: false, label: `stream ${input}` };
  const format = opts.format ?? (input.startsWith('/dev/video') ? 'v4l2' : null);
  return { input, format, file: false, label: `camera ${input}` };
}

function checkExists(spec: SourceSpec): void {
  if (/^[a-z][a-z0-9+.-]*:\/\//i.test(spec.input)) return;
  if (spec.format !== null && spec.format !== 'v4l2' && !spec.file) return; // e.g. avfoundation "0", dshow "video=…"
  if (!existsSync(spec.input)) {
    if (spec.file) throw new KerrError('FILE_NOT_FOUND', `the clip ${spec.input} does not exist`, { path: '--source', hint: 'Check the path' });
    throw new KerrError('FILE_NOT_FOUND', `no camera at ${spec.input}`, {
      path: spec.input,
      hint: 'Plug the camera in (ls /dev/video* lists cameras), name another device, or try it without one: kerrtrace watch --demo',
    });
  }
  if (spec.file && !statSync(spec.input).isFile()) throw new KerrError('FILE_NOT_FOUND', `${spec.input} is not a file`, { path: '--source', hint: 'Give a video file' });
}

function parseRate(text: unknown): number | null {
  if (typeof text !== 'string') return null;
  const [a, b] = text.split('/').map(Number);
  if (!Number.isFinite(a) || !(a! > 0)) return null;
  const r = b === undefined ? a! : a! / b;
  return Number.isFinite(r) && r > 0 && r < 1000 ? r : null;
}

/** Asks ffprobe for the first video stream (size, rate, colour tags); one line naming the input on failure. */
export function probeSource(spec: SourceSpec, maxWidth: number): SourceInfo {
  checkExists(spec);
  const args = ['-v', 'error', '-of', 'json', '-show_streams', '-show_format', '-select_streams', 'v:0'];
  if (spec.format) args.push('-f', spec.format);
  args.push('-i', spec.input);
  const r = spawnSync(ffprobePath(), args, { encoding: 'utf8', timeout: 20_000, maxBuffer: 16 * 1024 * 1024 });
  const why = (r.stderr ?? '').trim().split('\n').filter(Boolean).pop() ?? (r.error ? r.error.message : `exit ${r.status}`);
  if (r.status !== 0 || typeof r.stdout !== 'string') {
    throw new KerrError('FFMPEG_FAILED', `cannot open ${spec.label}: ${why}`, {
      path: spec.input,
      hint: spec.file ? 'Check that the file is a video ffmpeg reads' : 'Check that the camera is connected and not used by another program',
    });
  }
  let parsed: { streams?: Array<Record<string, unknown>>; format?: Record<string, unknown> };
  try {
    parsed = JSON.parse(r.stdout) as typeof parsed;
  } catch {
    throw new KerrError('FFMPEG_FAILED', `ffprobe gave unreadable output for ${spec.label}`, { path: spec.input });
  }
  const s = parsed.streams?.[0];
  if (!s || typeof s.width !== 'number' || typeof s.height !== 'number') {
    throw new KerrError('NOT_A_VIDEO', `${spec.label} has no video stream`, { path: spec.input, hint: 'Name a camera or a video file' });
  }
  let width = s.width;
  let height = s.height;
  const sideRotation = Array.isArray(s.side_data_list) ? (s.side_data_list as Array<{ rotation?: number }>).find((d) => typeof d.rotation === 'number')?.rotation : undefined;
  const tagRotation = Number((s.tags as Record<string, string> | undefined)?.rotate ?? 0);
  const rotation = (((Math.round(sideRotation ?? tagRotation) % 360) + 360) % 360);
  if (rotation === 90 || rotation === 270) [width, height] = [height, width];
  let liveWidth = width;
  let liveHeight = height;
  if (width > maxWidth) {
    liveWidth = maxWidth - (maxWidth % 2);
    liveHeight = Math.max(2, 2 * Math.round((height * liveWidth) / width / 2));
  } else {
    liveWidth = width - (width % 2);
    liveHeight = height - (height % 2);
  }
  const pixelFormat = String(s.pix_fmt ?? 'unknown');
  const rangeTag = String(s.color_range ?? 'unknown');
  const colourRange = pixelFormat.startsWith('yuvj') || rangeTag === 'pc' ? 'full' : rangeTag === 'tv' ? 'limited' : 'unknown';
  const duration = Number(parsed.format?.duration ?? s.duration);
  return {
    width, height, liveWidth, liveHeight,
    nominalFps: parseRate(s.avg_frame_rate) ?? parseRate(s.r_frame_rate),
    pixelFormat, colourRange,
    colourMatrix: String(s.color_space ?? 'unknown'),
    colourTransfer: String(s.color_transfer ?? 'unknown'),
    codec: String(s.codec_name ?? 'unknown'),
    durationS: Number.isFinite(duration) && duration > 0 ? duration : null,
  };
}

export interface RunOptions {
  /** Start this many seconds into a file source. */
  seekS?: number;
  /** Also copy the stream into this Matroska file. */
  recordPath?: string;
}

export interface SourceHandlers {
  /** One frame: planar YUV 4:2:0 of liveWidth × liveHeight (a fresh buffer), its presentation time in s. */
  onFrame(data: Uint8Array, ptsS: number): void;
  /** The child ended: null when the input simply ended (a file source), else a one-line reason. */
  onEnd(problem: string | null): void;
}

export interface SourceRun {
  readonly pid: number | undefined;
  /** Graceful stop; resolves once the child has exited. */
  stop(): Promise<void>;
  readonly exited: Promise<void>;
}

const SHOWINFO = /n:\s*(\d+)\s+pts:\s*(-?\d+)\s+pts_time:\s*(-?[0-9.eE+-]+)/;

/** Starts one ffmpeg child for the source. */
export function runSource(spec: SourceSpec, info: SourceInfo, opts: RunOptions, handlers: SourceHandlers): SourceRun {
  const args = ['-hide_banner', '-nostats', '-loglevel', 'info'];
  if (spec.file) args.push('-re');
  if (opts.seekS !== undefined && opts.seekS > 0) args.push('-ss', opts.seekS.toFixed(3));
  if (spec.format) args.push('-f', spec.format);
  args.push('-i', spec.input);
  const filters = ['showinfo'];
  if (info.liveWidth !== info.width || info.liveHeight !== info.height) filters.push(`scale=${info.liveWidth}:${info.liveHeight}:flags=area`);
  const pixFmt = info.colourRange === 'full' ? 'yuvj420p' : 'yuv420p';
  args.push('-map', '0:v:0', '-vf', filters.join(','), '-vsync', 'passthrough', '-f', 'rawvideo', '-pix_fmt', pixFmt, 'pipe:1');
  if (opts.recordPath) args.push('-map', '0:v:0', '-c', 'copy', '-f', 'matroska', opts.recordPath);
  const child: ChildProcessWithoutNullStreams = spawn(ffmpegPath(), args, { stdio: ['pipe', 'pipe', 'pipe'] });

  const chromaW = (info.liveWidth + 1) >> 1;
  const chromaH = (info.liveHeight + 1) >> 1;
  const frameBytes = info.liveWidth * info.liveHeight + 2 * chromaW * chromaH;
  let current = Buffer.alloc(frameBytes);
  let filled = 0;
  const frames: Buffer[] = [];
  const times: number[] = [];
  const lastLines: string[] = [];
  let stopping = false;

  const drain = (): void => {
    while (frames.length > 0 && times.length > 0) handlers.onFrame(frames.shift()!, times.shift()!);
    // Never hold more than a few frames waiting for their times (a silent stderr would grow them).
    while (frames.length > 8) frames.shift();
    while (times.length > 64) times.shift();
  };

  child.stdout.on('data', (chunk: Buffer) => {
    let offset = 0;
    while (offset < chunk.length) {
      const n = Math.min(frameBytes - filled, chunk.length - offset);
      chunk.copy(current, filled, offset, offset + n);
      filled += n;
      offset += n;
      if (filled === frameBytes) {
        frames.push(current);
        current = Buffer.alloc(frameBytes);
        filled = 0;
      }
    }
    drain();
  });
  let stderrRest = '';
  child.stderr.setEncoding('utf8');
  child.stderr.on('data', (text: string) => {
    const lines = (stderrRest + text).split(/\r?\n|\r/);
    stderrRest = lines.pop() ?? '';
    for (const line of lines) {
      const m = SHOWINFO.exec(line);
      if (m && line.includes('showinfo')) {
        times.push(Number(m[3]));
      } else if (line.trim() !== '' && !line.includes('showinfo')) {
        lastLines.push(line.trim());
        if (lastLines.length > 12) lastLines.shift();
      }
    }
    drain();
  });
  child.stdin.on('error', () => undefined);

  const exited = new Promise<void>((resolve) => {
    child.on('close', (code, signal) => {
      drain();
      const failed = !stopping && code !== 0;
      const why = lastLines.filter((l) => /error|cannot|invalid|no such|denied|busy|failed/i.test(l)).pop() ?? lastLines[lastLines.length - 1] ?? `ffmpeg exited with ${code ?? signal}`;
      handlers.onEnd(failed ? `${spec.label} stopped: ${why}` : null);
      resolve();
    });
    child.on('error', (err) => {
      handlers.onEnd(`${spec.label}: ${err.message}`);
      resolve();
    });
  });

  return {
    pid: child.pid,
    exited,
    async stop() {
      if (child.exitCode !== null || child.signalCode !== null) return exited;
      stopping = true;
      try {
        child.stdin.write('q');
        child.stdin.end();
      } catch {
        // already closed
      }
      const kill = setTimeout(() => child.kill('SIGKILL'), 5000);
      const soft = setTimeout(() => child.kill('SIGINT'), 1500);
      await exited;
      clearTimeout(kill);
      clearTimeout(soft);
    },
  };
}
