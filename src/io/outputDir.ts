/**
 * The one output policy of kerrtrace, used by every command that writes (analyze, stills, compare,
 * trace, simulate, demo). docs/output-folders.md explains it for users.
 *
 * 1. Checks before any work (`checkOutputDir`, `checkOutputFile`): the path is not empty, does not
 *    lead through a dangling link or a link loop, is not on a pseudo file system (/proc, /sys),
 *    is not the current folder or above it, does not overlap any input (every input resolved
 *    through links: the output may not be, hold or lie inside an input), may be replaced (absent,
 *    an empty folder, or `force` and a folder kerrtrace wrote: it carries OUTPUT_MARKER, which lists
 *    the names written, and nothing was added since), and can really be created and written (a
 *    probe staging folder is made and removed).
 * 2. Staging (`stageOutputDir`): files go into a hidden sibling `.NAME.partial-PID-TIME` that
 *    carries the marker from its first instant and is renamed into place whole.
 * 3. Kill-safe replace (`--force`): the old folder is renamed aside to `.NAME.backup-PID-TIME`,
 *    the new one renamed in, then the backup deleted with its marker last. At every instant one
 *    complete result is at the path or in the named backup.
 * 4. Recovery (`recoverOutput`, run by every check): a backup left by a killed run is restored when
 *    the path is empty, or deleted when the new result made it in; stale staging folders of dead
 *    processes are deleted. Only folders with the kerrtrace name pattern AND the marker are
 *    touched (files of `checkOutputFile` by name pattern and a dead writer's process id).
 * System errors (EACCES, EROFS, ENOSPC, ...) come out as one-line ENVIRONMENT KerrErrors.
 * Test-only hook: KERRTRACE_TEST_STEP_DELAY_MS=N prints `kerrtrace-step: NAME` on stderr and
 * pauses N ms at each step of writing and replacing, so the fault tests can kill at every step.
 */
import {
  existsSync, lstatSync, mkdirSync, readdirSync, readlinkSync, realpathSync, renameSync, rmdirSync, rmSync,
  readFileSync, statSync, statfsSync, unlinkSync, writeFileSync, writeSync,
} from 'node:fs';
import { basename, dirname, isAbsolute, join, relative, resolve } from 'node:path';
import { KerrError } from '../errors.js';
import { environmentError } from './environmentError.js';

/** Marker file in every output folder kerrtrace writes; only such folders are replaced by --force. */
export const OUTPUT_MARKER = '.kerrtrace-output';
/** Marker of demo folders written before OUTPUT_MARKER existed; still recognised. */
const LEGACY_DEMO_MARKER = '.kerrtrace-demo';
/** Present while a folder written in place (the demo) is incomplete; holds the writer's process id. */
export const INCOMPLETE_MARKER = '.kerrtrace-incomplete';
const MARKER_TEXT = 'Written by kerrtrace; `--force` may replace this folder as a whole.\n';

export interface OutputCheckOptions {
  force: boolean;
  /** Every input of the run (files or folders); compared after resolving links. */
  inputs?: string[];
  /** The option that named the output, for messages (default --out). */
  option?: string;
  /** Recognises folders this command wrote before the marker existed (e.g. simulate's four files). */
  writtenEarlier?: (entries: string[]) => boolean;
  /** Receives notes such as "restored an earlier result from its backup". Default: stderr. */
  onNote?: (text: string) => void;
}

export interface StagedDir {
  /** Where to write files now. */
  path: string;
  /** The final location (absolute, links resolved). */
  target: string;
  write(name: string, data: string | Uint8Array): void;
  commit(): void;
  abandon(): void;
}

const defaultNote = (text: string): void => {
  try {
    writeSync(2, `kerrtrace: note: ${text}\n`);
  } catch {
    // stderr closed: nothing to tell
  }
};

function inside(child: string, parent: string): boolean {
  const rel = relative(parent, child);
  return rel === '' || (!rel.startsWith('..') && !isAbsolute(rel));
}

