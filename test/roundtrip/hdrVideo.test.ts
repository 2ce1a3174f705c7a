/**
 * HDR phone video, simulated and analysed with no decoding option: a 10-bit HEVC clip with the
 * BT.2020 matrix and the HLG (ITU-R BT.2100) or PQ (SMPTE ST 2084) transfer must give B within
 * 1 % of the planted value, decoded from its own tags; a clip tagged with a transfer kerrtrace
 * cannot decode (log316) is refused in one line through the real command line, nothing written.
 * Before HLG and PQ were decoded, such clips were read as sRGB (B off by tens of per cent).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyzeRun } from '../../src/pipeline/analyze.js';
import { probeMedia } from '../../src/media/probe.js';
import { ffmpegPath } from '../../src/media/ffmpegPaths.js';
import { parseScenario } from '../../src/sim/scenario.js';
import { simulateRun } from '../../src/sim/simulate.js';

const ROOT = join(__dirname, '..', '..');
const BIN = join(ROOT, 'bin', 'kerrtrace.js');

/** A 240×180, 6 s sweep past V_π (test case; numbers invented). */
export function hdrScenario(transfer: string, seed: number): Record<string, unknown> {
  return {
    label: `hdr ${transfer}`,
    seed,
    cell: { kerrConstantMPerV2: 2.4e-12, lengthMm: 50, gapMm: 5, liquidBreakdownKvPerMm: 6 },
    light: { profile: 'gaussian', sigmaPx: 8, centreXPx: 120, centreYPx: 90, wavelengthNm: 532, amplitude: 0.6 },
    dirt: { scatterFloor: 0.006, haloPeak: 0.003, haloSigmaPx: 60 },
    camera: { widthPx: 240, heightPx: 180, frameRateHz: 30, ambient: 0.01, transfer, crf: 20 },
    drive: { segments: [
      { kind: 'hold', durationS: 0.5 },
      { kind: 'ramp', toHalfWaveFraction: 1.15, durationS: 2.5 },
      { kind: 'ramp', toV: 0, durationS: 2.5 },
      { kind: 'hold', durationS: 0.5 }] },
    logger: { sampleRateHz: 10, noiseV: 10, clockOffsetS: 0.3 },
  };
}

let work: string;
beforeAll(() => { work = mkdtempSync(join(tmpdir(), 'kt-hdr-')); });
afterAll(() => { rmSync(work, { recursive: true, force: true }); });

async function simulateAndAnalyse(transfer: 'hlg' | 'pq', seed: number) {
  const dir = join(work, transfer);
  const sim = await simulateRun(parseScenario(hdrScenario(transfer, seed), `${transfer}.json`), dir);
  const probe = await probeMedia(sim.files.clip);
  const out = await analyzeRun({ videoPath: sim.files.clip, voltsPath: sim.files.volts, lengthMm: 50, gapMm: 5 }, { toolVersion: 'test', ffmpegVersion: null });
  return { probe, out, trueB: 2.4e-12 };
}

describe('HDR video decoded from its tags (no option given)', () => {
  it('HLG 10-bit HEVC (BT.2100, BT.2020 matrix): tags read, 10-bit kept, B within 1 % of truth', async () => {
    const { probe, out, trueB } = await simulateAndAnalyse('hlg', 31);
    expect(probe.info.colourTransfer).toBe('arib-std-b67');
    expect(probe.info.bitDepth).toBe(10);
    expect(out.decoding).toMatchObject({ transfer: 'hlg', matrix: 'bt2020', range: 'limited' });
    expect(Math.abs(out.result.kerrConstant.value / trueB - 1)).toBeLessThan(0.01);
    expect(out.result.warnings.filter((w) => w.code === 'decoding')).toEqual([]);
  }, 180_000);

  it('PQ 10-bit HEVC (SMPTE ST 2084): B within 1 % of truth', async () => {
    const { probe, out, trueB } = await simulateAndAnalyse('pq', 32);
    expect(probe.info.colourTransfer).toBe('smpte2084');
    expect(out.decoding.transfer).toBe('pq');
    expect(Math.abs(out.result.kerrConstant.value / trueB - 1)).toBeLessThan(0.01);
  }, 180_000);
});

describe.skipIf(!existsSync(join(ROOT, 'dist', 'cli', 'main.js')))('a transfer kerrtrace cannot decode', () => {
  it('is refused in one line with exit 2 and nothing written, never decoded as something else', () => {
    const clip = join(work, 'log316.mp4');
    execFileSync(ffmpegPath(), ['-hide_banner', '-loglevel', 'error', '-y', '-f', 'lavfi', '-i', 'testsrc=s=160x120:r=10:d=2',
      '-c:v', 'libx264', '-pix_fmt', 'yuv420p', '-color_trc', 'log316', '-colorspace', 'bt709', '-color_range', 'tv', clip]);
    const volts = join(work, 'v.csv');
    writeFileSync(volts, `time_s,voltage_v\n${Array.from({ length: 21 }, (_v, i) => `${i},${i * 100}`).join('\n')}\n`);
    const outDir = join(work, 'refused');
    const r = spawnSync(process.execPath, [BIN, 'analyze', clip, '--volts', volts, '--length-mm', '50', '--gap-mm', '5', '--out', outDir, '--quiet'], { encoding: 'utf8' });
    expect(r.status).toBe(2);
    const lines = r.stderr.trim().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/color_transfer log316.*not one kerrtrace can decode/);
    expect(existsSync(outDir)).toBe(false);
    expect(readFileSync(volts, 'utf8')).toMatch(/^time_s/);
    // inspect shows such a file and says analyze would refuse it, without failing itself
    const shown = spawnSync(process.execPath, [BIN, 'inspect', clip], { encoding: 'utf8' });
    expect(shown.status).toBe(0);
    expect(shown.stdout).toMatch(/decoding\s+REFUSED: .*log316/);
  });
});
