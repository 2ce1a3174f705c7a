/**
 * Output folders are written whole or not at all: files go into a hidden staging folder beside
 * the target, which is renamed into place at the end. An existing result is never replaced
 * unless `force` is set, and `force` only ever replaces a folder that kerrtrace itself wrote
 * (it carries the marker file below) and that holds none of the inputs: `--out . --force` can
 * never delete the user's footage or notes. An output can never be one of the inputs.
 */
import { existsSync, mkdirSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, relative, resolve, isAbsolute } from 'node:path';
import { KerrError } from '../errors.js';

export interface StagedDir {
  /** Where to write files now. */
  path: string;
  /** The final location. */
  target: string;
  write(name: string, data: string | Uint8Array): void;
  commit(): void;
  abandon(): void;
}

/** Marker file in every output folder kerrtrace writes; only such folders are replaced by --force. */
export const OUTPUT_MARKER = '.kerrtrace-output';

function inside(child: string, parent: string): boolean {
  const rel = relative(parent, child);
  return rel === '' || (!rel.startsWith('..') && !isAbsolute(rel));
}

/** Refuses early (before expensive work) when the target exists and may not be replaced. */
export function checkOutputDir(target: string, force: boolean, inputs: string[], option = '--out'): void {
  const abs = resolve(target);
  for (const i of inputs) {
    if (inside(resolve(i), abs)) {
      throw new KerrError('FILE_EXISTS', `the output ${target} is or holds one of the inputs (${i})`, { path: option, hint: 'Choose another folder with --out' });
    }
  }
  if (!existsSync(abs)) return;
  if (!force) {
    throw new KerrError('FILE_EXISTS', `${target} already exists and would be overwritten`, {
      path: option,
      hint: 'Choose another folder with --out, or add --force to replace it',
    });
  }
  if (!statSync(abs).isDirectory() || !existsSync(join(abs, OUTPUT_MARKER))) {
    throw new KerrError('FILE_EXISTS', `${target} exists and is not a folder kerrtrace wrote, so --force will not replace it`, {
      path: option,
      hint: 'Choose a new folder with --out',
    });
  }
}

export function stageOutputDir(target: string, force: boolean): StagedDir {
  const abs = resolve(target);
  checkOutputDir(abs, force, []);
  mkdirSync(dirname(abs), { recursive: true });
  const staging = join(dirname(abs), `.${basename(abs)}.partial-${process.pid}-${Date.now()}`);
  mkdirSync(staging, { recursive: true });
  writeFileSync(join(staging, OUTPUT_MARKER), 'Written by kerrtrace; `--force` may replace this folder as a whole.\n');
  let done = false;
  return {
    path: staging,
    target: abs,
    write(name, data) {
      const p = join(staging, name);
      mkdirSync(dirname(p), { recursive: true });
      writeFileSync(p, data);
    },
    commit() {
      if (done) return;
      if (existsSync(abs)) {
        try {
          checkOutputDir(abs, force, []);
        } catch (err) {
          rmSync(staging, { recursive: true, force: true });
          throw err;
        }
        rmSync(abs, { recursive: true, force: true });
      }
      renameSync(staging, abs);
      done = true;
    },
    abandon() {
      if (done) return;
      rmSync(staging, { recursive: true, force: true });
      done = true;
    },
  };
}
