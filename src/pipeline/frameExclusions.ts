/**
 * Every frame exclusion of an analyze run, decided once before any fit (docs/analyze.md, "Frames
 * left out"). Before the sync (`preSyncExclusions`), in this order, a frame already left out
 * keeping its first reason:
 *
 *   no-reference   the reference region gave no exposure gain for the frame
 *   spark          a flash of the whole frame (findSparks)
 *   clipped        more than 1 % of the beam's pixels at the top code
 *   open-window    inside --open-window (the analyser parallel; these frames give the open level)
 *   open-turning   within OPEN_TURNING_MARGIN_S of the open window (the analyser being turned)
 *   particle       a short positive excursion of the beam intensity above a model of it that needs
 *                  no fit (`particleExclusions`): spikeFreeTrend, the largest of its running
 *                  median (keeps steps), a robust local quadratic (keeps smooth peaks) and, at a
 *                  sharp turn of the sweep, robust lines from either side; judged by
 *                  detectParticleEvents against the local noise.
 *   exposure-jump  a persistent step of the background outside the beam (detectExposureJumps)
 *
 * The sync (syncRun) then adds log-gap (the log has a gap there) and outside-log; the sync
 * itself runs on the frames the list above leaves in.
 * Each excluded frame has one reason; events list sparks, clipped frames, particles (one per
 * passage, at its peak) and exposure jumps.
 *
 * Exposure drift needs the background free of light that follows the drive (scatter of the
 * switched beam). Before a fit the modulation term is unknown, so the background is regressed on
 * the beam intensity itself, which is floor + amplitude × modulation: the same regression up to
 * an intercept (exposureDrift keeps only a positive slope, i.e. added scattered light).
 */
import { CLIPPED_FRACTION_LIMIT } from '../core/figures/clippedFractionLimit.js';
import { detectParticleEvents } from '../core/scatter/detectParticleEvents.js';
import { exposureDrift } from '../core/scatter/exposureDrift.js';
import { detectExposureJumps } from '../core/scatter/detectExposureJumps.js';
import { outsideBoxSeries } from '../core/scatter/boxSeries.js';
import { cellBoxArea, type CellBox } from '../core/regions/cellGeometry.js';
import { spikeFreeTrend } from '../core/signal/spikeFreeTrend.js';
import { median } from '../core/fit/robustScale.js';
import { quantity, type Quantity } from '../quantity.js';
import type { RunEvent, RunWarning } from '../result/schema.js';
import type { FlashDetection } from '../core/events/detectFlashes.js';
import { boxSumSeries, frameMeansOf } from './gridAccess.js';
import { keepOutBox } from './fullRateBoxes.js';
import type { ClipMeasurement } from './measureClip.js';
import type { CorrectedSeries } from './correctedSeries.js';

/**
 * Frames within this many seconds either side of --open-window are left out of the sync and the fit
 * (reason "open-turning"): turning an analyser by hand between parallel and crossed takes about a
 * second, and those frames are neither (this tool's documented margin).
 */
export const OPEN_TURNING_MARGIN_S = 1.5;

/**
 * Half-width of the trends that stand in for the model when particles are looked for, s: longer
 * than a particle passage (a few tenths of a second) so that none follows one, short against the
 * steps and ramps of a drive (this tool's choice; docs/scatter.md, particleEventRate).
 */
export const PARTICLE_MEDIAN_HALF_WINDOW_S = 0.5;

export interface PreSyncInput {
  clip: Pick<ClipMeasurement, 'grid' | 'beamRect' | 'nFrames' | 'times' | 'beam'>;
  series: CorrectedSeries;
  sparks: FlashDetection;
  openWindowS?: [number, number];
  /** A reference region was given (then exposure changes left are jumps, not drift). */
  referenceGiven: boolean;
  /** Typical interval between voltage-log samples, s (the particle detector's timing allowance). */
  logIntervalS?: number;
}

export interface FrameExclusions {
  /** Reason per frame, null for a frame used. */
  excluded: (string | null)[];
  events: RunEvent[];
  warnings: RunWarning[];
  /** Particle passages per minute over the frames judged (Poisson standard error). */
  particleRate: Quantity;
  /** Intensity of the open-window frames not left out for another reason (null without a window). */
  openWindowLevels: number[] | null;
}

