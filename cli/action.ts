/**
 * Wraps every command's action and turns every failure into one line on stderr and an exit code
 * (the table is in README "Exit codes" and DEVELOPERS.md):
 *   2  bad input or usage (a KerrError with an input code: bad option, missing file, output refused)
 *   3  a tool or the computation failed (ffmpeg missing or failing, the fit could not be made)
 *   4  an internal error: a bug in kerrtrace (one line asking for a report; KERRTRACE_DEBUG=1 shows the stack)
 *   5  the environment said no: permissions, read-only or full disk, closed or full stdout, link
 *      loops, too many open files (KerrError ENVIRONMENT, or a raw system error such as EACCES)
 * The line names the options of the inputs the error refers to (cli/flagNames.ts).
 * 130/143 interrupted by SIGINT/SIGTERM (staging folders removed, earlier results kept).
 */
import { isKerrError, type KerrError } from '../src/errors.js';
import { environmentError } from '../src/io/environmentError.js';
import { withFlags } from './flagNames.js';

const INPUT_CODES = new Set([
  'BAD_ARGUMENT', 'FILE_NOT_FOUND', 'FILE_EXISTS', 'NOT_A_VIDEO', 'TRUNCATED_MEDIA', 'BAD_REGION',
  'BAD_CSV', 'BAD_SCENARIO', 'NO_OVERLAP', 'NOT_IDENTIFIABLE', 'BAD_RESULT', 'UNSAFE',
  'UNSUPPORTED_ENCODING', 'BAD_PROFILE',
]);

/** Exit codes, named. */
export const EXIT = { ok: 0, input: 2, failed: 3, internal: 4, environment: 5 } as const;

/** Writes to stderr without ever throwing (stderr may be closed too). */
export function say(line: string): void {
  try {
    process.stderr.write(line);
  } catch {
    // nowhere left to tell
  }
}

export function exitCodeFor(err: KerrError): number {
  if (err.code === 'ENVIRONMENT') return EXIT.environment;
  return INPUT_CODES.has(err.code) ? EXIT.input : EXIT.failed;
}

export function reportError(err: unknown): number {
  const known = isKerrError(err) ? err : environmentError(err);
  if (known) {
    say(`kerrtrace: ${withFlags(known.oneLine(), known.inputs)}\n`);
    if (process.env.KERRTRACE_DEBUG) say(`${(err as Error).stack ?? ''}\n`);
    return exitCodeFor(known);
  }
  const message = err instanceof Error ? err.message : String(err);
  say(`kerrtrace: internal error: ${message}. Please report it with the command you ran (KERRTRACE_DEBUG=1 shows details)\n`);
  if (process.env.KERRTRACE_DEBUG && err instanceof Error) say(`${err.stack ?? ''}\n`);
  return EXIT.internal;
}

export function action<A extends unknown[]>(fn: (...args: A) => Promise<void> | void): (...args: A) => Promise<void> {
  return async (...args: A) => {
    try {
      await fn(...args);
    } catch (err) {
      process.exitCode = reportError(err);
    }
  };
}
