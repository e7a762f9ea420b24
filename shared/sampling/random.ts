/**
 * Seeded pseudo-random design: coordinate d of point i is a counter-based hash of (seed, i, d) turned into a
 * double in [0, 1) with 53 bits (mix32.ts: MurmurHash3's fmix32 chained over the words of seed, i and d,
 * then two more rounds for the two halves of the mantissa). No state, so any point is O(d) to reach.
 */
import { absorb, absorbInteger, seededState, unitFromState } from './mix32.js';
import type { UnitSampler } from './sampling-plan.js';

const TAG_RANDOM = 0x524e4447; // 'RNDG'

export function randomSampler(n: number, dimensions: number, seed: number): UnitSampler {
  const state = seededState(TAG_RANDOM, seed);
  return {
    size: n,
    dimensions,
    unitAt(i: number, d: number): number {
      return unitFromState(absorb(absorbInteger(state, i), d));
    },
  };
}
