/**
 * The raw static and modulated maps as files a user can load anywhere: one float32 file per map
 * plus one small JSON header for both (docs/scatter.md, "Map files", is the user's description):
 *
 *   maps/static.f32, maps/modulated.f32: width × height IEEE-754 float32 values, little-endian,
 *     row-major with the top row first (value of block (x, y) at byte offset 4·(y·width + x));
 *     block (x, y) covers video pixels [x·stepPx, (x+1)·stepPx) × [y·stepPx, (y+1)·stepPx);
 *   maps/maps.json: { format: "kerrtrace-block-maps", version: 1, width, height, stepPx,
 *     sampleType: "float32", byteOrder: "little-endian", order: "row-major, top row first",
 *     framesUsed, exposureCorrected, maps: [{ name, file, unit, meaning }] }.
 *
 * Little-endian is written explicitly (DataView), whatever the machine's order.
 * Pure (returns bytes; the caller writes them). Throws KerrError INTERNAL when a map does not hold
 * width × height values.
 * @example encodeMapFiles({ width: 2, height: 1, stepPx: 8, staticMap, modulatedMap, framesUsed: 300, exposureCorrected: false })['maps/static.f32'].length → 8
 */
import { KerrError } from '../errors.js';

export interface MapFilesInput {
  width: number;
  height: number;
  stepPx: number;
  staticMap: Float32Array;
  modulatedMap: Float32Array;
  framesUsed: number;
  exposureCorrected: boolean;
}

export const MAP_FORMAT = 'kerrtrace-block-maps';

/** Float32 values as little-endian bytes. */
export function encodeFloat32LE(values: Float32Array): Uint8Array {
  const bytes = new Uint8Array(values.length * 4);
  const view = new DataView(bytes.buffer);
  for (let i = 0; i < values.length; i++) view.setFloat32(4 * i, values[i]!, true);
  return bytes;
}

export function encodeMapFiles(input: MapFilesInput): Record<string, Uint8Array> {
  const { width, height, stepPx } = input;
  for (const [name, map] of [['static', input.staticMap], ['modulated', input.modulatedMap]] as const) {
    if (map.length !== width * height) throw new KerrError('INTERNAL', `the ${name} map holds ${map.length} values, not ${width}×${height}`);
  }
  const header = {
    format: MAP_FORMAT,
    version: 1,
    width,
    height,
    stepPx,
    sampleType: 'float32',
    byteOrder: 'little-endian',
    order: 'row-major, top row first',
    framesUsed: input.framesUsed,
    exposureCorrected: input.exposureCorrected,
    maps: [
      {
        name: 'static',
        file: 'static.f32',
        unit: 'linear (1 = full-scale white)',
        meaning: 'intercept of block intensity regressed on the modulation term: floor, scatter halo, ambient light and black level',
      },
      {
        name: 'modulated',
        file: 'modulated.f32',
        unit: 'linear per unit of modulation term',
        meaning: 'slope of block intensity regressed on the modulation term: the Kerr-modulated light (modulation amplitude per block)',
      },
    ],
  };
  return {
    'maps/static.f32': encodeFloat32LE(input.staticMap),
    'maps/modulated.f32': encodeFloat32LE(input.modulatedMap),
    'maps/maps.json': new TextEncoder().encode(`${JSON.stringify(header, null, 2)}\n`),
  };
}
