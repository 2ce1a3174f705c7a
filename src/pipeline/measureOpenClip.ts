/**
 * The open level from a separate clip (--open-video: analyser parallel, no field, same camera
 * settings): beam minus background for every frame, read the same way as the run's own beam — the
 * given regions at full resolution, or, for a beam found automatically, the same whole blocks
 * (block means) — so the open level and the run's intensities share one scale.
 * Throws KerrError BAD_ARGUMENT when the clip's frame size differs from the run's.
 */
import { KerrError } from '../errors.js';
import type { Rect, CameraDecoding } from '../media/types.js';
import { probeMedia } from '../media/probe.js';
import { decodingFor } from '../core/camera/decodingFor.js';
import { surroundWeights, type SurroundGeometry } from '../core/regions/localSurround.js';
import type { CellBox } from '../core/regions/cellGeometry.js';
import { decodePass, type RegionSeries } from './decodePass.js';
import { blockSeries } from './blockSeries.js';
import type { RunWarning } from '../result/schema.js';

export interface OpenClipInput {
  path: string;
  width: number;
  height: number;
  decodingOverrides: Partial<CameraDecoding>;
  beamRect: Rect;
  darkRoi?: Rect;
  haveSurround: boolean;
  geom: SurroundGeometry | undefined;
  /** The found beam's blocks (beam, a0, a1, b1) and block size, when the beam was found automatically. */
  blocks?: { boxes: readonly CellBox[]; step: number };
}

async function seriesOf(i: OpenClipInput, warnings: RunWarning[]): Promise<{ frames: number; series: RegionSeries[] }> {
  const probe = await probeMedia(i.path);
  const info = probe.info;
  if (info.width !== i.width || info.height !== i.height) {
    throw new KerrError('BAD_ARGUMENT', `the open video is ${info.width}×${info.height} but the run is ${i.width}×${i.height}`, { path: '--open-video', hint: 'Record the open level with the same camera settings' });
  }
  const decoding = decodingFor(info, i.decodingOverrides);
  const regions: Rect[] = i.blocks ? (i.darkRoi ? [i.darkRoi] : []) : [i.beamRect, ...(i.darkRoi ? [i.darkRoi] : i.haveSurround ? [i.geom!.a0, i.geom!.a1, i.geom!.b1] : [])];
  const pass = await decodePass(probe, decoding, { regions, ringRowStride: 2, ...(i.blocks ? { overviewStep: i.blocks.step } : {}) });
  for (const note of pass.notes) warnings.push({ code: 'probe', message: `open video: ${note}` });
  if (!i.blocks) return { frames: pass.frames, series: pass.regions };
  const fromBlocks = i.blocks.boxes.map((box) => blockSeries(pass.grid!, box));
  return { frames: pass.frames, series: [fromBlocks[0]!, ...(i.darkRoi ? pass.regions : fromBlocks.slice(1))] };
}

/** Beam minus background of every frame of the open clip. */
export async function measureOpenClip(i: OpenClipInput, warnings: RunWarning[]): Promise<number[]> {
  const { frames, series } = await seriesOf(i, warnings);
  const sw = i.geom ? surroundWeights(i.geom).coefficients : [0, 0, 0, 0];
  const levels: number[] = [];
  for (let f = 0; f < frames; f++) {
    let bg = 0;
    if (i.darkRoi) bg = series[1]!.luma[f]!;
    else if (i.haveSurround) bg = sw[1]! * series[1]!.luma[f]! + sw[2]! * series[2]!.luma[f]! + sw[3]! * series[3]!.luma[f]!;
    levels.push(series[0]!.luma[f]! - bg);
  }
  return levels;
}
