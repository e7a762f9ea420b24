/**
 * PRIM (Friedman & Fisher 1999, Statistics and Computing 9, 123) on synthetic data with a known answer, and the
 * peeling rules the paper states: each step removes a share alpha of the box (§4.1, "peeling fraction"), whole
 * values of a discrete variable at once, and peeling stops at the minimum support beta0.
 */
import { describe, expect, it } from 'vitest';
import { argsort } from '../../../orchestrator/query/argsort.js';
import { chooseStep, pasteBox, prim } from '../../../orchestrator/query/prim.js';

/** Mulberry32: a small seeded generator, so the synthetic data are the same on every run. */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** N points in the unit cube; pass with probability pIn inside `box` (per-dimension [lo, hi]) and pOut outside. */
function synthetic(n: number, d: number, box: readonly (readonly [number, number])[], pIn: number, pOut: number, seed = 7) {
  const r = rng(seed);
  const x = Array.from({ length: d }, () => new Float64Array(n));
  const y = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    let inside = true;
    for (let j = 0; j < d; j++) {
      x[j][i] = r();
      if (j < box.length && !(x[j][i] >= box[j][0] && x[j][i] <= box[j][1])) inside = false;
    }
    y[i] = r() < (inside ? pIn : pOut) ? 1 : 0;
  }
  return { x, y };
}

