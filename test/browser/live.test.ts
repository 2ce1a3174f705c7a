/**
 * `kerrtrace watch` in a real browser (chromium driven by playwright-core), end to end:
 * a simulated bench clip (closed → open → sweep, rendered by the project's simulator) is played
 * as if live with `--source`, while its voltage log is written into a file row by row as the clip
 * plays. The page must load with no console errors and no request leaving the machine, the meters
 * must move as the clip plays, the running B must come within 3 % of the simulated truth by the
 * end of the sweep, a region dragged on the picture must print as the `--roi` analyze takes, and
 * the run recorded from the page must analyse (real `kerrtrace analyze`) to the same B as the
 * source clip within its uncertainty. Screenshots go to test-output/screenshots/live-*.png.
 * A second, short session checks that ffmpeg is released when the page closes and is gone after
 * SIGINT. KERRTRACE_SKIP_BROWSER=1 is the only way to skip (and says so).
 * Needs the compiled command line (dist/, `npx tsc -p tsconfig.json`).
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { BROWSER_FLAGS, findBrowser, requireBrowser } from '../helpers/browser.js';
import { parseScenario } from '../../src/sim/scenario.js';
import { simulateRun } from '../../src/sim/simulate.js';
import { replayLog, type LogReplay } from '../../src/live/replayLog.js';
import { ffmpeg } from '../helpers/makeClip.js';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const BIN = join(ROOT, 'bin', 'kerrtrace.js');
const SHOTS = join(ROOT, 'test-output', 'screenshots');
const skip = findBrowser().skip;
if (skip) console.log('[browser test skipped] test/browser/live.test.ts: KERRTRACE_SKIP_BROWSER=1');

/** Truth of the simulated bench (invented numbers, like test-media). */
const B_TRUE = 2.4e-12;
const bench = (drive: unknown, extra: Record<string, unknown> = {}, cell: Record<string, unknown> = {}) => ({
  label: 'live browser test', seed: 909,
  cell: { kerrConstantMPerV2: B_TRUE, lengthMm: 50, gapMm: 5, extinctionRatio: 10000, liquidBreakdownKvPerMm: 6, ...cell },
  light: { profile: 'gaussian', sigmaPx: 8, centreXPx: 130, centreYPx: 90, wavelengthNm: 532, amplitude: 0.6 },
  dirt: { scatterFloor: 0.004, haloPeak: 0.003, haloSigmaPx: 60 },
  camera: { widthPx: 240, heightPx: 180, frameRateHz: 30, ambient: 0.01, transfer: 'srgb', crf: 18 },
  drive,
  logger: { sampleRateHz: 10, noiseV: 10, clockOffsetS: 0.3 },
  ...extra,
});
const CLOSED_S = 2;
const OPEN_S = 5;
const SWEEP_START_S = CLOSED_S + OPEN_S;

interface Watch {
  child: ChildProcess;
  url: string;
  out: () => string;
  exited: Promise<number | null>;
}

async function startWatch(args: string[]): Promise<Watch> {
  const child = spawn(process.execPath, [BIN, 'watch', ...args], { stdio: ['ignore', 'pipe', 'pipe'] });
  let out = '';
  let err = '';
  child.stdout!.on('data', (d: Buffer) => { out += d.toString(); });
  child.stderr!.on('data', (d: Buffer) => { err += d.toString(); });
  const exited = new Promise<number | null>((r) => child.on('exit', (code) => r(code)));
  const url = await new Promise<string>((resolve, reject) => {
    const timer = setInterval(() => {
      const m = /open (http:\/\/127\.0\.0\.1:\d+\/) in a browser/.exec(out);
      if (m) { clearInterval(timer); resolve(m[1]!); }
      if (child.exitCode !== null) { clearInterval(timer); reject(new Error(`watch exited: ${err}`)); }
    }, 20);
  });
  return { child, url, out: () => out, exited };
}

async function state(url: string): Promise<any> {
  const r = await fetch(`${url}state`);
  return r.json();
}

async function waitFor<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs = 20_000): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await probe();
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

function alive(pid: number): boolean {
  try { process.kill(pid, 0); return true; } catch { return false; }
}

