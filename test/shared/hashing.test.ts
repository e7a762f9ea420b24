/**
 * canonicalJson is written directly for speed (every point id hashes it); it must give exactly the text of its
 * definition: JSON.stringify of a copy whose object keys are sorted at every depth, undefined values dropped.
 * A change of one byte would change every point id and sweep id, so it is checked against that definition on
 * hand-made edge cases and on generated values.
 */
import { describe, expect, it } from 'vitest';
import { canonicalJson, contentHash } from '../../shared/hashing.js';

/** The definition (the implementation before it was written directly). */
function definition(value: unknown): string {
  const sortKeys = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(sortKeys);
    if (v !== null && typeof v === 'object') {
      const entries = Object.entries(v as Record<string, unknown>).filter(([, x]) => x !== undefined).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
      return Object.fromEntries(entries.map(([k, x]) => [k, sortKeys(x)]));
    }
    return v;
  };
  return JSON.stringify(sortKeys(value));
}

/** A small deterministic generator (mulberry32). */
function generator(seed: number): () => number {
  let a = seed;
  return () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function randomValue(r: () => number, depth: number): unknown {
  const kind = Math.floor(r() * (depth > 3 ? 6 : 8));
  const keys = ['alpha_active', 'b', 'a', '10', '2', '0', 'Zeta', 'é', 'a b', '__proto__x', '-1', '007'];
  switch (kind) {
    case 0: return (r() - 0.5) * 10 ** Math.floor(r() * 40 - 20);
    case 1: return Math.floor(r() * 1000) - 500;
    case 2: return ['disk', 'infall', 'quote"d', 'line\nbreak', '\u2028', ''][Math.floor(r() * 6)];
    case 3: return r() < 0.5;
    case 4: return null;
    case 5: return undefined;
    case 6: return Array.from({ length: Math.floor(r() * 4) }, () => randomValue(r, depth + 1));
    default: return Object.fromEntries(Array.from({ length: Math.floor(r() * 6) }, () => [keys[Math.floor(r() * keys.length)], randomValue(r, depth + 1)]));
  }
}

describe('canonicalJson', () => {
  it('is JSON.stringify of a key-sorted copy on edge cases', () => {
    const cases: unknown[] = [
      { b: 1, a: [3, { d: undefined, c: -0 }], '10': 'x', '2': 'y', '0': null },
      [undefined, () => 1, Symbol('s'), 1e21, 1e-7, -0],
      { f: () => 1, s: Symbol('s'), u: undefined, n: null, nested: { z: { y: { x: [] } } } },
      { checkpoints_myr: [0.1, 0.3, 0.5, 1, 2, 3, 5], alpha_active: 0.001, initial_state: 'infall' },
      'text', 17, true, null, [], {},
    ];
    for (const c of cases) expect(canonicalJson(c)).toBe(definition(c));
  });

  it('is JSON.stringify of a key-sorted copy on 2000 generated values', () => {
    const r = generator(20261202);
    for (let i = 0; i < 2000; i++) {
      const v = { root: randomValue(r, 0), other: randomValue(r, 0) };
      expect(canonicalJson(v)).toBe(definition(v));
    }
  });

  it('keeps objects apart whose keys join to the same text', () => {
    // Both key lists joined with U+0000 read "b\u0000a\u0000c": a cache keyed on that join would give the
    // second object the first one's key order and drop its values.
    const first = { b: 1, 'a\u0000c': 2 };
    const second = { 'b\u0000a': 3, c: 4 };
    expect(canonicalJson(first)).toBe(definition(first));
    expect(canonicalJson(second)).toBe(definition(second));
    expect(canonicalJson(second)).toBe('{"b\\u0000a":3,"c":4}');
  });

  it('refuses what JSON cannot hold, and keeps the ids it has always given', () => {
    expect(() => canonicalJson({ a: Number.NaN })).toThrow(RangeError);
    expect(() => canonicalJson([Number.POSITIVE_INFINITY])).toThrow(RangeError);
    // sha256sum of the text '{"a":1,"b":[1,2]}', computed outside this code.
    expect(contentHash({ b: [1, 2], a: 1 })).toBe('8baa73198470c7bb4c3ce142a8fd651affc0310d878bb9bd159e37a573fb4874');
  });
});
