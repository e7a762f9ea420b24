/**
 * Latin hypercube plan. The defining property (McKay, Beckman & Conover 1979, Technometrics 21, 239): in
 * every dimension the N points fall exactly one in each stratum [k/N, (k+1)/N). Also: the per-dimension
 * permutation is a bijection (it must be, for the property to hold for every N), seeds select designs, and
 * 10⁶ points stream by index.
 */
import { describe, expect, it } from 'vitest';
import { FEISTEL_ROUNDS, feistelPermutation } from '../../../shared/sampling/feistel-permutation.js';
import { makeSamplingPlan } from '../../../shared/sampling/index.js';
import { latinHypercubePermutation, latinHypercubeSampler } from '../../../shared/sampling/latin-hypercube.js';
import { pointInStratum } from '../../../shared/sampling/stratum.js';
import { log, unitDims, values } from './fixtures.js';

/** Counts of points per stratum of N in one coordinate (every count must be exactly 1); throws outside [0, 1). */
function strataCounts(n: number, coordinate: (i: number) => number): Uint32Array {
  const counts = new Uint32Array(n);
  for (let i = 0; i < n; i++) {
    const u = coordinate(i);
    if (!(u >= 0 && u < 1)) throw new Error(`point ${i}: coordinate ${u} is outside [0, 1)`);
    counts[Math.floor(u * n)]++;
  }
  return counts;
}

const allOnes = (counts: Uint32Array) => counts.every((c) => c === 1);

describe('Latin hypercube', () => {
  it.each([1, 2, 3, 7, 100, 1000, 1024, 4097])('N = %i: one point per stratum in each of 5 dimensions (McKay et al. 1979)', (n) => {
    const plan = makeSamplingPlan(unitDims(5), { plan: 'latin_hypercube', points: n, seed: 42 });
    expect(plan.size).toBe(n);
    const points = Array.from({ length: n }, (_, i) => plan.pointAt(i) as number[]);
    for (let d = 0; d < 5; d++) expect(allOnes(strataCounts(n, (i) => points[i][d]))).toBe(true);
  });

  it('stratifies in ln x for a log range: the k-th smallest point lies in stratum k of [ln min, ln max] (McKay et al. 1979, mapped)', () => {
    const n = 500;
    const plan = makeSamplingPlan([log('m_core_msun', 0.3, 3)], { plan: 'latin_hypercube', points: n, seed: 7 });
    const lo = Math.log(0.3);
    const width = Math.log(3) - lo;
    const t = Array.from({ length: n }, (_, i) => ((Math.log(plan.pointAt(i)[0] as number) - lo) / width) * n).sort((a, b) => a - b);
    // One point per stratum ⇔ the sorted positions satisfy k <= t_(k) < k + 1; 1e-9 allows for exp/log rounding.
    t.forEach((tk, k) => {
      expect(tk).toBeGreaterThanOrEqual(k - 1e-9);
      expect(tk).toBeLessThan(k + 1 + 1e-9);
    });
    for (let i = 0; i < n; i++) {
      const v = plan.pointAt(i)[0] as number;
      expect(v).toBeGreaterThanOrEqual(0.3);
      expect(v).toBeLessThanOrEqual(3);
    }
  });

  it('a values dimension with N a multiple of its length gives each value N/length times (stratification of the list)', () => {
    const plan = makeSamplingPlan([values('initial_state', 'infall', 'disk')], { plan: 'latin_hypercube', points: 10, seed: 3 });
    const got = Array.from({ length: 10 }, (_, i) => plan.pointAt(i)[0]);
    expect(got.filter((v) => v === 'infall').length).toBe(5);
    expect(got.filter((v) => v === 'disk').length).toBe(5);
  });

  it('equal seeds give identical designs, different seeds different ones', () => {
    const design = (seed: number) => {
      const plan = makeSamplingPlan(unitDims(3), { plan: 'latin_hypercube', points: 100, seed });
      return Array.from({ length: 100 }, (_, i) => plan.pointAt(i));
    };
    expect(design(11)).toEqual(design(11));
    const a = design(11);
    const b = design(12);
    // Different seeds: the stratum assignment itself changes for most points, not only the jitter.
    const sameStratum = a.filter((p, i) => Math.floor((p[0] as number) * 100) === Math.floor((b[i][0] as number) * 100)).length;
    expect(sameStratum).toBeLessThan(10);
    // Large seeds (beyond 32 bits) are distinct too: the high word of the seed is hashed.
    expect(design(2 ** 40)).not.toEqual(design(2 ** 40 + 2 ** 32));
  });

  it('dimensions are not paired: rank correlation between two dimensions is near 0 (|r| < 5/√N for independent permutations)', () => {
    const n = 1000;
    const s = latinHypercubeSampler(n, 3, 5);
    for (const [d1, d2] of [[0, 1], [0, 2], [1, 2]]) {
      let sxy = 0;
      for (let i = 0; i < n; i++) sxy += (Math.floor(s.unitAt(i, d1) * n) - (n - 1) / 2) * (Math.floor(s.unitAt(i, d2) * n) - (n - 1) / 2);
      const r = sxy / ((n * (n * n - 1)) / 12); // Spearman: the variance of ranks 0..n−1 is (n² − 1)/12
      expect(Math.abs(r)).toBeLessThan(5 / Math.sqrt(n));
    }
    // …and point order is not stratum order (the permutation is not near the identity).
    let sxi = 0;
    for (let i = 0; i < n; i++) sxi += (Math.floor(s.unitAt(i, 0) * n) - (n - 1) / 2) * (i - (n - 1) / 2);
    expect(Math.abs(sxi / ((n * (n * n - 1)) / 12))).toBeLessThan(5 / Math.sqrt(n));
  });

  it('10⁶ points stream by index: each of 2 dimensions still has one point per stratum', () => {
    const n = 1_000_000;
    const plan = makeSamplingPlan(unitDims(2), { plan: 'latin_hypercube', points: n, seed: 2024 });
    const seen = [new Uint8Array(n), new Uint8Array(n)];
    for (let i = 0; i < n; i++) {
      const p = plan.pointAt(i);
      for (let d = 0; d < 2; d++) seen[d][Math.floor((p[d] as number) * n)]++;
    }
    expect(seen.every((s) => s.every((c) => c === 1))).toBe(true);
  });
});

