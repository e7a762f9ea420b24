/**
 * PRIM, the Patient Rule Induction Method (Friedman & Fisher 1999, Statistics and Computing 9, 123): boxes in
 * parameter space where the pass rate is high.
 *
 * - Peeling (F&F §4.1): starting from the whole space, each step removes a slice of share alpha of the box's
 *   points from one face, the face whose removal leaves the highest mean; a face of a discrete variable removes
 *   whole values (ties). It stops before the support (share of all points in the box) would drop below beta0.
 *   The sequence of boxes is the peeling trajectory (support/coverage against density).
 * - Choice of box (F&F leave it to the analyst, with the trajectory): the largest box whose density is
 *   statistically indistinguishable from the best on the trajectory (chooseStep); the rule is ours.
 * - Pasting (F&F §4.2): the chosen box is grown again face by face, by alpha of its points, while that raises
 *   the mean.
 * - Covering (F&F §4.3): the next box is found the same way on the points outside the earlier ones.
 *
 * Data are columns in "PRIM space" (log10 of log-sampled parameters), so boxes of log parameters are in log
 * space. Each column is sorted once (argsort); peeling and pasting walk the sorted orders, so a step costs
 * O(d N) at worst and 10^6 points take seconds.
 */
import { argsort } from './argsort.js';
import { wilson } from './wilson.js';

export interface PrimOptions {
  /** Peeling (and pasting) fraction alpha, in (0, 0.5). Default 0.05 (F&F recommend 0.05-0.10). */
  readonly alpha?: number;
  /** Minimum support beta0: the smallest share of all points a box may hold, in (0, 1). Default 0.05. */
  readonly minSupport?: number;
  /** Boxes to find by covering. Default 3. */
  readonly maxBoxes?: number;
}

/** One box: bounds in PRIM space (exclusive thresholds; -Infinity/Infinity = that face never moved). */
export interface PrimBounds {
  /** The box holds points with lower[j] < x_j < upper[j]. */
  readonly lower: Float64Array;
  readonly upper: Float64Array;
}

export interface PrimStats {
  /** Points in the box (of those still in play). */
  readonly n: number;
  readonly passes: number;
  /** n / all points. */
  readonly support: number;
  /** passes / all passing points. */
  readonly coverage: number;
  /** passes / n: the pass rate inside. */
  readonly density: number;
}

export interface PrimStep extends PrimStats, PrimBounds {
  /** The face peeled to reach this box (null for the starting box). */
  readonly peeled: { readonly dim: number; readonly side: 'lower' | 'upper' } | null;
}

export interface PrimBox extends PrimStats, PrimBounds {
  /** The peeling trajectory this box came from (step 0 = everything still in play). */
  readonly trajectory: readonly PrimStep[];
  /** Index of the chosen step in the trajectory, before pasting. */
  readonly chosenStep: number;
  /** Pasting steps that grew the chosen box. */
  readonly pastes: number;
  /**
   * Display bounds: halfway between the last value removed and the first value kept on each moved face
   * (PRIM space; null where the face never moved).
   */
  readonly shownLower: readonly (number | null)[];
  readonly shownUpper: readonly (number | null)[];
}

export interface PrimResult {
  readonly boxes: readonly PrimBox[];
  readonly n: number;
  readonly passes: number;
  readonly alpha: number;
  readonly minSupport: number;
}

class Prim {
  readonly d: number;
  readonly n: number;
  readonly order: Uint32Array[];
  /** sorted[j][k] = x[j][order[j][k]]: the walks read values in sequence instead of jumping through x. */
  readonly sorted: Float64Array[];
  readonly active: Uint8Array;
  readonly inBox: Uint8Array;
  readonly totalPasses: number;