export function preSyncExclusions(input: PreSyncInput): FrameExclusions {
  const { clip, series, sparks } = input;
  const n = clip.nFrames;
  const excluded: (string | null)[] = new Array<string | null>(n).fill(null);
  const events: RunEvent[] = [];
  const warnings: RunWarning[] = [];
  for (let f = 0; f < n; f++) {
    if (!Number.isFinite(series.gain[f]!)) excluded[f] = 'no-reference';
    else if (sparks.flags[f]) excluded[f] = 'spark';
    else if (clip.beam.clipped[f]! > CLIPPED_FRACTION_LIMIT) excluded[f] = 'clipped';
    if (sparks.flags[f]) events.push({ kind: 'spark', frameIndex: f, timeS: clip.times[f]!, size: sparks.z[f]! });
  }
  markClipped(clip, excluded, events, warnings);
  const openWindowLevels = input.openWindowS ? markOpenWindow(input.openWindowS, clip.times, series.intensity, excluded) : null;
  const particles = particleExclusions({ excluded, intensity: series.intensity, times: clip.times, ...(input.logIntervalS !== undefined ? { logIntervalS: input.logIntervalS } : {}) });
  events.push(...particles.events);
  markExposureJumps(input, particles.excluded, events, warnings);
  events.sort((a, b) => a.frameIndex - b.frameIndex);
  return { excluded: particles.excluded, events, warnings, particleRate: particles.particleRate, openWindowLevels };
}

function markClipped(clip: PreSyncInput['clip'], excluded: (string | null)[], events: RunEvent[], warnings: RunWarning[]): void {
  let count = 0;
  for (let f = 0; f < excluded.length; f++) {
    if (excluded[f] !== 'clipped') continue;
    count++;
    events.push({ kind: 'clipped', frameIndex: f, timeS: clip.times[f]!, size: clip.beam.clipped[f]! });
  }
  if (count > 0) warnings.push({ code: 'clipping', message: `${count} frames have more than 1% clipped pixels in the beam and were left out; defocus the spot, add an ND filter or lower the exposure`, guideSection: 'avoid-clipping' });
}

/** Marks the open window and the turning margins; returns the usable open-window intensities. */
function markOpenWindow([a, b]: [number, number], times: Float64Array, intensity: Float64Array, excluded: (string | null)[]): number[] {
  const vals: number[] = [];
  for (let f = 0; f < excluded.length; f++) {
    const t = times[f]!;
    if (t >= a && t <= b) {
      if (!excluded[f]) vals.push(intensity[f]!);
      excluded[f] = 'open-window';
    } else if (t >= a - OPEN_TURNING_MARGIN_S && t <= b + OPEN_TURNING_MARGIN_S && !excluded[f]) {
      excluded[f] = 'open-turning';
    }
  }
  return vals;
}

function medianFrameS(times: Float64Array): number {
  const dts = new Float64Array(Math.max(0, times.length - 1));
  for (let k = 1; k < times.length; k++) dts[k - 1] = times[k]! - times[k - 1]!;
  const dt = dts.length > 0 ? median(dts) : 0;
  return dt > 0 ? dt : 1 / 30;
}

export interface ParticleExclusions {
  /** The exclusions with particle frames added (a new list). */
  excluded: (string | null)[];
  /** One event per passage, at its peak. */
  events: RunEvent[];
  /** Particle passages per minute over the frames judged (Poisson standard error). */
  particleRate: Quantity;
}

export interface ParticleInput {
  excluded: readonly (string | null)[];
  intensity: Float64Array;
  times: Float64Array;
  /** Typical interval between voltage-log samples, s (the detector's timing allowance). */
  logIntervalS?: number;
}

