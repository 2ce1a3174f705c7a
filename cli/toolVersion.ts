import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The package version, read from package.json (works from cli/ and from dist/cli/). */
export function toolVersion(): string {
  const here = dirname(fileURLToPath(import.meta.url));
  for (const p of [join(here, '..', '..', 'package.json'), join(here, '..', 'package.json')]) {
    try {
      const pkg = JSON.parse(readFileSync(p, 'utf8')) as { name?: string; version?: string };
      if (pkg.name === 'kerrtrace' && pkg.version) return pkg.version;
    } catch {
      // try the next location
    }
  }
  return 'unknown';
}
