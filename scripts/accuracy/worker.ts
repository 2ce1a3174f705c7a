/** Worker thread of the coverage study: receives case indices, answers with their outcomes. */
import { parentPort, workerData } from 'node:worker_threads';
import { mkdtempSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { randomCase } from './randomCase.js';
import { runCase } from './runCase.js';

const root = (workerData as { tmpRoot: string }).tmpRoot;
parentPort!.on('message', (index: number) => {
  const dir = mkdtempSync(join(root, `case-${index}-`));
  runCase(randomCase(index), join(dir, 'run'))
    .then((outcome) => parentPort!.postMessage({ index, outcome }))
    .catch((err: unknown) => parentPort!.postMessage({ index, error: err instanceof Error ? err.stack ?? err.message : String(err) }))
    .finally(() => rmSync(dir, { recursive: true, force: true }));
});
