/**
 * The mean of every frame over the blocks of a block store laid out frame after frame
 * (`data[f·cells + c]`): the whole-frame brightness series that flash detection and beam finding
 * start from. Pure; `frames · cells` must not exceed `data.length`.
 * @example frameMeans(Float32Array.of(1, 3, 2, 2), 2, 2) // Float64Array [2, 2]
 */
export function frameMeans(data: Float32Array, frames: number, cells: number): Float64Array {
  const out = new Float64Array(frames);
  for (let f = 0; f < frames; f++) {
    let s = 0;
    const off = f * cells;
    for (let c = 0; c < cells; c++) s += data[off + c]!;
    out[f] = s / cells;
  }
  return out;
}
