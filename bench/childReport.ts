/**
 * Runs a bench child (a Node script in dist/bench) and resolves with the JSON object on the last
 * line it prints; rejects when the child reports `error` or gives no `frames`/`seconds`.
 */
import { spawn } from 'node:child_process';

export interface ChildReport {
  frames: number;
  seconds: number;
  cpuS?: number;
  maxRssKb?: number;
  [key: string]: unknown;
}

export function runChildReport(args: string[]): Promise<ChildReport> {
  return new Promise((resolveReport, reject) => {
    const child = spawn(process.execPath, args, { stdio: ['ignore', 'pipe', 'inherit'] });
    let out = '';
    child.stdout.setEncoding('utf8');
    child.stdout.on('data', (text: string) => { out += text; });
    child.on('error', reject);
    child.on('close', () => {
      try {
        const r = JSON.parse(out.trim().split('\n').pop() ?? '{}') as Partial<ChildReport> & { error?: string };
        if (r.error !== undefined || r.frames === undefined || r.seconds === undefined) throw new Error(r.error ?? `no result from the child: ${out}`);
        resolveReport(r as ChildReport);
      } catch (e) {
        reject(e);
      }
    });
  });
}
