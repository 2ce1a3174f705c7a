/**
 * The pure renderer of the bench simulator: one frame at video time t.
 *
 * Scene (linear radiance, 1 = full scale, per channel c with light weight w_c):
 *   radiance_c = ambient + G(x,y)·w_c·(A·T_c(V(t)) + F + A/ratio) + H(x,y)·w_c·S
 *                [+ particle glow] [+ spark flash]; inside the reference patch: the patch radiance
 *                (+ spark flash).
 *   T_c = cos²(α−β) − sin2α·sin2β·sin²(δ_c/2)   (Jones calculus, any optics text),
 *   δ_c = δ_static + 2π·B_c·L_eff·(V/d)²         (Kerr law), V(t) = V_drive(t).
 * Camera: s = g·radiance; s + √(s/N + σ_read²)·z (shot noise with N photons per full scale and
 * read noise, z standard normal); clip to [0, 1]; transfer (sRGB IEC 61966-2-1, BT.709 OETF, or
 * linear); round to 8 bits. Output: interleaved RGB bytes, row-major, width·height·3.
 *
 * Pure: no file system, clock or process state; the RNG is passed in. Throws nothing.
 * @example renderFrame(scene, 0, 0, 1, rng.split('frame', 0), makeCodeEncoder('srgb'), new Uint8Array(w * h * 3))
 */
import { jonesTransmission } from '../core/physics/kerr.js';
import { driveVoltageV } from './drive.js';
import { NORMAL_TABLE, type Rng } from './rng.js';
import type { Rgb, ScenarioCamera } from './scenario.js';
import type { Scene } from './scene.js';
import { CODE_BINS, type CodeTable } from './transfer.js';

export interface RadianceInfo {
  voltageV: number;
  /** Transmission T_c per channel at this voltage. */
  transmission: Rgb;
  /** Mean radiance over all pixels and channels, before gain (what an exposure meter sees). */
  meanRadiance: number;
}

/**
 * Analyser angle at video time t, rad: fixed, or turning steadily by 2π every
 * cell.analyserTurnPeriodS (a calibration recording, Malus's law I ∝ cos²(analyser − polariser)).
 */
export function analyserAngleAt(scene: Scene, timeS: number): number {
  const { cell } = scene.scenario;
  return cell.analyserTurnPeriodS > 0 ? cell.analyserAngleRad + (2 * Math.PI * timeS) / cell.analyserTurnPeriodS : cell.analyserAngleRad;
}

/** T_c per channel at voltage V (Jones transmission with the static retardance added), at video time t. */
export function channelTransmission(scene: Scene, voltageV: number, timeS = 0): Rgb {
  const { cell } = scene.scenario;
  const analyserRad = analyserAngleAt(scene, timeS);
  const fieldVPerM = voltageV / cell.gapM;
  const t = (kerrConstantMPerV2: number): number => {
    const retardanceRad = cell.staticRetardanceRad + 2 * Math.PI * kerrConstantMPerV2 * cell.effectiveLengthM * fieldVPerM * fieldVPerM;
    return jonesTransmission(cell.polariserAngleRad, analyserRad, retardanceRad);
  };
  const b = scene.kerrConstantPerChannel;
  return [t(b[0]), t(b[1]), t(b[2])];
}

/** Beam profile G at a continuous position (same formula as the precomputed image). */
function beamAt(scene: Scene, xPx: number, yPx: number): number {
  const { light } = scene.scenario;
  const dx = xPx - light.centreXPx;
  const dy = yPx - light.centreYPx;
  const p = light.profile;
  if (p.kind === 'gaussian') return Math.exp(-(dx * dx) / (2 * p.sigmaXPx * p.sigmaXPx) - (dy * dy) / (2 * p.sigmaYPx * p.sigmaYPx));
  const f = (r: number): number => 1 / (1 + Math.exp((r - p.radiusPx) / p.edgePx));
  return f(Math.sqrt(dx * dx + dy * dy)) / f(0);
}