function errnoOf(err: unknown): string | undefined {
  return err instanceof Error ? (err as NodeJS.ErrnoException).code : undefined;
}

/** Sleeps synchronously (test-only step delays). */
function sleepMs(ms: number): void {
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);
}

/** Test-only: announce a step on stderr and pause (KERRTRACE_TEST_STEP_DELAY_MS). */
export function faultStep(step: string): void {
  const raw = process.env.KERRTRACE_TEST_STEP_DELAY_MS;
  if (raw === undefined || raw === '') return;
  try {
    writeSync(2, `kerrtrace-step: ${step}\n`);
  } catch {
    // ignore
  }
  const ms = Number(raw);
  if (Number.isFinite(ms) && ms > 0) sleepMs(ms);
}

/** Pseudo file systems that hold no files (statfs magic numbers from linux/magic.h). */
const PSEUDO_FS = new Map<number, string>([
  [0x9fa0, 'proc'], [0x62656572, 'sysfs'], [0x1cd1, 'devpts'], [0x64626720, 'debugfs'], [0x74726163, 'tracefs'],
  [0x73636673, 'securityfs'], [0x27e0eb, 'cgroup'], [0x63677270, 'cgroup2'], [0xcafe4a11, 'bpf'], [0x6e736673, 'nsfs'],
  [0x42494e4d, 'binfmt_misc'], [0x50495045, 'pipefs'], [0x534f434b, 'sockfs'], [0xf97cff8c, 'selinuxfs'], [0x65735546, 'fuse control'],
]);

/**
 * Resolves an output path through links: the real path of its deepest existing ancestor plus the
 * parts still to create. Refuses '' , dangling links, link loops, files in the middle of the
 * path and pseudo file systems, each in one plain line.
 */
export function resolveOutputPath(target: string, option = '--out'): { real: string; existing: string } {
  if (target.trim() === '') {
    throw new KerrError('BAD_ARGUMENT', `${option} is empty, so there is no folder to write to`, { path: option, hint: `Give ${option} a name, e.g. ${option} run1` });
  }
  const abs = resolve(target);
  const rest: string[] = [];
  let p = abs;
  let real: string | undefined;
  for (;;) {
    try {
      real = realpathSync(p);
      break;
    } catch (err) {
      const code = errnoOf(err);
      if (code === 'ELOOP') {
        throw new KerrError('ENVIRONMENT', `${option} ${target} leads into a loop of symbolic links (a link that points, through others, back to itself)`, { path: option, hint: 'Fix or remove the link (ls -l shows where it points), or choose another folder' });
      }
      // ENOTDIR: a file part-way; walking up finds it and the check below names it.
      if (code !== 'ENOENT' && code !== 'ENOTDIR') throw environmentError(err, target, 'looking at') ?? err;
      let link: string | undefined;
      try {
        if (lstatSync(p).isSymbolicLink()) link = readlinkSync(p);
      } catch {
        // not there at all
      }
      if (link !== undefined) {
        throw new KerrError('BAD_ARGUMENT', `${option} ${target} goes through the symbolic link ${p}, which points to ${link}, and that does not exist`, { path: option, hint: 'Create the folder the link points to, remove the link, or choose another folder' });
      }
      const up = dirname(p);
      if (up === p) throw new KerrError('BAD_ARGUMENT', `${option} ${target} has no existing folder above it`, { path: option });
      rest.unshift(basename(p));
      p = up;
    }
  }
  if (rest.length > 0 && !statSync(real).isDirectory()) {
    throw new KerrError('BAD_ARGUMENT', `${option} ${target} goes through the file ${real} as if it were a folder`, { path: option, hint: 'Check the path; every part before the last must be a folder' });
  }
  refusePseudoFs(real, target, option);
  return { real: join(real, ...rest), existing: real };
}

