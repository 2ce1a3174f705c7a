/**
 * One error shape for the whole tool. Library code throws `KerrError`; only the command line
 * turns it into a one-line message and an exit code. Errors are data: a code, an optional path
 * (file, option or field the problem concerns), a hint saying what to do about it, and the inputs
 * the hint refers to (neutral names; the command line adds its option names, cli/flagNames.ts).
 */
import type { InputName } from './core/inputName.js';

export type KerrErrorCode =
  | 'BAD_ARGUMENT' // an option or argument has the wrong form or value
  | 'FILE_NOT_FOUND'
  | 'FILE_EXISTS' // an output would overwrite an earlier result
  | 'NOT_A_VIDEO'
  | 'TRUNCATED_MEDIA'
  | 'FFMPEG_MISSING'
  | 'FFMPEG_FAILED'
  | 'BAD_REGION'
  | 'BAD_CSV'
  | 'BAD_SCENARIO'
  | 'NO_OVERLAP'
  | 'NOT_IDENTIFIABLE'
  | 'NOT_VALID' // the run was written but failed a gate (docs/analyze.md, "Gates")
  | 'FIT_FAILED'
  | 'BAD_RESULT'
  | 'UNSAFE'
  | 'UNSUPPORTED_ENCODING' // a colour encoding (transfer, matrix) that cannot be decoded faithfully
  | 'BAD_PROFILE' // a camera response profile that is unreadable or does not fit the footage
  | 'ENVIRONMENT' // the machine said no: permissions, read-only or full disk, closed output, link loops (exit 5)
  | 'INTERNAL';

export interface KerrErrorFields {
  /** The file, option or field the problem concerns, e.g. "--gap-mm" or "volts.csv:14:2". */
  path?: string;
  /** What the user can do about it, in one short sentence. */
  hint?: string;
  /** Extra machine-readable facts (frames read, sizes...). */
  details?: Record<string, unknown>;
  /**
   * The user's inputs the message or hint asks to give or check ("give the beam region" →
   * ['beamRegion']). The core words hints without option names; the command line names them.
   */
  inputs?: readonly InputName[];
}

export class KerrError extends Error {
  readonly code: KerrErrorCode;
  readonly path: string | undefined;
  readonly hint: string | undefined;
  readonly details: Record<string, unknown> | undefined;
  readonly inputs: readonly InputName[];

  constructor(code: KerrErrorCode, message: string, fields: KerrErrorFields = {}) {
    super(message);
    this.name = 'KerrError';
    this.code = code;
    this.path = fields.path;
    this.hint = fields.hint;
    this.details = fields.details;
    this.inputs = fields.inputs ?? [];
  }

  /** The single line the command line prints: message, then the hint. */
  oneLine(): string {
    if (!this.hint) return this.message;
    const hint = this.hint.charAt(0).toUpperCase() + this.hint.slice(1);
    return `${this.message.replace(/[.\s]+$/, '')}. ${hint}`;
  }
}

/**
 * The one error builder for bad values: "expected a positive gap in mm for --gap-mm but received -4".
 * @example invalid('a positive gap in mm', '--gap-mm', -4)
 */
export function invalid(
  expected: string,
  where: string,
  received: unknown,
  hint?: string,
  code: KerrErrorCode = 'BAD_ARGUMENT',
): KerrError {
  const shown = typeof received === 'string' ? JSON.stringify(received) : String(received);
  return new KerrError(code, `expected ${expected} for ${where} but received ${shown}`, hint === undefined ? { path: where } : { path: where, hint });
}

export function isKerrError(e: unknown): e is KerrError {
  return e instanceof KerrError;
}
