/**
 * The encoding edge of the simulator: raw RGB frames piped into ffmpeg → H.264 (libx264),
 * yuv420p, limited range, BT.709 matrix, tagged BT.709 primaries and the sRGB (iec61966-2-1) or
 * BT.709 transfer, in an MP4 with +faststart.
 *
 * RGB → Y'CbCr uses the BT.709 matrix explicitly (swscale out_color_matrix=bt709, out_range=tv,
 * accurate rounding), so a flat patch decodes back to its code value within ±2. libx264 runs with
 * macroblock-tree rate control and adaptive quantisation off (mbtree=0:aq-mode=0): with them on,
 * slow brightness ramps lag by several per cent in small regions; off, region means stay within
 * about 1 % of the raw frames at crf 18 (measured on the example ramp, 320×240).
 * Constant rate: rawvideo at the frame rate. Variable rate (works on the old bundled ffmpeg 4.1,
 * which lacks -fps_mode and the setts filter): rawvideo at the tick rate, each frame written once
 * per tick it lasts, exact repeats dropped with mpdecimate=hi=0:lo=0:frac=0:max=0 and -vsync vfr,
 * so every kept frame keeps the timestamp of its first tick. `probePacketTimesS` reads the result
 * back with ffprobe so the caller can check it.
 *
 * HDR clips (transfer hlg or pq): the caller hands in planar 10-bit Y'CbCr 4:2:0 (yuv420p10le, BT.2020
 * matrix, limited range; see yuv420p10FromRgb) and ffmpeg encodes HEVC Main 10 with libx265 (adaptive
 * quantisation and cu-tree off, for the same reason as above), tagged BT.2020 primaries and matrix and
 * the arib-std-b67 (HLG) or smpte2084 (PQ) transfer, as phones record HDR video.
 *
 * Throws KerrError FFMPEG_MISSING (no ffmpeg) or FFMPEG_FAILED (ffmpeg exits with an error; the
 * message carries ffmpeg's last line).
 * @example const enc = openClipEncoder({ outPath, widthPx: 320, heightPx: 240, transfer: 'srgb', crf: 18,
 *   rate: { kind: 'constant', rational: [30, 1] } }); await enc.write(rgb); await enc.finish();
 */
import { spawn, spawnSync, type ChildProcessWithoutNullStreams } from 'node:child_process';
import { KerrError } from '../errors.js';
import { ffmpegPath, ffprobePath } from '../media/ffmpegPaths.js';

export interface ClipEncoderOptions {
  outPath: string;
  widthPx: number;
  heightPx: number;
  transfer: 'srgb' | 'bt709' | 'hlg' | 'pq';
  crf: number;
  /** Constant: the frame rate num/den. Variable: the tick rate num/den; frames are written `repeats` ticks each. */
  rate: { kind: 'constant' | 'variable'; rational: [number, number] };
}

export interface ClipEncoder {
  /** Queues one frame (copied: rgb24 bytes, or yuv420p10le samples for HDR), written `repeats` times (variable rate: its length in ticks). */
  write(frame: Uint8Array | Uint16Array, repeats?: number): Promise<void>;
  /** Closes the pipe and waits for ffmpeg; throws FFMPEG_FAILED when it fails. */
  finish(): Promise<void>;
  /** Stops ffmpeg without waiting for a finished file. */
  abort(): void;
}

/** The ffmpeg arguments for these options (exported for tests and for the record). */
/** True for the transfers the simulator writes as 10-bit HEVC (HLG, PQ). */
export function isHdrTransfer(transfer: ClipEncoderOptions['transfer']): transfer is 'hlg' | 'pq' {
  return transfer === 'hlg' || transfer === 'pq';
}

