/**
 * Finds the ffmpeg and ffprobe executables, in this order:
 * 1. the environment variables KERRTRACE_FFMPEG / KERRTRACE_FFPROBE;
 * 2. the binaries shipped inside the registry packages @ffmpeg-installer/ffmpeg and
 *    @ffprobe-installer/ffprobe;
 * 3. `ffmpeg` / `ffprobe` on PATH.
 * The first candidate that runs (`-version` exits 0) wins; results are cached per process.
 * Throws KerrError FFMPEG_MISSING when none runs. When a candidate exists but may not be executed
 * by this user (EACCES on spawn: e.g. the npm package installs ffprobe as mode 744, executable by
 * its owner only), the message names the file, its mode and owner, and the `chmod a+x` to run.
 */
import { spawnSync } from 'node:child_process';
import { statSync } from 'node:fs';
import { createRequire } from 'node:module';
import { KerrError } from '../errors.js';

export type MediaTool = 'ffmpeg' | 'ffprobe';

const ENV_NAME: Record<MediaTool, string> = { ffmpeg: 'KERRTRACE_FFMPEG', ffprobe: 'KERRTRACE_FFPROBE' };
const PACKAGE_NAME: Record<MediaTool, string> = {
  ffmpeg: '@ffmpeg-installer/ffmpeg',
  ffprobe: '@ffprobe-installer/ffprobe',
};

const cache = new Map<MediaTool, { path: string; version: string }>();

function packagedPath(tool: MediaTool): string | undefined {
  try {
    const require = createRequire(import.meta.url);
    const mod = require(PACKAGE_NAME[tool]) as { path?: string };
    return typeof mod.path === 'string' ? mod.path : undefined;
  } catch {
    return undefined;
  }
}

/** Candidates that exist but this user may not execute (EACCES), with the reason in words. */
const notExecutable = new Map<string, string>();

/** "mode 744, owner uid 0" for a file, or '' when it cannot be read. */
export function describeMode(path: string): string {
  try {
    const st = statSync(path);
    return `mode ${(st.mode & 0o777).toString(8)}, owner uid ${st.uid}`;
  } catch {
    return '';
  }
}

function versionOf(path: string): string | undefined {
  const r = spawnSync(path, ['-version'], { encoding: 'utf8', timeout: 20_000 });
  if ((r.error as NodeJS.ErrnoException | undefined)?.code === 'EACCES') {
    notExecutable.set(path, describeMode(path));
    return undefined;
  }
  if (r.status !== 0 || typeof r.stdout !== 'string') return undefined;
  const first = r.stdout.split('\n')[0] ?? '';
  const m = /version\s+(\S+)/.exec(first);
  return m?.[1] ?? first.trim();
}

/** Path and version string of a working ffmpeg or ffprobe. */
export function locate(tool: MediaTool): { path: string; version: string } {
  const hit = cache.get(tool);
  if (hit) return hit;
  const fromEnv = process.env[ENV_NAME[tool]];
  const candidates: string[] = [];
  if (fromEnv) candidates.push(fromEnv);
  const packaged = packagedPath(tool);
  if (packaged) candidates.push(packaged);
  candidates.push(tool);
  for (const c of candidates) {
    const version = versionOf(c);
    if (version !== undefined) {
      const found = { path: c, version };
      cache.set(tool, found);
      return found;
    }
    if (c === fromEnv) {
      if (notExecutable.has(c)) throw notExecutableError(tool, c);
      throw new KerrError('FFMPEG_MISSING', `${ENV_NAME[tool]} points at ${c}, which does not run as ${tool}`, {
        path: ENV_NAME[tool],
        hint: `Set ${ENV_NAME[tool]} to a working ${tool} executable or unset it`,
      });
    }
  }
  const blocked = candidates.find((c) => notExecutable.has(c));
  if (blocked !== undefined) throw notExecutableError(tool, blocked);
  throw new KerrError('FFMPEG_MISSING', `no working ${tool} found`, {
    hint: `Run \`npm install\` (it ships ${PACKAGE_NAME[tool]}), install ${tool} on PATH, or set ${ENV_NAME[tool]} to its path`,
  });
}

function notExecutableError(tool: MediaTool, path: string): KerrError {
  const mode = notExecutable.get(path);
  return new KerrError('FFMPEG_MISSING', `${tool} at ${path} may not be run by this user (${mode || 'no execute permission'}; the npm package installs it executable by its owner only)`, {
    path,
    hint: `Run \`chmod a+x ${path}\` as its owner (or with sudo), or set ${ENV_NAME[tool]} to a working ${tool} that you may run`,
  });
}

export const ffmpegPath = (): string => locate('ffmpeg').path;
export const ffprobePath = (): string => locate('ffprobe').path;
