/**
 * SHA-256 of every input file of a run, started when the run starts so that the reads overlap the
 * decoding, and awaited once when the record is built. Each hash is settled at once, so a file
 * that cannot be read never leaves an unhandled rejection when the run fails earlier; `done()`
 * then throws its error.
 * @example const hashes = startInputHashes({ video: 'run.mp4', volts: 'volts.csv' }); …; (await hashes.done()).video.sha256
 */
import { sha256File } from '../io/sha256File.js';
import type { InputFile, RunResult } from '../result/schema.js';

export interface InputPaths {
  video: string;
  volts: string;
  openVideo?: string;
  cameraProfile?: string;
}

type Settled = { ok: InputFile } | { error: unknown };

export interface InputHashes {
  done: () => Promise<RunResult['inputs']>;
}

export function startInputHashes(paths: InputPaths): InputHashes {
  const started: [keyof InputPaths, Promise<Settled>][] = [];
  for (const key of ['video', 'volts', 'openVideo', 'cameraProfile'] as const) {
    const path = paths[key];
    if (path === undefined) continue;
    started.push([key, sha256File(path).then((sha256) => ({ ok: { path, sha256 } }), (error: unknown) => ({ error }))]);
  }
  return {
    done: async () => {
      const inputs: RunResult['inputs'] = {};
      for (const [key, pending] of started) {
        const s = await pending;
        if ('error' in s) throw s.error;
        inputs[key] = s.ok;
      }
      return inputs;
    },
  };
}
