/**
 * The Sobol sequence (Sobol' 1967) with the Joe & Kuo (2008) direction numbers (joe-kuo-directions.ts),
 * 32-bit, in Gray-code order (Antonov & Saleev 1979), the order of Joe & Kuo's own generator and of the
 * published first points. Point n is the xor of the direction numbers v_k for every set bit k of
 * gray(n) = n xor (n >> 1), so any point is O(d · 32) to reach without stepping through the ones before.
 * Dimension 1 is the van der Corput sequence in base 2. Point 0 is all zeros, as in the standard sequence;
 * a plan's `skip` starts the design further along.
 *
 * Direction numbers (Joe & Kuo, "Notes on generating Sobol sequences", 2008, eqs. for m_k and v_k):
 * v_k = m_k / 2^k for k <= s, and for k > s
 *   v_k = c_1 v_(k-1) xor c_2 v_(k-2) xor … xor c_(s-1) v_(k-s+1) xor v_(k-s) xor (v_(k-s) / 2^s),
 * held here as 32-bit integers V_k = v_k · 2^32.
 */
import { JOE_KUO_ROWS, SOBOL_MAX_DIMENSIONS } from './joe-kuo-directions.js';
import type { UnitSampler } from './sampling-plan.js';

/** Bits per direction number, and so the longest sequence: 2^32 points. */
export const SOBOL_BITS = 32;
export const SOBOL_MAX_POINTS = 4_294_967_296;

export { SOBOL_MAX_DIMENSIONS };

/** The 32 direction numbers V_1 … V_32 of each of the first `dimensions` dimensions, row-major. */
export function sobolDirections(dimensions: number): Uint32Array {
  if (!Number.isInteger(dimensions) || dimensions < 1 || dimensions > SOBOL_MAX_DIMENSIONS) {
    throw new RangeError(`Sobol dimensions must be a whole number in [1, ${SOBOL_MAX_DIMENSIONS}] (got ${dimensions})`);
  }
  const v = new Uint32Array(dimensions * SOBOL_BITS);
  for (let b = 0; b < SOBOL_BITS; b++) v[b] = 2 ** (SOBOL_BITS - 1 - b); // m_k = 1 for every k
  for (let d = 1; d < dimensions; d++) {
    const { s, a, m } = JOE_KUO_ROWS[d - 1];
    const o = d * SOBOL_BITS;
    for (let b = 0; b < SOBOL_BITS; b++) {
      if (b < s) {
        v[o + b] = m[b] * 2 ** (SOBOL_BITS - 1 - b);
        continue;
      }
      let x = v[o + b - s] ^ (v[o + b - s] >>> s);
      for (let l = 1; l < s; l++) if (((a >>> (s - 1 - l)) & 1) === 1) x ^= v[o + b - l];
      v[o + b] = x >>> 0;
    }
  }
  return v;
}

/** Coordinate d of Sobol point n (0 <= n < 2^32) as a 32-bit integer: x = xor of V_k over bits of gray(n). */
export function sobolInteger(directions: Uint32Array, n: number, d: number): number {
  let g = (n ^ (n >>> 1)) >>> 0;
  let x = 0;
  for (let k = d * SOBOL_BITS; g !== 0; k++, g >>>= 1) if ((g & 1) === 1) x ^= directions[k];
  return x >>> 0;
}

/** The design of points skip, skip + 1, …, skip + n − 1 of the sequence. */
export function sobolSampler(n: number, dimensions: number, skip: number): UnitSampler {
  if (!Number.isInteger(n) || !Number.isInteger(skip) || n < 1 || skip < 0 || n + skip > SOBOL_MAX_POINTS) {
    throw new RangeError(`Sobol points plus skip must be at most ${SOBOL_MAX_POINTS} (got ${n} + ${skip})`);
  }
  const directions = sobolDirections(dimensions);
  return {
    size: n,
    dimensions,
    unitAt(i: number, d: number): number {
      return sobolInteger(directions, i + skip, d) / SOBOL_MAX_POINTS;
    },
  };
}

/**
 * Points start … end − 1 streamed by the Antonov–Saleev recurrence (gray(n + 1) differs from gray(n) in
 * bit ctz(n + 1), so each step xors one direction number per dimension): O(d) per point after the first.
 * An independent route to the same points as `sobolInteger`, used by tests and by callers that stream.
 */
export function* sobolStream(directions: Uint32Array, dimensions: number, start: number, end: number): Generator<number[]> {
  if (start >= end) return;
  const x = Array.from({ length: dimensions }, (_, d) => sobolInteger(directions, start, d));
  yield x.map((xi) => xi / SOBOL_MAX_POINTS);
  for (let n = start + 1; n < end; n++) {
    const low = (n & -n) >>> 0;
    const bit = 31 - Math.clz32(low);
    for (let d = 0; d < dimensions; d++) x[d] = (x[d] ^ directions[d * SOBOL_BITS + bit]) >>> 0;
    yield x.map((xi) => xi / SOBOL_MAX_POINTS);
  }
}