  constructor(
    readonly x: readonly Float64Array[],
    readonly y: Uint8Array,
    readonly alpha: number,
    readonly minCount: number,
  ) {
    this.d = x.length;
    this.n = y.length;
    this.order = x.map(argsort);
    this.sorted = x.map((col, j) => {
      const ord = this.order[j];
      const out = new Float64Array(col.length);
      for (let k = 0; k < col.length; k++) out[k] = col[ord[k]];
      return out;
    });
    this.active = new Uint8Array(this.n);
    let passes = 0;
    for (let i = 0; i < this.n; i++) {
      // A point with a missing coordinate (NaN) can be in no box.
      let ok = 1;
      for (let j = 0; j < this.d; j++) if (Number.isNaN(x[j][i])) ok = 0;
      this.active[i] = ok;
      if (ok === 1) passes += y[i];
    }
    this.inBox = new Uint8Array(this.n);
    this.totalPasses = passes;
  }

  stats(n: number, passes: number): PrimStats {
    return { n, passes, support: n / this.n, coverage: this.totalPasses === 0 ? 0 : passes / this.totalPasses, density: n === 0 ? 0 : passes / n };
  }

  /** Peel from a box holding every active point; returns the trajectory. */
  peel(): PrimStep[] {
    const { d, n, x, y, order, inBox } = this;
    let nBox = 0;
    let yBox = 0;
    for (let i = 0; i < n; i++) {
      inBox[i] = this.active[i];
      nBox += inBox[i];
      yBox += inBox[i] & y[i];
    }
    const lower = new Float64Array(d).fill(-Infinity);
    const upper = new Float64Array(d).fill(Infinity);
    const loPtr = new Int32Array(d);
    const hiPtr = new Int32Array(d).fill(n - 1);
    const steps: PrimStep[] = [{ ...this.stats(nBox, yBox), lower: lower.slice(), upper: upper.slice(), peeled: null }];
    for (;;) {
      const m = Math.max(1, Math.round(this.alpha * nBox));
      let best: { dim: number; side: 'lower' | 'upper'; removed: number; yRemoved: number; value: number; mean: number } | null = null;
      for (let j = 0; j < d; j++) {
        for (const side of ['lower', 'upper'] as const) {
          const ptr = side === 'lower' ? loPtr : hiPtr;
          const dir = side === 'lower' ? 1 : -1;
          // Points out of the box stay out: skip them at the edge once and for all.
          while (ptr[j] >= 0 && ptr[j] < n && inBox[order[j][ptr[j]]] === 0) ptr[j] += dir;
          const slice = this.walk(j, ptr[j], dir, m, inBox);
          if (slice === null || slice.count >= nBox || nBox - slice.count < this.minCount) continue;
          const mean = (yBox - slice.passes) / (nBox - slice.count);
          if (best === null || mean > best.mean || (mean === best.mean && slice.count < best.removed)) {
            best = { dim: j, side, removed: slice.count, yRemoved: slice.passes, value: slice.last, mean };
          }
        }
      }
      if (best === null) break;
      const sv = this.sorted[best.dim];
      const v = best.value;
      // Remove the slice: walk the same order until past its last value.
      const ord = order[best.dim];
      const ptr = best.side === 'lower' ? loPtr : hiPtr;
      const dir = best.side === 'lower' ? 1 : -1;
      for (let k = ptr[best.dim]; k >= 0 && k < n && (dir === 1 ? sv[k] <= v : sv[k] >= v); k += dir) inBox[ord[k]] = 0;
      nBox -= best.removed;
      yBox -= best.yRemoved;
      if (best.side === 'lower') lower[best.dim] = v;
      else upper[best.dim] = v;
      steps.push({ ...this.stats(nBox, yBox), lower: lower.slice(), upper: upper.slice(), peeled: { dim: best.dim, side: best.side } });
    }
    return steps;
  }

