import { describe, expect, it } from 'vitest';
import { encodeMapFiles, encodeFloat32LE, MAP_FORMAT } from '../../src/maps/encodeMapFiles.js';

describe('encodeMapFiles', () => {
  it('writes little-endian float32 rows, top row first, readable with Buffer.readFloatLE', () => {
    const staticMap = Float32Array.of(0.25, -1.5, 3, 1e-7, 0, 42);
    const modulatedMap = Float32Array.of(1, 2, 3, 4, 5, 6);
    const files = encodeMapFiles({ width: 3, height: 2, stepPx: 8, staticMap, modulatedMap, framesUsed: 450, exposureCorrected: true });
    expect(Object.keys(files).sort()).toEqual(['maps/maps.json', 'maps/modulated.f32', 'maps/static.f32']);
    const bytes = Buffer.from(files['maps/static.f32']!);
    expect(bytes.length).toBe(24);
    for (let i = 0; i < 6; i++) expect(bytes.readFloatLE(4 * i)).toBe(staticMap[i]);
    // IEEE-754 single 0.25 = 0x3E800000, little-endian bytes 00 00 80 3E
    expect(Array.from(bytes.subarray(0, 4))).toEqual([0x00, 0x00, 0x80, 0x3e]);
    const header = JSON.parse(new TextDecoder().decode(files['maps/maps.json']));
    expect(header).toMatchObject({ format: MAP_FORMAT, version: 1, width: 3, height: 2, stepPx: 8, sampleType: 'float32', byteOrder: 'little-endian', framesUsed: 450, exposureCorrected: true });
    expect(header.maps.map((m: { file: string }) => m.file)).toEqual(['static.f32', 'modulated.f32']);
  });

  it('refuses a map of the wrong size', () => {
    expect(() => encodeMapFiles({ width: 2, height: 2, stepPx: 4, staticMap: new Float32Array(3), modulatedMap: new Float32Array(4), framesUsed: 1, exposureCorrected: false })).toThrow(/static map holds 3 values/);
    expect(encodeFloat32LE(new Float32Array(0)).length).toBe(0);
  });
});