function refusePseudoFs(existing: string, target: string, option: string): void {
  let kind: string | undefined;
  try {
    kind = PSEUDO_FS.get(statfsSync(existing).type);
  } catch {
    // statfs unavailable: fall back to the path
  }
  if (kind === undefined && /^\/(proc|sys)(\/|$)/.test(existing)) kind = existing.split('/')[1];
  if (kind !== undefined) {
    throw new KerrError('BAD_ARGUMENT', `${option} ${target} is on ${kind}, a system file system that cannot hold files`, { path: option, hint: 'Choose a folder on a disk, e.g. in your home folder' });
  }
}

function realOrResolved(p: string): string {
  try {
    return realpathSync(p);
  } catch {
    return resolve(p);
  }
}

/** Refuses an output that is, holds or lies inside any input, or is (or holds) the current folder. */
function refuseOverlap(target: string, real: string, inputs: string[], option: string, exists: boolean): void {
  for (const input of inputs) {
    const forms = new Set([resolve(input), realOrResolved(input)]);
    for (const f of forms) {
      for (const t of new Set([resolve(target), real])) {
        if (inside(f, t)) {
          throw new KerrError('FILE_EXISTS', `the output ${target} is or holds one of the inputs (${input})`, { path: option, hint: `Choose another folder with ${option}; kerrtrace never writes over its inputs` });
        }
        let isDir = false;
        try {
          isDir = statSync(f).isDirectory();
        } catch {
          // missing inputs are reported by the command itself
        }
        if (isDir && inside(t, f)) {
          throw new KerrError('FILE_EXISTS', `the output ${target} lies inside the input folder ${input}`, { path: option, hint: `Choose a folder outside the inputs with ${option}` });
        }
      }
    }
  }
  if (exists && inside(realOrResolved(process.cwd()), real)) {
    throw new KerrError('FILE_EXISTS', `the output ${target} is the current folder or holds it, so it cannot be replaced`, { path: option, hint: `Give ${option} a new folder name, e.g. ${option} run1` });
  }
}

/** True when the folder was written by kerrtrace (marker, legacy marker or the caller's rule). */
function writtenByUs(dir: string, writtenEarlier?: (entries: string[]) => boolean): boolean {
  let entries: string[];
  try {
    entries = readdirSync(dir);
  } catch {
    return false;
  }
  return entries.includes(OUTPUT_MARKER) || entries.includes(LEGACY_DEMO_MARKER) || (writtenEarlier?.(entries) ?? false);
}

/** Top-level names the marker lists as written by kerrtrace, or undefined for a marker without a list. */
function listedEntries(dir: string): string[] | undefined {
  const m = /^files: (\[.*\])$/m.exec(safeRead(join(dir, OUTPUT_MARKER)));
  if (!m) return undefined;
  try {
    const list = JSON.parse(m[1]!) as unknown;
    return Array.isArray(list) && list.every((x) => typeof x === 'string') ? list : undefined;
  } catch {
    return undefined;
  }
}

/** Rewrites the marker with the list of what the folder holds now (just before it is moved into place). */
function writeManifest(dir: string): void {
  const entries = readdirSync(dir).filter((e) => e !== INCOMPLETE_MARKER).sort();
  writeFileSync(join(dir, OUTPUT_MARKER), `${MARKER_TEXT}files: ${JSON.stringify(entries)}\n`);
}

function processAlive(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return errnoOf(err) === 'EPERM';
  }
}

/** Deletes a folder kerrtrace wrote, the marker last, so a kill part-way leaves it recognisable. */
export function removeOurFolder(dir: string): void {
  let entries: string[];
  try {
    entries = readdirSync(dir);
  } catch (err) {
    if (errnoOf(err) === 'ENOENT') return;
    throw err;
  }
  for (const e of entries) {
    if (e === OUTPUT_MARKER || e === LEGACY_DEMO_MARKER) continue;
    rmSync(join(dir, e), { recursive: true, force: true });
  }
  for (const m of [LEGACY_DEMO_MARKER, OUTPUT_MARKER]) rmSync(join(dir, m), { force: true });
  try {
    rmdirSync(dir);
  } catch (err) {
    if (errnoOf(err) !== 'EBUSY') throw err; // a mount point stays, empty
  }
}

