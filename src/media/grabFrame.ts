/**
 * One video frame as a PNG, for drawing regions on: ffmpeg seeks to `timeS` (seconds from the
 * start of the file, input-side seeking, which decodes from the previous key frame to the exact
 * time), applies the rotation metadata like the analysis does, and writes one PNG to a pipe:
 *
 *   ffmpeg -v error -nostdin -ss t -i file:PATH -frames:v 1 -f image2pipe -vcodec png -compression_level 1 -
 *
 * (the PNG is an intermediate that the overlay decodes again, so the fastest deflate level: a
 * noisy 1080p frame takes 0.1 s instead of 0.4 s at the default level, for a file 13 % larger).
 * A stream with B-frames is sought from t − 3/23 s (ffmpeg's own rule), so a frame just after a
 * keyframe still decodes from the one before it: pipeline/showFrame.ts picks frames with that in
 * mind.
 * (the `file:` protocol prefix keeps a path that starts with '-' or holds ':' from being read as
 * an option or another protocol, as in probe.ts).
 *
 * Works with the bundled 2018 static ffmpeg build. The child is killed after `timeoutMs`
 * (default 60 s).
 * Edge module. Throws KerrError FILE_NOT_FOUND when the video does not exist, BAD_ARGUMENT for a
 * negative or non-finite time, FFMPEG_FAILED when ffmpeg fails or gives no frame (a time past the
 * end), FFMPEG_MISSING (from `ffmpegPath`) when no ffmpeg runs.
 * @example const png = await grabFramePng('run1.mp4', 2.5); // Buffer starting with \x89PNG
 */
import { spawn } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import { KerrError, invalid } from '../errors.js';
import { ffmpegPath } from './ffmpegPaths.js';

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

export async function grabFramePng(videoPath: string, timeS: number, options: { timeoutMs?: number } = {}): Promise<Buffer> {
  if (!existsSync(videoPath) || !statSync(videoPath).isFile()) {
    throw new KerrError('FILE_NOT_FOUND', `video ${videoPath} not found`, { path: videoPath, hint: 'Check the path of the video' });
  }
  if (!Number.isFinite(timeS) || timeS < 0) throw invalid('a time of 0 s or more from the start of the video', 'frame time', timeS);
  const exe = ffmpegPath();
  const args = ['-v', 'error', '-nostdin', '-ss', timeS.toFixed(6), '-i', `file:${videoPath}`, '-frames:v', '1', '-f', 'image2pipe', '-vcodec', 'png', '-compression_level', '1', '-'];
  const timeoutMs = options.timeoutMs ?? 60_000;
  return new Promise<Buffer>((resolve, reject) => {
    const child = spawn(exe, args, { stdio: ['ignore', 'pipe', 'pipe'], windowsHide: true });
    const out: Buffer[] = [];
    const err: Buffer[] = [];
    let timedOut = false;
    const timer = setTimeout(() => { timedOut = true; child.kill('SIGKILL'); }, timeoutMs);
    child.stdout.on('data', (b: Buffer) => out.push(b));
    child.stderr.on('data', (b: Buffer) => err.push(b));
    child.on('error', (e) => {
      clearTimeout(timer);
      reject(new KerrError('FFMPEG_MISSING', `ffmpeg could not be started (${e.message})`, { hint: 'Install ffmpeg or set KERRTRACE_FFMPEG to its path' }));
    });
    child.on('close', (code) => {
      clearTimeout(timer);
      const png = Buffer.concat(out);
      const message = Buffer.concat(err).toString('utf8').trim().split('\n').pop() ?? '';
      if (timedOut) {
        reject(new KerrError('FFMPEG_FAILED', `ffmpeg took longer than ${timeoutMs / 1000} s to give the frame at ${timeS.toFixed(3)} s of ${videoPath}`, { path: videoPath, hint: 'Check the video with `kerrtrace inspect`' }));
      } else if (code !== 0) {
        reject(new KerrError('FFMPEG_FAILED', `ffmpeg could not give the frame at ${timeS.toFixed(3)} s of ${videoPath}${message ? `: ${message}` : ''}`, { path: videoPath, hint: 'Check the video with `kerrtrace inspect`' }));
      } else if (png.length < PNG_SIGNATURE.length || !png.subarray(0, 8).equals(PNG_SIGNATURE)) {
        reject(new KerrError('FFMPEG_FAILED', `no frame at ${timeS.toFixed(3)} s of ${videoPath} (past the end?)`, { path: videoPath, hint: 'Give a time inside the video' }));
      } else {
        resolve(png);
      }
    });
  });
}
