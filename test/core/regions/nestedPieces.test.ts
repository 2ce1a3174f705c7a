import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { isNestedChain, nestedPieces } from '../../../src/core/regions/nestedPieces.js';

describe('nestedPieces', () => {
  it('covers every pixel of the outer rectangle exactly once, each in the smallest ring that holds it (checked pixel by pixel)', () => {
    fc.assert(fc.property(
      fc.array(fc.tuple(fc.nat(4), fc.nat(4), fc.nat(4), fc.nat(4)), { minLength: 0, maxLength: 3 }),
      fc.integer({ min: 1, max: 6 }), fc.integer({ min: 1, max: 6 }),
      (grows, w0, h0) => {
        const chain = [{ x: 20, y: 20, w: w0, h: h0 }];
        for (const [l, t, r, b] of grows) {
          const p = chain[chain.length - 1]!;
          chain.push({ x: p.x - l, y: p.y - t, w: p.w + l + r, h: p.h + t + b });
        }
        expect(isNestedChain(chain)).toBe(true);
        const { pieces, ringOf } = nestedPieces(chain);
        const outer = chain[chain.length - 1]!;
        for (let y = outer.y; y < outer.y + outer.h; y++) {
          for (let x = outer.x; x < outer.x + outer.w; x++) {
            const hits = pieces.map((p, i) => (x >= p.x && x < p.x + p.w && y >= p.y && y < p.y + p.h ? i : -1)).filter((i) => i >= 0);
            expect(hits).toHaveLength(1);
            const smallest = chain.findIndex((r) => x >= r.x && x < r.x + r.w && y >= r.y && y < r.y + r.h);
            expect(ringOf[hits[0]!]).toBe(smallest);
          }
        }
      },
    ));
  });

  it('says when a chain is not nested', () => {
    expect(isNestedChain([{ x: 0, y: 0, w: 5, h: 5 }, { x: 1, y: 0, w: 5, h: 5 }])).toBe(false);
  });
});
