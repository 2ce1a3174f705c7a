/**
 * Runs a short-lived helper program (ffprobe, a one-off ffmpeg) to completion and collects its
 * output as text. stdin is closed; the child is killed when the optional AbortSignal fires.
 *
 * @throws KerrError FFMPEG_MISSING when the executable cannot be started (the media tools are the
 *   only programs this project runs); the AbortSignal's reason when aborted.
 * @example const r = await runProcess(ffprobePath(), ['-version']); r.code // 0
 */
import { spawn } from 'node:child_process';
import { KerrError } from '../errors.js';

export interface ProcessOutcome {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

export interface RunProcessOptions {
  signal?: AbortSignal;
  /** Kill the child after this many milliseconds (default: no limit). */
  timeoutMs?: number;
}

export function runProcess(file: string, args: readonly string[], opts: RunProcessOptions = {}): Promise<ProcessOutcome> {
  return new Promise((resolve, reject) => {
    opts.signal?.throwIfAborted();
    const child = spawn(file, args, { stdio: ['ignore', 'pipe', 'pipe'], windowsHide: true });
    const out: Buffer[] = [];
    const err: Buffer[] = [];
    child.stdout.on('data', (b: Buffer) => out.push(b));
    child.stderr.on('data', (b: Buffer) => err.push(b));
    let timer: NodeJS.Timeout | undefined;
    const onAbort = (): void => { child.kill('SIGKILL'); };
    opts.signal?.addEventListener('abort', onAbort, { once: true });
    if (opts.timeoutMs !== undefined) timer = setTimeout(() => child.kill('SIGKILL'), opts.timeoutMs);
    child.on('error', (e: NodeJS.ErrnoException) => {
      if (timer) clearTimeout(timer);
      opts.signal?.removeEventListener('abort', onAbort);
      reject(new KerrError('FFMPEG_MISSING', `could not start ${file} (${e.code ?? e.message})`, {
        hint: 'Run `npm install` in the project folder, or set KERRTRACE_FFMPEG / KERRTRACE_FFPROBE to working executables',
      }));
    });
    child.on('close', (code, signal) => {
      if (timer) clearTimeout(timer);
      opts.signal?.removeEventListener('abort', onAbort);
      if (opts.signal?.aborted) {
        reject(opts.signal.reason);
        return;
      }
      resolve({ code, signal, stdout: Buffer.concat(out).toString('utf8'), stderr: Buffer.concat(err).toString('utf8') });
    });
  });
}
