/**
 * Reads one JSON object of a scenario file with a declared list of keys: unknown keys are errors
 * that name the key and the close valid ones; every value is checked where it enters, with the
 * project's one error builder (`invalid`), code BAD_SCENARIO, and the path "section.key in file".
 *
 * Throws KerrError BAD_SCENARIO. Example:
 *   const cell = new ScenarioReader(json.cell, 'cell', 'run.json', ['gapMm', 'lengthMm']);
 *   cell.positive('gapMm', 'the electrode gap in mm')   // → 5
 */
import { KerrError, invalid } from '../errors.js';

const DOCS_HINT = 'See docs/scenario.md for every key with its unit and default';

/** Edit distance between two short strings (case already folded by the caller). */
function editDistance(a: string, b: string): number {
  const prev = new Array<number>(b.length + 1);
  for (let j = 0; j <= b.length; j++) prev[j] = j;
  for (let i = 1; i <= a.length; i++) {
    let diag = prev[0]!;
    prev[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const up = prev[j]!;
      prev[j] = Math.min(up + 1, prev[j - 1]! + 1, diag + (a[i - 1] === b[j - 1] ? 0 : 1));
      diag = up;
    }
  }
  return prev[b.length]!;
}

/** Valid keys that look like `key`: same letters ignoring case, small edit distance, or one containing the other. */
export function closeKeys(key: string, valid: readonly string[]): string[] {
  const k = key.toLowerCase();
  const scored = valid
    .map((v) => {
      const l = v.toLowerCase();
      const d = editDistance(k, l);
      const contains = l.includes(k) || k.includes(l);
      return { v, score: l === k ? 0 : contains ? 1 : d };
    })
    .filter((s) => s.score <= Math.max(2, Math.floor(key.length / 3)))
    .sort((a, b) => a.score - b.score);
  return scored.slice(0, 3).map((s) => s.v);
}

export function describe(value: unknown): string {
  if (value === null) return 'null';
  if (Array.isArray(value)) return `a list of ${value.length}`;
  if (typeof value === 'object') return 'an object';
  return typeof value === 'string' ? JSON.stringify(value) : String(value);
}

export class ScenarioReader {
  readonly obj: Record<string, unknown>;

  /**
   * @param value the JSON value of this section (must be an object)
   * @param section dotted path of the section ("" for the top level)
   * @param source the file name shown in messages
   * @param keys the keys this section accepts
   */
  constructor(value: unknown, readonly section: string, readonly source: string, readonly keys: readonly string[]) {
    if (value === null || typeof value !== 'object' || Array.isArray(value)) {
      throw invalid('an object', this.where(''), describe(value), DOCS_HINT, 'BAD_SCENARIO');
    }
    this.obj = value as Record<string, unknown>;
    for (const key of Object.keys(this.obj)) {
      if (!keys.includes(key)) {
        const close = closeKeys(key, keys);
        const guess = close.length > 0 ? ` (did you mean ${close.join(' or ')}?)` : '';
        throw new KerrError('BAD_SCENARIO', `unknown key ${this.dotted(key)} in ${source}${guess}`, {
          path: this.where(key),
          hint: `Valid keys${section ? ` in ${section}` : ' at the top level'}: ${keys.join(', ')}`,
        });
      }
    }
  }

  private dotted(key: string): string {
    return this.section ? (key ? `${this.section}.${key}` : this.section) : key || 'the top level';
  }

  /** "cell.gapMm in run.json" */
  where(key: string): string {
    return `${this.dotted(key)} in ${this.source}`;
  }

  has(key: string): boolean {
    return this.obj[key] !== undefined;
  }

  raw(key: string): unknown {
    return this.obj[key];
  }

  missing(key: string, what: string): KerrError {
    return new KerrError('BAD_SCENARIO', `missing required key ${this.dotted(key)} (${what}) in ${this.source}`, {
      path: this.where(key),
      hint: `Add it. ${DOCS_HINT}`,
    });
  }