  /**
   * From position `start` of order[j], moving by `dir`, take the first `m` points that `member` accepts (a mask:
   * 1 = accepted, or a predicate), plus
   * every further accepted point with the same value as the m-th (ties go together). Null if none.
   */
  walk(j: number, start: number, dir: number, m: number, member: Uint8Array | ((i: number) => boolean)): { count: number; passes: number; last: number; end: number } | null {
    const mask = member instanceof Uint8Array ? member : null;
    const ord = this.order[j];
    const sv = this.sorted[j];
    let count = 0;
    let passes = 0;
    let last = Number.NaN;
    let k = start;
    for (; k >= 0 && k < this.n; k += dir) {
      const i = ord[k];
      if (count >= m && sv[k] !== last) break;
      if (mask !== null ? mask[i] === 0 : !(member as (i: number) => boolean)(i)) continue;
      count++;
      passes += this.y[i];
      last = sv[k];
    }
    return count === 0 ? null : { count, passes, last, end: k };
  }

  /** Is point i inside the bounds on every dimension but `skip`? */
  insideExcept(i: number, lower: Float64Array, upper: Float64Array, skip: number): boolean {
    if (this.active[i] === 0) return false;
    for (let j = 0; j < this.d; j++) {
      if (j === skip) continue;
      const v = this.x[j][i];
      if (!(v > lower[j] && v < upper[j])) return false;
    }
    return true;
  }

  /** First position in order[j] whose value is above `t` (`strict`) or at least `t`. */
  firstPosition(j: number, t: number, strict: boolean): number {
    const sv = this.sorted[j];
    let lo = 0;
    let hi = this.n;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      const v = sv[mid];
      if (v < t || (strict && v === t)) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  }

  /** Grow a box face by face while that raises its mean (F&F §4.2). */
  paste(lowerIn: Float64Array, upperIn: Float64Array): { lower: Float64Array; upper: Float64Array; n: number; passes: number; pastes: number } {
    const lower = lowerIn.slice();
    const upper = upperIn.slice();
    let nBox = 0;
    let yBox = 0;
    for (let i = 0; i < this.n; i++) {
      if (this.insideExcept(i, lower, upper, -1)) {
        nBox++;
        yBox += this.y[i];
      }
    }
    let pastes = 0;
    for (;;) {
      const m = Math.max(1, Math.round(this.alpha * nBox));
      let best: { dim: number; side: 'lower' | 'upper'; count: number; passes: number; bound: number; mean: number } | null = null;
      for (let j = 0; j < this.d; j++) {
        for (const side of ['lower', 'upper'] as const) {
          const bound = side === 'lower' ? lower[j] : upper[j];
          if (!Number.isFinite(bound)) continue;
          // Walk outward from the face: values <= lower downwards, values >= upper upwards.
          const start = side === 'lower' ? this.firstPosition(j, bound, true) - 1 : this.firstPosition(j, bound, false);
          const slice = this.walk(j, start, side === 'lower' ? -1 : 1, m, (i) => this.insideExcept(i, lower, upper, j));
          if (slice === null) continue;
          const mean = (yBox + slice.passes) / (nBox + slice.count);
          if (mean > yBox / nBox && (best === null || mean > best.mean)) {
            // The new face: the next value beyond the slice (any point), or open when none is left.
            const next = slice.end >= 0 && slice.end < this.n ? this.sorted[j][slice.end] : side === 'lower' ? -Infinity : Infinity;
            best = { dim: j, side, count: slice.count, passes: slice.passes, bound: next, mean };
          }
        }
      }
      if (best === null) break;
      if (best.side === 'lower') lower[best.dim] = best.bound;
      else upper[best.dim] = best.bound;
      nBox += best.count;
      yBox += best.passes;
      pastes++;
    }
    return { lower, upper, n: nBox, passes: yBox, pastes };
  }

  /** Display bounds of a box: halfway between the face threshold and the nearest point kept inside. */
  shown(lower: Float64Array, upper: Float64Array): { shownLower: (number | null)[]; shownUpper: (number | null)[] } {
    const minIn = new Float64Array(this.d).fill(Infinity);
    const maxIn = new Float64Array(this.d).fill(-Infinity);
    for (let i = 0; i < this.n; i++) {
      if (!this.insideExcept(i, lower, upper, -1)) continue;
      for (let j = 0; j < this.d; j++) {
        const v = this.x[j][i];
        if (v < minIn[j]) minIn[j] = v;
        if (v > maxIn[j]) maxIn[j] = v;
      }
    }
    return {
      shownLower: [...lower].map((t, j) => (Number.isFinite(t) && Number.isFinite(minIn[j]) ? (t + minIn[j]) / 2 : null)),
      shownUpper: [...upper].map((t, j) => (Number.isFinite(t) && Number.isFinite(maxIn[j]) ? (t + maxIn[j]) / 2 : null)),
    };
  }
}

