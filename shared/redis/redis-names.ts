/**
 * Names in Redis, in one place: a sweep's chunk and results queues (named after the sweep and the model
 * version, so a worker of another version never takes its chunks), chunk job ids, and the plain keys disksweep
 * keeps beside BullMQ's (registry of sweeps, sentinel, worker heartbeats). Nothing here holds a ':' where
 * BullMQ forbids one.
 */
export const versionTag = (modelVersion: string): string => `v${modelVersion.replace(/[^0-9A-Za-z]+/g, '_')}`;

const sweep16 = (sweepId: string): string => sweepId.slice(0, 16);

export function chunkQueueName(sweepId: string, modelVersion: string): string {
  return `chunks-${sweep16(sweepId)}-${versionTag(modelVersion)}`;
}

export function resultsQueueName(sweepId: string, modelVersion: string): string {
  return `results-${sweep16(sweepId)}-${versionTag(modelVersion)}`;
}

/** Chunk k's job id: deterministic (a re-add of a waiting chunk is a no-op), never all digits, no ':'. */
export function chunkJobId(sweepId: string, k: number): string {
  return `c-${sweep16(sweepId)}-${k}`;
}

/** Hash of the sweeps whose chunks workers should take: field = chunk queue name, value = JSON entry. */
export const registryKey = (prefix: string): string => `${prefix}:disksweep:sweeps`;

/** Present while the orchestrator runs a sweep; its absence means Redis lost its data. */
export const sentinelKey = (prefix: string, sweepId: string): string => `${prefix}:disksweep:sentinel:${sweep16(sweepId)}`;

export const heartbeatKey = (prefix: string, host: string, pid: number): string => `${prefix}:disksweep:worker:${host}:${pid}`;
export const heartbeatPattern = (prefix: string): string => `${prefix}:disksweep:worker:*`;
