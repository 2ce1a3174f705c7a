/**
 * The voltage of each photo: from a voltage map (CSV, parseStillsMap, names matched by
 * matchMapToPhotos; photos not in the map are left out, counted and warned about) or from the file
 * names (voltageFromFileName). Then the unit check, as for a video's log: photo voltages that are
 * not all zero but never exceed SYNC_SETTINGS.minDriveV (50 V) are kilovolts read as volts (a
 * liquid cell needs kilovolts).
 * Edge: reads the map file.
 * @throws KerrError FILE_NOT_FOUND (a missing map), BAD_CSV (as parseStillsMap, matchMapToPhotos),
 *   BAD_ARGUMENT (names without a voltage; voltages that look like kilovolts read as volts).
 * @example const v = await seriesVoltages(listing, undefined); v.voltageV
 */
import { readFile } from 'node:fs/promises';
import { SYNC_SETTINGS } from '../core/sync/findSyncOffset.js';
import { KerrError } from '../errors.js';
import type { RunWarning } from '../result/schema.js';
import type { PhotoFormat, StillPhotoListing } from './listStillPhotos.js';
import { parseStillsMap } from './parseStillsMap.js';
import { matchMapToPhotos } from './matchMapToPhotos.js';
import { voltageFromFileName } from './voltageFromFileName.js';
import { listNames } from './listNames.js';

export interface SeriesVoltages {
  photos: string[];
  formats: PhotoFormat[];
  voltageV: number[];
  voltageSource: 'csv' | 'file-names';
  /** Photos of the folder left out (not in the map), with the reason. */
  leftOut: Array<{ file: string; reason: string }>;
  warnings: RunWarning[];
  notes: string[];
}

type Listing = StillPhotoListing;

async function fromMap(listing: Listing, voltsPath: string): Promise<SeriesVoltages> {
  let text: string;
  try {
    text = await readFile(voltsPath, 'utf8');
  } catch {
    throw new KerrError('FILE_NOT_FOUND', `the voltage map ${voltsPath} does not exist`, { path: '--volts', hint: 'Give the CSV that lists each photo file and its voltage' });
  }
  const map = parseStillsMap(text, voltsPath);
  const matched = matchMapToPhotos([...map.voltageByFile.keys()], listing.photos, voltsPath);
  const keep: number[] = [];
  const out: SeriesVoltages = { photos: [], formats: [], voltageV: [], voltageSource: 'csv', leftOut: [], warnings: [], notes: [] };
  listing.photos.forEach((p, i) => {
    if (matched.has(p)) keep.push(i);
    else out.leftOut.push({ file: p, reason: `not in ${voltsPath}` });
  });
  const notListed = out.leftOut.map((l) => l.file);
  if (notListed.length > 0) out.warnings.push({ code: 'photos-not-in-map', message: `${notListed.length} photo(s) in the folder are not in ${voltsPath} and were left out: ${listNames(notListed)}` });
  if (map.duplicates > 0) out.notes.push(`${map.duplicates} row(s) of ${voltsPath} repeat a photo with the same voltage`);
  out.photos = keep.map((i) => listing.photos[i]!);
  out.formats = keep.map((i) => listing.formats[i]!);
  out.voltageV = out.photos.map((p) => map.voltageByFile.get(matched.get(p)!)!.voltageV);
  return out;
}

function fromFileNames(listing: Listing): SeriesVoltages {
  const without: string[] = [];
  const voltageV: number[] = [];
  for (const p of listing.photos) {
    const v = voltageFromFileName(p);
    if (v === null) without.push(p);
    else voltageV.push(v);
  }
  if (without.length > 0) {
    throw new KerrError('BAD_ARGUMENT', `no voltage in the file name of ${listNames(without)}`, {
      path: without[0]!,
      hint: 'Name the photos with their voltage (e.g. step07_12.5kV.jpg, 0450V.png, 3,2kV.tif; see docs/stills.md) or give a CSV with --volts',
    });
  }
  return { photos: listing.photos, formats: listing.formats, voltageV, voltageSource: 'file-names', leftOut: [], warnings: [], notes: [] };
}

export async function seriesVoltages(listing: Listing, voltsPath: string | undefined): Promise<SeriesVoltages> {
  const out = voltsPath !== undefined ? await fromMap(listing, voltsPath) : fromFileNames(listing);
  let maxAbsV = 0;
  for (const v of out.voltageV) maxAbsV = Math.max(maxAbsV, Math.abs(v));
  if (maxAbsV > 0 && maxAbsV < SYNC_SETTINGS.minDriveV) {
    throw new KerrError('BAD_ARGUMENT', `the photo voltages never exceed ${maxAbsV} V, too little to modulate a Kerr cell: they look like kilovolts read as volts`, {
      path: out.voltageSource === 'file-names' ? out.photos[0]! : voltsPath ?? '--volts',
      hint: out.voltageSource === 'file-names'
        ? 'Write the unit in the file names, e.g. step07_4.5kV.jpg'
        : 'Put the unit in the voltage column\'s header, e.g. voltage_kV or U [kV]',
    });
  }
  return out;
}
