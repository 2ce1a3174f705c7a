import { describe, expect, it } from 'vitest';
import { findPhotoRegions } from '../../src/stills/findPhotoRegions.js';
import type { PhotoBlockGrid } from '../../src/stills/photoBlockGrid.js';

/** 20×10 blocks of 4 px: ambient 0.05, a 2×2-block beam at blocks (12..13, 4..5) rising with k, a grey card at (1..2, 1..2). */
function grid(k: number, exposure: number, card = 0.18, step = 0.08): PhotoBlockGrid {
  const gw = 20, gh = 10;
  const luma = new Float64Array(gw * gh).fill(0.05);
  for (let y = 4; y <= 5; y++) for (let x = 12; x <= 13; x++) luma[y * gw + x] = 0.05 + step * k;
  for (let y = 1; y <= 2; y++) for (let x = 1; x <= 2; x++) luma[y * gw + x] = card;
  return { step: 4, gridWidth: gw, gridHeight: gh, luma: luma.map((v) => v * exposure), clipped: new Float64Array(gw * gh) };
}

describe('findPhotoRegions', () => {
  it('the beam is the area that varies across the photos, rings around it as analyze builds them, means from the grid', () => {
    const grids = [0, 1, 2, 3, 4, 5].map((k) => grid(k, 1));
    const found = findPhotoRegions(grids, new Float64Array(6).fill(1), new Uint8Array(6).fill(1));
    expect(found.beam).toEqual({ x: 48, y: 16, w: 8, h: 8 });
    // gap of one block, rings round(2/3) → 2 blocks wide (at least 2)
    expect(found.geometry.a0).toEqual({ x: 44, y: 12, w: 16, h: 16 });
    expect(found.geometry.a1).toEqual({ x: 36, y: 4, w: 32, h: 32 });
    expect(found.geometry.b1).toEqual({ x: 28, y: 0, w: 48, h: 40 }); // clipped at the top edge
    expect(found.means[0][3]).toBeCloseTo(0.05 + 0.24, 12);
    expect(found.means[3][3]).toBeCloseTo(0.05 + (4 * 0.24) / 120, 12); // b1 (12 × 10 blocks) holds the beam's 4 blocks
  });

  it('a change of exposure alone is not taken for the beam: the grids are divided by the relative exposure', () => {
    const exposure = [1, 2, 0.5, 1.5, 0.8, 1.2];
    const grids = [0, 1, 2, 3, 4, 5].map((k) => grid(k, exposure[k]!, 0.6, 0.02)); // a bright card swings more than the beam
    const found = findPhotoRegions(grids, Float64Array.from(exposure), new Uint8Array(6).fill(1));
    expect(found.beam).toEqual({ x: 48, y: 16, w: 8, h: 8 });
  });

  it('nothing varies: refused in one line (BAD_REGION) that says to give --roi', () => {
    const grids = [0, 1, 2, 3, 4, 5].map(() => grid(1, 1));
    expect(() => findPhotoRegions(grids, new Float64Array(6).fill(1), new Uint8Array(6).fill(1))).toThrow(/could not be found automatically/);
  });
});
