/**
 * Run (or resume) one registered sweep to completion or interruption: lock heartbeat, progress on stderr,
 * Ctrl-C handling (first: finish the chunks in flight and stop; second: stop now), and the transport's
 * lifetime. Shared by `run` and `resume`; the transport is chosen by the caller.
 */
import { ProgressReporter } from '../cli/progress.js';
import type { SweepStore } from '../store/index.js';
import type { Transport } from '../transport/transport.js';
import type { SweepPlan } from './sweep-plan.js';
import { runSweep, type SweepCounts } from './sweep-runner.js';

export interface ExecuteOptions {
  readonly store: SweepStore;
  readonly plan: SweepPlan;
  readonly chunkSize: number;
  readonly hasResult: Uint8Array;
  readonly transport: Transport;
  /** Where progress goes (stderr in the CLI). */
  readonly progressStream: NodeJS.WriteStream;
  /** Install SIGINT/SIGTERM handlers (the CLI does; tests driving this in-process may not). */
  readonly handleSignals: boolean;
}

export type ExecuteResult = SweepCounts & { interrupted: boolean };

const HEARTBEAT_MS = 15_000;

export async function executeSweep(o: ExecuteOptions): Promise<ExecuteResult> {
  const controller = new AbortController();
  let signals = 0;
  const onSignal = (): void => {
    signals++;
    if (signals === 1) {
      o.progressStream.write(`\nstopping: ${o.transport.interruptNote ?? 'finishing the chunks in flight'} (press Ctrl-C again to stop at once)\n`);
      controller.abort();
    } else {
      // Committed results are safe in SQLite; what was in flight simply has no result and is rerun by resume.
      o.progressStream.write('\nstopping now\n');
      o.store.close();
      process.exit(130);
    }
  };
  if (o.handleSignals) {
    process.on('SIGINT', onSignal);
    process.on('SIGTERM', onSignal);
  }
  const heartbeat = setInterval(() => o.store.heartbeat(), HEARTBEAT_MS);
  heartbeat.unref();
  const already = o.hasResult.reduce((n, v) => n + v, 0);
  const progress = new ProgressReporter(o.progressStream, o.plan.spec.name, already);
  try {
    const result = await runSweep({
      sweepId: o.plan.sweepId,
      chunkSize: o.chunkSize,
      source: o.plan.source,
      hasResult: o.hasResult,
      store: o.store,
      transport: o.transport,
      signal: controller.signal,
      onProgress: (c) => progress.update(c),
    });
    progress.end(result);
    return result;
  } finally {
    clearInterval(heartbeat);
    if (o.handleSignals) {
      process.off('SIGINT', onSignal);
      process.off('SIGTERM', onSignal);
    }
  }
}
