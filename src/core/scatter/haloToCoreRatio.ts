/**
 * Halo-to-core ratio: how bright the static forward-scatter light just outside the beam is,
 * relative to the beam's modulation amplitude at its core:
 *
 *   R = (mean over the halo band of (a_c − φ·b_c) − far dark level) / (κ · peak of the modulated map).
 *
 * "Just outside the beam" is the halo band of `regionsFromMaps`: the blocks outside the beam's
 * 5 % footprint within w = max(r₅₀, 2 blocks) of it (r₅₀ the half-peak radius), for a round beam
 * the ring r₅ < r ≤ r₅ + r₅₀. The band mean and the dark level are intercepts of the per-block
 * regression (`modulationMaps`, static light); the peak is a slope (I_amp of the brightest block).
 * κ (`gridLuminanceScale`, default 1) turns the peak from the grid's grey-luma units into Rec. 709
 * luminance, the unit of the numerator: the halo is a small signal over the room light, where the
 * grid reads luminance to first order, but a bright coloured core is compressed by the transfer
 * curve (a red spot by about 0.6×) and would otherwise inflate R by 1/κ.
 * φ·b_c removes the beam's own zero-field light (floor) from the band: it follows the beam profile,
 * so in block c it is the floor fraction φ (zero-field light over I_amp, from the Kerr fit) times
 * the block's modulated light b_c; without φ (or φ not finite and ≥ 0) nothing is removed.
 * The simulator's truth (src/sim/truth.ts) is the same quantity from the planted light:
 * S·(mean H over the band − H at the far corner)/A.
 *
 * Standard error by first-order propagation (numerator N, peak P and κ independent):
 *   σ_R = √((σ_N/(κP))² + (R·σ_P/P)² + (R·σ_κ/κ)²),  σ_N = √(σ_band² + σ_dark²),
 * with σ_band = √(Σ se(a_c)²)/n over the n band blocks.
 *
 * Dimensionless. A clean liquid gives R near 0 (only polariser leak and stray light); dirt that
 * scatters light forward raises it. Returns null (nothing to report)
 * when there is no far dark region or no band. Pure; throws nothing.
 * @example haloToCoreRatio(maps, regions, { coreScale: { scale: 1.6, stdErr: 0.005 }, floorFraction: 0.026 }) → { ratio: { value: 0.0150, stdErr: 0.0001 }, … }
 */
import { quantity, type Quantity } from '../../quantity.js';
import type { ModulationMaps } from './modulationMaps.js';
import type { ScatterRegions } from './regionsFromMaps.js';

export interface HaloMeasure {
  ratio: Quantity;
  /** Mean static light in the band (floor removed) and the far dark level, linear (grid) units. */
  bandLevel: number;
  darkLevel: number;
  /** κ·P: the core's modulation amplitude in luminance units. */
  coreAmplitude: number;
  /** Blocks averaged in the band. */
  bandCells: number;
}

export interface HaloOptions {
  /** κ and its standard error (`gridLuminanceScale`); default 1 ± 0. */
  coreScale?: { scale: number; stdErr: number };
  /** φ, the floor fraction of the Kerr fit; default: no floor removed. */
  floorFraction?: number;
}

export function haloToCoreRatio(maps: ModulationMaps, regions: ScatterRegions, options: HaloOptions = {}): HaloMeasure | null {
  const coreScale = options.coreScale ?? { scale: 1, stdErr: 0 };
  const phi = options.floorFraction !== undefined && Number.isFinite(options.floorFraction) && options.floorFraction >= 0 ? options.floorFraction : 0;
  if (!regions.dark || regions.halo.cellCount <= 0) return null;
  const { mask, outer } = regions.halo;
  let sum = 0;
  let varSum = 0;
  let n = 0;
  for (let y = outer.y0; y <= outer.y1; y++) {
    for (let x = outer.x0; x <= outer.x1; x++) {
      const c = y * maps.width + x;
      if (!mask[c]) continue;
      sum += maps.staticMap[c]! - phi * maps.modulatedMap[c]!;
      varSum += maps.staticStdErr[c]! ** 2;
      n++;
    }
  }
  if (n === 0) return null;
  const bandLevel = sum / n;
  const numerator = bandLevel - regions.dark.level;
  const numeratorErr = Math.hypot(Math.sqrt(varSum) / n, regions.dark.levelStdErr);
  const peak = regions.peakModulated.value * coreScale.scale;
  const ratio = numerator / peak;
  const ratioErr = Math.hypot(
    numeratorErr / peak,
    ratio * (regions.peakModulated.stdErr / regions.peakModulated.value),
    ratio * (coreScale.stdErr / coreScale.scale),
  );
  return { ratio: quantity(ratio, ratioErr), bandLevel, darkLevel: regions.dark.level, coreAmplitude: peak, bandCells: n };
}