function isEmptyDir(p: string): boolean {
  try {
    return statSync(p).isDirectory() && readdirSync(p).length === 0;
  } catch {
    return false;
  }
}

const PARTIAL = /^\.(.+)\.partial-(\d+)-\d+$/;
const BACKUP = /^\.(.+)\.backup-(\d+)-(\d+)$/;

/**
 * Cleans up after runs that were killed while writing `real`: restores a backup when the path is
 * empty, deletes a backup the new result replaced, deletes stale staging folders and files, and
 * removes an in-place folder left incomplete. Touches only names and markers kerrtrace makes.
 */
export function recoverOutput(real: string, onNote: (text: string) => void = defaultNote): void {
  const parent = dirname(real);
  const name = basename(real);
  let entries: string[];
  try {
    entries = readdirSync(parent);
  } catch {
    return;
  }
  // An in-place folder (the demo) whose writer died: remove it so its backup can come back.
  const incomplete = join(real, INCOMPLETE_MARKER);
  if (existsSync(incomplete) && writtenByUs(real)) {
    const pid = Number.parseInt(safeRead(incomplete), 10);
    if (!Number.isFinite(pid) || !processAlive(pid)) {
      removeOurFolder(real);
      onNote(`removed ${real}, left incomplete by an interrupted run`);
    }
  }
  const backups: { path: string; time: number }[] = [];
  for (const e of entries) {
    const full = join(parent, e);
    const partial = PARTIAL.exec(e);
    if (partial && partial[1] === name && !processAlive(Number(partial[2]))) {
      let isDir = false;
      try {
        isDir = lstatSync(full).isDirectory();
      } catch {
        continue;
      }
      if (isDir && writtenByUs(full)) removeOurFolder(full);
      else if (!isDir && lstatSync(full).isFile()) unlinkSync(full); // a file output's staging (trace)
      continue;
    }
    const backup = BACKUP.exec(e);
    if (backup && backup[1] === name && !processAlive(Number(backup[2])) && writtenByUs(full)) {
      backups.push({ path: full, time: Number(backup[3]) });
    }
  }
  backups.sort((a, b) => b.time - a.time);
  for (const [k, b] of backups.entries()) {
    if (k === 0 && (!existsSync(real) || isEmptyDir(real))) {
      if (existsSync(real)) rmdirSync(real);
      renameSync(b.path, real);
      onNote(`restored the earlier result ${real} from ${basename(b.path)}, left by an interrupted run`);
    } else if (k > 0 || writtenByUs(real)) {
      removeOurFolder(b.path); // the new result made it in (or an older backup)
    } else {
      onNote(`an earlier result left by an interrupted run waits in ${b.path}; ${real} now holds something else, so it was left alone`);
    }
  }
}

function safeRead(p: string): string {
  try {
    return readFileSync(p, 'utf8');
  } catch {
    return '';
  }
}

export interface CheckedOutput {
  /** Absolute target with links resolved. */
  real: string;
  /** What is there now. */
  state: 'absent' | 'empty' | 'ours';
}

/**
 * Refuses early (before expensive work) an output that may not be written or replaced, and proves
 * it can be written by making and removing a probe staging folder. Also recovers after killed runs.
 */
export function checkOutputDir(target: string, force: boolean | OutputCheckOptions, inputs: string[] = [], option = '--out'): CheckedOutput {
  const o: OutputCheckOptions = typeof force === 'boolean' ? { force, inputs, option } : force;
  const opt = o.option ?? '--out';
  const { real } = resolveOutputPath(target, opt);
  refuseOverlap(target, real, o.inputs ?? [], opt, existsSync(real));
  try {
    recoverOutput(real, o.onNote);
  } catch (err) {
    throw environmentError(err, dirname(real), 'cleaning up after an interrupted run in') ?? err;
  }
  const state = replaceableState(target, real, o, opt);
  probeWritable(real);
  return { real, state };
}

