/**
 * The probe's and the decoder's notes as run warnings, so what `inspect` and `trace` show also
 * reaches result.json and the report of a run: "probe" for facts about the file (frame counts,
 * timestamps), "decoding" for guesses about its colour encoding (untagged transfer, matrix or
 * range; a measured response used in place of a tag), pointing to the camera section of the guide.
 * Pure. Throws nothing.
 * @example decodingWarnings(['the container has no presentation timestamps; ...'], [])
 *   // [{ code: 'probe', message: 'the container has no presentation timestamps; ...' }]
 */
import type { RunWarning } from '../result/schema.js';

export function decodingWarnings(probeNotes: readonly string[], decodingNotes: readonly string[]): RunWarning[] {
  return [
    ...probeNotes.map((message): RunWarning => ({ code: 'probe', message })),
    ...decodingNotes.map((message): RunWarning => ({ code: 'decoding', message, guideSection: 'lock-camera' })),
  ];
}
