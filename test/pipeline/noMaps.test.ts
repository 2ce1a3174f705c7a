/**
 * `--no-maps` skips pictures only: every headline figure of result.json is bit-identical with and
 * without the maps (docs/analyze.md, "What --no-maps does"). Checked on two test-media clips that
 * leave frames out for several reasons: sparks-halo (sparks, particles, steps, a halo) and
 * vfr-phone without its reference region (a spark and an exposure change that only the background
 * shows; before the exclusions were decided once, the maps' stage found it and refitted, so B
 * moved with --no-maps). Also: the record takes the clock, versions and input hashes as given.
 */
import { readFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { analyzeWithProducts } from '../../src/pipeline/analyzeWithProducts.js';
import type { AnalyzeOptions } from '../../src/pipeline/analyze.js';
import type { RunResult } from '../../src/result/schema.js';
import { testMediaFile } from '../helpers/referenceData.js';

const HEADLINE = ['kerrConstant', 'halfWaveVoltage', 'quarterWaveVoltage', 'syncOffset', 'floorFraction', 'contrastRatio', 'uncertainty', 'validity',
  'frames', 'events', 'identifiable', 'identifiability', 'model', 'fit', 'linearised', 'sync', 'cameraResponse', 'hysteresis', 'conductivity', 'regions'] as const;
/** Warnings that only the pictures can give (mapProducts) or that say there are none. */
const MAP_ONLY = new Set(['maps-weak', 'maps-no-beam', 'no-far-dark', 'overlay-frame', 'reference-candidate', 'no-maps']);

function options(name: string): AnalyzeOptions {
  const scenario = JSON.parse(readFileSync(testMediaFile(name, 'scenario.json'), 'utf8')) as { cell: { lengthMm: number; gapMm: number; electrodeHeightMm?: number } };
  return {
    videoPath: testMediaFile(name, 'run', 'clip.mp4'), voltsPath: testMediaFile(name, 'run', 'volts.csv'),
    lengthMm: scenario.cell.lengthMm, gapMm: scenario.cell.gapMm,
    ...(scenario.cell.electrodeHeightMm ? { electrodeHeightMm: scenario.cell.electrodeHeightMm } : {}),
  };
}

async function both(o: AnalyzeOptions): Promise<[RunResult, RunResult]> {
  const hooks = { toolVersion: 'test', ffmpegVersion: null, nodeVersion: 'v20', startedAt: new Date(0) };
  const withMaps = await analyzeWithProducts(o, hooks, { products: true, report: false });
  const without = await analyzeWithProducts(o, hooks, { products: false, report: false });
  expect(withMaps.products).not.toBeNull();
  expect(without.products).toBeNull();
  return [withMaps.out.result, without.out.result];
}

function expectSameHeadline(a: RunResult, b: RunResult): void {
  for (const key of HEADLINE) expect(JSON.stringify(b[key]), key).toBe(JSON.stringify(a[key]));
  const { haloToCoreRatio: _picturesOnly, ...scatterA } = a.scatter ?? {};
  expect(JSON.stringify(b.scatter ?? {})).toBe(JSON.stringify(scatterA));
  const common = (r: RunResult) => JSON.stringify(r.warnings.filter((w) => !MAP_ONLY.has(w.code)));
  expect(common(b)).toBe(common(a));
}

describe('--no-maps leaves every headline figure bit-identical', () => {
  it('sparks-halo (sparks, particles, halo, steps, beam found automatically)', async () => {
    const [a, b] = await both(options('sparks-halo'));
    expect(a.events.some((e) => e.kind === 'particle')).toBe(true);
    expect(a.events.filter((e) => e.kind === 'spark').length).toBeGreaterThan(0);
    expect(a.scatter?.haloToCoreRatio).toBeDefined();
    expectSameHeadline(a, b);
  });

  it('vfr-phone without its reference region (exposure changes seen only in the background)', async () => {
    const [a, b] = await both(options('vfr-phone'));
    expect(a.warnings.map((w) => w.code)).toContain('exposure-drift');
    expectSameHeadline(a, b);
    // the record's file list says what the folder will hold, maps or not
    expect(Object.values(a.files)).toContain('regions.png');
    expect(Object.values(b.files)).not.toContain('regions.png');
  });

  it('takes the clock, the versions and the input hashes as given, hashed from the files themselves', async () => {
    const o = options('cfr-ramp');
    const hooks = { toolVersion: 'test-1', ffmpegVersion: 'ff-x', nodeVersion: 'v20.0.0-test', startedAt: new Date(0) };
    const { out } = await analyzeWithProducts(o, hooks, { products: false, report: true });
    const r = out.result;
    expect(r.createdAt).toBe('1970-01-01T00:00:00.000Z');
    expect(r.tool).toEqual({ name: 'kerrtrace', version: 'test-1', ffmpegVersion: 'ff-x', node: 'v20.0.0-test' });
    // SHA-256 computed here with node:crypto over the whole file, independently of src/io/sha256File
    const sha = (p: string) => createHash('sha256').update(readFileSync(p)).digest('hex');
    expect(r.inputs.video).toEqual({ path: o.videoPath, sha256: sha(o.videoPath) });
    expect(r.inputs.volts).toEqual({ path: o.voltsPath, sha256: sha(o.voltsPath) });
    // the report's files are listed before anything is written
    expect(r.files.report).toBe('report.html');
    expect(r.files.summary).toBe('summary.md');
  });
});
