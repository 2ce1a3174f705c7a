/**
 * Which frame of the clip regions.png is drawn on: a bright kept frame that is cheap to take.
 *
 * The picture is for checking where the regions sit, so any frame whose beam is at least
 * `BRIGHT_SHARE` of the way from the dimmest to the brightest kept frame serves as well as the
 * brightest. Taking a frame costs ffmpeg a seek to the keyframe at or before it and a decode of every
 * frame from there (grabFramePng): on a clip with a keyframe every 250 frames that is seconds, on
 * the critical path of the run. So among the bright frames the one fewest frames after the keyframe
 * the seek lands on (the last at or before its time − SEEK_BACK_S) wins, and the brighter one on a
 * tie. Without keyframe times (the container marks none) every
 * frame costs the same and the brightest kept frame is taken.
 *
 * Pure.
 * @example showFrame(intensity, excluded, times, probe.keyframeTimesS) // → frame index
 */

/** Share of the kept frames' brightness range a frame must reach to be drawn on (our choice). */
export const BRIGHT_SHARE = 0.8;

/**
 * How far before the time asked for ffmpeg's input seek (`-ss` before `-i`) may land: for a stream
 * with decoding delay (B-frames) it seeks to t − 3/23 s (ffmpeg's command-line tool, from memory of
 * its source; confirmed here by timing: a frame 0.13 s after a keyframe is taken in 0.7 s, the
 * keyframe itself in 4 s because the seek falls back to the previous one). Rounded up.
 */
export const SEEK_BACK_S = 0.15;

/** Index of the last frame whose time is at or before t (−1 when none). */
function frameAtOrBefore(times: Float64Array, t: number): number {
  let lo = 0, hi = times.length - 1, found = -1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    if (times[mid]! <= t) { found = mid; lo = mid + 1; } else hi = mid - 1;
  }
  return found;
}

/**
 * @param intensity how bright the beam is in each frame (its intensity, or the modulation term)
 * @param excluded truthy (a reason) for the frames left out of the fit
 * @param times frame presentation times, s, ascending
 * @param keyframeTimesS keyframe presentation times on the same clock, s, ascending (may be empty)
 * @returns the frame index to draw on (the middle frame when no frame is kept)
 */
export function showFrame(intensity: Float64Array, excluded: ArrayLike<unknown>, times: Float64Array, keyframeTimesS: Float64Array): number {
  let lo = Infinity, hi = -Infinity, brightest = -1;
  for (let f = 0; f < intensity.length; f++) {
    const v = intensity[f]!;
    if (excluded[f] || !Number.isFinite(v)) continue;
    lo = Math.min(lo, v);
    if (v > hi) { hi = v; brightest = f; }
  }
  if (brightest < 0) return intensity.length >> 1;
  if (keyframeTimesS.length === 0) return brightest;
  // half a frame of slack so a keyframe's time matches its own frame
  const slackS = times.length > 1 ? 0.5 * (times[times.length - 1]! - times[0]!) / (times.length - 1) : 0;
  const keyFrames = Array.from(keyframeTimesS, (t) => frameAtOrBefore(times, t + slackS));
  const threshold = lo + BRIGHT_SHARE * (hi - lo);
  let best = brightest, bestCost = Infinity, k = -1;
  for (let f = 0; f < intensity.length; f++) {
    const v = intensity[f]!;
    if (excluded[f] || !Number.isFinite(v) || v < threshold) continue;
    // the keyframe the seek lands on: the last one at or before the frame's time − SEEK_BACK_S
    const landing = times[f]! - SEEK_BACK_S;
    while (k + 1 < keyframeTimesS.length && keyframeTimesS[k + 1]! <= landing) k++;
    while (k >= 0 && keyframeTimesS[k]! > landing) k--;
    const cost = k >= 0 && keyFrames[k]! >= 0 ? f - keyFrames[k]! : f + 1; // no keyframe before: decode from the start
    if (cost < bestCost || (cost === bestCost && v > intensity[best]!)) { best = f; bestCost = cost; }
  }
  return best;
}
