/**
 * Where kerrtrace is installed and which version it is: walks up from this file to the first
 * package.json whose name is "kerrtrace" (works from the sources under vitest and from the
 * compiled files in dist/). Reports use the root to link warnings to the installed
 * docs/recording-a-run.md by a relative path. Cached per process.
 * Returns null fields when no such package.json is found; never throws.
 * @example packageInfo().version === '0.1.0'
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export interface PackageInfo {
  root: string | null;
  version: string;
}

let cached: PackageInfo | undefined;

export function packageInfo(): PackageInfo {
  if (cached) return cached;
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let depth = 0; depth < 8; depth++) {
    try {
      const pkg = JSON.parse(readFileSync(join(dir, 'package.json'), 'utf8')) as { name?: string; version?: string };
      if (pkg.name === 'kerrtrace') {
        cached = { root: dir, version: pkg.version ?? 'unknown' };
        return cached;
      }
    } catch {
      // no package.json here: keep walking up
    }
    const parent = dirname(dir);
    if (parent === dir) break;
    dir = parent;
  }
  cached = { root: null, version: 'unknown' };
  return cached;
}
