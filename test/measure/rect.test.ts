import { describe, expect, it } from 'vitest';
import { boundingRect, parseRect, validateRect } from '../../src/measure/rect.js';
import { KerrError } from '../../src/errors.js';

function errorOf(fn: () => unknown): KerrError {
  try {
    fn();
  } catch (e) {
    if (e instanceof KerrError) return e;
    throw e;
  }
  throw new Error('expected a KerrError');
}

describe('parseRect', () => {
  it('reads x,y,w,h with optional spaces', () => {
    expect(parseRect('10,20,30,40', '--roi')).toEqual({ x: 10, y: 20, w: 30, h: 40 });
    expect(parseRect(' 0, 0 ,5,6 ', '--roi')).toEqual({ x: 0, y: 0, w: 5, h: 6 });
  });

  it.each(['10,20,30', '10,20,30,40,50', 'a,b,c,d', '10;20;30;40', '1.5,2,3,4', ''])('rejects the malformed %j as BAD_REGION naming the option', (text) => {
    const e = errorOf(() => parseRect(text, '--dark-roi'));
    expect(e.code).toBe('BAD_REGION');
    expect(e.message).toContain('--dark-roi');
    expect(e.message).toContain('x,y,w,h');
    expect(e.hint).toBeTruthy();
  });

  it.each(['1,2,0,4', '1,2,4,0', '1,2,-3,4'])('rejects zero or negative size %j', (text) => {
    const e = errorOf(() => parseRect(text, '--roi'));
    expect(e.code).toBe('BAD_REGION');
    expect(e.message).toMatch(/positive width and height/);
  });

  it('rejects a negative corner', () => {
    expect(errorOf(() => parseRect('-1,2,3,4', '--roi')).code).toBe('BAD_REGION');
  });
});

describe('validateRect', () => {
  it('accepts a region touching the frame edges', () => {
    expect(validateRect({ x: 0, y: 0, w: 320, h: 240 }, 320, 240, '--roi')).toEqual({ x: 0, y: 0, w: 320, h: 240 });
  });

  it('rejects a region reaching past the right edge and states the frame size', () => {
    const e = errorOf(() => validateRect({ x: 300, y: 0, w: 40, h: 30 }, 320, 240, '--roi'));
    expect(e.code).toBe('BAD_REGION');
    expect(e.message).toContain('320x240');
    expect(e.message).toContain('x = 340');
    expect(e.path).toBe('--roi');
  });

  it('rejects a region past the bottom edge', () => {
    const e = errorOf(() => validateRect({ x: 0, y: 230, w: 10, h: 11 }, 320, 240, '--reference-roi'));
    expect(e.message).toContain('y = 241');
    expect(e.message).toContain('--reference-roi');
  });

  it('rejects fractional or empty regions', () => {
    expect(errorOf(() => validateRect({ x: 0.5, y: 0, w: 10, h: 10 }, 320, 240, '--roi')).code).toBe('BAD_REGION');
    expect(errorOf(() => validateRect({ x: 0, y: 0, w: 0, h: 10 }, 320, 240, '--roi')).code).toBe('BAD_REGION');
  });
});

describe('boundingRect', () => {
  it('holds all rectangles', () => {
    expect(boundingRect([{ x: 10, y: 20, w: 5, h: 5 }, { x: 2, y: 30, w: 3, h: 10 }])).toEqual({ x: 2, y: 20, w: 13, h: 20 });
  });
});
