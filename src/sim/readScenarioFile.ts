/**
 * Reads a scenario JSON file from disk and parses it (parseScenario). The edge between the file
 * system and the pure scenario parser.
 * Throws KerrError FILE_NOT_FOUND (missing or unreadable file) or BAD_SCENARIO (not JSON, with
 * line and column, or a bad value), UNSAFE (drive above the breakdown field).
 * @example const scenario = await readScenarioFile('scenarios/example-ramp.json')
 */
import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { KerrError } from '../errors.js';
import { parseScenario, type Scenario } from './scenario.js';
import { missingPathText } from '../io/missingPathText.js';

export async function readScenarioFile(path: string, overrides: { seed?: number } = {}): Promise<Scenario> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw new KerrError('FILE_NOT_FOUND', code === 'ENOENT' || code === 'ELOOP' ? missingPathText(path, `scenario file ${path} not found`) : `cannot read scenario file ${path} (${code ?? 'error'})`, {
      path,
      hint: 'Check the path; scenarios/example-ramp.json is a starting point',
    });
  }
  let json: unknown;
  try {
    json = JSON.parse(text.replace(/^\uFEFF/, ''));
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    const at = /position (\d+)/.exec(message);
    let where = '';
    if (at) {
      const before = text.slice(0, Number(at[1]));
      const line = before.split('\n').length;
      const column = before.length - before.lastIndexOf('\n');
      where = ` at line ${line}, column ${column}`;
    }
    throw new KerrError('BAD_SCENARIO', `scenario file ${path} is not valid JSON${where}`, {
      path,
      hint: 'Fix the JSON syntax (no comments or trailing commas); docs/scenario.md shows the format',
    });
  }
  if (overrides.seed !== undefined && json !== null && typeof json === 'object' && !Array.isArray(json)) {
    json = { ...(json as Record<string, unknown>), seed: overrides.seed };
  }
  return parseScenario(json, basename(path));
}
