/**
 * Wraps every command's action: a KerrError becomes one line on stderr and exit code 2 (bad input)
 * or 3 (a tool or computation failed); anything else is an internal error, reported in one line
 * with a request to file an issue (set KERRTRACE_DEBUG=1 for the stack).
 */
import { isKerrError } from '../src/errors.js';

const INPUT_CODES = new Set([
  'BAD_ARGUMENT', 'FILE_NOT_FOUND', 'FILE_EXISTS', 'NOT_A_VIDEO', 'TRUNCATED_MEDIA', 'BAD_REGION',
  'BAD_CSV', 'BAD_SCENARIO', 'NO_OVERLAP', 'NOT_IDENTIFIABLE', 'BAD_RESULT', 'UNSAFE',
  'UNSUPPORTED_ENCODING', 'BAD_PROFILE',
]);

export function reportError(err: unknown): number {
  if (isKerrError(err)) {
    process.stderr.write(`kerrtrace: ${err.oneLine()}\n`);
    if (process.env.KERRTRACE_DEBUG) process.stderr.write(`${err.stack ?? ''}\n`);
    return INPUT_CODES.has(err.code) ? 2 : 3;
  }
  const message = err instanceof Error ? err.message : String(err);
  process.stderr.write(`kerrtrace: internal error: ${message}. Please report it with the command you ran (KERRTRACE_DEBUG=1 shows details)\n`);
  if (process.env.KERRTRACE_DEBUG && err instanceof Error) process.stderr.write(`${err.stack ?? ''}\n`);
  return 4;
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
