/**
 * CPU seconds used by this process and by its finished (reaped) children, for benchmark figures
 * that do not depend on how busy the machine is: wall-clock speed on a shared machine swings with
 * other work, CPU time per frame much less. Children's time comes from /proc/self/stat (cutime +
 * cstime, Linux); elsewhere it is reported as NaN.
 *
 * @example const before = childrenCpuS(); await runFfmpeg(); const ffmpegCpuS = childrenCpuS() - before;
 */
import { readFileSync } from 'node:fs';

/** Clock ticks per second of /proc times (USER_HZ, 100 on Linux). */
const TICKS_PER_S = 100;

/** CPU seconds of all children this process has waited for. */
export function childrenCpuS(): number {
  try {
    const stat = readFileSync('/proc/self/stat', 'utf8');
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    // after the name: state(0) ppid ... utime(11) stime(12) cutime(13) cstime(14)
    return (Number(fields[13]) + Number(fields[14])) / TICKS_PER_S;
  } catch {
    return NaN;
  }
}

/** CPU seconds of this process itself (user + system). */
export function selfCpuS(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}
