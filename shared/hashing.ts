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
      const keys = Object.keys(record).sort();
      const indexes = keys.filter(isArrayIndex);
      const ordered = indexes.length === 0 ? keys : [...indexes.sort((a, b) => Number(a) - Number(b)), ...keys.filter((k) => !isArrayIndex(k))];
      const parts: string[] = [];
      for (const key of ordered) {
        const text = canonical(record[key]);
        if (text !== undefined) parts.push(`${JSON.stringify(key)}:${text}`);
      }
      return `{${parts.join(',')}}`;
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
