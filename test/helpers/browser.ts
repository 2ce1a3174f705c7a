/**
 * Finds a Chromium-family browser for the browser tests, in a documented order:
 *   1. KERRTRACE_BROWSER: a path to the executable;
 *   2. `chromium`, `chromium-browser`, `google-chrome` on PATH (Debian: `apt-get install -y chromium`);
 *   3. none: the tests fail with one line saying how to get one.
 * A browser shipped inside an npm package (@sparticuz/chromium) was evaluated as a third source and
 * not adopted; DEVELOPERS.md says why.
 * KERRTRACE_SKIP_BROWSER=1 is the only way to skip them; the skip is printed in the run's summary
 * (see test/setup/summaryReporter.ts).
 * The launch flags keep the browser off the network and out of the user's profile.
 */
import { accessSync, constants, statSync } from 'node:fs';
import { delimiter, isAbsolute, join } from 'node:path';

export const BROWSER_NAMES = ['chromium', 'chromium-browser', 'google-chrome'] as const;

export const BROWSER_FLAGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
] as const;

export interface BrowserLookup {
  /** The executable to launch, or null when none was found. */
  executablePath: string | null;
  /** True when KERRTRACE_SKIP_BROWSER asks to skip the browser tests. */
  skip: boolean;
  /** One line: where the browser came from, or what is missing and how to get it. */
  message: string;
}

function isExecutableFile(p: string): boolean {
  try {
    if (!statSync(p).isFile()) return false;
    accessSync(p, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

/** The first executable called `name` on PATH, or null. */
export function onPath(name: string, pathVar = process.env['PATH'] ?? ''): string | null {
  for (const dir of pathVar.split(delimiter)) {
    if (!dir) continue;
    const candidate = join(dir, name);
    if (isExecutableFile(candidate)) return candidate;
  }
  return null;
}

/** Looks a browser up in the documented order; never throws. */
export function findBrowser(env: NodeJS.ProcessEnv = process.env): BrowserLookup {
  const skip = env['KERRTRACE_SKIP_BROWSER'] === '1';
  const fromEnv = env['KERRTRACE_BROWSER'];
  if (fromEnv) {
    const ok = isAbsolute(fromEnv) ? isExecutableFile(fromEnv) : onPath(fromEnv, env['PATH']) !== null;
    const resolved = isAbsolute(fromEnv) ? fromEnv : onPath(fromEnv, env['PATH']);
    if (ok && resolved) return { executablePath: resolved, skip, message: `browser from KERRTRACE_BROWSER: ${resolved}` };
    return {
      executablePath: null,
      skip,
      message: `KERRTRACE_BROWSER=${fromEnv} is not an executable file; point it at a Chromium-family browser or unset it`,
    };
  }
  for (const name of BROWSER_NAMES) {
    const found = onPath(name, env['PATH']);
    if (found) return { executablePath: found, skip, message: `browser on PATH: ${found}` };
  }
  return {
    executablePath: null,
    skip,
    message:
      'no browser for the browser tests: install one (Debian: apt-get install -y chromium), or set KERRTRACE_BROWSER to its path, or set KERRTRACE_SKIP_BROWSER=1 to skip them',
  };
}

/** The executable to launch; throws the lookup's one-line message when there is none. */
export function requireBrowser(env: NodeJS.ProcessEnv = process.env): string {
  const found = findBrowser(env);
  if (!found.executablePath) throw new Error(found.message);
  return found.executablePath;
}
