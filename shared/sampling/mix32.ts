/**
 * Counter-based hashing on 32-bit words: deterministic on every platform (only Math.imul, shifts and xor).
 *
 * The mixer is the 32-bit finalizer `fmix32` of MurmurHash3 (Austin Appleby, MurmurHash3.cpp, public
 * domain; constants 0x85ebca6b and 0xc2b2ae35). It is a bijection on 32-bit words with full avalanche, so a
 * chain that xors one input word into the state and mixes again is injective in each word given the others.
 */

const TWO_32 = 4_294_967_296;
const TWO_26 = 67_108_864;
const TWO_53 = 9_007_199_254_740_992;

/** The MurmurHash3 finalizer: a bijection on 32-bit unsigned words. */
export function fmix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** Absorbs one 32-bit word into a hash state: fmix32(state xor word). */
export function absorb(state: number, word: number): number {
  return fmix32((state ^ word) >>> 0);
}

/** Absorbs a non-negative safe integer as its low and high 32-bit words. */
export function absorbInteger(state: number, x: number): number {
  return absorb(absorb(state, x >>> 0), Math.floor(x / TWO_32) >>> 0);
}

/** The hash state after a stream tag and a seed: the common prefix of every hash a seeded plan draws. */
export function seededState(tag: number, seed: number): number {
  return absorbInteger(absorb(0x9e3779b9, tag), seed);
}

/** A uniform double in [0, 1) with 53 random bits: the top 27 bits of `hi` and the top 26 bits of `lo`. */
export function unit53(hi: number, lo: number): number {
  return ((hi >>> 5) * TWO_26 + (lo >>> 6)) / TWO_53;
}

/** A uniform double in [0, 1) keyed by a hash state: two further rounds of the mixer give its two words. */
export function unitFromState(state: number): number {
  return unit53(absorb(state, 0x68e31da4), absorb(state, 0xb5297a4d));
}
