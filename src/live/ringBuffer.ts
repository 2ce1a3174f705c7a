/**
 * A fixed-capacity ring of numbers (Float64Array): pushing onto a full ring drops the oldest
 * value, so memory stays bounded however long the live view runs (an hour at 30 fps needs no more
 * than the capacity). Pure; no allocation after construction except in `toArray`/`tail`.
 * @throws KerrError INTERNAL for a capacity that is not a whole number ≥ 1.
 * @example const r = new RingBuffer(3); r.push(1); r.push(2); r.push(3); r.push(4); r.toArray() // [2, 3, 4]
 */
import { KerrError } from '../errors.js';

export class RingBuffer {
  readonly capacity: number;
  private readonly data: Float64Array;
  private start = 0;
  private count = 0;
  /** Values pushed since construction or the last clear (including the dropped ones). */
  pushed = 0;

  constructor(capacity: number) {
    if (!Number.isInteger(capacity) || capacity < 1) throw new KerrError('INTERNAL', `a ring buffer needs a whole capacity of 1 or more, not ${capacity}`);
    this.capacity = capacity;
    this.data = new Float64Array(capacity);
  }

  get length(): number {
    return this.count;
  }

  push(value: number): void {
    const end = (this.start + this.count) % this.capacity;
    this.data[end] = value;
    if (this.count < this.capacity) this.count++;
    else this.start = (this.start + 1) % this.capacity;
    this.pushed++;
  }

  /** The i-th oldest value held (0 = oldest); NaN outside 0..length−1. */
  at(i: number): number {
    if (i < 0 || i >= this.count) return Number.NaN;
    return this.data[(this.start + i) % this.capacity]!;
  }

  /** The newest value, NaN when empty. */
  last(): number {
    return this.at(this.count - 1);
  }

  /** The values held, oldest first, as a new array. */
  toArray(): Float64Array {
    return this.tail(this.count);
  }

  /** The newest n values (fewer when fewer are held), oldest first, as a new array. */
  tail(n: number): Float64Array {
    const m = Math.max(0, Math.min(n, this.count));
    const out = new Float64Array(m);
    const first = this.count - m;
    for (let i = 0; i < m; i++) out[i] = this.data[(this.start + first + i) % this.capacity]!;
    return out;
  }

  clear(): void {
    this.start = 0;
    this.count = 0;
    this.pushed = 0;
  }
}
