/**
 * Finds the ffmpeg and ffprobe executables, in this order:
 * 1. the environment variables KERRTRACE_FFMPEG / KERRTRACE_FFPROBE;
 * 2. the binaries shipped inside the registry packages @ffmpeg-installer/ffmpeg and
 *    @ffprobe-installer/ffprobe;
 * 3. `ffmpeg` / `ffprobe` on PATH.
 * The first candidate that runs (`-version` exits 0) wins; results are cached per process.
 * Throws KerrError FFMPEG_MISSING when none runs.
 */
import { spawnSync } from 'node:child_process';
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

function versionOf(path: string): string | undefined {
  const r = spawnSync(path, ['-version'], { encoding: 'utf8', timeout: 20_000 });
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
      throw new KerrError('FFMPEG_MISSING', `${ENV_NAME[tool]} points at ${c}, which does not run as ${tool}`, {
        path: ENV_NAME[tool],
        hint: `Set ${ENV_NAME[tool]} to a working ${tool} executable or unset it`,
      });
    }
  }
  throw new KerrError('FFMPEG_MISSING', `no working ${tool} found`, {
    hint: `Run \`npm install\` (it ships ${PACKAGE_NAME[tool]}), install ${tool} on PATH, or set ${ENV_NAME[tool]} to its path`,
  });
}

export const ffmpegPath = (): string => locate('ffmpeg').path;
export const ffprobePath = (): string => locate('ffprobe').path;
