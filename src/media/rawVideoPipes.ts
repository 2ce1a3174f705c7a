/**
 * The engine under the frame and region streams: runs one ffmpeg that decodes a video once and
 * writes one or more raw planar YUV 4:2:0 outputs (8-bit, or 16-bit little-endian words for
 * sources deeper than 8 bits, so a 10-bit clip keeps every bit) (the whole picture, or crops of it) to pipes,
 * and yields, frame by frame, one filled buffer per output with the frame's index and
 * presentation time.
 *
 * - Output k goes to file descriptor 1 (k = 0) or k + 2 (pipe:3, pipe:4, ...); several crops come
 *   from one decode through `split` and `crop` (which only moves data pointers), so only the
 *   cropped bytes cross the pipes.
 * - One preallocated buffer per output, filled from the pipe's chunks (no per-chunk copies or joins, no
 *   JS loops over pixels); the buffers are REUSED for the next frame.
 * - Backpressure: pipes are read only while the consumer asks for the next frame. ffmpeg writes the
 *   outputs of a frame in order and the reader reads them in the same order, so it never waits on
 *   one pipe while ffmpeg is blocked on another.
 * - The child is killed and reaped when the consumer stops early, throws, or the AbortSignal fires.
 * - Decoder threads: `decoderThreads()`, two more than ffmpeg's own choice (cores + 1), so that
 *   frames keep decoding while ffmpeg's main thread waits for us to drain a pipe.
 *
 * @throws (while iterating) KerrError TRUNCATED_MEDIA (details framesRead, framesExpected),
 *   FFMPEG_FAILED, FFMPEG_MISSING, the AbortSignal's reason.
 * Internal to src/media: use openFrameStream or openRegionStream.
 */
import { spawn } from 'node:child_process';
import { availableParallelism } from 'node:os';
import type { Readable } from 'node:stream';
import { KerrError } from '../errors.js';
import { ffmpegPath } from './ffmpegPaths.js';
import type { ProbeResult } from './probe.js';
import { ffmpegInput } from './probe.js';

/** Bytes of one planar 4:2:0 frame: W·H luma plus two ⌈W/2⌉·⌈H/2⌉ chroma planes. */
export function yuv420FrameBytes(width: number, height: number): number {
  return width * height + 2 * ((width + 1) >> 1) * ((height + 1) >> 1);
}

/**
 * Raw planar formats we ask ffmpeg for: 4:2:0, 8-bit or 16-bit little-endian words for deeper
 * sources; and 4:4:4 in 16-bit words for block overviews (each block's mean Y′, Cb, Cr kept with
 * fractional precision).
 */
export type RawPixelFormat = 'yuv420p' | 'yuvj420p' | 'yuv420p10le' | 'yuv420p12le' | 'yuv420p16le' | 'yuv444p16le';

/** Bytes of one frame of a raw format: 4:2:0 (see yuv420FrameBytes) or 4:4:4 (three full planes), 2 bytes a sample above 8 bits. */
export function rawFrameBytes(format: RawPixelFormat, width: number, height: number): number {
  const bytesPerSample = rawBitDepth(format) > 8 ? 2 : 1;
  return bytesPerSample * (format === 'yuv444p16le' ? 3 * width * height : yuv420FrameBytes(width, height));
}

/** Bits per sample of a raw format (8 for the byte formats). */
export function rawBitDepth(format: RawPixelFormat): number {
  const m = /p(\d+)le$/.exec(format);
  return m ? Number(m[1]) : 8;
}

export interface RawOutput {
  /** Filter chain applied to the decoded (and auto-rotated) picture, e.g. "crop=40:30:20:10"; '' for none. */
  filter: string;
  width: number;
  height: number;
  /** This output's format when it differs from the plan's (e.g. an 8-bit overview of a 10-bit clip). */
  pixelFormat?: RawPixelFormat;
}

export interface RawPipesPlan {
  probe: ProbeResult;
  outputs: RawOutput[];
  maxFrames?: number;
  expectedFrames: number;
  pixelFormat: RawPixelFormat;
}

export interface ChildExit {
  pid: number | undefined;
  code: number | null;
  signal: NodeJS.Signals | null;
}

export interface RawFrameSet {
  index: number;
  timeS: number;
  /** One buffer per output, in the plan's order (reused for the next frame). */
  buffers: Uint8Array[];
}

