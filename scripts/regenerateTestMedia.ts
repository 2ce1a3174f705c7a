/**
 * `npm run media`: renders every test-media case from its scenario file(s) with the simulator,
 * replacing the clip, log and truth beside the scenario. Each case folder holds scenario.json
 * (the run) and optionally open.json (an open-level clip rendered into open/).
 */
import { existsSync, readdirSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { readScenarioFile } from '../src/sim/readScenarioFile.js';
import { simulateRun } from '../src/sim/simulate.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'test-media');

for (const name of readdirSync(root).sort()) {
  const dir = join(root, name);
  if (!statSync(dir).isDirectory()) continue;
  for (const [file, out] of [['scenario.json', 'run'], ['open.json', 'open']] as const) {
    const path = join(dir, file);
    if (!existsSync(path)) continue;
    const started = Date.now();
    const summary = await simulateRun(await readScenarioFile(path), join(dir, out), { force: true });
    process.stdout.write(`${name}/${out}: ${summary.frameCount} frames, ${summary.durationS.toFixed(1)} s, ${((Date.now() - started) / 1000).toFixed(1)} s to render\n`);
  }
}
