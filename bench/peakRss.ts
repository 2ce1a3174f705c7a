/**
 * Peak resident memory of this process in kB: VmHWM from /proc/self/status, which starts afresh
 * at exec (getrusage's maxRSS keeps the parent's high-water mark across fork and exec on Linux, so
 * it would report the benchmark runner's memory, not this work's). Falls back to maxRSS elsewhere.
 */
import { readFileSync } from 'node:fs';

export function peakRssKb(): number {
  try {
    const m = /VmHWM:\s+(\d+)\s+kB/.exec(readFileSync('/proc/self/status', 'utf8'));
    if (m) return Number(m[1]);
  } catch {
    // not Linux
  }
  return process.resourceUsage().maxRSS;
}