export interface RawPipesRun {
  frames: AsyncGenerator<RawFrameSet, void, undefined>;
  /** Set once the child is spawned. */
  readonly pid: number | undefined;
  /** Resolves after the child has exited and been reaped. */
  readonly exited: Promise<ChildExit>;
  readonly notes: string[];
  readonly args: string[];
}

const STDERR_KEEP = 4096;

/**
 * Decoder threads for our pipes: cores + 3, two more than ffmpeg's automatic cores + 1. The pipes
 * are read only while the consumer asks for the next frame, so ffmpeg's main thread (filters,
 * pipe writes) waits while a frame is measured; more frames in flight keep the decoder busy
 * meanwhile. Frame-threaded decoding is bit-exact, so the pixels do not change. Measured with
 * `npm run bench` on 2 cores (1080p, 30 s, analyze with --roi): about 0.5–1 s faster in 12–13 s
 * (B the same to the last digit); docs/analyze.md has the table.
 */
export function decoderThreads(): number {
  return availableParallelism() + 3;
}

/** ffmpeg arguments for a plan (exported for tests and diagnostics). */
export function rawPipesArgs(plan: RawPipesPlan): string[] {
  const { probe, outputs } = plan;
  const args = ['-hide_banner', '-nostdin', '-nostats', '-v', 'error', '-threads', String(decoderThreads()), '-i', ffmpegInput(probe.info.path)];
  const frameLimit = plan.maxFrames !== undefined ? ['-frames:v', String(plan.maxFrames)] : [];
  const tail = (fd: number, format: RawPixelFormat): string[] => [...frameLimit, '-f', 'rawvideo', '-pix_fmt', format, `pipe:${fd}`];
  if (outputs.length === 1) {
    args.push('-map', `0:${probe.streamIndex}`, '-an', '-sn', '-dn', '-vsync', '0');
    if (outputs[0]!.filter) args.push('-vf', outputs[0]!.filter);
    args.push(...tail(1, outputs[0]!.pixelFormat ?? plan.pixelFormat));
    return args;
  }
  const labels = outputs.map((_o, k) => `s${k}`);
  const graph = [`[0:${probe.streamIndex}]split=${outputs.length}${labels.map((l) => `[${l}]`).join('')}`];
  outputs.forEach((o, k) => graph.push(`[s${k}]${o.filter || 'null'}[o${k}]`));
  args.push('-filter_complex', graph.join(';'), '-vsync', '0');
  outputs.forEach((o, k) => args.push('-map', `[o${k}]`, ...tail(k === 0 ? 1 : k + 2, o.pixelFormat ?? plan.pixelFormat)));
  return args;
}

/** Reads exact frame-sized pieces from a pipe into one buffer, keeping the rest of a chunk for later. */
class PipeFrameReader {
  private readonly chunks: AsyncIterator<Buffer>;
  private pending: Buffer | null = null;
  private pendingOffset = 0;

  constructor(readable: Readable, readonly buffer: Uint8Array) {
    this.chunks = (readable as AsyncIterable<Buffer>)[Symbol.asyncIterator]();
  }

  /** Fills the buffer with the next frame; returns the bytes filled (less than a frame at the end). */
  async fill(): Promise<number> {
    const size = this.buffer.length;
    let filled = 0;
    while (filled < size) {
      if (this.pending === null) {
        const next = await this.chunks.next();
        if (next.done) return filled;
        this.pending = next.value;
        this.pendingOffset = 0;
      }
      const chunk = this.pending;
      const n = Math.min(size - filled, chunk.length - this.pendingOffset);
      this.buffer.set(n === chunk.length ? chunk : chunk.subarray(this.pendingOffset, this.pendingOffset + n), filled);
      filled += n;
      this.pendingOffset += n;
      if (this.pendingOffset === chunk.length) this.pending = null;
    }
    return filled;
  }

  async close(): Promise<void> {
    await this.chunks.return?.();
  }
}

