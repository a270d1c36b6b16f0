// CPU time of this process's threads, from Linux's per-thread scheduler statistics
// (/proc/self/task/<tid>/schedstat, its first field the nanoseconds spent on a CPU; proc(5)).
import fs from 'node:fs';

const TASKS = '/proc/self/task';

/** Milliseconds on a CPU per thread id, or null where the system has no such statistics. */
export function threadCpuMs(): Map<string, number> | null {
  if (!fs.existsSync(TASKS)) return null;
  const times = new Map<string, number>();
  for (const tid of fs.readdirSync(TASKS)) {
    try {
      times.set(tid, Number(fs.readFileSync(`${TASKS}/${tid}/schedstat`, 'utf8').split(' ')[0]) / 1e6);
    } catch {
      // The thread ended between the listing and the read.
    }
  }
  return times;
}

/** CPU milliseconds since `before`: of this process's main thread, and of all its other threads together. */
export function cpuSince(before: Map<string, number>): { main: number; others: number } {
  const now = threadCpuMs() ?? new Map<string, number>();
  const mainTid = String(process.pid);
  let main = 0;
  let others = 0;
  for (const [tid, ms] of now) {
    const used = ms - (before.get(tid) ?? 0);
    if (tid === mainTid) main += used;
    else others += used;
  }
  return { main, others };
}
