/**
 * The import rule of DEVELOPERS.md ("Layout: layers with one direction of dependency"), checked on
 * the sources themselves: the core is pure computation and imports only itself and the shared
 * types (errors, quantities, the result schema); media is an edge that needs nothing from the
 * measuring, wiring or feature layers. A failure names each offending file, line and import.
 * Common practice (layered architecture enforced by a test), not an outside source.
 */
import { describe, expect, it } from 'vitest';
import { importsOf, propertyAccessesOf, tsFilesUnder, type ImportFound } from '../helpers/sourceFiles.js';

/** Where the core may import from: itself and the shared vocabulary files. */
const CORE_MAY_IMPORT = ['src/core/', 'src/errors.js', 'src/quantity.js', 'src/result/'];
/** Node modules that reach files, processes, the network or the clock: never in the core. */
const IMPURE_NODE_MODULES = ['fs', 'fs/promises', 'child_process', 'process', 'os', 'net', 'http', 'https', 'worker_threads', 'readline', 'tty', 'dgram', 'cluster', 'perf_hooks', 'timers'];
/** Globals that read the process or the clock. */
const IMPURE_GLOBALS: Record<string, string[] | 'any'> = { process: 'any', Date: ['now'], performance: ['now'] };

/** Layers media must not import (it is an edge below measuring, wiring and the features). */
const MEDIA_MUST_NOT_IMPORT = ['src/measure/', 'src/pipeline/', 'src/stills/', 'src/report/', 'src/live/', 'src/sim/', 'cli/'];

function shown(file: string, imp: ImportFound): string {
  return `${file}:${imp.line} imports '${imp.specifier}'`;
}

/** Offending imports of every file under `folder`, as one line each. */
function offences(folder: string, bad: (imp: ImportFound) => boolean): string[] {
  return tsFilesUnder(folder).flatMap((file) => importsOf(file).filter(bad).map((imp) => shown(file, imp)));
}

function impureNode(imp: ImportFound): boolean {
  const name = imp.specifier.replace(/^node:/, '');
  return IMPURE_NODE_MODULES.includes(name);
}

function coreImportOffences(folder = 'src/core'): string[] {
  return offences(folder, (imp) => {
    if (imp.specifier.startsWith('.')) return !CORE_MAY_IMPORT.some((ok) => imp.target === ok || imp.target.startsWith(ok));
    return impureNode(imp);
  });
}

describe('layers: one direction of dependency (DEVELOPERS.md)', () => {
  it('finds the files it is meant to check', () => {
    // A rule over no files cannot fail: make sure the walk sees the core and media.
    expect(tsFilesUnder('src/core').length).toBeGreaterThan(50);
    expect(tsFilesUnder('src/media').length).toBeGreaterThan(5);
    expect(tsFilesUnder('src/core')).toContain('src/core/regions/rect.ts');
  });

  it('src/core imports only the core, errors, quantities and the result schema, and no impure Node module', () => {
    const found = coreImportOffences();
    expect(found, `the core must stay pure; move these types or helpers into src/core, or the code out of it:\n${found.join('\n')}`).toEqual([]);
  });

  it('src/core reads neither the process nor the clock', () => {
    const found = tsFilesUnder('src/core').flatMap((file) => propertyAccessesOf(file)
      .filter(({ object, property }) => {
        const rule = IMPURE_GLOBALS[object];
        return rule === 'any' || (Array.isArray(rule) && rule.includes(property));
      })
      .map(({ object, property, line }) => `${file}:${line} reads ${object}.${property}`));
    expect(found, `pass these in from the caller instead:\n${found.join('\n')}`).toEqual([]);
  });

  it('src/media imports nothing from measure, pipeline, the features or the command line', () => {
    const found = offences('src/media', (imp) => MEDIA_MUST_NOT_IMPORT.some((layer) => imp.target.startsWith(layer)));
    expect(found, `media is an edge below these layers:\n${found.join('\n')}`).toEqual([]);
  });
});