export function runRawPipes(plan: RawPipesPlan, opts: { onProgress?: (done: number, total: number) => void; signal?: AbortSignal }): RawPipesRun {
  const args = rawPipesArgs(plan);
  const notes: string[] = [];
  const outputCount = plan.outputs.length;
  const stdio: Array<'ignore' | 'pipe'> = ['ignore', 'pipe', 'pipe'];
  for (let k = 1; k < outputCount; k++) stdio.push('pipe');
  const child = spawn(ffmpegPath(), args, { stdio, windowsHide: true });
  let spawnError: Error | undefined;
  const exited = new Promise<ChildExit>((resolve) => {
    child.once('exit', (code, signal) => resolve({ pid: child.pid, code, signal }));
    child.once('error', (e) => {
      spawnError = e;
      resolve({ pid: child.pid, code: null, signal: null });
    });
  });
  let stderrTail = '';
  const stderr = child.stdio[2] as Readable;
  stderr.setEncoding('utf8');
  stderr.on('data', (s: string) => { stderrTail = (stderrTail + s).slice(-STDERR_KEEP); });
  const onAbort = (): void => { child.kill('SIGKILL'); };
  opts.signal?.addEventListener('abort', onAbort, { once: true });

  const pipes = plan.outputs.map((_o, k) => child.stdio[k === 0 ? 1 : k + 2] as Readable);
  const readers = plan.outputs.map((o, k) => new PipeFrameReader(pipes[k]!, new Uint8Array(rawFrameBytes(o.pixelFormat ?? plan.pixelFormat, o.width, o.height))));
  const buffers = readers.map((r) => r.buffer);
  const times = plan.probe.frameTimesS;
  const medianIntervalS = plan.probe.frameIntervalS?.median ?? 0;
  const { expectedFrames } = plan;
  const path = plan.probe.info.path;

  const timeOf = (i: number): number => {
    if (i < times.length) return times[i]!;
    if (i === times.length) notes.push(`ffmpeg delivered more frames than the container has timestamps (${times.length}); later frames are timed by the median interval`);
    const last = times.length > 0 ? times[times.length - 1]! : 0;
    return last + (i - times.length + 1) * medianIntervalS;
  };

  async function* frames(): AsyncGenerator<RawFrameSet, void, undefined> {
    let index = 0;
    let partial = false;
    try {
      for (;;) {
        let complete = 0;
        let ended = false;
        for (const reader of readers) {
          const got = await reader.fill();
          if (got === reader.buffer.length) complete++;
          else {
            ended = true;
            if (got > 0 || complete > 0) partial = true;
            break;
          }
        }
        if (ended) break;
        opts.onProgress?.(index + 1, Math.max(expectedFrames, index + 1));
        yield { index, timeS: timeOf(index), buffers };
        index++;
        opts.signal?.throwIfAborted();
      }
      const exit = await exited;
      opts.signal?.throwIfAborted();
      if (spawnError) {
        throw new KerrError('FFMPEG_MISSING', `could not start ffmpeg (${(spawnError as NodeJS.ErrnoException).code ?? spawnError.message})`, {
          hint: 'Run `npm install` in the project folder, or set KERRTRACE_FFMPEG to a working ffmpeg',
        });
      }
      if (partial || index < expectedFrames) {
        throw new KerrError('TRUNCATED_MEDIA',
          `${path} ends early: read ${index} of ${expectedFrames} frames before the data stopped${partial ? ' (the last frame was incomplete)' : ''}`,
          {
            path,
            hint: 'The file is cut short or damaged; copy it again from the camera, or trim the clip to the frames that decode',
            details: { framesRead: index, framesExpected: expectedFrames, stderr: stderrTail.trim() },
          });
      }
      if (exit.code !== 0) {
        const last = stderrTail.trim().split('\n').pop() ?? '';
        throw new KerrError('FFMPEG_FAILED', `ffmpeg stopped with exit code ${exit.code ?? exit.signal} while decoding ${path}${last ? `: ${last}` : ''}`, {
          path,
          hint: 'Check that the file plays; run `kerrtrace inspect` on it for details',
        });
      }
    } finally {
      opts.signal?.removeEventListener('abort', onAbort);
      if (child.exitCode === null && child.signalCode === null && spawnError === undefined) {
        for (const p of pipes) p.destroy();
        child.kill('SIGTERM');
        const hardKill = setTimeout(() => child.kill('SIGKILL'), 2000);
        await exited;
        clearTimeout(hardKill);
      } else {
        await exited;
      }
      await Promise.all(readers.map((r) => r.close()));
    }
  }

  return {
    frames: frames(),
    get pid() { return child.pid; },
    exited,
    notes,
    args,
  };
}
