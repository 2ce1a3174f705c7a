/**
 * Matches the file names of a voltage map (CSV) to the photos of the folder: exactly, then
 * case-insensitively, then without extension; a path in the map is reduced to its last part.
 * Returns photo → the map's name for it. Pure.
 * @throws KerrError BAD_CSV when a map row matches no photo (or several), or two rows name the
 *   same photo.
 * @example matchMapToPhotos(['STEP01.JPG'], ['step01.jpg'], 'map.csv').get('step01.jpg') === 'STEP01.JPG'
 */
import { extname } from 'node:path';
import { KerrError } from '../errors.js';
import { listNames } from './listNames.js';

export function matchMapToPhotos(mapNames: string[], photos: string[], csvName: string): Map<string, string> {
  const byLower = new Map<string, string[]>();
  const byStem = new Map<string, string[]>();
  for (const p of photos) {
    const lower = p.toLowerCase();
    byLower.set(lower, [...(byLower.get(lower) ?? []), p]);
    const stem = lower.slice(0, lower.length - extname(lower).length);
    byStem.set(stem, [...(byStem.get(stem) ?? []), p]);
  }
  const photoSet = new Set(photos);
  const result = new Map<string, string>(); // photo → csv name
  const missing: string[] = [];
  for (const raw of mapNames) {
    const name = raw.split(/[\\/]/).pop()!;
    const lower = name.toLowerCase();
    const candidates = photoSet.has(name) ? [name] : (byLower.get(lower) ?? byStem.get(lower) ?? []);
    if (candidates.length !== 1) {
      missing.push(raw);
      continue;
    }
    const photo = candidates[0]!;
    if (result.has(photo)) {
      throw new KerrError('BAD_CSV', `${csvName} names the photo ${photo} twice (as ${result.get(photo)} and ${raw})`, { path: csvName, hint: 'Keep one row per photo' });
    }
    result.set(photo, raw);
  }
  if (missing.length > 0) {
    throw new KerrError('BAD_CSV', `${csvName} names ${missing.length === 1 ? 'a photo' : `${missing.length} photos`} not found in the folder: ${listNames(missing)}`, {
      path: csvName,
      hint: 'The file column must hold the photo names exactly as in the folder (extension optional); fix the names or remove those rows',
    });
  }
  return result;
}