function replaceableState(target: string, real: string, o: OutputCheckOptions, opt: string): CheckedOutput['state'] {
  let info;
  try {
    info = statSync(real);
  } catch (err) {
    if (errnoOf(err) === 'ENOENT') return 'absent';
    throw environmentError(err, target, 'looking at') ?? err;
  }
  if (!info.isDirectory()) {
    throw new KerrError('FILE_EXISTS', `${target} is a file, not a folder, so it cannot be the output folder`, { path: opt, hint: `Give ${opt} a folder name (it is created if missing)` });
  }
  let entries: string[];
  try {
    entries = readdirSync(real);
  } catch (err) {
    throw environmentError(err, target, 'reading') ?? err;
  }
  if (entries.length === 0) return 'empty';
  if (!o.force) {
    throw new KerrError('FILE_EXISTS', `${target} already exists and would be overwritten`, { path: opt, hint: `Choose another folder with ${opt}, or add --force to replace it` });
  }
  if (!writtenByUs(real, o.writtenEarlier)) {
    throw new KerrError('FILE_EXISTS', `${target} exists and is not a folder kerrtrace wrote, so --force will not replace it`, { path: opt, hint: `Choose a new or empty folder with ${opt}` });
  }
  const listed = listedEntries(real);
  const added = listed === undefined ? [] : entries.filter((e) => !listed.includes(e) && e !== INCOMPLETE_MARKER);
  if (added.length > 0) {
    const shown = added.slice(0, 3).join(', ') + (added.length > 3 ? ', …' : '');
    throw new KerrError('FILE_EXISTS', `${target} was written by kerrtrace but now also holds ${added.length === 1 ? 'a file' : `${added.length} files`} it did not write (${shown}), so --force will not replace it`, { path: opt, hint: `Move ${added.length === 1 ? 'it' : 'them'} elsewhere first, or choose another folder with ${opt}` });
  }
  return 'ours';
}

/** Creates the missing parents and a staging folder with the marker, then removes what it made. */
function probeWritable(real: string): void {
  const made: string[] = [];
  let p = dirname(real);
  while (!existsSync(p)) {
    made.unshift(p);
    p = dirname(p);
  }
  const probe = stagingName(real);
  try {
    for (const m of made) mkdirSync(m);
    mkdirSync(probe);
    writeFileSync(join(probe, OUTPUT_MARKER), MARKER_TEXT);
  } catch (err) {
    throw environmentError(err, made[0] ?? dirname(real), 'creating the output folder in') ?? err;
  } finally {
    rmSync(probe, { recursive: true, force: true });
    for (const m of made.reverse()) {
      try {
        rmdirSync(m);
      } catch {
        // keep it
      }
    }
  }
}

let stamp = 0;
function stagingName(real: string): string {
  stamp = Math.max(stamp + 1, Date.now());
  return join(dirname(real), `.${basename(real)}.partial-${process.pid}-${stamp}`);
}

/** Staged folders not yet committed or abandoned; removed by `abandonAllStaged` on a signal. */
const live = new Set<StagedDir>();

/** Abandons every open staged folder (called on SIGTERM/SIGINT before exiting). */
export function abandonAllStaged(): void {
  for (const s of [...live]) {
    try {
      s.abandon();
    } catch {
      // best effort: the next run cleans up
    }
  }
}

/**
 * Stages an output folder (see the module comment). `force` may be the options object.
 * The returned `write` and `commit` turn system errors into ENVIRONMENT KerrErrors.
 */
