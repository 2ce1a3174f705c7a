/**
 * Shared types of the media layer. Everything downstream (region measurement, maps, the analyze
 * pipeline) codes against these.
 */

import type { ColourRange } from '../core/camera/decodingTypes.js';

// The geometry and decoding words belong to the core; re-exported here so the edges keep one import.
export type { Rect } from '../core/regions/rect.js';
export type { CameraDecoding, ColourRange, ResponseTable, TransferName, YuvMatrix } from '../core/camera/decodingTypes.js';

/** What `probeVideo` learns about a file (the `inspect` command prints it). */
export interface VideoInfo {
  path: string;
  container: string; // format_name, e.g. "mov,mp4,m4a,3gp,3g2,mj2"
  codec: string; // e.g. "h264"
  /** Displayed size: rotation metadata applied (90/270 swap width and height). */
  width: number;
  height: number;
  codedWidth: number;
  codedHeight: number;
  rotationDeg: number; // 0, 90, 180, 270
  frameCount: number; // from the container, or counted when the container does not say
  frameCountCounted: boolean;
  nominalFps: number | null; // r_frame_rate
  meanFps: number | null; // frames / duration
  variableFrameRate: boolean;
  durationS: number;
  startTimeS: number;
  pixelFormat: string; // e.g. "yuv420p"
  bitDepth: number;
  colourRange: ColourRange | 'unknown';
  colourTransfer: string; // ffprobe's color_transfer, or "unknown"
  colourPrimaries: string;
  colourMatrix: string; // ffprobe's color_space
}

/**
 * One decoded frame. Planar 8-bit YUV 4:2:0 in the displayed orientation (ffmpeg applies the
 * rotation), cropped/scaled if requested. `data` is a view into a buffer that the stream REUSES
 * for the next frame: copy what you need before pulling the next frame.
 */
export interface Frame {
  index: number; // 0-based index in presentation order
  timeS: number; // presentation time from the container's timestamps, seconds
  width: number;
  height: number;
  /** Y plane (width*height), then U and V planes (ceil(w/2)*ceil(h/2) each). */
  data: Uint8Array;
  /**
   * Bits per sample; absent or 8: one byte per sample. Above 8 (10-, 12- or 16-bit sources), each
   * sample is a 16-bit little-endian word in `data` (read it through a Uint16Array view), value
   * range 0..2^bitDepth − 1, so `data` holds twice as many bytes.
   */
  bitDepth?: number;
}

/** Per-frame measurement of one region (linear units: 1.0 = full-scale white). */
export interface RegionSample {
  r: number;
  g: number;
  b: number;
  /** Rec. 709 luminance 0.2126 R + 0.7152 G + 0.0722 B of the linear channels. */
  luma: number;
  pixelCount: number;
  clippedFraction: number;
}
