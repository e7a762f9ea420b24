/**
 * Content hashes that name things: a point is the hash of its fully resolved model input plus the model
 * version; a sweep is the hash of its canonical spec. Canonical JSON sorts object keys at every depth, so the
 * same content always hashes the same however it was written.
 */
import { createHash } from 'node:crypto';

export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortKeys(value));
}

function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return Object.fromEntries(entries.map(([k, v]) => [k, sortKeys(v)]));
  }
  if (typeof value === 'number' && !Number.isFinite(value)) {
    throw new RangeError(`canonicalJson: ${value} has no JSON form`);
  }
  return value;
}

/** SHA-256 of the canonical JSON, hex. */
export function contentHash(value: unknown): string {
  return createHash('sha256').update(canonicalJson(value)).digest('hex');
}
