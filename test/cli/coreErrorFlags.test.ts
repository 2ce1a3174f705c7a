/**
 * Core errors are worded without option names and carry the inputs they concern; the command line
 * prints the options (cli/flagNames.ts). Through the real command line on the small test clip: a
 * reference region on the beam (checkRegionsApart) and an open level dimmer than the crossed run
 * (checkOpenLevel) each give one line that ends with the option to change, exit 2, and write
 * nothing. Needs dist/ (`npx tsc -p tsconfig.json`).
 */
import { existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TEST_MEDIA, expectOneLineError, inBatches, kerrtraceCli, requireBuiltCli, type CliRun } from '../helpers/cliRun.js';

const CASE = join(TEST_MEDIA, 'cfr-ramp', 'run');
const BASE = [join(CASE, 'clip.mp4'), '--volts', join(CASE, 'volts.csv'), '--length-mm', '50', '--gap-mm', '5', '--roi', '110,70,41,41', '--quiet', '--no-report'];

describe('core errors through the command line name the option to change', () => {
  let dir: string;
  let overlap: CliRun;
  let dimOpen: CliRun;

  beforeAll(async () => {
    requireBuiltCli();
    dir = mkdtempSync(join(tmpdir(), 'kerrtrace-flags-'));
    [overlap, dimOpen] = await inBatches([
      () => kerrtraceCli(['analyze', ...BASE, '--reference-roi', '120,80,10,10', '--out', join(dir, 'overlap')]),
      () => kerrtraceCli(['analyze', ...BASE, '--open-level', '0.001', '--out', join(dir, 'dim-open')]),
    ]);
  });
  afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

  it('a reference region on the beam: plain words from the core, then (--reference-roi)', () => {
    expectOneLineError(overlap, /^kerrtrace: the reference region 120,80,10,10 overlaps the beam region \(--roi\) at 110,70,41,41\. Put the region .* \(--reference-roi\)$/);
    expect(overlap.code).toBe(2);
  });

  it('an open level dimmer than the crossed run: the core says "open level", the line names its options', () => {
    expectOneLineError(dimOpen, /^kerrtrace: the open level 0\.00100 is below the brightest measured signal .* \(--open-level, --open-window or --open-video\)$/);
    expect(dimOpen.code).toBe(2);
  });

  it('writes nothing', () => {
    expect(existsSync(join(dir, 'overlap'))).toBe(false);
    expect(existsSync(join(dir, 'dim-open'))).toBe(false);
    expect(readdirSync(dir)).toEqual([]);
  });
});