  fail(expected: string, key: string, received: unknown, hint = DOCS_HINT): KerrError {
    return invalid(expected, this.where(key), typeof received === 'object' || received === undefined ? describe(received) : received, hint, 'BAD_SCENARIO');
  }

  /** A finite number; `fallback` undefined means required. */
  number(key: string, what: string, fallback?: number, range: { min?: number; max?: number } = {}): number {
    const v = this.obj[key];
    if (v === undefined) {
      if (fallback === undefined) throw this.missing(key, what);
      return fallback;
    }
    if (typeof v !== 'number' || !Number.isFinite(v)) throw this.fail(`a number (${what})`, key, v);
    if (range.min !== undefined && v < range.min) throw this.fail(`${what} of at least ${range.min}`, key, v);
    if (range.max !== undefined && v > range.max) throw this.fail(`${what} of at most ${range.max}`, key, v);
    return v;
  }

  /** A finite number > 0 (sizes, durations, rates); `fallback` undefined means required. */
  positive(key: string, what: string, fallback?: number, max?: number): number {
    const v = this.obj[key];
    if (v === undefined) {
      if (fallback === undefined) throw this.missing(key, what);
      return fallback;
    }
    if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) throw this.fail(`a positive number (${what})`, key, v);
    if (max !== undefined && v > max) throw this.fail(`${what} of at most ${max}`, key, v);
    return v;
  }

  /** A finite number ≥ 0 (levels, noise); `fallback` undefined means required. */
  nonNegative(key: string, what: string, fallback?: number, max?: number): number {
    const v = this.obj[key];
    if (v === undefined) {
      if (fallback === undefined) throw this.missing(key, what);
      return fallback;
    }
    if (typeof v !== 'number' || !Number.isFinite(v) || v < 0) throw this.fail(`a number ≥ 0 (${what})`, key, v);
    if (max !== undefined && v > max) throw this.fail(`${what} of at most ${max}`, key, v);
    return v;
  }

  /** An integer in [min, max]. */
  integer(key: string, what: string, fallback: number | undefined, min: number, max: number): number {
    const v = this.obj[key];
    if (v === undefined) {
      if (fallback === undefined) throw this.missing(key, what);
      return fallback;
    }
    if (typeof v !== 'number' || !Number.isInteger(v) || v < min || v > max) {
      throw this.fail(`a whole number from ${min} to ${max} (${what})`, key, v);
    }
    return v;
  }

  boolean(key: string, what: string, fallback: boolean): boolean {
    const v = this.obj[key];
    if (v === undefined) return fallback;
    if (typeof v !== 'boolean') throw this.fail(`true or false (${what})`, key, v);
    return v;
  }

  choice<T extends string>(key: string, what: string, allowed: readonly T[], fallback: T): T {
    const v = this.obj[key];
    if (v === undefined) return fallback;
    if (typeof v !== 'string' || !(allowed as readonly string[]).includes(v)) {
      throw this.fail(`one of ${allowed.map((a) => JSON.stringify(a)).join(', ')} (${what})`, key, v);
    }
    return v as T;
  }

  string(key: string, what: string, fallback: string): string {
    const v = this.obj[key];
    if (v === undefined) return fallback;
    if (typeof v !== 'string') throw this.fail(`text (${what})`, key, v);
    return v;
  }

  /** A list of `length` numbers each ≥ 0 (length undefined: any length ≥ 1). */
  numberList(key: string, what: string, fallback: number[], length?: number): number[] {
    const v = this.obj[key];
    if (v === undefined) return fallback;
    const ok = Array.isArray(v) && v.length > 0 && (length === undefined || v.length === length) &&
      v.every((x) => typeof x === 'number' && Number.isFinite(x) && x >= 0);
    if (!ok) throw this.fail(`${length === undefined ? 'a list' : `a list of ${length}`} of numbers ≥ 0 (${what})`, key, v);
    return (v as number[]).slice();
  }
}
