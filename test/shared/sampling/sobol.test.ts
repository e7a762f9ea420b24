/**
 * Sobol plan: published first points, the properties a (t, s)-sequence in base 2 must have, and checks of
 * the hand-copied Joe & Kuo table that do not come from the table itself.
 */
import { describe, expect, it } from 'vitest';
import { makeSamplingPlan, SOBOL_MAX_DIMENSIONS } from '../../../shared/sampling/index.js';
import { JOE_KUO_ROWS } from '../../../shared/sampling/joe-kuo-directions.js';
import { sobolDirections, sobolSampler, sobolStream } from '../../../shared/sampling/sobol.js';
import { unitDims } from './fixtures.js';

const unitSobol = (dims: number, points: number, skip = 0) =>
  makeSamplingPlan(unitDims(dims), { plan: 'sobol', points, skip });

describe('Sobol: published points', () => {
  it('dimension 1 is van der Corput in Gray-code order: 0, 0.5, 0.75, 0.25, 0.375, 0.875, 0.625, 0.125', () => {
    // Source: column 1 of Joe & Kuo's example output (next test); by definition the base-2 radical inverse of
    // gray(i) = 0, 1, 3, 2, 6, 7, 5, 4.
    const plan = unitSobol(1, 8);
    expect(Array.from({ length: 8 }, (_, i) => plan.pointAt(i)[0])).toEqual([0, 0.5, 0.75, 0.25, 0.375, 0.875, 0.625, 0.125]);
  });

  it('first 10 points of dimensions 1–3 equal the worked example on Joe & Kuo\'s Sobol page', () => {
    // Source: the example output for N = 10, D = 3 with new-joe-kuo-6.21201 on
    // https://web.maths.unsw.edu.au/~fkuo/sobol/ , as reproduced in public test suites (e.g. a JAX test
    // "test_deterministic_prefix_retains_unsw_example", a Julia "joekuofirst" test, a Python sobol_point_gen
    // self-check), all three agreeing.
    const published = [
      [0, 0, 0], [0.5, 0.5, 0.5], [0.75, 0.25, 0.25], [0.25, 0.75, 0.75], [0.375, 0.375, 0.625],
      [0.875, 0.875, 0.125], [0.625, 0.125, 0.875], [0.125, 0.625, 0.375], [0.1875, 0.3125, 0.9375],
      [0.6875, 0.8125, 0.4375],
    ];
    const plan = unitSobol(3, 10);
    expect(Array.from({ length: 10 }, (_, i) => plan.pointAt(i))).toEqual(published);
  });

  it('first 8 points of dimensions 1–2 equal SciPy\'s unscrambled Sobol reference', () => {
    // Source: scipy/stats/tests/test_qmc.py, TestSobol.unscramble_nd (SciPy also uses Joe & Kuo's table).
    const published = [[0, 0], [0.5, 0.5], [0.75, 0.25], [0.25, 0.75], [0.375, 0.375], [0.875, 0.875], [0.625, 0.125], [0.125, 0.625]];
    const plan = unitSobol(2, 8);
    expect(Array.from({ length: 8 }, (_, i) => plan.pointAt(i))).toEqual(published);
  });

  it('points 1–20 of dimensions 1–8 equal the reference of an independent implementation of the same table', () => {
    // Source: aldanor/qrng-rust, src/sobol.rs, test `test_sobol_seq` (Gray-code order from point 1, new-joe-kuo
    // direction numbers). Points up to 20 use direction numbers V_1 … V_5, so this checks m_1 … m_5 of rows 2–8.
    const reference = [
      [0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5],
      [0.75, 0.25, 0.25, 0.25, 0.75, 0.75, 0.25, 0.75],
      [0.25, 0.75, 0.75, 0.75, 0.25, 0.25, 0.75, 0.25],
      [0.375, 0.375, 0.625, 0.875, 0.375, 0.125, 0.375, 0.875],
      [0.875, 0.875, 0.125, 0.375, 0.875, 0.625, 0.875, 0.375],
      [0.625, 0.125, 0.875, 0.625, 0.625, 0.875, 0.125, 0.125],
      [0.125, 0.625, 0.375, 0.125, 0.125, 0.375, 0.625, 0.625],
      [0.1875, 0.3125, 0.9375, 0.4375, 0.5625, 0.3125, 0.4375, 0.9375],
      [0.6875, 0.8125, 0.4375, 0.9375, 0.0625, 0.8125, 0.9375, 0.4375],
      [0.9375, 0.0625, 0.6875, 0.1875, 0.3125, 0.5625, 0.1875, 0.1875],
      [0.4375, 0.5625, 0.1875, 0.6875, 0.8125, 0.0625, 0.6875, 0.6875],
      [0.3125, 0.1875, 0.3125, 0.5625, 0.9375, 0.4375, 0.0625, 0.0625],
      [0.8125, 0.6875, 0.8125, 0.0625, 0.4375, 0.9375, 0.5625, 0.5625],
      [0.5625, 0.4375, 0.0625, 0.8125, 0.1875, 0.6875, 0.3125, 0.8125],
      [0.0625, 0.9375, 0.5625, 0.3125, 0.6875, 0.1875, 0.8125, 0.3125],
      [0.09375, 0.46875, 0.46875, 0.65625, 0.28125, 0.96875, 0.53125, 0.84375],
      [0.59375, 0.96875, 0.96875, 0.15625, 0.78125, 0.46875, 0.03125, 0.34375],
      [0.84375, 0.21875, 0.21875, 0.90625, 0.53125, 0.21875, 0.78125, 0.09375],
      [0.34375, 0.71875, 0.71875, 0.40625, 0.03125, 0.71875, 0.28125, 0.59375],
      [0.46875, 0.09375, 0.84375, 0.28125, 0.15625, 0.84375, 0.90625, 0.21875],
    ];
    const plan = unitSobol(8, 20, 1);
    expect(Array.from({ length: 20 }, (_, i) => plan.pointAt(i))).toEqual(reference);
  });

  it('point 0 is all zeros; skip starts further along the same sequence', () => {
    expect(unitSobol(40, 1).pointAt(0)).toEqual(new Array(40).fill(0));
    const full = unitSobol(5, 100);
    const skipped = unitSobol(5, 60, 40);
    for (let i = 0; i < 60; i++) expect(skipped.pointAt(i)).toEqual(full.pointAt(i + 40));
  });
});

