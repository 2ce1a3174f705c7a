/**
 * Everything about a simulated bench that does not change from frame to frame, computed once:
 * the beam profile image G(x,y) (peak 1), the halo image H(x,y) (peak 1), per-channel Kerr
 * constants, the light levels, the particle tracks and the spark frames, and the regions (ROI
 * around the beam, reference ROI inside the patch) that the truth file reports.
 *
 * Beam: Gaussian G = exp(−dx²/2σx² − dy²/2σy²), or top-hat with a logistic soft edge
 * G = f(r)/f(0), f(r) = 1/(1 + e^((r − R)/edge)). Halo: H = exp(−r²/2σh²) about the beam centre.
 * Particles cross the beam on straight lines (closest approach within half the beam radius of the
 * centre, random direction) at constant speed over durationS; sparks flash the frame whose
 * interval [t_k, t_k+1) holds the spark time.
 * Pixel centres are at integer coordinates. Units: pixels, seconds, linear radiance (1 = full
 * scale). Pure (the RNG is passed in). Throws nothing.
 * @example prepareScene(parseScenario(json, 'a.json'), clock, makeRng(1)).roi → { x, y, w, h }
 */
import type { Rect } from '../media/types.js';
import type { Scenario, Rgb } from './scenario.js';
import type { FrameClock } from './frameTimes.js';
import type { Rng } from './rng.js';

export interface ParticleTrack {
  startS: number;
  endS: number;
  /** Position at startS and velocity, px and px/s. */
  x0Px: number;
  y0Px: number;
  vxPxPerS: number;
  vyPxPerS: number;
  /** Distance of the straight path from the beam centre, px. */
  closestApproachPx: number;
}

export interface SparkEvent {
  timeS: number;
  frameIndex: number;
}

export interface Scene {
  scenario: Scenario;
  width: number;
  height: number;
  beam: Float32Array;
  halo: Float32Array;
  /** B per channel (R, G, B), m/V²: B times the dispersion factor. */
  kerrConstantPerChannel: Rgb;
  /** Light at zero field besides the static-retardance term: scatter floor F + polariser leak A/ratio. */
  polariserLeak: number;
  particles: ParticleTrack[];
  sparks: SparkEvent[];
  /** Spark radiance added to each frame (0 for most). */
  sparkRadiancePerFrame: Float64Array;
  roi: Rect;
  referenceRoi: Rect | null;
  /** Distance from the beam centre at which the beam is negligible (used for ROI and particle paths), px. */
  beamReachPx: number;
}

