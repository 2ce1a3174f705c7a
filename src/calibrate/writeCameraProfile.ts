/**
 * Writes a camera profile as pretty JSON, whole or not at all (written beside, then renamed). An
 * existing file is replaced only with `force` and only when it is itself a camera profile: a file
 * kerrtrace did not write is never overwritten.
 * Edge module. @throws KerrError FILE_EXISTS.
 * @example await writeCameraProfile(profile, 'phone.json', { force: false })
 */
import { readFile } from 'node:fs/promises';
import { KerrError } from '../errors.js';
import { CAMERA_PROFILE_KIND, type CameraProfile } from '../io/cameraProfile.js';
import { writeFileAtomic } from '../report/writeFileAtomic.js';

export async function writeCameraProfile(profile: CameraProfile, path: string, opts: { force: boolean }): Promise<void> {
  let existing: string | null = null;
  try { existing = await readFile(path, 'utf8'); } catch { existing = null; }
  if (existing !== null) {
    let isProfile = false;
    try { isProfile = (JSON.parse(existing) as { kind?: unknown }).kind === CAMERA_PROFILE_KIND; } catch { isProfile = false; }
    if (!opts.force || !isProfile) {
      throw new KerrError('FILE_EXISTS', `${path} already exists${isProfile ? '' : ' and is not a camera profile'}`, {
        path: '--out',
        hint: isProfile ? 'Choose another --out file, or add --force to replace that profile' : 'Choose another --out file; kerrtrace replaces only its own camera profiles',
      });
    }
  }
  await writeFileAtomic(path, `${JSON.stringify(profile, null, 2)}\n`);
}
