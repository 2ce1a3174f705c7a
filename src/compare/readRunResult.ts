/**
 * Reads one run's result.json for `compare`: the argument may be the file itself or the folder
 * that holds it. Checks, with one BAD_RESULT line each: the file exists, is JSON, is a kerrtrace
 * run result of the schema version this tool reads, has no unknown top-level keys, and carries
 * the fields compare uses with the right types (cell geometry as positive numbers, headline
 * figures as {value: number, stdErr?: number}). Also returns the file's SHA-256 for provenance.
 * Throws KerrError BAD_RESULT (the path is in the error's `path`).
 * @example const { result, source } = await readRunResult('runs/before'); // reads runs/before/result.json
 */
import { createHash } from 'node:crypto';
import { readFile, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { KerrError } from '../errors.js';
import { READABLE_RESULT_SCHEMA_VERSIONS, type InputFile, type RunResult } from '../result/schema.js';
import { missingPathText } from '../io/missingPathText.js';

/** Every top-level key of RunResult; the Record type makes the compiler flag a key added to the schema but not here. */
const KNOWN_KEYS: Record<keyof RunResult, true> = {
  schemaVersion: true, kind: true, label: true, createdAt: true, source: true, tool: true, inputs: true, options: true,
  cell: true, camera: true, regions: true, kerrConstant: true, halfWaveVoltage: true, syncOffset: true, floorFraction: true,
  contrastRatio: true, quarterWaveVoltage: true, identifiable: true, identifiability: true, model: true, fit: true,
  linearised: true, sync: true, frames: true, events: true, log: true, scatter: true, hysteresis: true, conductivity: true,
  channels: true, cameraResponse: true, floorFractionTerms: true, warnings: true, files: true, uncertainty: true, validity: true,
};

const HEADLINE = ['kerrConstant', 'halfWaveVoltage', 'syncOffset', 'floorFraction', 'contrastRatio', 'quarterWaveVoltage'] as const;

export async function readRunResult(pathArg: string): Promise<{ result: RunResult; source: InputFile }> {
  let file = pathArg;
  let info;
  try {
    info = await stat(pathArg);
  } catch {
    throw bad(pathArg, missingPathText(pathArg, `no result file at ${pathArg}`), 'Give the result.json written by `kerrtrace analyze`, or the folder that holds it');
  }
  if (info.isDirectory()) {
    file = join(pathArg, 'result.json');
    try {
      info = await stat(file);
    } catch {
      throw bad(file, `the folder ${pathArg} holds no result.json`, 'Give a folder written by `kerrtrace analyze`, or the result file itself');
    }
  }
  const bytes = await readFile(file);
  let data: unknown;
  try {
    data = JSON.parse(bytes.toString('utf8'));
  } catch (err) {
    const why = err instanceof Error ? err.message.split('\n')[0] : 'parse error';
    throw bad(file, `${file} is not valid JSON (${why})`, 'Give the result.json written by `kerrtrace analyze`');
  }
  const result = validate(data, file);
  return { result, source: { path: file, sha256: createHash('sha256').update(bytes).digest('hex') } };
}

function bad(path: string, message: string, hint: string): KerrError {
  return new KerrError('BAD_RESULT', message, { path, hint });
}

function isObject(x: unknown): x is Record<string, unknown> {
  return typeof x === 'object' && x !== null && !Array.isArray(x);
}

function validate(data: unknown, file: string): RunResult {
  const hint = 'Give the result.json written by `kerrtrace analyze`';
  if (!isObject(data)) throw bad(file, `${file} does not hold a JSON object`, hint);
  if (data.kind !== 'kerrtrace-run') {
    throw bad(file, `expected a kerrtrace run result (kind "kerrtrace-run") in ${file} but received kind ${JSON.stringify(data.kind ?? null)}`, hint);
  }
  if (typeof data.schemaVersion !== 'number' || !READABLE_RESULT_SCHEMA_VERSIONS.includes(data.schemaVersion)) {
    throw bad(file, `expected result schema version ${READABLE_RESULT_SCHEMA_VERSIONS.join(' or ')} in ${file} but received ${JSON.stringify(data.schemaVersion ?? null)}`, 'Re-run `kerrtrace analyze` with this version of kerrtrace, or compare with the version that wrote it');
  }
  const unknown = Object.keys(data).filter((k) => !(k in KNOWN_KEYS));
  if (unknown.length > 0) throw bad(file, `${file} has unknown field${unknown.length > 1 ? 's' : ''} ${unknown.map((k) => JSON.stringify(k)).join(', ')}`, 'Give an unedited result.json written by `kerrtrace analyze`');
  const need = (cond: boolean, what: string): void => {
    if (!cond) throw bad(file, `expected ${what} in ${file}`, 'The file looks damaged or hand-edited; re-run `kerrtrace analyze`');
  };
  need(typeof data.label === 'string', 'a string "label"');
  need(typeof data.createdAt === 'string', 'a string "createdAt"');
  need(typeof data.identifiable === 'boolean', 'a true/false "identifiable"');
  need(isObject(data.cell), 'a "cell" object');
  const cell = data.cell as Record<string, unknown>;
  for (const k of ['lengthM', 'effectiveLengthM', 'gapM']) need(typeof cell[k] === 'number' && (cell[k] as number) > 0, `a positive number "cell.${k}"`);
  need(cell.wavelengthNm === null || typeof cell.wavelengthNm === 'number', 'a number or null "cell.wavelengthNm"');
  need(isObject(data.camera), 'a "camera" object');
  const camera = data.camera as Record<string, unknown>;
  need(typeof camera.width === 'number' && typeof camera.height === 'number', 'numbers "camera.width" and "camera.height"');
  need(camera.fps === null || typeof camera.fps === 'number', 'a number or null "camera.fps"');
  need(typeof camera.transfer === 'string' && typeof camera.range === 'string', 'strings "camera.transfer" and "camera.range"');
  for (const k of HEADLINE) need(isQuantity(data[k]), `a figure {value, stdErr} "${k}"`);
  // Damaged figures: a negative or non-finite uncertainty, a non-positive B or V_π.
  for (const k of HEADLINE) {
    const q = data[k] as { value: number | null; stdErr?: number | null };
    need(q.stdErr === undefined || q.stdErr === null || q.stdErr >= 0, `a non-negative uncertainty "${k}.stdErr" (received ${String(q.stdErr)})`);
  }
  for (const k of ['kerrConstant', 'halfWaveVoltage'] as const) {
    const q = data[k] as { value: number | null };
    need(q.value === null || q.value > 0, `a positive "${k}.value" (received ${String(q.value)})`);
  }
  if (data.uncertainty !== undefined) need(isObject(data.uncertainty) && isObject((data.uncertainty as Record<string, unknown>).kerrConstant), 'an "uncertainty" object with a "kerrConstant" budget');
  need(isObject(data.log), 'a "log" object');
  const log = data.log as Record<string, unknown>;
  need(log.temperatureC === null || isQuantity(log.temperatureC), 'a figure or null "log.temperatureC"');
  need(Array.isArray(data.warnings), 'a "warnings" list');
  need(isObject(data.inputs), 'an "inputs" object');
  if (data.scatter !== undefined) {
    need(isObject(data.scatter), 'a "scatter" object');
    for (const [k, v] of Object.entries(data.scatter as Record<string, unknown>)) need(v === undefined || isQuantity(v), `a figure "scatter.${k}"`);
  }
  return data as unknown as RunResult;
}

function isQuantity(x: unknown): boolean {
  if (!isObject(x)) return false;
  // JSON has no NaN/Infinity: analyze writes them as null, which compare treats as "not reported".
  if (!(typeof x.value === 'number' || x.value === null)) return false;
  return x.stdErr === undefined || x.stdErr === null || typeof x.stdErr === 'number';
}