export function stageOutputDir(target: string, force: boolean | OutputCheckOptions, inputs: string[] = []): StagedDir {
  const o: OutputCheckOptions = typeof force === 'boolean' ? { force, inputs } : force;
  const { real } = checkOutputDir(target, o);
  const staging = stagingName(real);
  try {
    mkdirSync(dirname(real), { recursive: true });
    mkdirSync(staging);
    writeFileSync(join(staging, OUTPUT_MARKER), MARKER_TEXT);
  } catch (err) {
    rmSync(staging, { recursive: true, force: true });
    throw environmentError(err, dirname(real), 'creating the output folder in') ?? err;
  }
  faultStep('staged');
  let done = false;
  const staged: StagedDir = {
    path: staging,
    target: real,
    write(name, data) {
      const p = join(staging, name);
      try {
        mkdirSync(dirname(p), { recursive: true });
        writeFileSync(p, data);
      } catch (err) {
        throw environmentError(err, target, 'writing') ?? err;
      }
      faultStep(`wrote ${name}`);
    },
    commit() {
      if (done) return;
      try {
        const state = replaceableState(target, real, o, o.option ?? '--out');
        writeManifest(staging);
        install(staging, real, state);
      } catch (err) {
        staged.abandon();
        throw environmentError(err, target, 'moving the finished output into') ?? err;
      }
      done = true;
      live.delete(staged);
    },
    abandon() {
      if (done) return;
      done = true;
      live.delete(staged);
      try {
        removeOurFolder(staging);
      } catch {
        // the next run removes it
      }
    },
  };
  live.add(staged);
  return staged;
}

/** Moves the staged folder into place: old aside, new in, old deleted (marker last). */
function install(staging: string, real: string, state: CheckedOutput['state']): void {
  if (state !== 'ours') {
    try {
      renameSync(staging, real); // replaces an empty folder atomically
    } catch (err) {
      const code = errnoOf(err);
      if (state === 'empty' && (code === 'EBUSY' || code === 'EXDEV' || code === 'EPERM' || code === 'EACCES')) {
        fillEmptyFolder(staging, real); // a mount point or a folder we may fill but not replace
        return;
      }
      throw err;
    }
    faultStep('installed');
    return;
  }
  const backup = join(dirname(real), `.${basename(real)}.backup-${process.pid}-${Date.now()}`);
  renameSync(real, backup);
  faultStep('moved old aside');
  try {
    renameSync(staging, real);
  } catch (err) {
    renameSync(backup, real);
    throw err;
  }
  faultStep('moved new in');
  try {
    removeBackup(backup);
  } catch (err) {
    throw environmentError(err, backup, 'deleting the earlier result (the new one is in place) at') ?? err;
  }
}

function removeBackup(backup: string): void {
  const entries = readdirSync(backup).filter((e) => e !== OUTPUT_MARKER && e !== LEGACY_DEMO_MARKER);
  for (const e of entries) {
    rmSync(join(backup, e), { recursive: true, force: true });
    faultStep(`deleted old ${e}`);
  }
  removeOurFolder(backup);
}

/** For an empty folder that cannot be replaced by rename: flag it incomplete, move files in, unflag. */
function fillEmptyFolder(staging: string, real: string): void {
  writeFileSync(join(real, INCOMPLETE_MARKER), String(process.pid));
  writeFileSync(join(real, OUTPUT_MARKER), MARKER_TEXT);
  for (const e of readdirSync(staging)) {
    if (e === OUTPUT_MARKER) continue;
    renameSync(join(staging, e), join(real, e));
  }
  writeManifest(real);
  unlinkSync(join(real, INCOMPLETE_MARKER));
  removeOurFolder(staging);
}

/**
 * For writers whose files name each other by absolute path (the demo): writes in place. The old
 * folder (if any, and replaceable) is moved to a backup first; the new folder carries
 * INCOMPLETE_MARKER until `commit`, so a killed run's folder is removed and the backup restored
 * by the next run. `abandon` does the same at once.
 */
