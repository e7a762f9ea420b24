/** The store's public surface: open a store, and the types that go in and come out. */
export { openStore, SweepStore, StoreReader, type StoreOptions, type WalCheckpoint } from './sweep-store.js';
export type { StoreMode } from './open-connection.js';
export {
  INFRASTRUCTURE_ERROR,
  STORED_STATUSES,
  parseStoredOutcomes,
  storedOutcomeSchema,
  newSweepSchema,
  type NewSweep,
  type Outcome,
  type ParamValue,
  type RegisterOutcome,
  type StoredOutcome,
  type StoredRecord,
  type StoredStatus,
  type SweepRecord,
  type WriteSummary,
} from './store-types.js';
export { reasonShape, type FailureReason, type StatusCounts } from './result-reader.js';
export type { ReusablePoint, ReuseSummary } from './result-reuse.js';
export { DATABASE_SCOPE, LOCK_STALE_MS, isPidAlive, type AcquireOutcome, type LockInfo, type LockOwner, type LockRequest } from './store-lock.js';
export { APPLICATION_ID, SCHEMA_VERSION } from './schema.js';
export { pickSweep } from './pick-sweep.js';