describe('Sobol: (t, s)-sequence properties', () => {
  it('every one of the 40 dimensions: the first 2^k points hit each dyadic interval of width 2^-k once (k <= 12)', () => {
    // Each one-dimensional projection of a Sobol sequence is a (0, 1)-sequence in base 2 (Sobol' 1967;
    // Niederreiter 1992, Def. 4.2): any block of 2^k points starting at a multiple of 2^k is a (0, k, 1)-net.
    const k = 12;
    const n = 2 ** k;
    const plan = unitSobol(SOBOL_MAX_DIMENSIONS, n);
    const hits = Array.from({ length: SOBOL_MAX_DIMENSIONS }, () => new Uint8Array(n));
    for (let i = 0; i < n; i++) plan.pointAt(i).forEach((u, d) => hits[d][Math.floor((u as number) * n)]++);
    for (let d = 0; d < SOBOL_MAX_DIMENSIONS; d++) {
      expect(hits[d].every((h) => h === 1)).toBe(true);
      for (let j = 0; j < k; j++) {
        // The first 2^j points (a prefix) are a (0, j, 1)-net too.
        const m = 2 ** j;
        const seen = new Uint8Array(m);
        for (let i = 0; i < m; i++) seen[Math.floor((plan.pointAt(i)[d] as number) * m)]++;
        expect(seen.every((h) => h === 1)).toBe(true);
      }
    }
  });

  it('an aligned later block (skip = 3 · 2^10, 2^10 points) is a (0, 10, 1)-net in every dimension', () => {
    const n = 1024;
    const plan = unitSobol(SOBOL_MAX_DIMENSIONS, n, 3 * n);
    for (let d = 0; d < SOBOL_MAX_DIMENSIONS; d++) {
      const seen = new Uint8Array(n);
      for (let i = 0; i < n; i++) seen[Math.floor((plan.pointAt(i)[d] as number) * n)]++;
      expect(seen.every((h) => h === 1)).toBe(true);
    }
  });

  it('dimensions 1–2 form a (0, 2)-sequence: 2^8 points put one point in every elementary box of area 2^-8', () => {
    // Sobol's first two coordinates (x and the polynomial x + 1) give a (0, 2)-sequence in base 2
    // (Niederreiter 1992, §4.5): every box [a 2^-j, (a+1) 2^-j) × [b 2^-(8-j), (b+1) 2^-(8-j)) holds one point.
    const n = 256;
    const plan = unitSobol(2, n);
    for (let j = 0; j <= 8; j++) {
      const nx = 2 ** j;
      const ny = n / nx;
      const boxes = new Uint8Array(n);
      for (let i = 0; i < n; i++) {
        const [x, y] = plan.pointAt(i) as number[];
        boxes[Math.floor(x * nx) * ny + Math.floor(y * ny)]++;
      }
      expect(boxes.every((b) => b === 1)).toBe(true);
    }
  });

  it('random access equals the Antonov–Saleev stream (one xor per step), from 0 and from an offset', () => {
    const dims = SOBOL_MAX_DIMENSIONS;
    const directions = sobolDirections(dims);
    const sampler = sobolSampler(5000, dims, 0);
    let i = 0;
    for (const p of sobolStream(directions, dims, 0, 5000)) {
      for (let d = 0; d < dims; d++) if (p[d] !== sampler.unitAt(i, d)) throw new Error(`point ${i}, dimension ${d}: ${p[d]} ≠ ${sampler.unitAt(i, d)}`);
      i++;
    }
    expect(i).toBe(5000);
    const late = 2 ** 31 - 7; // crosses bit 31 of the index
    const far = sobolSampler(20, dims, late);
    i = 0;
    for (const p of sobolStream(directions, dims, late, late + 20)) {
      expect(p).toEqual(Array.from({ length: dims }, (_, d) => far.unitAt(i, d)));
      i++;
    }
    expect(i).toBe(20);
  });

  it('the last point of the 2^32-point sequence is reachable and inside [0, 1)', () => {
    const plan = unitSobol(SOBOL_MAX_DIMENSIONS, 1, 2 ** 32 - 1);
    for (const u of plan.pointAt(0) as number[]) {
      expect(u).toBeGreaterThanOrEqual(0);
      expect(u).toBeLessThan(1);
    }
  });
});