/**
 * The step to keep: the largest box (earliest step) whose density cannot be told from the best one's at 95 %,
 * i.e. whose Wilson upper bound reaches the highest Wilson lower bound on the trajectory. Late peels chase
 * noise (the density creeps up as the box shrinks); this keeps the box the data support, in the spirit of the
 * one-standard-error rule of Breiman et al. (1984) for trees.
 */
export function chooseStep(trajectory: readonly PrimStats[]): number {
  const bounds = trajectory.map((s) => wilson(s.passes, s.n));
  const bestLow = Math.max(...bounds.map((b) => b.low));
  const k = bounds.findIndex((b) => b.high >= bestLow);
  return k < 0 ? 0 : k;
}

/**
 * Pasting alone (F&F §4.2): grow the box (lower[j] < x_j < upper[j]) by slices of alpha of its points while
 * that raises its mean. Returns the grown bounds and how many slices were added.
 */
export function pasteBox(x: readonly Float64Array[], y: Uint8Array, lower: Float64Array, upper: Float64Array, alpha = 0.05): { lower: Float64Array; upper: Float64Array; pastes: number } {
  const grown = new Prim(x, y, alpha, 1).paste(lower, upper);
  return { lower: grown.lower, upper: grown.upper, pastes: grown.pastes };
}

/**
 * Find up to `maxBoxes` boxes of high pass rate.
 * @param x one column per dimension, in PRIM space (log10 for log-sampled parameters); equal lengths
 * @param y 1 = pass, 0 = fail, per point
 */
export function prim(x: readonly Float64Array[], y: Uint8Array, options: PrimOptions = {}): PrimResult {
  const alpha = options.alpha ?? 0.05;
  const minSupport = options.minSupport ?? 0.05;
  const maxBoxes = options.maxBoxes ?? 3;
  if (!(alpha > 0 && alpha < 0.5)) throw new RangeError(`PRIM alpha must be in (0, 0.5) (got ${alpha})`);
  if (!(minSupport > 0 && minSupport < 1)) throw new RangeError(`PRIM minimum support must be in (0, 1) (got ${minSupport})`);
  const engine = new Prim(x, y, alpha, Math.max(1, Math.ceil(minSupport * y.length)));
  const boxes: PrimBox[] = [];
  for (let b = 0; b < maxBoxes; b++) {
    let remaining = 0;
    let remainingPasses = 0;
    for (let i = 0; i < engine.n; i++) {
      remaining += engine.active[i];
      remainingPasses += engine.active[i] & y[i];
    }
    if (remaining < engine.minCount || remainingPasses === 0) break;
    const trajectory = engine.peel();
    const chosenStep = chooseStep(trajectory);
    const chosen = trajectory[chosenStep];
    const pasted = engine.paste(chosen.lower, chosen.upper);
    const box: PrimBox = {
      ...engine.stats(pasted.n, pasted.passes),
      lower: pasted.lower,
      upper: pasted.upper,
      trajectory,
      chosenStep,
      pastes: pasted.pastes,
      ...engine.shown(pasted.lower, pasted.upper),
    };
    // Covering: a later box must beat the pass rate of what is left, or it describes nothing.
    if (b > 0 && wilson(box.passes, box.n).low <= remainingPasses / remaining) break;
    boxes.push(box);
    if (chosenStep === 0 && pasted.pastes === 0) break; // the whole space: nothing more to separate
    for (let i = 0; i < engine.n; i++) if (engine.insideExcept(i, box.lower, box.upper, -1)) engine.active[i] = 0;
  }
  return { boxes, n: engine.n, passes: engine.totalPasses, alpha, minSupport };
}
