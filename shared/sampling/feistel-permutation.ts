/**
 * A keyed bijection of [0, n) evaluated one index at a time in O(1) memory: a Feistel network (Luby &
 * Rackoff 1988) over the next power of two 2^b >= n, restricted to [0, n) by cycle walking (Black & Rogaway
 * 2002: apply the network again until the value falls inside the domain; from x < n the walk must return
 * below n because the network permutes [0, 2^b)). Since 2^b < 2n the expected number of walks is below 2.
 *
 * The b bits split into a left part of ceil(b/2) and a right part of floor(b/2) bits; a round maps
 * (L, R) to (R, L xor F(R)) with F(R) = fmix32(R xor key) cut to L's width, so the two widths swap each
 * round and every round is invertible whatever F is. b <= 32, so both parts fit in 16 bits.
 */
import { fmix32 } from './mix32.js';

/** The largest domain the permutation supports. */
export const MAX_PERMUTATION_SIZE = 4_294_967_296;

/** Rounds of the network; any count gives a bijection, six mix well beyond the four of Luby–Rackoff. */
export const FEISTEL_ROUNDS = 6;

export interface IndexPermutation {
  /** The size n of the domain [0, n). */
  readonly size: number;
  /** The image of x (0 <= x < n). */
  at(x: number): number;
}

/** The permutation of [0, n) keyed by `keys` (one 32-bit key per round, FEISTEL_ROUNDS of them). */
export function feistelPermutation(n: number, keys: readonly number[]): IndexPermutation {
  if (!Number.isInteger(n) || n < 1 || n > MAX_PERMUTATION_SIZE) {
    throw new RangeError(`permutation size must be a whole number in [1, ${MAX_PERMUTATION_SIZE}] (got ${n})`);
  }
  if (keys.length !== FEISTEL_ROUNDS) throw new RangeError(`expected ${FEISTEL_ROUNDS} round keys (got ${keys.length})`);
  let bits = 0;
  while (2 ** bits < n) bits++;
  const rightBits = bits >>> 1;
  const leftBits = bits - rightBits;

  const network = (x: number): number => {
    let wl = leftBits;
    let wr = rightBits;
    let left = Math.floor(x / 2 ** wr);
    let right = x - left * 2 ** wr;
    for (let r = 0; r < FEISTEL_ROUNDS; r++) {
      const f = fmix32((right ^ keys[r]) >>> 0) & ((1 << wl) - 1);
      const next = left ^ f;
      left = right;
      right = next;
      const w = wl;
      wl = wr;
      wr = w;
    }
    return left * 2 ** wr + right;
  };

  return {
    size: n,
    at(x: number): number {
      let y = network(x);
      while (y >= n) y = network(y);
      return y;
    },
  };
}