export function encoderArgs(o: ClipEncoderOptions): string[] {
  const [num, den] = o.rate.rational;
  if (isHdrTransfer(o.transfer)) {
    const trc = o.transfer === 'hlg' ? 'arib-std-b67' : 'smpte2084';
    const hdrTiming: string[] = [];
    const hdrFilters: string[] = [];
    if (o.rate.kind === 'variable') {
      hdrFilters.push('mpdecimate=hi=0:lo=0:frac=0:max=0');
      hdrTiming.push('-vsync', 'vfr', '-video_track_timescale', String(den === 1 ? num * 10 : num));
    }
    return [
      '-hide_banner', '-loglevel', 'error', '-y',
      '-f', 'rawvideo', '-pix_fmt', 'yuv420p10le', '-s', `${o.widthPx}x${o.heightPx}`, '-framerate', `${num}/${den}`, '-i', 'pipe:0',
      ...(hdrFilters.length ? ['-vf', hdrFilters.join(',')] : []),
      ...hdrTiming,
      '-an', '-c:v', 'libx265', '-preset', 'fast', '-crf', String(o.crf), '-pix_fmt', 'yuv420p10le',
      '-x265-params', `log-level=error:aq-mode=0:cutree=0:colorprim=bt2020:transfer=${trc}:colormatrix=bt2020nc:range=limited`,
      '-colorspace', 'bt2020nc', '-color_primaries', 'bt2020', '-color_trc', trc, '-color_range', 'tv', '-tag:v', 'hvc1',
      '-movflags', '+faststart',
      '-f', 'mp4', o.outPath,
    ];
  }
  const filters = ['scale=out_color_matrix=bt709:out_range=tv:flags=accurate_rnd+full_chroma_int', 'format=yuv420p'];
  const timing: string[] = [];
  if (o.rate.kind === 'variable') {
    filters.push('mpdecimate=hi=0:lo=0:frac=0:max=0');
    timing.push('-vsync', 'vfr', '-video_track_timescale', String(den === 1 ? num * 10 : num));
  }
  return [
    '-hide_banner', '-loglevel', 'error', '-y',
    '-f', 'rawvideo', '-pix_fmt', 'rgb24', '-s', `${o.widthPx}x${o.heightPx}`, '-framerate', `${num}/${den}`, '-i', 'pipe:0',
    '-vf', filters.join(','),
    ...timing,
    '-an', '-c:v', 'libx264', '-preset', 'faster', '-crf', String(o.crf), '-x264-params', 'mbtree=0:aq-mode=0', '-pix_fmt', 'yuv420p',
    '-colorspace', 'bt709', '-color_primaries', 'bt709', '-color_trc', o.transfer === 'srgb' ? 'iec61966-2-1' : 'bt709', '-color_range', 'tv',
    '-movflags', '+faststart',
    '-f', 'mp4', o.outPath,
  ];
}

export function openClipEncoder(o: ClipEncoderOptions): ClipEncoder {
  const args = encoderArgs(o);
  const child: ChildProcessWithoutNullStreams = spawn(ffmpegPath(), args, { stdio: ['pipe', 'pipe', 'pipe'] });
  let stderr = '';
  child.stderr.on('data', (chunk: Buffer) => {
    stderr = (stderr + chunk.toString('utf8')).slice(-8000);
  });
  child.stdout.resume();
  let pipeError: Error | null = null;
  child.stdin.on('error', (err) => {
    pipeError = err;
  });
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => {
    child.on('close', (code, signal) => resolve({ code, signal }));
    child.on('error', (err) => {
      pipeError = err;
      resolve({ code: -1, signal: null });
    });
  });
  let done = false;

  const failure = (what: string): KerrError => {
    const last = stderr.trim().split('\n').filter(Boolean).pop() ?? (pipeError ? (pipeError as Error).message : 'no message');
    return new KerrError('FFMPEG_FAILED', `ffmpeg could not ${what}: ${last}`, {
      hint: 'Check that the bundled ffmpeg runs (kerrtrace --version) and that the output folder is writable',
      details: { stderr },
    });
  };

  return {
    async write(frame: Uint8Array | Uint16Array, repeats = 1): Promise<void> {
      if (done) throw new KerrError('INTERNAL', 'clip encoder used after finish');
      // the caller reuses its buffer for the next frame (16-bit samples go out little-endian, the host order on x86/ARM)
      const copy = Buffer.from(Buffer.from(frame.buffer, frame.byteOffset, frame.byteLength));
      for (let r = 0; r < repeats; r++) {
        if (pipeError) throw failure('encode the clip');
        if (!child.stdin.write(copy)) {
          const outcome = await Promise.race([
            new Promise<'drain'>((resolve) => child.stdin.once('drain', () => resolve('drain'))),
            exited.then(() => 'exit' as const),
          ]);
          if (outcome === 'exit') throw failure('encode the clip');
        }
      }
    },
    async finish(): Promise<void> {
      done = true;
      child.stdin.end();
      const { code, signal } = await exited;
      if (code !== 0) throw failure(signal ? `finish the clip (stopped by ${signal})` : 'finish the clip');
    },
    abort(): void {
      done = true;
      child.stdin.destroy();
      if (child.exitCode === null) child.kill('SIGKILL');
    },
  };
}

/** Presentation times (s) of the video packets of a file, sorted, from ffprobe. */
export function probePacketTimesS(path: string): number[] {
  const r = spawnSync(ffprobePath(), ['-v', 'error', '-select_streams', 'v:0', '-show_entries', 'packet=pts_time', '-of', 'csv=p=0', path], {
    encoding: 'utf8',
    maxBuffer: 64 * 1024 * 1024,
  });
  if (r.status !== 0) {
    throw new KerrError('FFMPEG_FAILED', `ffprobe could not read ${path}: ${(r.stderr ?? '').trim().split('\n').pop() ?? 'no message'}`, {
      path,
    });
  }
  return r.stdout
    .split('\n')
    .map((l) => l.trim().replace(/,$/, ''))
    .filter((l) => l.length > 0 && l !== 'N/A')
    .map(Number)
    .filter(Number.isFinite)
    .sort((a, b) => a - b);
}
