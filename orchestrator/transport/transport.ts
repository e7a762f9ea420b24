/**
 * The seam between "what to run" and "where it runs". The sweep runner above it is the same for every
 * transport: it submits chunks, and commits each chunk's outcomes as they come back. A transport may deliver a
 * chunk's outcome more than once (the store's writes are idempotent); it forgets a chunk only after the
 * runner's commit for it has resolved, so a crash between the two loses nothing.
 */
import type { ChunkOutcomePayload, ChunkTaskPayload } from '../../shared/job-payload.js';

/** Commits one chunk's outcomes to the store. If it rejects, the transport stops and `close` rethrows. */
export type CommitOutcome = (outcome: ChunkOutcomePayload) => Promise<void>;

export type CloseMode = 'graceful' | 'interrupted' | 'immediate';

export interface Transport {
  /** One line for logs and progress, e.g. "embedded, 2 threads". */
  readonly description: string;
  /** What the first Ctrl-C does with work in flight, for the message (default: finishing the chunks in flight). */
  readonly interruptNote?: string;
  /** Chunks outstanding that keep every worker busy; the runner submits up to this many ahead of commits. */
  readonly window: number;
  /** Hand a chunk over (returns when the transport has taken it, not when it is done). */
  submit(chunk: ChunkTaskPayload): Promise<void>;
  /** Register the commit callback; call once, before the first submit. */
  onOutcome(commit: CommitOutcome): void;
  /** Outcomes submitted and not yet committed. */
  pending(): number;
  /**
   * Stop. 'graceful': chunks already submitted finish and are committed first. 'interrupted' (Ctrl-C): what
   * this process holds is committed, and chunks a transport can leave safely elsewhere stay there (Redis:
   * queued chunks keep going to workers and their results wait in Redis for `resume`); the embedded transport
   * finishes its chunks as in 'graceful'. 'immediate': abandon them (they have no result in the store, so
   * `resume` runs them again).
   */
  close(mode: CloseMode): Promise<void>;
}
