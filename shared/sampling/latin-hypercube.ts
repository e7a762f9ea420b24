/**
 * Latin hypercube sampling (McKay, Beckman & Conover 1979, Technometrics 21, 239): in each dimension the n
 * points fall one in each stratum [k/n, (k+1)/n). Point i takes stratum π_d(i) in dimension d, where π_d is a
 * seeded bijection of [0, n) evaluated per index (feistel-permutation.ts), and a seeded jitter inside the
 * stratum, so point i costs O(d) and nothing of size n is ever stored.
 */
import { FEISTEL_ROUNDS, feistelPermutation, type IndexPermutation } from './feistel-permutation.js';
import { absorb, absorbInteger, seededState, unitFromState } from './mix32.js';
import type { UnitSampler } from './sampling-plan.js';
import { pointInStratum } from './stratum.js';

/** Stream tags keep the permutation keys and the jitter independent of each other and of other plans. */
const TAG_PERMUTATION = 0x4c485350; // 'LHSP'
const TAG_JITTER = 0x4c48534a; // 'LHSJ'

/** The seeded permutation of dimension d: round keys hash (seed, d, round). */
export function latinHypercubePermutation(n: number, seed: number, d: number): IndexPermutation {
  const state = absorb(seededState(TAG_PERMUTATION, seed), d);
  const keys = Array.from({ length: FEISTEL_ROUNDS }, (_, r) => absorb(state, r));
  return feistelPermutation(n, keys);
}

export function latinHypercubeSampler(n: number, dimensions: number, seed: number): UnitSampler {
  const permutations = Array.from({ length: dimensions }, (_, d) => latinHypercubePermutation(n, seed, d));
  const jitterState = seededState(TAG_JITTER, seed);
  return {
    size: n,
    dimensions,
    unitAt(i: number, d: number): number {
      const jitter = unitFromState(absorb(absorbInteger(jitterState, i), d));
      return pointInStratum(permutations[d].at(i), n, jitter);
    },
  };
}
