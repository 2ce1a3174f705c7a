import { describe, expect, it } from 'vitest';
import { cellBoxToRect, rectToCellBox, growCellBox, cellBoxesOverlap, cellBoxArea, sameCellBox } from '../../../src/core/regions/cellGeometry.js';
import { boxSeries, boxTotals, outsideBoxSeries } from '../../../src/core/scatter/boxSeries.js';
import { referenceGain } from '../../../src/core/scatter/referenceGain.js';

describe('block geometry', () => {
  it('converts between block boxes and pixel rectangles', () => {
    expect(cellBoxToRect({ x0: 2, y0: 1, x1: 3, y1: 1 }, 8)).toEqual({ x: 16, y: 8, w: 16, h: 8 });
    expect(rectToCellBox({ x: 16, y: 8, w: 16, h: 8 }, 8, 40, 30)).toEqual({ x0: 2, y0: 1, x1: 3, y1: 1 });
    // only blocks wholly inside count; a rectangle inside one block takes the block it touches
    expect(rectToCellBox({ x: 13, y: 8, w: 20, h: 9 }, 8, 40, 30)).toEqual({ x0: 2, y0: 1, x1: 3, y1: 1 });
    expect(rectToCellBox({ x: 17, y: 9, w: 3, h: 3 }, 8, 40, 30)).toEqual({ x0: 2, y0: 1, x1: 2, y1: 1 });
    expect(rectToCellBox({ x: 400, y: 9, w: 3, h: 3 }, 8, 40, 30)).toBeNull();
    expect(growCellBox({ x0: 0, y0: 5, x1: 2, y1: 6 }, 2, 40, 30)).toEqual({ x0: 0, y0: 3, x1: 4, y1: 8 });
    expect(cellBoxesOverlap({ x0: 0, y0: 0, x1: 2, y1: 2 }, { x0: 2, y0: 2, x1: 4, y1: 4 })).toBe(true);
    expect(cellBoxesOverlap({ x0: 0, y0: 0, x1: 2, y1: 2 }, { x0: 3, y0: 0, x1: 4, y1: 4 })).toBe(false);
    expect(cellBoxArea({ x0: 1, y0: 1, x1: 3, y1: 2 })).toBe(6);
    expect(sameCellBox({ x0: 1, y0: 1, x1: 3, y1: 2 }, { x0: 1, y0: 1, x1: 3, y1: 2 })).toBe(true);
    expect(sameCellBox({ x0: 1, y0: 1, x1: 3, y1: 2 }, { x0: 1, y0: 1, x1: 3, y1: 3 })).toBe(false);
  });

  it('averages the grid inside and outside a box per frame (hand sums)', () => {
    // 3×2 grid, 2 frames: frame 0 = 1..6, frame 1 = 10·(1..6)
    const grid = Float32Array.of(1, 2, 3, 4, 5, 6, 10, 20, 30, 40, 50, 60);
    const box = { x0: 1, y0: 0, x1: 2, y1: 1 }; // values 2,3,5,6
    expect(Array.from(boxTotals(grid, 2, 3, 2, box))).toEqual([16, 160]); // 2+3+5+6
    expect(Array.from(boxSeries(grid, 2, 3, 2, box))).toEqual([4, 40]);
    expect(() => boxTotals(grid, 2, 3, 2, { x0: 2, y0: 0, x1: 1, y1: 1 })).toThrow(/does not lie inside/);
    const frameMean = Float64Array.of(3.5, 35);
    expect(Array.from(outsideBoxSeries(grid, frameMean, 3, 2, box))).toEqual([2.5, 25]); // (1+4)/2
    expect(() => outsideBoxSeries(grid, frameMean, 3, 2, { x0: 0, y0: 0, x1: 2, y1: 1 })).toThrow(/whole grid/);
  });

  it('recomputes the exposure gain from the reference blocks relative to their median', () => {
    const grid = Float32Array.of(0.2, 0.5, 0.2, 0.6, 0.2, 0.4); // 2×1 grid, 3 frames; reference = right block
    const gain = referenceGain(grid, 3, 2, 1, 8, { x: 8, y: 0, w: 8, h: 8 })!;
    expect(Array.from(gain).map((g) => Number(g.toFixed(6)))).toEqual([1, 1.2, 0.8]);
    expect(referenceGain(new Float32Array(6), 3, 2, 1, 8, { x: 8, y: 0, w: 8, h: 8 })).toBeNull();
  });
});
