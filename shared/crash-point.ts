/**
 * Named places where a test can make this process die at once (SIGKILL, as a power cut or `kill -9` would),
 * to prove that no crash between two steps of the results path loses or duplicates a result. Inert unless
 * DISKSWEEP_CRASH_AT names the point; DISKSWEEP_CRASH_AFTER=n lets the point pass n times first (default 0).
 */
export type CrashPointName =
  /** Orchestrator: a result job's transaction committed, the job not yet completed in Redis. */
  | 'after-commit'
  /** Worker: a chunk's results added to the results queue, the chunk job not yet returned. */
  | 'after-results-push'
  /** Orchestrator: part of an `addBulk` of chunk jobs sent, the rest not. */
  | 'mid-add-bulk';

let passes = 0;

export function crashPoint(name: CrashPointName): void {
  if (process.env.DISKSWEEP_CRASH_AT !== name) return;
  const after = Number(process.env.DISKSWEEP_CRASH_AFTER ?? '0');
  if (passes++ < after) return;
  process.stderr.write(`crash point ${name}: killing this process\n`);
  process.kill(process.pid, 'SIGKILL');
}
