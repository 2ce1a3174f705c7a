/**
 * The live session: one camera or stream (liveSource), the measurements made on every frame, the
 * followed voltage log, the running fit and the recordings. The server (liveServer) shows its
 * `snapshot()` several times a second and forwards the page's buttons to it.
 *
 * Per frame (live pixels; the source may be scaled down, regions are kept in source pixels too):
 * - a block grid of linear luminance (measure/gridSampler) goes into a ring of recent frames, from
 *   which the beam is found every 2 s with core/regions/findBeam (the block that varies most), or,
 *   while nothing varies yet, the brightest blob is shown as a guess;
 * - the beam, two surround rings (core/regions/localSurround), the dark and reference regions are
 *   measured with the colour decoding analyze uses (measure/regionMeter);
 * - intensity = beam − surround (as analyze does without --dark-roi), the clipped fraction, the
 *   reference level, and the frame time go into ring buffers of two minutes.
 * Memory is bounded: rings of fixed size, the latest frame only, log samples capped at an hour.
 * Edge module (clock, timers, files for recordings).
 */
import { readFileSync, existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { KerrError, isKerrError } from '../errors.js';
import type { CameraDecoding, Rect } from '../media/types.js';
import { decodingFor } from '../core/camera/decodingFor.js';
import { createGridSampler, type GridSampler } from '../measure/gridSampler.js';
import { createRegionMeter, type RegionMeter } from '../measure/regionMeter.js';
import { validateRect } from '../measure/rect.js';
import { findBeam } from '../core/regions/findBeam.js';
import { cellBoxToRect, floodFill } from '../core/regions/cellGeometry.js';
import { surroundWeights } from '../core/regions/localSurround.js';
import { surroundRings } from '../core/regions/surroundRings.js';
import { percentileSorted } from '../core/stats/percentileSorted.js';
import { median } from '../core/fit/robustScale.js';
import { stageOutputDir, type StagedDir } from '../io/outputDir.js';
import { formatNumber } from '../quantity.js';
import { RingBuffer } from './ringBuffer.js';
import { clippingMeter, driftPercentPerMinute, exposureMeter, extinctionMeter, framesMeter, frameTiming, logMeter, type Meter } from './meters.js';
import { liveFit, type LiveFitResult } from './liveFit.js';
import { createLogFollower, type LogFollower } from './logFollower.js';
import { followFile, type FileFollow } from './followFile.js';
import { runSource, type SourceInfo, type SourceRun, type SourceSpec } from './liveSource.js';

export type RegionKind = 'beam' | 'dark' | 'reference';

export interface SessionOptions {
  spec: SourceSpec;
  info: SourceInfo;
  voltsPath: string | null;
  /** As typed on the command line, for the analyze command; null when not given. */
  lengthMm: string | null;
  gapMm: string | null;
  effectiveLengthMm: string | null;
  polariserAngleDeg: number;
  roi: Rect | null;
  darkRoi: Rect | null;
  referenceRoi: Rect | null;
  /** Folder that receives one run folder per recording. */
  outDir: string;
  /** Stop the camera after this many seconds with no page open (not while recording). */
  idleS: number;
  /** Prints one line for the user (stdout). */
  say(line: string): void;
}

export interface RecordingState {
  active: boolean;
  dir: string | null;
  seconds: number;
  last: { dir: string; command: string } | null;
  error: string | null;
}

export interface Snapshot {
  source: { label: string; width: number; height: number; running: boolean; ended: boolean; paused: boolean; problem: string | null; pid: number | null; frames: number };
  regions: { beam: Rect | null; beamHow: string | null; surround: Rect | null; dark: Rect | null; reference: Rect | null; roiText: string | null };
  meters: Meter[];
  strip: { t: number[]; i: number[] };
  openLevel: number | null;
  capturingOpen: boolean;
  fit: (LiveFitResult & { updatedAgoS: number }) | null;
  fitEnabled: string | null;
  recording: RecordingState;
  picture: { width: number; height: number; version: number };
}

const RING_SECONDS = 120;
const GRID_FRAMES = 150;
const FIND_EVERY_MS = 1000;

function rectText(r: Rect): string {
  return `${r.x},${r.y},${r.w},${r.h}`;
}

function quoteArg(s: string): string {
  return /^[\w./:@%+=,-]+$/.test(s) ? s : `'${s.replace(/'/g, `'\\''`)}'`;
}

export class LiveSession {
  readonly o: SessionOptions;
  private readonly decoding: CameraDecoding;
  private readonly sampler: GridSampler;
  private readonly cells: number;
  private readonly grid: Float32Array;
  private gridCount = 0;
  private gridHead = 0;
  private readonly capacity: number;
  private readonly tRing: RingBuffer;
  private readonly iRing: RingBuffer;
  private readonly clipRing: RingBuffer;
  private readonly refRing: RingBuffer;
  private readonly useRing: RingBuffer;
  private readonly frameTimes: RingBuffer;
  private readonly logT = new RingBuffer(36_000);
  private readonly logV = new RingBuffer(36_000);
  private logFollower: LogFollower | null = null;
  private fileFollow: FileFollow | null = null;
  private logProblem: string | null = null;
  private lastLogArrival = -Infinity;
  private totalMissing = 0;
  private lastFrameT = Number.NaN;

  /** Regions in live pixels; the *Src versions are in source pixels (what the user sees and types). */
  private beam: Rect | null = null;
  private beamSrc: Rect | null = null;
  private beamHow: 'flag' | 'drawn' | 'found' | 'brightest' | null = null;
  private rings: { a0: Rect; a1: Rect; b1: Rect; coefficients: [number, number, number, number] } | null = null;
  private dark: Rect | null = null;
  private darkSrc: Rect | null = null;
  private darkGiven = false;
  private reference: Rect | null = null;
  private referenceSrc: Rect | null = null;
  private meter: RegionMeter | null = null;

  private openLevel: number | null = null;
  private openCapture: { untilT: number | null; values: number[] } | null = null;
  private fitResult: LiveFitResult | null = null;
  private fitAt = 0;
  private fitTimer: NodeJS.Timeout | null = null;
  private findTimer: NodeJS.Timeout | null = null;
  private idleTimer: NodeJS.Timeout | null = null;

  private run: SourceRun | null = null;
  private runId = 0;
  private runBase = 0;
  private runPts0: number | null = null;
  private startedAtMs = Date.now();
  private ended = false;
  private paused = false;
  private problem: string | null = null;
  private frames = 0;
  private latest: Uint8Array | null = null;
  private pictureVersion = 0;

  private staged: StagedDir | null = null;
  private recordStartT = 0;
  private recordStartedAt = '';
  private lastRecording: { dir: string; command: string } | null = null;
  private recordError: string | null = null;
  private busy: Promise<unknown> = Promise.resolve();
  private clients = 0;
  private closed = false;

  constructor(o: SessionOptions) {
    this.o = o;
    const { info } = o;
    this.decoding = decodingFor({ colourTransfer: info.colourTransfer, colourMatrix: info.colourMatrix, colourRange: info.colourRange === 'full' ? 'full' : info.colourRange === 'limited' ? 'limited' : 'unknown', height: info.height });
    const step = Math.max(2, Math.ceil(info.liveWidth / 80));
    this.sampler = createGridSampler(info.liveWidth, info.liveHeight, step, this.decoding);
    this.cells = this.sampler.gridWidth * this.sampler.gridHeight;
    this.grid = new Float32Array(GRID_FRAMES * this.cells);
    const fps = Math.min(120, info.nominalFps ?? 30);
    this.capacity = Math.ceil(fps * RING_SECONDS) + 16;
    this.tRing = new RingBuffer(this.capacity);
    this.iRing = new RingBuffer(this.capacity);
    this.clipRing = new RingBuffer(this.capacity);
    this.refRing = new RingBuffer(this.capacity);
    this.useRing = new RingBuffer(this.capacity);
    this.frameTimes = new RingBuffer(Math.ceil(fps * 70) + 16);
    if (o.roi) this.setRegion('beam', o.roi, 'flag');
    if (o.darkRoi) this.setRegion('dark', o.darkRoi, 'flag');
    if (o.referenceRoi) this.setRegion('reference', o.referenceRoi, 'flag');
  }

  /** Starts the camera, the log follower and the timers. Resolves when the first frame arrived (or the source failed). */
  async start(): Promise<void> {
    if (this.o.voltsPath) this.followLog(this.o.voltsPath);
    this.findTimer = setInterval(() => this.findRegions(), FIND_EVERY_MS);
    this.scheduleFit(500);
    await this.startRun({});
  }

  private followLog(path: string): void {
    this.logFollower = createLogFollower(path);
    this.fileFollow = followFile(path, {
      onText: (text) => {
        if (!this.logFollower) return;
        try {
          const s = this.logFollower.feed(text);
          for (let i = 0; i < s.timeS.length; i++) { this.logT.push(s.timeS[i]!); this.logV.push(s.voltageV[i]!); }
          if (s.timeS.length > 0) { this.lastLogArrival = performance.now(); this.logProblem = null; }
        } catch (err) {
          this.logProblem = isKerrError(err) ? err.oneLine() : String(err);
        }
      },
      onRestart: () => {
        this.logFollower = createLogFollower(path);
        this.logT.clear();
        this.logV.clear();
        this.o.say(`the voltage log ${path} started over (replaced or cut short); following it from its beginning`);
      },
      onProblem: (p) => { this.logProblem = p; },
    });
  }

  private async startRun(opts: { seekS?: number; recordPath?: string }): Promise<void> {
    const id = ++this.runId;
    this.runPts0 = null;
    this.runBase = opts.seekS ?? (Number.isFinite(this.lastFrameT) ? this.lastFrameT : 0);
    if (!this.o.spec.file) this.runBase = (Date.now() - this.startedAtMs) / 1000;
    let firstFrame: () => void = () => undefined;
    const first = new Promise<void>((r) => { firstFrame = r; });
    this.problem = null;
    this.run = runSource(this.o.spec, this.o.info, opts, {
      onFrame: (data, ptsS) => {
        if (id !== this.runId) return;
        this.onFrame(data, ptsS);
        firstFrame();
      },
      onEnd: (problem) => {
        firstFrame();
        if (id !== this.runId) return;
        this.run = null;
        if (problem !== null) {
          this.problem = problem;
          this.o.say(problem);
        } else if (this.o.spec.file) {
          this.ended = true;
          this.o.say(`${this.o.spec.label} has ended`);
        }
        if (this.staged) void this.queue(async () => this.finishRecording()).catch((err: unknown) => this.o.say(isKerrError(err) ? err.oneLine() : String(err)));
      },
    });
    await first;
  }

  private async stopRun(): Promise<void> {
    const run = this.run;
    this.runId++;
    this.run = null;
    if (run) await run.stop();
  }

  /** Position to resume a file source at, s. */
  private resumeAt(): number {
    return Number.isFinite(this.lastFrameT) ? this.lastFrameT + 1 / (this.o.info.nominalFps ?? 30) : 0;
  }

  private onFrame(data: Uint8Array, ptsS: number): void {
    if (this.runPts0 === null) this.runPts0 = ptsS;
    let t = this.runBase + (ptsS - this.runPts0);
    if (Number.isFinite(this.lastFrameT) && t <= this.lastFrameT) t = this.lastFrameT + 1e-3;
    const nominal = this.o.info.nominalFps;
    if (Number.isFinite(this.lastFrameT) && nominal) {
      const gap = (t - this.lastFrameT) * nominal;
      if (gap > 1.5) this.totalMissing += Math.round(gap) - 1;
    }
    this.lastFrameT = t;
    this.frames++;
    this.frameTimes.push(t);
    this.latest = data;
    this.pictureVersion++;
    const frame = { index: this.frames, timeS: t, width: this.o.info.liveWidth, height: this.o.info.liveHeight, data };
    this.sampler.sample(frame, this.grid.subarray(this.gridHead * this.cells, (this.gridHead + 1) * this.cells));
    this.gridHead = (this.gridHead + 1) % GRID_FRAMES;
    this.gridCount = Math.min(GRID_FRAMES, this.gridCount + 1);

    if (this.meter && this.rings && this.beam) {
      const m = this.meter.measure(frame);
      const c = this.rings.coefficients;
      const surround = c[1] * m[1]!.luma + c[2] * m[2]!.luma + c[3] * m[3]!.luma;
      const intensity = m[0]!.luma - surround;
      let k = 4;
      const darkLevel = this.dark ? m[k++]!.luma : Number.NaN;
      const refLevel = this.reference ? m[k++]!.luma : Number.NaN;
      let usable = m[0]!.clippedFraction > 0.01 ? 0 : 1;
      if (this.openCapture) {
        if (this.openCapture.untilT === null) this.openCapture.untilT = t + 1;
        if (t <= this.openCapture.untilT) {
          this.openCapture.values.push(intensity);
          usable = 0;
        } else {
          this.openLevel = this.openCapture.values.length > 0 ? median(this.openCapture.values) : null;
          this.o.say(`open level captured: ${formatNumber(this.openLevel ?? Number.NaN)} (linear, beam minus surround)`);
          this.openCapture = null;
        }
      }
      this.tRing.push(t);
      this.iRing.push(intensity);
      this.clipRing.push(m[0]!.clippedFraction);
      this.refRing.push(Number.isFinite(darkLevel) ? refLevel - darkLevel : refLevel);
      this.useRing.push(usable);
    }
  }

  // ---------------- regions ----------------

  private toLive(r: Rect): Rect {
    const sx = this.o.info.width / this.o.info.liveWidth;
    const sy = this.o.info.height / this.o.info.liveHeight;
    const x0 = Math.floor(r.x / sx), y0 = Math.floor(r.y / sy);
    const x1 = Math.min(this.o.info.liveWidth, Math.ceil((r.x + r.w) / sx));
    const y1 = Math.min(this.o.info.liveHeight, Math.ceil((r.y + r.h) / sy));
    return { x: x0, y: y0, w: Math.max(1, x1 - x0), h: Math.max(1, y1 - y0) };
  }

  private toSource(r: Rect): Rect {
    const sx = this.o.info.width / this.o.info.liveWidth;
    const sy = this.o.info.height / this.o.info.liveHeight;
    const x = Math.round(r.x * sx), y = Math.round(r.y * sy);
    return { x, y, w: Math.min(this.o.info.width - x, Math.round(r.w * sx)), h: Math.min(this.o.info.height - y, Math.round(r.h * sy)) };
  }

  /** Sets a region given in source pixels (checked against the frame); returns the option text for analyze. */
  setRegion(kind: RegionKind, rect: Rect, how: 'flag' | 'drawn'): string {
    const option = kind === 'beam' ? '--roi' : kind === 'dark' ? '--dark-roi' : '--reference-roi';
    validateRect(rect, this.o.info.width, this.o.info.height, option);
    const live = this.toLive(rect);
    if (kind === 'beam') this.applyBeam(live, rect, how);
    else if (kind === 'dark') { this.dark = live; this.darkSrc = { ...rect }; this.darkGiven = true; this.rebuildMeter(); }
    else { this.reference = live; this.referenceSrc = { ...rect }; this.refRing.clear(); this.rebuildMeter(); }
    const text = `${option} ${rectText(rect)}`;
    if (how === 'drawn') this.o.say(`${kind} region drawn: ${text}`);
    return text;
  }

  /** Forgets a drawn region: the beam is searched for again, the dark region chosen again, the reference dropped. */
  clearRegion(kind: RegionKind): void {
    if (kind === 'beam') { this.beam = null; this.beamSrc = null; this.beamHow = null; this.rings = null; this.resetSeries(); this.findRegions(); }
    else if (kind === 'dark') { this.darkGiven = false; this.dark = null; this.darkSrc = null; this.pickDark(); }
    else { this.reference = null; this.referenceSrc = null; }
    this.rebuildMeter();
  }

  private resetSeries(): void {
    this.tRing.clear(); this.iRing.clear(); this.clipRing.clear(); this.refRing.clear(); this.useRing.clear();
    this.fitResult = null;
  }

  private applyBeam(live: Rect, src: Rect, how: 'flag' | 'drawn' | 'found' | 'brightest'): void {
    const W = this.o.info.liveWidth, H = this.o.info.liveHeight;
    const { a0, a1, b1 } = surroundRings(live, W, H);
    const sw = surroundWeights({ beam: live, a0, a1, b1 });
    this.beam = live;
    this.beamSrc = src;
    this.beamHow = how;
    this.rings = { a0, a1, b1, coefficients: sw.coefficients };
    if (this.openLevel !== null || this.openCapture !== null) {
      // The open level is beam minus surround of one region; another region reads another level.
      this.openLevel = null;
      this.openCapture = null;
      this.o.say('the beam region changed: capture the open level again');
    }
    this.resetSeries();
    if (!this.darkGiven) this.pickDark();
    this.rebuildMeter();
  }

  private rebuildMeter(): void {
    if (!this.beam || !this.rings) { this.meter = null; return; }
    const list = [this.beam, this.rings.a0, this.rings.a1, this.rings.b1];
    if (this.dark) list.push(this.dark);
    if (this.reference) list.push(this.reference);
    this.meter = createRegionMeter(this.o.info.liveWidth, this.o.info.liveHeight, list, this.decoding, list.map((_, i) => (i === 0 ? 1 : 2)));
  }

  /** Mean of each block over the grid ring. */
  private meanMap(): Float64Array {
    const map = new Float64Array(this.cells);
    for (let f = 0; f < this.gridCount; f++) {
      const off = f * this.cells;
      for (let c = 0; c < this.cells; c++) map[c] += this.grid[off + c]!;
    }
    for (let c = 0; c < this.cells; c++) map[c] /= Math.max(1, this.gridCount);
    return map;
  }

  /** The darkest 4×4-block window that stays clear of the beam's outer ring. */
  private pickDark(): void {
    if (this.gridCount < 5) return;
    const gw = this.sampler.gridWidth, gh = this.sampler.gridHeight, step = this.sampler.step;
    const map = this.meanMap();
    const n = Math.max(2, Math.min(4, Math.floor(Math.min(gw, gh) / 4)));
    const keepOut = this.rings?.b1 ?? null;
    let best = Infinity;
    let bestRect: Rect | null = null;
    for (let y = 0; y + n <= gh; y++) {
      for (let x = 0; x + n <= gw; x++) {
        const r = { x: x * step, y: y * step, w: n * step, h: n * step };
        if (keepOut && r.x < keepOut.x + keepOut.w && keepOut.x < r.x + r.w && r.y < keepOut.y + keepOut.h && keepOut.y < r.y + r.h) continue;
        let s = 0;
        for (let j = 0; j < n; j++) for (let i = 0; i < n; i++) s += map[(y + j) * gw + x + i]!;
        if (s < best) { best = s; bestRect = r; }
      }
    }
    if (bestRect) { this.dark = bestRect; this.darkSrc = this.toSource(bestRect); }
  }

  /** Looks for the beam (unless given, drawn or already found by its modulation). */
  findRegions(): void {
    if (this.gridCount < 10) return;
    if (!this.darkGiven && !this.dark) { this.pickDark(); this.rebuildMeter(); }
    if (this.beamHow === 'flag' || this.beamHow === 'drawn' || this.beamHow === 'found') return;
    const gw = this.sampler.gridWidth, gh = this.sampler.gridHeight, step = this.sampler.step;
    try {
      const found = findBeam({ grid: this.grid, frames: this.gridCount, gridWidth: gw, gridHeight: gh });
      // findBeam only asks for the strongest variation to stand out from the rest of the frame;
      // live, before anything is swept, that can be the noise of a bright still patch. Keep it
      // only when the light there changes by at least 0.02 of full scale and by 30 % of its level.
      const mean = this.meanMap();
      let peakCell = 0;
      for (let k = 1; k < this.cells; k++) if (found.rangeMap[k]! > found.rangeMap[peakCell]!) peakCell = k;
      if (!(found.peakRange >= 0.02 && found.peakRange >= 0.3 * mean[peakCell]!)) throw new KerrError('BAD_REGION', 'no clear modulation yet');
      const live = cellBoxToRect(found.beam, step);
      this.applyBeam(live, this.toSource(live), 'found');
      this.o.say(`beam found where the light changes at ${formatNumber(this.lastFrameT)} s: --roi ${rectText(this.beamSrc!)}`);
      return;
    } catch (err) {
      if (!isKerrError(err)) throw err;
    }
    // Nothing varies yet: show the brightest blob as a guess (not kept once the beam moves).
    const map = this.meanMap();
    let peak = 0;
    for (let c = 1; c < this.cells; c++) if (map[c]! > map[peak]!) peak = c;
    const med = median(map);
    if (!(map[peak]! - med > 0.01)) return;
    const { box } = floodFill(map, gw, gh, peak, med + 0.25 * (map[peak]! - med));
    const live = cellBoxToRect(box, step);
    if (this.beam && this.beamHow === 'brightest' && rectText(live) === rectText(this.beam)) return;
    this.applyBeam(live, this.toSource(live), 'brightest');
  }

  /** Starts averaging the beam over the next second as the open level (analyser parallel, field off). */
  captureOpen(): void {
    if (!this.meter) throw new KerrError('BAD_REGION', 'there is no beam region yet to measure the open level in', { hint: 'Drag a beam region on the picture first' });
    this.openCapture = { untilT: null, values: [] };
  }

  clearOpen(): void {
    this.openLevel = null;
  }

  // ---------------- fit ----------------

  fitSettings(): string | null {
    if (!this.o.voltsPath) return 'give --volts FILE to follow a voltage log';
    if (this.o.gapMm === null || this.o.lengthMm === null) return 'give --length-mm and --gap-mm for B';
    return null;
  }

  private scheduleFit(delayMs: number): void {
    if (this.closed) return;
    this.fitTimer = setTimeout(() => {
      const t0 = performance.now();
      try {
        this.runFit();
      } catch (err) {
        this.fitResult = { status: 'waiting', reason: err instanceof Error ? err.message : String(err) };
      }
      const took = performance.now() - t0;
      this.scheduleFit(Math.max(1000, 3 * took));
    }, delayMs);
    this.fitTimer.unref();
  }

  private runFit(): void {
    if (this.fitSettings() !== null || this.tRing.length < 30) return;
    const t = this.tRing.toArray();
    const i = this.iRing.toArray();
    const u = Uint8Array.from(this.useRing.toArray());
    let logT = this.logT.toArray();
    let logV = this.logV.toArray();
    // Once an offset is known, search near it: the log may hold an hour, the frames two minutes.
    const previous = this.fitResult && this.fitResult.status === 'ok' ? this.fitResult.offsetS : null;
    if (previous !== null && t.length > 0) {
      const lo = t[0]! - previous - 60, hi = t[t.length - 1]! - previous + 60;
      let a = 0, b = logT.length;
      while (a < b && logT[a]! < lo) a++;
      while (b > a && logT[b - 1]! > hi) b--;
      if (b - a >= 5) { logT = logT.subarray(a, b); logV = logV.subarray(a, b); }
    }
    const gapM = Number(this.o.gapMm) * 1e-3;
    const effM = Number(this.o.effectiveLengthMm ?? this.o.lengthMm) * 1e-3;
    this.fitResult = liveFit({ frameTimesS: t, intensity: i, usable: u, logTimeS: logT, logVoltageV: logV, gapM, effectiveLengthM: effM, polariserAngleDeg: this.o.polariserAngleDeg });
    this.fitAt = performance.now();
  }

  // ---------------- recording ----------------

  private queue<T>(job: () => Promise<T>): Promise<T> {
    const next = this.busy.then(job, job);
    this.busy = next.catch(() => undefined);
    return next;
  }

  get recording(): boolean {
    return this.staged !== null;
  }

  private nextRunDir(): string {
    const d = new Date();
    const p = (n: number) => String(n).padStart(2, '0');
    const stamp = `${d.getFullYear()}${p(d.getMonth() + 1)}${p(d.getDate())}-${p(d.getHours())}${p(d.getMinutes())}${p(d.getSeconds())}`;
    let dir = resolve(this.o.outDir, `run-${stamp}`);
    for (let k = 2; existsSync(dir); k++) dir = resolve(this.o.outDir, `run-${stamp}-${k}`);
    return dir;
  }

  startRecording(): Promise<{ dir: string }> {
    return this.queue(async () => {
      if (this.staged) throw new KerrError('BAD_ARGUMENT', 'already recording', { hint: 'Stop the recording first' });
      if (this.ended) throw new KerrError('BAD_ARGUMENT', `${this.o.spec.label} has ended, nothing more to record`);
      const target = this.nextRunDir();
      const staged = stageOutputDir(target, false);
      const seekS = this.o.spec.file ? this.resumeAt() : undefined;
      await this.stopRun();
      this.staged = staged;
      this.recordError = null;
      this.recordStartT = Number.isFinite(this.lastFrameT) ? this.lastFrameT : 0;
      this.recordStartedAt = new Date().toISOString();
      this.paused = false;
      await this.startRun({ ...(seekS !== undefined ? { seekS } : {}), recordPath: join(staged.path, 'clip.mkv') });
      this.o.say(`recording into ${target}`);
      return { dir: target };
    });
  }

  stopRecording(): Promise<{ dir: string; command: string }> {
    return this.queue(async () => {
      if (!this.staged) throw new KerrError('BAD_ARGUMENT', 'not recording', { hint: 'Start a recording first' });
      const seekS = this.o.spec.file ? this.resumeAt() : undefined;
      await this.stopRun();
      const done = this.finishRecording();
      if (!this.ended && !this.closed) await this.startRun(seekS !== undefined ? { seekS } : {});
      return done;
    });
  }

  /** Writes the log copy and run.json next to the finished clip and moves the run folder into place. */
  private finishRecording(): { dir: string; command: string } {
    const staged = this.staged;
    if (!staged) return this.lastRecording ?? { dir: '', command: '' };
    this.staged = null;
    const clip = join(staged.path, 'clip.mkv');
    if (!existsSync(clip)) {
      staged.abandon();
      this.recordError = 'the recording produced no clip (did the source stop at once?)';
      throw new KerrError('FFMPEG_FAILED', this.recordError, { hint: 'Check the camera and try again' });
    }
    let voltsName: string | null = null;
    if (this.o.voltsPath && existsSync(this.o.voltsPath)) {
      const text = readFileSync(this.o.voltsPath, 'utf8');
      const end = Math.max(text.lastIndexOf('\n'), text.lastIndexOf('\r'));
      staged.write('volts.csv', end >= 0 ? text.slice(0, end + 1) : '');
      voltsName = 'volts.csv';
    }
    const dir = staged.target;
    const parts = ['kerrtrace', 'analyze', quoteArg(join(dir, 'clip.mkv'))];
    parts.push('--volts', voltsName ? quoteArg(join(dir, voltsName)) : 'LOG.csv');
    parts.push('--length-mm', this.o.lengthMm ?? 'L', '--gap-mm', this.o.gapMm ?? 'D');
    if (this.o.effectiveLengthMm) parts.push('--effective-length-mm', this.o.effectiveLengthMm);
    if (this.beamSrc && (this.beamHow === 'drawn' || this.beamHow === 'flag')) parts.push('--roi', rectText(this.beamSrc));
    if (this.darkSrc && this.darkGiven) parts.push('--dark-roi', rectText(this.darkSrc));
    if (this.referenceSrc) parts.push('--reference-roi', rectText(this.referenceSrc));
    if (this.o.polariserAngleDeg !== 45) parts.push('--polariser-angle-deg', String(this.o.polariserAngleDeg));
    const command = parts.join(' ');
    const fit = this.fitResult && this.fitResult.status === 'ok' ? this.fitResult : null;
    const description = {
      kind: 'kerrtrace live recording',
      source: this.o.spec.label,
      startedAt: this.recordStartedAt,
      stoppedAt: new Date().toISOString(),
      liveSecondsRecorded: Number.isFinite(this.lastFrameT) ? Math.max(0, this.lastFrameT - this.recordStartT) : 0,
      clip: 'clip.mkv',
      clipNote: 'the camera stream copied without re-encoding (Matroska)',
      volts: voltsName,
      lengthMm: this.o.lengthMm, gapMm: this.o.gapMm, effectiveLengthMm: this.o.effectiveLengthMm, polariserAngleDeg: this.o.polariserAngleDeg,
      regions: {
        beam: this.beamSrc, beamHow: this.beamHow, dark: this.darkSrc, darkGiven: this.darkGiven, reference: this.referenceSrc,
      },
      openLevelLive: this.openLevel,
      liveFit: fit ? { kerrConstant: fit.kerrConstant, halfWaveVoltage: fit.halfWaveVoltage, offsetS: fit.offsetS, points: fit.points } : null,
      analyzeCommand: command,
    };
    staged.write('run.json', `${JSON.stringify(description, null, 2)}\n`);
    staged.commit();
    this.lastRecording = { dir, command };
    this.o.say(`recording stopped: ${dir}\n  measure it with:\n  ${command}`);
    return this.lastRecording;
  }

  // ---------------- clients and shutdown ----------------

  /** Number of pages connected; with none for idleS the camera is released, and taken back when one returns. */
  setClients(n: number): void {
    this.clients = n;
    if (n > 0) {
      if (this.idleTimer) { clearTimeout(this.idleTimer); this.idleTimer = null; }
      if (this.paused && !this.closed) {
        this.paused = false;
        const seekS = this.o.spec.file ? this.resumeAt() : undefined;
        void this.queue(() => this.startRun(seekS !== undefined ? { seekS } : {}));
        this.o.say('a page is open again: camera resumed');
      }
      return;
    }
    if (this.idleTimer || this.closed) return;
    this.idleTimer = setTimeout(() => {
      this.idleTimer = null;
      if (this.clients > 0 || !this.run) return;
      if (this.staged) { this.setClients(0); return; } // not while recording: look again later
      this.paused = true;
      void this.queue(() => this.stopRun());
      this.o.say(`no page open for ${this.o.idleS} s: camera released (open the page again to resume)`);
    }, this.o.idleS * 1000);
    this.idleTimer.unref();
  }

  /** Stops everything: finishes a running recording, stops ffmpeg and waits for it to exit. */
  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    if (this.findTimer) clearInterval(this.findTimer);
    if (this.fitTimer) clearTimeout(this.fitTimer);
    if (this.idleTimer) clearTimeout(this.idleTimer);
    this.fileFollow?.stop();
    await this.queue(async () => {
      await this.stopRun();
      if (this.staged) {
        try { this.finishRecording(); } catch (err) { this.o.say(isKerrError(err) ? err.oneLine() : String(err)); }
      }
    });
  }

  get runningPid(): number | null {
    return this.run?.pid ?? null;
  }

  // ---------------- what the page shows ----------------

  /** The latest frame's luma plane, halved until it is at most 320 pixels across: [w, h] in 2 × uint16, then w·h bytes. */
  picture(): Buffer | null {
    if (!this.latest) return null;
    const W = this.o.info.liveWidth, H = this.o.info.liveHeight;
    let k = 1;
    while (W / k > 320) k *= 2;
    const w = Math.floor(W / k), h = Math.floor(H / k);
    const out = Buffer.alloc(4 + w * h);
    out.writeUInt16LE(w, 0);
    out.writeUInt16LE(h, 2);
    const y = this.latest;
    for (let j = 0; j < h; j++) for (let i = 0; i < w; i++) out[4 + j * w + i] = y[j * k * W + i * k]!;
    return out;
  }

  snapshot(): Snapshot {
    const now = this.lastFrameT;
    // strip chart: the last minute, at most 300 points
    const t = this.tRing.toArray();
    const iv = this.iRing.toArray();
    let from = 0;
    while (from < t.length && t[from]! < now - 60) from++;
    const stride = Math.max(1, Math.ceil((t.length - from) / 300));
    const strip = { t: [] as number[], i: [] as number[] };
    for (let k = from; k < t.length; k += stride) { strip.t.push(t[k]! - now); strip.i.push(iv[k]!); }
    // last 10 s for the floor and clipping
    let from10 = t.length;
    while (from10 > 0 && t[from10 - 1]! >= now - 10) from10--;
    const recentI = iv.slice(from10).filter(Number.isFinite).sort();
    const floor = recentI.length > 0 ? percentileSorted(recentI, 0.05) : Number.NaN;
    const clips = this.clipRing.tail(t.length - from10);
    let worstClip = Number.NaN;
    for (const c of clips) worstClip = Number.isFinite(worstClip) ? Math.max(worstClip, c) : c;
    // reference drift over the last minute
    let drift = Number.NaN;
    if (this.reference) {
      const refs = this.refRing.toArray();
      const n = Math.min(refs.length, t.length);
      const tt = t.subarray(t.length - n);
      const rr = refs.subarray(refs.length - n);
      let s = 0;
      while (s < n && tt[s]! < now - 60) s++;
      try { drift = driftPercentPerMinute(tt.subarray(s), rr.subarray(s)); } catch { drift = Number.NaN; }
    }
    const ft = this.frameTimes.toArray();
    const cut = (span: number) => { let s = ft.length; while (s > 0 && ft[s - 1]! >= now - span) s--; return ft.subarray(s); };
    const logAge = Number.isFinite(this.lastLogArrival) ? (performance.now() - this.lastLogArrival) / 1000 : Infinity;
    const meters: Meter[] = [
      extinctionMeter({ closedLevel: floor, openLevel: this.openLevel, floorAboveSurround: this.beam ? floor : Number.NaN }),
      clippingMeter(this.beam ? worstClip : Number.NaN),
      exposureMeter(drift, this.reference !== null),
      framesMeter(frameTiming(cut(5)), frameTiming(cut(60)), this.o.info.nominalFps, this.totalMissing),
      logMeter(this.o.voltsPath !== null, this.logFollower?.rows ?? 0, logAge, this.logProblem),
    ];
    const roiText = this.beamSrc ? `--roi ${rectText(this.beamSrc)}` : null;
    return {
      source: {
        label: this.o.spec.label, width: this.o.info.width, height: this.o.info.height,
        running: this.run !== null, ended: this.ended, paused: this.paused, problem: this.problem, pid: this.run?.pid ?? null, frames: this.frames,
      },
      regions: {
        beam: this.beamSrc, beamHow: this.beamHow,
        surround: this.rings ? this.toSource(this.rings.b1) : null,
        dark: this.darkSrc, reference: this.referenceSrc, roiText,
      },
      meters,
      strip,
      openLevel: this.openLevel,
      capturingOpen: this.openCapture !== null,
      fit: this.fitResult ? { ...this.fitResult, updatedAgoS: (performance.now() - this.fitAt) / 1000 } : null,
      fitEnabled: this.fitSettings(),
      recording: {
        active: this.staged !== null,
        dir: this.staged ? this.staged.target : null,
        seconds: this.staged && Number.isFinite(this.lastFrameT) ? Math.max(0, this.lastFrameT - this.recordStartT) : 0,
        last: this.lastRecording,
        error: this.recordError,
      },
      picture: { width: this.o.info.liveWidth, height: this.o.info.liveHeight, version: this.pictureVersion },
    };
  }
}
