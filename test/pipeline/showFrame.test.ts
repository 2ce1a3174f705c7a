/**
 * The frame regions.png is drawn on: bright (at least 80 % of the kept frames' range), kept, and as
 * few frames after a keyframe as possible, because taking it costs ffmpeg a decode from that
 * keyframe. Synthetic series; the keyframe times of a real clip come from the probe (checked on a
 * test-media clip whose encoder puts a keyframe every 250 frames).
 */
import { describe, expect, it } from 'vitest';
import { showFrame, BRIGHT_SHARE, SEEK_BACK_S } from '../../src/pipeline/showFrame.js';
import { probeMedia } from '../../src/media/probe.js';
import { testMediaFile } from '../helpers/referenceData.js';

const FPS = 30;
function clip(n: number): { times: Float64Array; intensity: Float64Array } {
  const times = Float64Array.from({ length: n }, (_, f) => 2 + f / FPS); // a clock that starts at 2 s
  // one slow rise and fall: peak at frame 500
  const intensity = Float64Array.from({ length: n }, (_, f) => 0.05 + Math.exp(-(((f - 500) / 150) ** 2)));
  return { times, intensity };
}

describe('showFrame', () => {
  it('takes the brightest kept frame when no keyframe times are known', () => {
    const { times, intensity } = clip(900);
    expect(showFrame(intensity, new Array(900).fill(null), times, new Float64Array())).toBe(500);
  });

  it('skips excluded frames, even the brightest', () => {
    const { times, intensity } = clip(900);
    const excluded: (string | null)[] = new Array(900).fill(null);
    excluded[500] = 'spark';
    const f = showFrame(intensity, excluded, times, new Float64Array());
    expect([499, 501]).toContain(f);
  });

  it('prefers a bright frame just after a keyframe to the brightest one far from it', () => {
    const { times, intensity } = clip(900);
    const keys = Float64Array.from([0, 250, 460, 750], (f) => times[f]!);
    const f = showFrame(intensity, new Array(900).fill(null), times, keys);
    // the first frame at least SEEK_BACK_S after keyframe 460 (ffmpeg's seek lands that far back)
    expect(f).toBe(460 + Math.ceil(SEEK_BACK_S * FPS));
    const lo = Math.min(...intensity), hi = Math.max(...intensity);
    expect(intensity[f]!).toBeGreaterThanOrEqual(lo + BRIGHT_SHARE * (hi - lo));
  });

  it('never draws on a dim frame to save decoding', () => {
    const { times, intensity } = clip(900);
    const keys = Float64Array.from([0, 250, 750], (f) => times[f]!); // none inside the bright stretch
    const f = showFrame(intensity, new Array(900).fill(null), times, keys);
    const lo = Math.min(...intensity), hi = Math.max(...intensity);
    expect(intensity[f]!).toBeGreaterThanOrEqual(lo + BRIGHT_SHARE * (hi - lo));
    // the first bright frame after keyframe 250 costs least
    let first = 0;
    while (intensity[first]! < lo + BRIGHT_SHARE * (hi - lo)) first++;
    expect(f).toBe(first);
  });

  it('gives the middle frame when every frame is left out', () => {
    const { times, intensity } = clip(100);
    expect(showFrame(intensity, new Array(100).fill('spark'), times, new Float64Array())).toBe(50);
  });
});

describe('probe keyframe times', () => {
  it('lists the keyframes the container marks, ascending, on the frame clock', async () => {
    const probe = await probeMedia(testMediaFile('cfr-ramp', 'run', 'clip.mp4'));
    const k = probe.keyframeTimesS;
    expect(k.length).toBeGreaterThan(0);
    expect(k[0]).toBeCloseTo(probe.frameTimesS[0]!, 6); // an encode starts on a keyframe
    for (let i = 1; i < k.length; i++) expect(k[i]!).toBeGreaterThan(k[i - 1]!);
    for (const t of k) expect(probe.frameTimesS.some((ft) => Math.abs(ft - t) < 1e-6)).toBe(true);
  });
});