export function openOutputDirInPlace(target: string, o: OutputCheckOptions): StagedDir {
  const { real, state } = checkOutputDir(target, o);
  let backup: string | undefined;
  try {
    if (state === 'ours') {
      backup = join(dirname(real), `.${basename(real)}.backup-${process.pid}-${Date.now()}`);
      renameSync(real, backup);
      faultStep('moved old aside');
    }
    if (state !== 'empty') mkdirSync(real, { recursive: true });
    writeFileSync(join(real, INCOMPLETE_MARKER), String(process.pid));
    writeFileSync(join(real, OUTPUT_MARKER), MARKER_TEXT);
  } catch (err) {
    if (backup !== undefined && !existsSync(join(real, OUTPUT_MARKER))) {
      try {
        rmSync(join(real, INCOMPLETE_MARKER), { force: true });
        if (state !== 'empty') rmdirSync(real);
        renameSync(backup, real);
      } catch {
        // the next run restores it
      }
    }
    throw environmentError(err, target, 'creating') ?? err;
  }
  let done = false;
  const handle: StagedDir = {
    path: real,
    target: real,
    write(name, data) {
      const p = join(real, name);
      try {
        mkdirSync(dirname(p), { recursive: true });
        writeFileSync(p, data);
      } catch (err) {
        throw environmentError(err, target, 'writing') ?? err;
      }
    },
    commit() {
      if (done) return;
      try {
        writeManifest(real);
        unlinkSync(join(real, INCOMPLETE_MARKER));
        faultStep('marked complete');
        if (backup !== undefined) removeBackup(backup);
      } catch (err) {
        throw environmentError(err, target, 'finishing') ?? err;
      }
      done = true;
      live.delete(handle);
    },
    abandon() {
      if (done) return;
      done = true;
      live.delete(handle);
      try {
        if (state === 'empty') {
          for (const e of readdirSync(real)) if (e !== OUTPUT_MARKER && e !== INCOMPLETE_MARKER) rmSync(join(real, e), { recursive: true, force: true });
          rmSync(join(real, OUTPUT_MARKER), { force: true });
          rmSync(join(real, INCOMPLETE_MARKER), { force: true });
        } else {
          rmSync(join(real, INCOMPLETE_MARKER), { force: true });
          removeOurFolder(real);
        }
        if (backup !== undefined) renameSync(backup, real);
      } catch {
        // the next run recovers
      }
    },
  };
  live.add(handle);
  return handle;
}

/**
 * Refuses, before any work, a single-file output (trace's CSV) that is empty, an input (links
 * resolved), a folder, under a missing folder or a pseudo file system, or exists without force.
 * Also removes stale temporary files of killed runs and checks the folder is writable.
 */
export function checkOutputFile(out: string, force: boolean, inputs: string[], option = '--out'): string {
  const { real } = resolveOutputPath(out, option);
  for (const i of inputs) {
    if (realOrResolved(i) === real || resolve(i) === resolve(out)) {
      throw new KerrError('FILE_EXISTS', `the output ${out} is the input ${i}`, { path: option, hint: `Give another file name with ${option}` });
    }
  }
  const folder = dirname(real);
  if (!existsSync(folder) || !statSync(folder).isDirectory()) {
    throw new KerrError('BAD_ARGUMENT', `the folder for ${option} ${out} does not exist`, { path: option, hint: `Create ${dirname(out)} first or choose another path` });
  }
  recoverOutput(real);
  if (existsSync(real)) {
    if (statSync(real).isDirectory()) {
      throw new KerrError('BAD_ARGUMENT', `${option} ${out} is a folder`, { path: option, hint: 'Give a file name such as trace.csv' });
    }
    if (!force) {
      throw new KerrError('FILE_EXISTS', `${out} already exists and would be overwritten`, { path: option, hint: `Choose another name with ${option}, or add --force to replace it` });
    }
  }
  const probe = stagingName(real);
  try {
    writeFileSync(probe, '');
  } catch (err) {
    throw environmentError(err, folder, 'creating a file in') ?? err;
  } finally {
    rmSync(probe, { force: true });
  }
  return real;
}

/** Writes a single file through a temporary sibling renamed into place (never over an input). */
export function writeOutputFile(out: string, data: string | Uint8Array, force: boolean, option = '--out'): void {
  const real = resolveOutputPath(out, option).real;
  const temp = stagingName(real);
  try {
    writeFileSync(temp, data);
    faultStep('wrote temporary file');
    if (existsSync(real) && !force) {
      throw new KerrError('FILE_EXISTS', `${out} appeared while kerrtrace was running`, { path: option, hint: `Run again with another ${option} or with --force` });
    }
    renameSync(temp, real);
  } catch (err) {
    rmSync(temp, { force: true });
    throw environmentError(err, out, 'writing') ?? err;
  }
}
