/**
 * Output folders are written whole or not at all: files go into a hidden staging folder beside
 * the target, which is renamed into place at the end. An existing result is never replaced
 * unless `force` is set, and an output can never be one of the inputs.
 */
import { existsSync, mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
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

/** Refuses early (before expensive work) when the target exists and `force` is not set. */
export function checkOutputDir(target: string, force: boolean, inputs: string[], option = '--out'): void {
  const abs = resolve(target);
  for (const i of inputs) {
    if (resolve(i) === abs) {
      throw new KerrError('FILE_EXISTS', `the output ${target} is one of the inputs`, { path: option, hint: 'Choose another folder with --out' });
    }
  }
  if (existsSync(abs) && !force) {
    throw new KerrError('FILE_EXISTS', `${target} already exists and would be overwritten`, {
      path: option,
      hint: 'Choose another folder with --out, or add --force to replace it',
    });
  }
}

export function stageOutputDir(target: string, force: boolean): StagedDir {
  const abs = resolve(target);
  checkOutputDir(abs, force, []);
  mkdirSync(dirname(abs), { recursive: true });
  const staging = join(dirname(abs), `.${basename(abs)}.partial-${process.pid}-${Date.now()}`);
  mkdirSync(staging, { recursive: true });
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
        if (!force) {
          rmSync(staging, { recursive: true, force: true });
          throw new KerrError('FILE_EXISTS', `${target} appeared while the run was working`, { hint: 'Run again with another --out or --force' });
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