export function prepareScene(scenario: Scenario, clock: FrameClock, rng: Rng): Scene {
  const { widthPx: width, heightPx: height } = scenario.camera;
  const { light, dirt } = scenario;
  const cx = light.centreXPx;
  const cy = light.centreYPx;
  const beam = new Float32Array(width * height);
  const halo = new Float32Array(width * height);
  const profile = light.profile;
  const haloTwoVar = 2 * dirt.haloSigmaPx * dirt.haloSigmaPx;
  const logistic = (r: number): number => (profile.kind === 'tophat' ? 1 / (1 + Math.exp((r - profile.radiusPx) / profile.edgePx)) : 0);
  const tophatPeak = logistic(0);
  for (let y = 0; y < height; y++) {
    const dy = y - cy;
    for (let x = 0; x < width; x++) {
      const dx = x - cx;
      const i = y * width + x;
      if (profile.kind === 'gaussian') {
        beam[i] = Math.exp(-(dx * dx) / (2 * profile.sigmaXPx * profile.sigmaXPx) - (dy * dy) / (2 * profile.sigmaYPx * profile.sigmaYPx));
      } else {
        beam[i] = logistic(Math.sqrt(dx * dx + dy * dy)) / tophatPeak;
      }
      halo[i] = Math.exp(-(dx * dx + dy * dy) / haloTwoVar);
    }
  }

  const beamReachPx = profile.kind === 'gaussian'
    ? 2.5 * Math.max(profile.sigmaXPx, profile.sigmaYPx)
    : profile.radiusPx + 3 * profile.edgePx;
  const half = Math.ceil(beamReachPx);
  const x0 = Math.max(0, Math.round(cx) - half);
  const y0 = Math.max(0, Math.round(cy) - half);
  const x1 = Math.min(width, Math.round(cx) + half + 1);
  const y1 = Math.min(height, Math.round(cy) + half + 1);
  const roi: Rect = { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };

  const patch = scenario.camera.referencePatch;
  let referenceRoi: Rect | null = null;
  if (patch) {
    const inset = patch.rect.w >= 12 && patch.rect.h >= 12 ? 2 : 0; // keep clear of chroma-subsampled edges
    referenceRoi = { x: patch.rect.x + inset, y: patch.rect.y + inset, w: patch.rect.w - 2 * inset, h: patch.rect.h - 2 * inset };
  }

  const particles = planParticles(scenario, beamReachPx, rng.split('particles'));
  const { sparks, perFrame } = planSparks(scenario, clock, rng.split('sparks'));
  const d = light.dispersion;
  const b = scenario.cell.kerrConstantMPerV2;
  return {
    scenario,
    width,
    height,
    beam,
    halo,
    kerrConstantPerChannel: [b * d[0], b * d[1], b * d[2]],
    polariserLeak: light.amplitude / scenario.cell.extinctionRatio,
    particles,
    sparks,
    sparkRadiancePerFrame: perFrame,
    roi,
    referenceRoi,
    beamReachPx,
  };
}

function planParticles(scenario: Scenario, beamReachPx: number, rng: Rng): ParticleTrack[] {
  const { count, durationS } = scenario.dirt.particles;
  const { centreXPx: cx, centreYPx: cy } = scenario.light;
  const tracks: ParticleTrack[] = [];
  const latestStartS = Math.max(0, scenario.durationS - durationS);
  for (let i = 0; i < count; i++) {
    const startS = rng.between(0, latestStartS);
    const angleRad = rng.between(0, 2 * Math.PI);
    const offsetPx = rng.between(-0.5, 0.5) * beamReachPx;
    const ux = Math.cos(angleRad);
    const uy = Math.sin(angleRad);
    // closest point to the centre is offset along the normal; the path runs ±reach along the direction
    const midX = cx - uy * offsetPx;
    const midY = cy + ux * offsetPx;
    const speedPxPerS = (2 * beamReachPx) / durationS;
    tracks.push({
      startS,
      endS: startS + durationS,
      x0Px: midX - ux * beamReachPx,
      y0Px: midY - uy * beamReachPx,
      vxPxPerS: ux * speedPxPerS,
      vyPxPerS: uy * speedPxPerS,
      closestApproachPx: Math.abs(offsetPx),
    });
  }
  return tracks.sort((a, b) => a.startS - b.startS);
}

/** Index of the frame whose interval [t_k, t_k+1) holds timeS (the last frame holds everything after it). */
export function frameIndexAt(timesS: Float64Array, timeS: number): number {
  let lo = 0;
  let hi = timesS.length - 1;
  if (timeS <= timesS[0]!) return 0;
  if (timeS >= timesS[hi]!) return hi;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (timesS[mid]! <= timeS) lo = mid;
    else hi = mid;
  }
  return lo;
}

function planSparks(scenario: Scenario, clock: FrameClock, rng: Rng): { sparks: SparkEvent[]; perFrame: Float64Array } {
  const { timesS, count, brightness } = scenario.dirt.sparks;
  const perFrame = new Float64Array(clock.timesS.length);
  const times = timesS ?? Array.from({ length: count }, () => rng.between(0, scenario.durationS)).sort((a, b) => a - b);
  const sparks = times.map((timeS) => {
    const frameIndex = frameIndexAt(clock.timesS, timeS);
    perFrame[frameIndex] = perFrame[frameIndex]! + brightness;
    return { timeS, frameIndex };
  });
  return { sparks, perFrame };
}
