import { locate } from '../src/media/ffmpegPaths.js';
import { toolVersion } from './toolVersion.js';

/** Versions recorded in every result. */
export function toolVersionInfo(): { toolVersion: string; ffmpegVersion: string | null } {
  let ffmpegVersion: string | null = null;
  try {
    ffmpegVersion = locate('ffmpeg').version;
  } catch {
    ffmpegVersion = null;
  }
  return { toolVersion: toolVersion(), ffmpegVersion };
}
