/**
 * The camera response profile file (`kerrtrace calibrate-camera` writes it; `analyze` and `stills`
 * read it with --camera-profile): a small JSON document holding the measured response as a
 * monotone table from R'G'B' code value (0..255 scale, after range expansion and matrix) to
 * relative linear light, what the codes were decoded with, the camera's make, model and settings
 * where the file said them, the date, the data it came from, and the fit residual. The format is
 * documented in docs/camera-response.md.
 *
 * `parseCameraProfile` is pure (checks the shape, the table's monotony); `readCameraProfile`
 * reads a file. @throws KerrError FILE_NOT_FOUND, BAD_PROFILE (not JSON, not a profile, a table
 * that cannot be used).
 * @example const profile = await readCameraProfile('phone-pro-mode.json'); profile.response.code.length
 */
import { readFile } from 'node:fs/promises';
import { KerrError } from '../errors.js';
import { checkResponseTable } from '../core/camera/responseTable.js';
import type { ResponseTable } from '../media/types.js';

export const CAMERA_PROFILE_KIND = 'kerrtrace-camera-profile';
export const CAMERA_PROFILE_VERSION = 1;

export interface CameraProfile {
  kind: typeof CAMERA_PROFILE_KIND;
  version: typeof CAMERA_PROFILE_VERSION;
  createdAt: string;
  tool: { name: 'kerrtrace'; version: string };
  /** Make, model, software... as the file's metadata gives them (EXIF or container tags). */
  camera: Record<string, string>;
  /** Exposure, ISO, colour tags, pixel format... as the metadata gives them. */
  settings: Record<string, string>;
  /** How the code values in the table were obtained from the file. */
  decoding: { range: string; matrix: string; transferTag: string; bitDepth: number };
  source: {
    kind: 'rotating-analyser' | 'angle-table' | 'photo-angles';
    files: string[];
    /** Frames or photos that entered the fit. */
    points: number;
    /** Period of the light (half a turn of the analyser), s, for a steady rotation. */
    lightPeriodS?: number;
    /** Angle of the analyser at which the light is brightest, as found, deg (0 = as given). */
    brightestAtDeg?: number;
    /** The image channel the codes were read from ('r', 'g' or 'b'). */
    channel: string;
  };
  /** Relative linear light (0 at the lowest code measured, 1 at the highest) against code value. */
  response: ResponseTable;
  /** Codes covered by the calibration; outside them the table is extended linearly. */
  codeRange: [number, number];
  fit: {
    /** RMS of Malus's law minus the table, relative to the light range (0..1). */
    residualRms: number;
    /** Largest deviation of a measured curve from the tagged curve, relative to full scale, for orientation. */
    departureFromTags: number;
  };
}

function bad(path: string, why: string): KerrError {
  return new KerrError('BAD_PROFILE', `${path} is not a usable camera profile: ${why}`, {
    path,
    hint: 'Give a file written by `kerrtrace calibrate-camera`, or make one again',
  });
}

export function parseCameraProfile(json: unknown, path: string): CameraProfile {
  if (json === null || typeof json !== 'object' || Array.isArray(json)) throw bad(path, 'not a JSON object');
  const p = json as Partial<CameraProfile>;
  if (p.kind !== CAMERA_PROFILE_KIND) throw bad(path, `its kind is ${JSON.stringify(p.kind)}, not "${CAMERA_PROFILE_KIND}"`);
  if (p.version !== CAMERA_PROFILE_VERSION) throw bad(path, `version ${JSON.stringify(p.version)} is not one this kerrtrace reads (${CAMERA_PROFILE_VERSION})`);
  if (!p.response || typeof p.response !== 'object') throw bad(path, 'no response table');
  checkResponseTable(p.response, path);
  const range = p.codeRange;
  if (!Array.isArray(range) || range.length !== 2 || !(range[1] > range[0])) throw bad(path, 'no code range');
  if (!p.fit || !Number.isFinite(p.fit.residualRms)) throw bad(path, 'no fit residual');
  return p as CameraProfile;
}

export async function readCameraProfile(path: string): Promise<CameraProfile> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new KerrError('FILE_NOT_FOUND', `no camera profile at ${path}${code && code !== 'ENOENT' ? ` (${code})` : ''}`, { path, hint: 'Check the path of the --camera-profile file' });
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    throw bad(path, 'not valid JSON');
  }
  return parseCameraProfile(json, path);
}
