/**
 * Content hashes that name things: a point is the hash of its fully resolved model input plus the model
 * version; a sweep is the hash of its canonical spec. Canonical JSON sorts object keys at every depth, so the
 * same content always hashes the same however it was written.
 */
import { createHash } from 'node:crypto';

export function canonicalJson(value: unknown): string {
  const text = canonical(value);
  if (text === undefined) throw new TypeError(`canonicalJson: ${typeof value} has no JSON form`);
  return text;
}

/** Integer-like keys ("0", "17"): JavaScript objects enumerate them first, in numeric order. */
const ARRAY_INDEX = /^(?:0|[1-9]\d{0,9})$/;
const isArrayIndex = (key: string): boolean => ARRAY_INDEX.test(key) && Number(key) < 4294967295;

/**
 * Sorted key order per object shape, and quoted keys: a sweep derives 10^5-10^6 points whose parameter objects
 * share one shape, so both are computed once. Bounded, so odd inputs cannot grow them without limit.
 */
const CACHE_LIMIT = 1000;
const keyOrders = new Map<string, readonly string[]>();
const quotedKeys = new Map<string, string>();

function orderedKeys(keys: string[]): readonly string[] {
  // JSON text of the list, not a join: joined keys are ambiguous when a key holds the separator.
  const shape = JSON.stringify(keys);
  const hit = keyOrders.get(shape);
  if (hit !== undefined) return hit;
  keys.sort();
  const indexes = keys.filter(isArrayIndex);
  const ordered = indexes.length === 0 ? keys : [...indexes.sort((a, b) => Number(a) - Number(b)), ...keys.filter((k) => !isArrayIndex(k))];
  if (keyOrders.size < CACHE_LIMIT) keyOrders.set(shape, ordered);
  return ordered;
}

function quotedKey(key: string): string {
  let q = quotedKeys.get(key);
  if (q === undefined) {
    q = JSON.stringify(key);
    if (quotedKeys.size < CACHE_LIMIT * 10) quotedKeys.set(key, q);
  }
  return q;
}

/**
 * JSON text with the keys of every object sorted (and what JSON.stringify drops, dropped), written directly:
 * the text is byte for byte what `JSON.stringify` makes of a copy with sorted keys (integer-like keys first,
 * in numeric order, as objects enumerate them), without building the copies. Every point id is a hash of
 * this text, so test/shared/hashing.test.ts checks it against that definition.
 */
function canonical(value: unknown): string | undefined {
  switch (typeof value) {
    case 'string':
      return JSON.stringify(value);
    case 'number':
      if (!Number.isFinite(value)) throw new RangeError(`canonicalJson: ${value} has no JSON form`);
      return JSON.stringify(value);
    case 'boolean':
      return value ? 'true' : 'false';
    case 'object': {
      if (value === null) return 'null';
      if (Array.isArray(value)) return `[${value.map((v: unknown) => canonical(v) ?? 'null').join(',')}]`;
      const record = value as Record<string, unknown>;
      let out = '';
      for (const key of orderedKeys(Object.keys(record))) {
        const text = canonical(record[key]);
        if (text !== undefined) out += `${out === '' ? '' : ','}${quotedKey(key)}:${text}`;
      }
      return `{${out}}`;
    }
    case 'bigint':
      throw new TypeError('canonicalJson: a BigInt has no JSON form');
    default:
      return undefined; // undefined, functions, symbols: left out of objects, null in arrays (as JSON.stringify)
  }
}

/** SHA-256 of the canonical JSON, hex. */
export function contentHash(value: unknown): string {
  return createHash('sha256').update(canonicalJson(value)).digest('hex');
}