function analyzeJson(args: string[]): { value: number; stdErr: number } {
  const r = spawnSync(process.execPath, [BIN, 'analyze', ...args, '--no-maps', '--no-report', '--json', '--quiet'], { encoding: 'utf8', timeout: 120_000 });
  if (r.status !== 0) throw new Error(`analyze failed: ${r.stderr}`);
  const result = JSON.parse(r.stdout) as { kerrConstant: { value: number; stdErr: number } };
  return result.kerrConstant;
}

describe.skipIf(skip)('kerrtrace watch in a browser', () => {
  let dir = '';
  let browser: Browser;
  let source = '';
  let sweepDir = '';

  beforeAll(async () => {
    const executablePath = requireBrowser();
    mkdirSync(SHOTS, { recursive: true });
    dir = mkdtempSync(join(tmpdir(), 'kerrtrace-live-browser-'));
    const hold = (s: number) => ({ segments: [{ kind: 'hold', durationS: s }] });
    const sweep = { segments: [
      { kind: 'hold', durationS: 0.5 },
      { kind: 'ramp', toHalfWaveFraction: 1.15, durationS: 4 },
      { kind: 'ramp', toV: 0, durationS: 4 },
      { kind: 'hold', durationS: 3 }] };
    sweepDir = join(dir, 'sweep');
    await Promise.all([
      simulateRun(parseScenario(bench(hold(CLOSED_S), { seed: 910 }), 'closed'), join(dir, 'closed')),
      // analyser turned parallel to the polariser: the open level
      simulateRun(parseScenario(bench(hold(OPEN_S), { seed: 911 }, { analyserAngleDeg: 45 }), 'open'), join(dir, 'open')),
      simulateRun(parseScenario(bench(sweep), 'sweep'), sweepDir),
    ]);
    const list = join(dir, 'parts.txt');
    writeFileSync(list, ['closed', 'open', 'sweep'].map((p) => `file '${join(dir, p, 'clip.mp4')}'`).join('\n'));
    source = join(dir, 'bench.mp4');
    await ffmpeg(['-f', 'concat', '-safe', '0', '-i', list, '-c', 'copy', source]);
    const { chromium } = await import('playwright-core');
    browser = await chromium.launch({ executablePath, args: [...BROWSER_FLAGS] });
  }, 120_000);

  afterAll(async () => {
    await browser?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('shows the meters, the running fit, a drawn region and a recording that analyze measures', async () => {
    // The source clip measured directly: the reference for the recorded run.
    const fromSource = analyzeJson([join(sweepDir, 'clip.mp4'), '--volts', join(sweepDir, 'volts.csv'), '--length-mm', '50', '--gap-mm', '5', '--out', join(dir, 'source.kerrtrace')]);
    expect(Math.abs(fromSource.value / B_TRUE - 1)).toBeLessThan(0.03);

    const live = join(dir, 'live-volts.csv');
    const runs = join(dir, 'runs');
    const page: Page = await browser.newPage({ viewport: { width: 1280, height: 1000 } });
    const consoleErrors: string[] = [];
    const outside: string[] = [];
    page.on('console', (m) => { if (m.type() === 'error') consoleErrors.push(m.text()); });
    page.on('pageerror', (e) => consoleErrors.push(e.message));
    await page.route('**/*', (route) => {
      const u = new URL(route.request().url());
      if (u.hostname === '127.0.0.1') return route.continue();
      outside.push(u.href);
      return route.abort();
    });

    const watch = await startWatch(['--source', source, '--volts', live, '--length-mm', '50', '--gap-mm', '5', '--out', runs, '--idle-s', '30']);
    // The logger: the sweep's rows appear as their moments pass (log time + offset = video time).
    const t0 = performance.now();
    const replay: LogReplay = replayLog(join(sweepDir, 'volts.csv'), live, SWEEP_START_S + 0.3);
    try {
      await page.goto(watch.url, { waitUntil: 'load' });
      const frames = async () => (await state(watch.url)).source.frames as number;
      await waitFor('the first picture', async () => (await page.locator('#source').innerText()).includes('frames'));
      const metersAtSetup = await page.locator('#meters li').allInnerTexts();
      expect(metersAtSetup).toHaveLength(5);

      // Open phase: capture the open level once a beam region exists.
      // The beam is found where the light changed (closed → open); its open level is captured.
      await waitFor('the open phase and the beam found', async () => {
        const s = await state(watch.url);
        return s.source.frames >= (CLOSED_S + 0.5) * 30 && s.regions.beamHow === 'found';
      });
      const captureAt = `${await frames()} (${(performance.now() - t0) / 1000} s after the start)`;
      await page.click('#capture-open');
      const openLevel = await waitFor('the open level', async () => (await state(watch.url)).openLevel as number | null, 10_000);
      expect(await page.locator('#safety').innerText()).toMatch(/High voltage[\s\S]*Laser/);
      await page.screenshot({ path: join(SHOTS, 'live-setup.png'), fullPage: true });

      // Sweep: record it.
      await waitFor('the sweep', async () => (await frames()) >= SWEEP_START_S * 30 + 3);
      await page.click('#record');
      await waitFor('recording', async () => (await state(watch.url)).recording.active);

      // By the end of the sweep (the drive back at zero) the running B is within 3 % of the truth.
      await waitFor('the end of the sweep', async () => (await frames()) >= (SWEEP_START_S + 8.8) * 30, 30_000);
      // Stop the recording from the page: the analyze command is printed there and on stdout
      // (checked below, once the fit has been looked at).
      await waitFor('the stop button', async () => (await page.locator('#record').innerText()) === 'Stop recording', 5_000);
      await page.click('#record');
      const fit = await waitFor('a fit that covers the sweep', async () => {
        const s = await state(watch.url);
        return s.fit?.status === 'ok' && s.fit.maxVoltageOverHalfWave > 1.1 && s.fit.updatedAgoS < 1 ? s.fit : null;
      }, 10_000);
      expect(Math.abs(fit.kerrConstant.value / B_TRUE - 1)).toBeLessThan(0.03);
      const shownB = Number(await page.locator('#fit-text').getAttribute('data-b'));
      expect(Math.abs(shownB / B_TRUE - 1)).toBeLessThan(0.03);
      expect(await page.locator('#fit-text').innerText()).toMatch(/B = 2\.[34]\d*e-12 ±/);
      // The meters moved: extinction is now a closed/open ratio, the frame count has grown, the strip chart has data.
      const metersInSweep = await page.locator('#meters li').allInnerTexts();
      expect(metersInSweep[0]).toMatch(/closed\/open 1 : /);
      // The open level (captured in the open phase) is the top of the sweep's fitted curve, floor +
      // amplitude, since the sweep passed V_π: within 10 %.
      const top = fit.curve.intensity.reduce((a: number, b: number) => Math.max(a, b), 0);
      expect(openLevel / top, `open level captured from frame ${captureAt}; ${watch.out()}`).toBeGreaterThan(0.9);
      expect(openLevel / top).toBeLessThan(1.1);
      // the simulated liquid scatters (floor ≈ 0.7 % of the open level): fair, not good
      expect(metersInSweep[0]).toMatch(/FAIR/i);
      expect(metersInSweep).not.toEqual(metersAtSetup);
      expect(metersInSweep[4]).toMatch(/\d+ rows/);
      expect(Number(await page.locator('#strip').getAttribute('data-points'))).toBeGreaterThan(100);
      await page.screenshot({ path: join(SHOTS, 'live-sweep.png'), fullPage: true });

      const command = await waitFor('the analyze command', async () => {
        const t = await page.locator('#command').innerText();
        return t.startsWith('kerrtrace analyze') ? t : null;
      }, 20_000);
      expect(watch.out()).toContain(command);
      await page.screenshot({ path: join(SHOTS, 'live-recording.png'), fullPage: true });
      const runDir = join(runs, readdirSync(runs).find((n) => n.startsWith('run-'))!);
      for (const f of ['clip.mkv', 'volts.csv', 'run.json']) expect(existsSync(join(runDir, f)), f).toBe(true);

      // The recorded run, measured by the real analyze command it printed.
      const args = command.split(' ').slice(2);
      const fromRecording = analyzeJson([...args, '--out', join(dir, 'recorded.kerrtrace')]);
      const sigma = Math.hypot(fromSource.stdErr, fromRecording.stdErr);
      expect(Math.abs(fromRecording.value - fromSource.value)).toBeLessThanOrEqual(2 * sigma);
      expect(Math.abs(fromRecording.value / B_TRUE - 1)).toBeLessThan(0.03);

      // A region dragged on the picture prints as the --roi analyze takes.
      const box = (await page.locator('#picture').boundingBox())!;
      const [ax, ay, bx, by] = [40.3, 30.6, 120.2, 100.4];
      await page.mouse.move(box.x + ax, box.y + ay);
      await page.mouse.down();
      await page.mouse.move(box.x + (ax + bx) / 2, box.y + (ay + by) / 2);
      await page.mouse.move(box.x + bx, box.y + by);
      await page.mouse.up();
      const sx = 240 / box.width, sy = 180 / box.height;
      const x0 = Math.round(ax * sx), y0 = Math.round(ay * sy);
      const expected = `--roi ${x0},${y0},${Math.round(bx * sx) - x0},${Math.round(by * sy) - y0}`;
      await waitFor('the drawn --roi', async () => (await page.locator('#roi').innerText()) === expected, 5_000);
      await waitFor('the drawn --roi on stdout', async () => watch.out().includes(`beam region drawn: ${expected}`), 5_000);

      expect(consoleErrors, consoleErrors.join(" / ")).toEqual([]);
      expect(outside).toEqual([]);
      const csp = (await fetch(watch.url)).headers.get('content-security-policy') ?? '';
      expect(csp).toContain("default-src 'none'");
      expect(csp).toContain("script-src 'self'");
    } finally {
      replay.stop();
      await page.close();
      const pid = (await state(watch.url).catch(() => ({ source: { pid: null } }))).source.pid as number | null;
      watch.child.kill('SIGTERM');
      expect(await watch.exited).toBe(0);
      if (pid) expect(alive(pid)).toBe(false);
    }
  }, 150_000);

  it('releases ffmpeg when the page closes, takes it back when it returns, leaves none behind after Ctrl-C, and the page reconnects to a new server', async () => {
    const port = await new Promise<number>((resolve) => {
      const probe = createServer();
      probe.listen(0, '127.0.0.1', () => { const p = (probe.address() as AddressInfo).port; probe.close(() => resolve(p)); });
    });
    const watch = await startWatch(['--source', join(sweepDir, 'clip.mp4'), '--idle-s', '1', '--out', join(dir, 'runs2'), '--port', String(port)]);
    const page = await browser.newPage();
    await page.goto(watch.url);
    const pid = await waitFor('ffmpeg', async () => (await state(watch.url)).source.pid as number | null);
    expect(alive(pid)).toBe(true);
    await page.close();
    await waitFor('the camera released', async () => (await state(watch.url)).source.paused, 10_000);
    await waitFor('ffmpeg gone', async () => !alive(pid), 5_000);
    const again = await browser.newPage();
    await again.goto(watch.url);
    const pid2 = await waitFor('ffmpeg again', async () => (await state(watch.url)).source.pid as number | null, 10_000);
    expect(alive(pid2)).toBe(true);
    await waitFor('the page live', async () => (await again.locator('#connection').innerText()) === 'live', 5_000);
    watch.child.kill('SIGINT');
    expect(await watch.exited).toBe(0);
    expect(alive(pid2)).toBe(false);
    await waitFor('the page to notice', async () => (await again.locator('#connection').innerText()).startsWith('disconnected'), 10_000);
    // The server comes back on the same port: the page reconnects by itself.
    const back = await startWatch(['--source', join(sweepDir, 'clip.mp4'), '--out', join(dir, 'runs3'), '--port', String(port)]);
    await waitFor('the page reconnected', async () => (await again.locator('#connection').innerText()) === 'live', 10_000);
    await waitFor('frames from the new server', async () => /\d+ frames/.test(await again.locator('#source').innerText()), 10_000);
    await again.close();
    back.child.kill('SIGTERM');
    expect(await back.exited).toBe(0);
  }, 60_000);
});
