import { describe, expect, it } from 'vitest';
import { mean } from 'simple-statistics';
import { frameMeans } from '../../../src/core/events/frameMeans.js';

describe('frameMeans', () => {
  it('gives each frame the mean of its blocks (checked against simple-statistics mean)', () => {
    const cells = 5, frames = 4;
    const data = Float32Array.from({ length: cells * frames }, (_v, i) => Math.sin(i) * 3 + i / 7);
    const m = frameMeans(data, frames, cells);
    for (let f = 0; f < frames; f++) expect(m[f]).toBeCloseTo(mean(Array.from(data.subarray(f * cells, (f + 1) * cells))), 12);
    expect(Array.from(frameMeans(Float32Array.of(1, 3, 2, 2), 2, 2))).toEqual([2, 2]);
  });
});
