/**
 * A chain of nested rectangles r₀ ⊂ r₁ ⊂ … ⊂ rₙ cut into disjoint pieces: r₀ itself, then each
 * ring rₖ \ rₖ₋₁ as up to four strips (top, bottom, left, right). Measuring the pieces converts
 * every pixel of rₙ once; the sums of the nested rectangles are cumulative sums of the pieces.
 * Pure. Throws nothing; empty strips are left out. `ringOf[i]` is the chain index of piece i.
 */
import type { Rect } from './rect.js';

export function nestedPieces(chain: readonly Rect[]): { pieces: Rect[]; ringOf: number[] } {
  const pieces: Rect[] = [];
  const ringOf: number[] = [];
  const push = (r: Rect, k: number) => {
    if (r.w > 0 && r.h > 0) {
      pieces.push(r);
      ringOf.push(k);
    }
  };
  if (chain.length === 0) return { pieces, ringOf };
  push(chain[0]!, 0);
  for (let k = 1; k < chain.length; k++) {
    const o = chain[k]!;
    const i = chain[k - 1]!;
    push({ x: o.x, y: o.y, w: o.w, h: i.y - o.y }, k);
    push({ x: o.x, y: i.y + i.h, w: o.w, h: o.y + o.h - (i.y + i.h) }, k);
    push({ x: o.x, y: i.y, w: i.x - o.x, h: i.h }, k);
    push({ x: i.x + i.w, y: i.y, w: o.x + o.w - (i.x + i.w), h: i.h }, k);
  }
  return { pieces, ringOf };
}

/** True when every rectangle of the chain lies inside the next one. */
export function isNestedChain(chain: readonly Rect[]): boolean {
  for (let k = 1; k < chain.length; k++) {
    const i = chain[k - 1]!, o = chain[k]!;
    if (i.x < o.x || i.y < o.y || i.x + i.w > o.x + o.w || i.y + i.h > o.y + o.h) return false;
  }
  return true;
}
