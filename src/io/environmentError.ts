/**
 * Turns an operating-system error (a Node `ErrnoException`: EACCES, EROFS, ENOSPC, EPIPE, ENOTDIR,
 * ELOOP, EMFILE, ...) into one KerrError with code ENVIRONMENT: the path, what went wrong in plain
 * words and what to do. The command line prints it in one line and exits with code 5
 * (README "Exit codes"): these are problems of the machine the tool runs on, not bugs and not bad
 * input. Returns undefined for anything that is not a recognised system error, so callers can
 * re-throw it unchanged.
 * @example environmentError(Object.assign(new Error('x'), { code: 'ENOSPC' }), '/data/run1', 'writing')
 *   // → "no space left on the disk while writing /data/run1. Free some space or choose --out on another disk"
 */
import { KerrError } from '../errors.js';

interface Plain {
  what: string;
  hint: string;
}

/** Plain words per errno code; `doing` is e.g. "writing", `path` the file or folder. */
const WORDS: Record<string, (path: string, doing: string) => Plain> = {
  EACCES: (p, d) => ({ what: `permission denied while ${d} ${p}`, hint: 'Choose a folder you may write to (e.g. with --out), or ask the owner to change its permissions' }),
  EPERM: (p, d) => ({ what: `the operating system does not allow ${d} ${p}`, hint: 'Choose another folder (e.g. with --out) or check its permissions and attributes' }),
  EROFS: (p, d) => ({ what: `${p} is on a read-only file system (while ${d})`, hint: 'Choose a folder on a writable disk with --out' }),
  ENOSPC: (p, d) => ({ what: `no space left on the disk while ${d} ${p}`, hint: 'Free some space or choose --out on another disk; nothing earlier was replaced' }),
  EDQUOT: (p, d) => ({ what: `your disk quota is used up while ${d} ${p}`, hint: 'Free some space or choose --out on another disk; nothing earlier was replaced' }),
  EFBIG: (p, d) => ({ what: `the file system refuses a file this large while ${d} ${p}`, hint: 'Choose --out on another disk' }),
  ENOTDIR: (p) => ({ what: `a part of the path ${p} is a file, not a folder`, hint: 'Check the path; every part before the last must be a folder' }),
  EISDIR: (p) => ({ what: `${p} is a folder where a file was expected`, hint: 'Give a file name instead' }),
  ELOOP: (p) => ({ what: `${p} leads into a loop of symbolic links`, hint: 'Fix or remove the link (ls -l shows where it points), or choose another path' }),
  ENAMETOOLONG: (p) => ({ what: `the path ${p} is too long for the file system`, hint: 'Choose a shorter path' }),
  EMFILE: (p, d) => ({ what: `too many files are open in this process while ${d} ${p}`, hint: 'Raise the limit (ulimit -n 4096) and run again' }),
  ENFILE: (p, d) => ({ what: `too many files are open on this machine while ${d} ${p}`, hint: 'Close other programs or raise the system limit, then run again' }),
  EPIPE: (p) => ({ what: `${p} was closed by the program reading it before everything was written`, hint: 'Let the reading program read to the end, or redirect the output to a file' }),
  EIO: (p, d) => ({ what: `an input/output error from the disk or device while ${d} ${p}`, hint: 'Check the disk (or the network share) and run again' }),
  EXDEV: (p, d) => ({ what: `${p} lies on another disk than its staging folder (while ${d})`, hint: 'Choose an --out whose parent folder is on the same disk' }),
  EBUSY: (p, d) => ({ what: `${p} is busy (a mount point or in use) while ${d}`, hint: 'Choose a folder inside it, or another folder, with --out' }),
  ENOMEM: (p, d) => ({ what: `the machine ran out of memory while ${d} ${p}`, hint: 'Close other programs and run again' }),
  ETXTBSY: (p, d) => ({ what: `${p} is a program that is running (while ${d})`, hint: 'Choose another path' }),
};

/** The errno codes this module explains. */
export const ENVIRONMENT_CODES: ReadonlySet<string> = new Set(Object.keys(WORDS));

export function isEnvironmentErrno(err: unknown): err is NodeJS.ErrnoException {
  return err instanceof Error && typeof (err as NodeJS.ErrnoException).code === 'string' && ENVIRONMENT_CODES.has((err as NodeJS.ErrnoException).code!);
}

/**
 * The ENVIRONMENT KerrError for a system error, or undefined when `err` is not one.
 * `path` defaults to the error's own path; `doing` is a verb phrase ("writing", "reading").
 */
export function environmentError(err: unknown, path?: string, doing = 'using'): KerrError | undefined {
  if (!isEnvironmentErrno(err)) return undefined;
  const code = err.code!;
  const where = path ?? err.path ?? 'a file';
  const { what, hint } = WORDS[code]!(where, doing);
  return new KerrError('ENVIRONMENT', `${what} (${code})`, { path: where, hint, details: { errno: code, syscall: err.syscall } });
}

/** Runs `fn`; a system error it throws comes out as the ENVIRONMENT KerrError for `path`. */
export function withEnvironment<T>(path: string, doing: string, fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    throw environmentError(err, path, doing) ?? err;
  }
}
