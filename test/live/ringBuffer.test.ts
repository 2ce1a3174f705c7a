import { describe, expect, it } from 'vitest';
import { RingBuffer } from '../../src/live/ringBuffer.js';

describe('RingBuffer', () => {
  it('keeps the newest values in order and drops the oldest when full', () => {
    const r = new RingBuffer(3);
    for (const x of [1, 2, 3, 4, 5]) r.push(x);
    expect(Array.from(r.toArray())).toEqual([3, 4, 5]);
    expect(r.length).toBe(3);
    expect(r.pushed).toBe(5);
    expect(r.at(0)).toBe(3);
    expect(r.last()).toBe(5);
    expect(Number.isNaN(r.at(3))).toBe(true);
    expect(Array.from(r.tail(2))).toEqual([4, 5]);
    expect(Array.from(r.tail(10))).toEqual([3, 4, 5]);
  });

  it('holds no more than its capacity over an hour of frames at 60 fps', () => {
    const r = new RingBuffer(7216);
    for (let k = 0; k < 3600 * 60; k++) r.push(k);
    expect(r.length).toBe(7216);
    expect(r.at(0)).toBe(3600 * 60 - 7216);
    expect(r.last()).toBe(3600 * 60 - 1);
  });

  it('matches a plain array model for random pushes and clears', () => {
    let seed = 5;
    const rand = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
    const r = new RingBuffer(17);
    let model: number[] = [];
    for (let k = 0; k < 2000; k++) {
      if (rand() < 0.01) { r.clear(); model = []; continue; }
      const x = rand();
      r.push(x);
      model.push(x);
      if (model.length > 17) model.shift();
      expect(r.length).toBe(model.length);
    }
    expect(Array.from(r.toArray())).toEqual(model);
  });

  it('refuses a capacity below one', () => {
    expect(() => new RingBuffer(0)).toThrow(/capacity/);
    expect(() => new RingBuffer(2.5)).toThrow(/capacity/);
  });
});