describe('seeded Feistel permutation', () => {
  const keys = (k: number) => Array.from({ length: FEISTEL_ROUNDS }, (_, r) => (k * 0x9e3779b9 + r * 0x7f4a7c15) >>> 0);

  it('is a bijection of [0, n) for every n from 1 to 300 and for n = 2^16 + 1 (cycle walking over the next power of two)', () => {
    for (const n of [...Array.from({ length: 300 }, (_, k) => k + 1), 65_537]) {
      const p = feistelPermutation(n, keys(n));
      const hit = new Uint8Array(n);
      for (let x = 0; x < n; x++) hit[p.at(x)]++;
      expect(hit.every((h) => h === 1)).toBe(true);
    }
  });

  it('different keys give different permutations; the LHS keys depend on seed and dimension', () => {
    const order = (p: { at(x: number): number }) => Array.from({ length: 64 }, (_, x) => p.at(x));
    expect(order(feistelPermutation(64, keys(1)))).not.toEqual(order(feistelPermutation(64, keys(2))));
    expect(order(latinHypercubePermutation(64, 9, 0))).not.toEqual(order(latinHypercubePermutation(64, 9, 1)));
    expect(order(latinHypercubePermutation(64, 9, 0))).not.toEqual(order(latinHypercubePermutation(64, 10, 0)));
    expect(order(latinHypercubePermutation(64, 9, 0))).toEqual(order(latinHypercubePermutation(64, 9, 0)));
  });

  it('handles the largest domain, 2^32: images stay in range and distinct inputs give distinct images', () => {
    const n = 2 ** 32;
    const p = feistelPermutation(n, keys(3));
    const xs = [0, 1, 2, 2 ** 31 - 1, 2 ** 31, n - 2, n - 1];
    const ys = xs.map((x) => p.at(x));
    for (const y of ys) {
      expect(Number.isInteger(y)).toBe(true);
      expect(y).toBeGreaterThanOrEqual(0);
      expect(y).toBeLessThan(n);
    }
    expect(new Set(ys).size).toBe(xs.length);
  });
});

describe('point inside a stratum', () => {
  it('keeps floor(u · n) = k even when k + jitter rounds up to the next integer', () => {
    const jitter = 1 - 2 ** -53; // the largest double below 1: k + jitter rounds to k + 1 for k >= 1
    expect(5 + jitter).toBe(6);
    for (const n of [7, 10, 1000, 2 ** 32]) {
      for (const k of [0, 1, 5, n - 1]) {
        const u = pointInStratum(k, n, jitter);
        expect(Math.floor(u * n)).toBe(k);
        expect(u).toBeLessThan(1);
        expect(Math.floor(pointInStratum(k, n, 0) * n)).toBe(k);
      }
    }
  });
});
