/**
 * Process-wide guards the command line installs before any command runs:
 * - `guardStdout`: stdout closed early (`| head -1`: EPIPE) or full (`> /dev/full`: ENOSPC) gives
 *   one line on stderr and exit code 5, for every command and for --help and --json output,
 *   instead of a Node stack trace. Output files already written stay complete. Errors on stderr
 *   itself are ignored (there is nowhere left to report them).
 * - `installSignalCleanup`: SIGTERM, SIGINT and SIGHUP remove the staging folders of this run
 *   (src/io/outputDir.ts abandonAllStaged) and exit with 128 + the signal number. A replace
 *   already in progress is synchronous and finishes first, so the earlier result or the new one
 *   is always in place.
 *   A command that listens for the signal itself (watch) owns the shutdown instead.
 */
import { writeSync } from 'node:fs';
import { abandonAllStaged } from '../src/io/outputDir.js';
import { EXIT } from './action.js';

let stdoutFailed = false;

/** The one line for a failed stdout; exported for tests. */
export function stdoutFailureLine(code: string | undefined): string {
  if (code === 'EPIPE' || code === 'ERR_STREAM_DESTROYED') {
    return 'kerrtrace: standard output was closed before everything was written (the reading program stopped early, e.g. `| head`). Files on disk are unaffected; let the reader read to the end or redirect to a file';
  }
  if (code === 'ENOSPC' || code === 'EDQUOT') {
    return 'kerrtrace: standard output is full (no space left where it goes). Files on disk are unaffected; free some space or redirect the output elsewhere';
  }
  return `kerrtrace: could not write to standard output (${code ?? 'unknown error'}). Files on disk are unaffected; redirect the output to a file and try again`;
}

export function guardStdout(): void {
  process.stdout.on('error', (err: NodeJS.ErrnoException) => {
    if (stdoutFailed) return;
    stdoutFailed = true;
    try {
      writeSync(2, `${stdoutFailureLine(err.code)}\n`);
    } catch {
      // stderr closed as well
    }
    process.exitCode = EXIT.environment;
  });
  process.stderr.on('error', () => {
    // nowhere left to report
  });
}

const SIGNALS: Array<[NodeJS.Signals, number]> = [['SIGINT', 2], ['SIGTERM', 15], ['SIGHUP', 1]];

export function installSignalCleanup(): void {
  for (const [signal, number] of SIGNALS) {
    process.on(signal, () => {
      // A command that handles the signal itself (watch stops ffmpeg and finishes a recording)
      // owns the shutdown and its own staged folders.
      if (process.listenerCount(signal) > 1) return;
      abandonAllStaged();
      try {
        writeSync(2, `kerrtrace: stopped by ${signal}; nothing was replaced and partial output was removed\n`);
      } catch {
        // stderr closed
      }
      process.exit(128 + number);
    });
  }
}
