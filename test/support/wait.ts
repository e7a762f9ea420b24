/**
 * Bounded waits for tests that watch another process: poll a condition until it holds, and fail with a message
 * that says what was awaited when it does not within the limit. Never a fixed sleep standing in for a condition.
 */

export interface WaitOptions {
  /** Give up after this long (ms). */
  readonly timeoutMs: number;
  /** What is awaited, for the failure message ("50 results in the database"); a function is called on failure. */
  readonly what: string | (() => string);
  /** Poll interval (ms), default 20. */
  readonly everyMs?: number;
}

const pause = (ms: number): Promise<void> => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * Resolve once `condition()` returns true; reject after `timeoutMs`. The condition may throw to fail early
 * (e.g. when the process it watches has exited).
 */
export async function waitFor(condition: () => boolean | Promise<boolean>, options: WaitOptions): Promise<void> {
  const deadline = Date.now() + options.timeoutMs;
  for (;;) {
    if (await condition()) return;
    if (Date.now() > deadline) {
      const what = typeof options.what === 'function' ? options.what() : options.what;
      throw new Error(`timed out after ${options.timeoutMs} ms waiting for ${what}`);
    }
    await pause(options.everyMs ?? 20);
  }
}
