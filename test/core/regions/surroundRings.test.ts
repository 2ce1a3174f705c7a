import { describe, expect, it } from 'vitest';
import { growRect, surroundRings } from '../../../src/core/regions/surroundRings.js';

// Expected rectangles worked by hand from the stated rule: gap = max(2, round(0.15·side)),
// ring width = max(4, round(0.25·side)), everything clipped to the frame (self-consistency of the
// documented geometry; no outside source).
describe('surroundRings', () => {
  it('puts a gap and two rings around a beam in the middle of the frame', () => {
    const g = surroundRings({ x: 100, y: 80, w: 40, h: 40 }, 320, 240); // gap 6, ring 10
    expect(g.a0).toEqual({ x: 94, y: 74, w: 52, h: 52 });
    expect(g.a1).toEqual({ x: 84, y: 64, w: 72, h: 72 });
    expect(g.b1).toEqual({ x: 74, y: 54, w: 92, h: 92 });
  });
  it('uses the minimum gap and ring for a small beam and clips at the frame edge', () => {
    const g = surroundRings({ x: 0, y: 3, w: 8, h: 10 }, 20, 20); // side 8: gap 2, ring 4
    expect(g.a0).toEqual({ x: 0, y: 1, w: 10, h: 14 });
    expect(g.a1).toEqual({ x: 0, y: 0, w: 14, h: 19 });
    expect(g.b1).toEqual({ x: 0, y: 0, w: 18, h: 20 });
    expect(growRect({ x: 15, y: 15, w: 5, h: 5 }, 3, 20, 20)).toEqual({ x: 12, y: 12, w: 8, h: 8 });
  });
});
