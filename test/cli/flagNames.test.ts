/**
 * cli/flagNames.ts: the core's input names become the options a user types. Every entry must name
 * options that a command really registers (read from cli/commands/*.ts), so the table cannot go
 * stale silently.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { FLAG_FOR_INPUT, withFlags } from '../../cli/flagNames.js';
import { KerrError } from '../../src/errors.js';
import { reportError } from '../../cli/action.js';
import { REPO_ROOT } from '../helpers/sourceFiles.js';

describe('withFlags', () => {
  it('adds the option of each input once, in order', () => {
    expect(withFlags('no beam found. Give the beam region', ['beamRegion'])).toBe('no beam found. Give the beam region (--roi)');
    expect(withFlags('regions overlap', ['referenceRegion', 'beamRegion', 'referenceRegion'])).toBe('regions overlap (--reference-roi; --roi)');
  });

  it('leaves out options the line already names and keeps a line without inputs as it is', () => {
    expect(withFlags('region 1,2,3,4 for --roi reaches x = 9', ['beamRegion'])).toBe('region 1,2,3,4 for --roi reaches x = 9');
    // "--roi" is not "--roi" when it is part of "--reference-roi"
    expect(withFlags('check --reference-roi', ['beamRegion'])).toBe('check --reference-roi (--roi)');
    expect(withFlags('plain', [])).toBe('plain');
    expect(withFlags('plain', undefined)).toBe('plain');
  });

  it('names only options that a command registers', () => {
    const dir = join(REPO_ROOT, 'cli', 'commands');
    const registered = readdirSync(dir).map((f) => readFileSync(join(dir, f), 'utf8')).join('\n');
    const missing: string[] = [];
    for (const [input, flags] of Object.entries(FLAG_FOR_INPUT)) {
      for (const flag of flags.match(/--[a-z-]+/g) ?? []) {
        if (!new RegExp(`'${flag}[ <\\[']`).test(registered)) missing.push(`${input}: ${flag}`);
      }
    }
    expect(missing).toEqual([]);
  });
});

describe('reportError prints the options of a core error', () => {
  it('appends the option to the one line on stderr', () => {
    const written: string[] = [];
    const original = process.stderr.write.bind(process.stderr);
    process.stderr.write = ((chunk: string) => { written.push(String(chunk)); return true; }) as typeof process.stderr.write;
    let code: number;
    try {
      code = reportError(new KerrError('NOT_IDENTIFIABLE', 'no beam found', { hint: 'Give the beam region as x,y,w,h', inputs: ['beamRegion'] }));
    } finally {
      process.stderr.write = original;
    }
    expect(code).toBe(2);
    expect(written.join('')).toBe('kerrtrace: no beam found. Give the beam region as x,y,w,h (--roi)\n');
  });
});