export function particleExclusions(input: ParticleInput): ParticleExclusions {
  const excluded = input.excluded.slice();
  const candidate = Uint8Array.from(excluded, (e) => (e ? 0 : 1));
  const half = Math.max(3, Math.round(PARTICLE_MEDIAN_HALF_WINDOW_S / medianFrameS(input.times)));
  const model = spikeFreeTrend(input.intensity, candidate, input.times, half);
  const found = detectParticleEvents({
    intensity: input.intensity, model, candidate, timesS: input.times,
    ...(input.logIntervalS !== undefined ? { logIntervalS: input.logIntervalS } : {}),
  });
  const events: RunEvent[] = [];
  for (const e of found.events) {
    for (let f = e.firstFrame; f <= e.lastFrame; f++) if (!excluded[f]) excluded[f] = 'particle';
    events.push({ kind: 'particle', frameIndex: e.peakFrame, timeS: e.peakTimeS, size: e.size });
  }
  const particleRate = Number.isFinite(found.ratePerMinute.value) ? found.ratePerMinute : quantity(NaN, undefined, '1/min');
  return { excluded, events, particleRate };
}

/** Mean outside a box of blocks at every frame (a bounded store: from its tracked sums; a box it did not track, the whole frame). */
function outsideBox(grid: PreSyncInput['clip']['grid'], frameMean: Float64Array, box: CellBox): Float64Array {
  if (!grid.tracked) return outsideBoxSeries(grid.data, frameMean, grid.gridWidth, grid.gridHeight, box);
  const inside = boxSumSeries(grid, box);
  if (!inside) return frameMean;
  const cells = grid.gridWidth * grid.gridHeight, area = cellBoxArea(box);
  return frameMean.map((m, f) => (cells * m - inside[f]!) / (cells - area));
}

/** The background outside the beam (grown by half its width), per frame, from the grid. */
function backgroundLevel(clip: PreSyncInput['clip'], gain: Float64Array | null): Float64Array {
  const { grid } = clip;
  const cells = grid.gridWidth * grid.gridHeight;
  const frameMean = frameMeansOf(grid);
  const keepOut = keepOutBox(grid, clip.beamRect);
  const raw = keepOut && cellBoxArea(keepOut) < cells ? outsideBox(grid, frameMean, keepOut) : frameMean;
  return gain ? raw.map((v, f) => (gain[f]! > 0 ? v / gain[f]! : NaN)) : raw;
}

function markExposureJumps(input: PreSyncInput, excluded: (string | null)[], events: RunEvent[], warnings: RunWarning[]): void {
  const { clip, series } = input;
  const level = backgroundLevel(clip, input.referenceGiven ? series.gain : null);
  const include = Uint8Array.from(excluded, (e) => (e === null ? 1 : 0));
  const drift = exposureDrift({ level, modulation: series.intensity, include });
  const jumps = detectExposureJumps({ level: drift.driveFreeLevel, skip: Uint8Array.from(include, (k) => 1 - k) });
  for (const j of jumps) {
    events.push({ kind: 'exposure-jump', frameIndex: j.frameIndex, timeS: clip.times[j.frameIndex]!, size: j.size });
    if (!excluded[j.frameIndex]) excluded[j.frameIndex] = 'exposure-jump';
  }
  // Only a reference region corrects exposure: without one, say so (exposure-drift), never that
  // jumps "remain after the reference correction".
  if (!input.referenceGiven && (drift.drifting || jumps.length > 0)) {
    const parts: string[] = [];
    if (drift.drifting) parts.push(`the background outside the beam varies by ${((drift.ratio - 1) * 100).toFixed(0)}% (95th/5th percentile) without following the drive`);
    if (jumps.length > 0) parts.push(`its level jumps ${jumps.length} time${jumps.length > 1 ? 's' : ''} (first at ${clip.times[jumps[0]!.frameIndex]!.toFixed(2)} s)`);
    warnings.push({ code: 'exposure-drift', message: `${parts.join(' and ')}: the camera's exposure changed during the run, which biases the floor and the Kerr fit. Lock exposure or put a constant reference card in view and give --reference-roi`, guideSection: 'lock-exposure' });
  } else if (input.referenceGiven && jumps.length > 0) {
    warnings.push({ code: 'exposure-jump', message: `${jumps.length} sudden exposure change${jumps.length > 1 ? 's' : ''} remain after the reference correction; ${jumps.length > 1 ? 'those frames are' : 'that frame is'} left out of the fit`, guideSection: 'lock-exposure' });
  }
}