describe('PRIM', () => {
  it('argsort sorts, ties in index order, NaN last', () => {
    const x = Float64Array.from([3, 1, 2, 1, -5, 3, -0, 0, Number.NaN, -Infinity, 1e-300, -1e-300]);
    expect([...argsort(x)]).toEqual([9, 4, 11, 6, 7, 10, 1, 3, 2, 0, 5, 8]);
    const r = rng(2);
    const many = Float64Array.from({ length: 5000 }, () => (r() - 0.5) * 10 ** Math.floor(r() * 20 - 10) * (r() < 0.1 ? 0 : 1));
    const expected = [...many.keys()].sort((a, b) => many[a] - many[b] || a - b);
    expect([...argsort(many)]).toEqual(expected);
  });

  it('recovers a known box in the unit cube with 10 % label noise (within 0.04 on every face)', () => {
    const truth: [number, number][] = [[0.2, 0.6], [0.5, 0.9]];
    const { x, y } = synthetic(20_000, 4, truth, 0.9, 0.1);
    const result = prim(x, y, { alpha: 0.05, minSupport: 0.05 });
    const box = result.boxes[0];
    for (let j = 0; j < 2; j++) {
      expect(Math.abs((box.shownLower[j] ?? 0) - truth[j][0]), `dim ${j} lower`).toBeLessThan(0.04);
      expect(Math.abs((box.shownUpper[j] ?? 1) - truth[j][1]), `dim ${j} upper`).toBeLessThan(0.04);
    }
    // The dimensions that do not matter stay (almost) whole: no face moved by more than a peel or two.
    for (let j = 2; j < 4; j++) {
      expect(box.shownLower[j] ?? 0).toBeLessThan(0.1);
      expect(box.shownUpper[j] ?? 1).toBeGreaterThan(0.9);
    }
    // Inside the true box 90 % pass; the found box is nearly as pure and holds most of the passes inside it.
    expect(box.density).toBeGreaterThan(0.8);
    expect(box.coverage).toBeGreaterThan(0.5);
  });

  it('each peel removes a share alpha of the box (continuous data: exactly round(alpha n))', () => {
    const { x, y } = synthetic(5_000, 3, [[0, 0.5]], 0.8, 0.2, 11);
    for (const alpha of [0.05, 0.1]) {
      const { trajectory } = prim(x, y, { alpha, minSupport: 0.05, maxBoxes: 1 }).boxes[0];
      for (let k = 1; k < trajectory.length; k++) {
        const before = trajectory[k - 1].n;
        expect(before - trajectory[k].n, `alpha ${alpha}, step ${k}`).toBe(Math.max(1, Math.round(alpha * before)));
      }
    }
  });

  it('peeling stops at the minimum support beta0: the last box holds >= beta0 N, one more peel would not', () => {
    const n = 5_000;
    const { x, y } = synthetic(n, 3, [[0, 0.3]], 0.9, 0.1, 3);
    for (const beta0 of [0.05, 0.2]) {
      const { trajectory } = prim(x, y, { alpha: 0.05, minSupport: beta0, maxBoxes: 1 }).boxes[0];
      const last = trajectory[trajectory.length - 1];
      expect(last.support).toBeGreaterThanOrEqual(beta0);
      expect(last.n - Math.max(1, Math.round(0.05 * last.n))).toBeLessThan(Math.ceil(beta0 * n));
    }
  });

  it('a discrete variable is peeled a whole value at a time', () => {
    const r = rng(5);
    const n = 4_000;
    const level = new Float64Array(n);
    const cont = new Float64Array(n);
    const y = new Uint8Array(n);
    for (let i = 0; i < n; i++) {
      level[i] = Math.floor(r() * 4); // 4 grid levels, ~1000 points each: one peel (5 %) lands inside a level
      cont[i] = r();
      y[i] = r() < (level[i] >= 2 ? 0.9 : 0.1) ? 1 : 0;
    }
    const box = prim([level, cont], y, { alpha: 0.05, minSupport: 0.1, maxBoxes: 1 }).boxes[0];
    const levelPeels = box.trajectory.filter((s) => s.peeled?.dim === 0);
    expect(levelPeels.length).toBeGreaterThan(0);
    for (const s of levelPeels) {
      const k = box.trajectory.indexOf(s);
      const removed = box.trajectory[k - 1].n - s.n;
      expect(removed).toBeGreaterThan(0.1 * n); // a whole level (~25 %), not 5 % of the box
    }
    // The passing levels 2 and 3 are what is left: the lower face sits between levels 1 and 2.
    expect(box.shownLower[0]).toBeCloseTo(1.5, 5);
  });

  it('pasting never lowers the density of the chosen box; the chosen step is the first indistinguishable from the best', () => {
    const { x, y } = synthetic(8_000, 3, [[0.1, 0.7], [0.3, 0.8]], 0.85, 0.15, 21);
    const box = prim(x, y).boxes[0];
    expect(box.density).toBeGreaterThanOrEqual(box.trajectory[box.chosenStep].density);
    expect(chooseStep(box.trajectory)).toBe(box.chosenStep);
    // Worked case (Wilson bounds computed from the formula): 500/1000 -> [0.469, 0.531], 400/500 ->
    // [0.763, 0.833], 90/100 -> [0.826, 0.945]. The best lower bound is 0.826 (step 2); step 1's upper bound
    // 0.833 reaches it, step 0's 0.531 does not: step 1 is kept.
    const steps = [{ n: 1000, passes: 500 }, { n: 500, passes: 400 }, { n: 100, passes: 90 }].map((s) => ({ ...s, support: 0, coverage: 0, density: s.passes / s.n }));
    expect(chooseStep(steps)).toBe(1);
  });

  it('pasting grows a box while the added slices raise its mean, and stops where they would lower it', () => {
    // Pass rate 0.2 below x = 0.3, 0.9 on (0.3, 0.7), 0.2 above: a box (-inf, 0.5) has mean about 0.48 and every
    // slice added above 0.5 raises it, until x = 0.7, past which slices of 0.2 would lower it (F&F §4.2).
    const r = rng(13);
    const n = 20_000;
    const x = [new Float64Array(n)];
    const y = new Uint8Array(n);
    for (let i = 0; i < n; i++) {
      x[0][i] = r();
      y[i] = r() < (x[0][i] > 0.3 && x[0][i] < 0.7 ? 0.9 : 0.2) ? 1 : 0;
    }
    const grown = pasteBox(x, y, Float64Array.of(-Infinity), Float64Array.of(0.5));
    expect(grown.pastes).toBeGreaterThan(2);
    expect(grown.lower[0]).toBe(-Infinity);
    expect(Math.abs(grown.upper[0] - 0.7)).toBeLessThan(0.03);
    // A box that already ends at the edge of the high region is not grown.
    expect(pasteBox(x, y, Float64Array.of(0.3), Float64Array.of(0.7)).pastes).toBe(0);
  });

  it('covering finds a second box on the points outside the first', () => {
    const r = rng(9);
    const n = 20_000;
    const x = [new Float64Array(n), new Float64Array(n)];
    const y = new Uint8Array(n);
    for (let i = 0; i < n; i++) {
      x[0][i] = r();
      x[1][i] = r();
      const a = x[0][i] < 0.25 && x[1][i] < 0.25;
      const b = x[0][i] > 0.7 && x[1][i] > 0.7;
      y[i] = r() < (a || b ? 0.95 : 0.05) ? 1 : 0;
    }
    const { boxes } = prim(x, y, { maxBoxes: 3 });
    expect(boxes.length).toBeGreaterThanOrEqual(2);
    const centres = boxes.slice(0, 2).map((b) => ((b.shownLower[0] ?? 0) + (b.shownUpper[0] ?? 1)) / 2).sort((p, q) => p - q);
    expect(centres[0]).toBeLessThan(0.3);
    expect(centres[1]).toBeGreaterThan(0.65);
  });
});