describe('Sobol: hand-copied direction table', () => {
  /** Order of x modulo the GF(2) polynomial with bit pattern `poly` (degree s); primitive iff it is 2^s − 1. */
  function isPrimitive(poly: number, s: number): boolean {
    const period = 2 ** s - 1;
    let x = 1;
    for (let e = 1; e <= period; e++) {
      x <<= 1;
      if (x & (1 << s)) x ^= poly;
      if (x === 1) return e === period;
    }
    return false;
  }
  /** The polynomial x^s + c_1 x^(s-1) + … + c_(s-1) x + 1 whose inner coefficients are the bits of a. */
  const polynomial = (s: number, a: number) => (1 << s) | (a << 1) | 1;

  it('has 39 rows, so 40 dimensions with van der Corput', () => {
    expect(JOE_KUO_ROWS.length).toBe(39);
    expect(SOBOL_MAX_DIMENSIONS).toBe(40);
  });

  it('lists every primitive polynomial of degree 1–7 and then degree 8 in increasing a (Joe & Kuo\'s stated order)', () => {
    // Joe & Kuo: "we arrange the primitive polynomials in increasing order of their degrees, and for those with
    // the same degree ... in increasing order of the numbers a". Enumerated here by brute force over GF(2).
    const expected: [number, number][] = [];
    for (let s = 1; s <= 8; s++) {
      for (let a = 0; a < 2 ** (s - 1); a++) if (isPrimitive(polynomial(s, a), s)) expected.push([s, a]);
    }
    // φ(2^s − 1)/s primitive polynomials of degree s: 1, 1, 2, 2, 6, 6, 18, 16.
    expect([1, 2, 3, 4, 5, 6, 7, 8].map((s) => expected.filter(([t]) => t === s).length)).toEqual([1, 1, 2, 2, 6, 6, 18, 16]);
    expect(JOE_KUO_ROWS.map((r) => [r.s, r.a])).toEqual(expected.slice(0, 39));
  });

  it('every initial direction number m_k is odd and below 2^k, s of them per row', () => {
    for (const r of JOE_KUO_ROWS) {
      expect(r.m.length).toBe(r.s);
      r.m.forEach((mk, k) => {
        expect(mk % 2).toBe(1);
        expect(mk).toBeLessThan(2 ** (k + 1));
      });
    }
  });

  it('rejects more dimensions than the table holds, naming the limit', () => {
    expect(() => unitSobol(41, 8)).toThrow(/at most 40 varied parameters/);
    expect(() => makeSamplingPlan(unitDims(3), { plan: 'sobol', points: 10, skip: 2 ** 32 - 5 })).toThrow(/sampling\.points/);
  });
});