/** Fills `out` (width·height·3 floats) with the scene's linear radiance at video time timeS. */
export function renderRadiance(scene: Scene, frameIndex: number, timeS: number, out: Float32Array): RadianceInfo {
  const { scenario, width, height, beam, halo } = scene;
  const { light, dirt, camera } = scenario;
  const voltageV = driveVoltageV(scenario.drive, timeS);
  const transmission = channelTransmission(scene, voltageV, timeS);
  const w = light.channelWeights;
  const zeroFieldExtra = dirt.scatterFloor + scene.polariserLeak;
  const beamLevel = [0, 1, 2].map((c) => w[c]! * (light.amplitude * transmission[c]! + zeroFieldExtra));
  const haloLevel = [0, 1, 2].map((c) => w[c]! * dirt.haloPeak);
  const spark = scene.sparkRadiancePerFrame[frameIndex] ?? 0;
  const ambient = camera.ambient + spark;
  const a0 = beamLevel[0]!, a1 = beamLevel[1]!, a2 = beamLevel[2]!;
  const h0 = haloLevel[0]!, h1 = haloLevel[1]!, h2 = haloLevel[2]!;
  const n = width * height;
  for (let i = 0, j = 0; i < n; i++, j += 3) {
    const g = beam[i]!;
    const h = halo[i]!;
    out[j] = ambient + g * a0 + h * h0;
    out[j + 1] = ambient + g * a1 + h * h1;
    out[j + 2] = ambient + g * a2 + h * h2;
  }

  for (const p of scene.particles) {
    if (timeS < p.startS || timeS > p.endS) continue;
    const px = p.x0Px + p.vxPxPerS * (timeS - p.startS);
    const py = p.y0Px + p.vyPxPerS * (timeS - p.startS);
    const glow = dirt.particles.brightness * beamAt(scene, px, py);
    if (glow <= 0) continue;
    const sizePx = dirt.particles.sizePx;
    const reach = Math.ceil(3 * sizePx);
    const twoVar = 2 * sizePx * sizePx;
    for (let y = Math.max(0, Math.floor(py) - reach); y <= Math.min(height - 1, Math.ceil(py) + reach); y++) {
      for (let x = Math.max(0, Math.floor(px) - reach); x <= Math.min(width - 1, Math.ceil(px) + reach); x++) {
        const blob = glow * Math.exp(-((x - px) ** 2 + (y - py) ** 2) / twoVar);
        const j = (y * width + x) * 3;
        out[j] = out[j]! + blob * w[0];
        out[j + 1] = out[j + 1]! + blob * w[1];
        out[j + 2] = out[j + 2]! + blob * w[2];
      }
    }
  }

  const patch = camera.referencePatch;
  if (patch) {
    const level = patch.radiance + spark;
    for (let y = patch.rect.y; y < patch.rect.y + patch.rect.h; y++) {
      out.fill(level, (y * width + patch.rect.x) * 3, (y * width + patch.rect.x + patch.rect.w) * 3);
    }
  }

  const rowSums = new Float64Array(height);
  for (let y = 0; y < height; y++) {
    let s = 0;
    const end = (y + 1) * width * 3;
    for (let j = y * width * 3; j < end; j++) s += out[j]!;
    rowSums[y] = s;
  }
  let total = 0;
  for (let y = 0; y < height; y++) total += rowSums[y]!;
  return { voltageV, transmission, meanRadiance: total / (n * 3) };
}

export interface ExposureInfo {
  /** Channel values that reached full scale (code 255) after gain and noise. */
  clippedCount: number;
}

/**
 * Camera stage: gain, shot and read noise, clipping, transfer, rounding to the table's codes
 * (8-bit into a Uint8Array, 10-bit into a Uint16Array).
 * `codes` maps linear light to a code value (makeCodeEncoder); `rng` supplies the noise.
 */
export function exposeFrame(
  radiance: Float32Array,
  gain: number,
  camera: Pick<ScenarioCamera, 'photonsPerFullScale' | 'readNoise'>,
  rng: Rng,
  codes: CodeTable,
  out: Uint8Array | Uint16Array,
): ExposureInfo {
  const shotScale = camera.photonsPerFullScale > 0 ? 1 / camera.photonsPerFullScale : 0;
  const readVar = camera.readNoise * camera.readNoise;
  const noisy = shotScale > 0 || readVar > 0;
  const { lut, thresholds, topCode } = codes;
  const normal = NORMAL_TABLE;
  let clippedCount = 0;
  let bits = 0;
  const n = radiance.length;
  for (let j = 0; j < n; j++) {
    let s = gain * radiance[j]!;
    if (noisy) {
      // 32 random bits give two 16-bit indexes into the normal table
      let index: number;
      if ((j & 1) === 0) {
        bits = rng.nextInt32();
        index = bits >>> 16;
      } else {
        index = bits & 0xffff;
      }
      s += Math.sqrt((s > 0 ? s * shotScale : 0) + readVar) * normal[index]!;
    }
    let code: number;
    if (!(s > 0)) code = 0;
    else if (s >= 1) code = topCode;
    else {
      code = lut[(s * CODE_BINS) | 0]!;
      while (s >= thresholds[code]!) code++;
    }
    if (code === topCode) clippedCount++;
    out[j] = code;
  }
  return { clippedCount };
}

/** Radiance then camera: fills `out` (width·height·3 bytes). `work` is an optional reusable float buffer. */
export function renderFrame(
  scene: Scene,
  frameIndex: number,
  timeS: number,
  gain: number,
  rng: Rng,
  codes: CodeTable,
  out: Uint8Array | Uint16Array,
  work: Float32Array = new Float32Array(scene.width * scene.height * 3),
): RadianceInfo & ExposureInfo {
  const info = renderRadiance(scene, frameIndex, timeS, work);
  const exposure = exposeFrame(work, gain, scene.scenario.camera, rng, codes, out);
  return { ...info, ...exposure };
}
