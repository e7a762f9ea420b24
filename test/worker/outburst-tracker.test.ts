import { describe, expect, it } from 'vitest';
import { OutburstTracker, type OutburstSummary } from '../../worker/outburst-tracker.js';

/** Deterministic step series: uneven steps, a steady Ṁ with bursts of `burst` x at the given step ranges. */
function series(steps: number, bursts: ReadonlyArray<readonly [number, number]>, burst: number) {
  let seed = 12345;
  const rand = (): number => {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    return seed / 2147483648;
  };
  const out: { t: number; m: number; mdot: number }[] = [];
  let t = 0;
  let m = 0;
  for (let k = 0; k < steps; k++) {
    const dt = 0.5 + rand();
    const mdot = bursts.some(([a, b]) => k >= a && k < b) ? burst : 1 + 0.1 * rand();
    t += dt;
    m += mdot * dt;
    out.push({ t, m, mdot });
  }
  return out;
}

/** The tracker's rule written plainly over the whole history (no cursor, nothing dropped). */
function reference(rows: ReturnType<typeof series>, window: number, factor: number): OutburstSummary {
  const times = [0];
  const masses = [0];
  const summary: OutburstSummary = { count: 0, mass: 0, firstStart: null };
  let inOutburst = false;
  for (const { t, m, mdot } of rows) {
    const tStart = times[times.length - 1];
    times.push(t);
    masses.push(m);
    const from = t - window;
    if (from < 0) continue;
    let k = 0;
    while (k + 1 < times.length && times[k + 1] <= from) k++;
    const massThen = times[k + 1] > times[k] ? masses[k] + ((masses[k + 1] - masses[k]) * (from - times[k])) / (times[k + 1] - times[k]) : masses[k];
    const mean = (m - massThen) / window;
    const bursting = mean > 0 && mdot > factor * mean;
    if (bursting) {
      if (!inOutburst) {
        summary.count++;
        if (summary.firstStart === null) summary.firstStart = tStart;
      }
      summary.mass += mdot * (t - tStart);
    }
    inOutburst = bursting;
  }
  return summary;
}

describe('OutburstTracker', () => {
  it('counts each run of bursting steps once and books the mass accreted during them', () => {
    const rows = series(3000, [[1000, 1010], [2000, 2005]], 1000);
    const tracker = new OutburstTracker(200, 10);
    for (const r of rows) tracker.observe(r.t, r.m, r.mdot);
    const got = tracker.result();
    expect(got.count).toBe(2);
    expect(got.firstStart).toBe(rows[999].t);
    let mass = 0;
    for (let k = 1000; k < 1010; k++) mass += 1000 * (rows[k].t - rows[k - 1].t);
    for (let k = 2000; k < 2005; k++) mass += 1000 * (rows[k].t - rows[k - 1].t);
    expect(got.mass).toBeCloseTo(mass, 6);
  });

  it('gives exactly the plain full-history result on a long run (history behind the window is dropped)', () => {
    const rows = series(30000, [[5000, 5003], [12000, 12040], [29000, 29001]], 500);
    const tracker = new OutburstTracker(150, 10);
    for (const r of rows) tracker.observe(r.t, r.m, r.mdot);
    const want = reference(rows, 150, 10);
    expect(want.count).toBe(3);
    expect(tracker.result()).toEqual(want);
  });

  it('matches the full-history result where many steps sit near the threshold (every mean matters)', () => {
    // Ṁ spread over four decades and a factor of 3: hundreds of outbursts, each decided by the windowed mean.
    const rows = series(30000, [], 0).map((r) => ({ ...r }));
    let m = 0;
    let seed = 7;
    for (let k = 0; k < rows.length; k++) {
      seed = (seed * 1103515245 + 12345) % 2147483648;
      const dt = rows[k].t - (k === 0 ? 0 : rows[k - 1].t);
      rows[k].mdot = 10 ** (4 * (seed / 2147483648));
      m += rows[k].mdot * dt;
      rows[k].m = m;
    }
    const tracker = new OutburstTracker(150, 3);
    for (const r of rows) tracker.observe(r.t, r.m, r.mdot);
    const want = reference(rows, 150, 3);
    expect(want.count).toBeGreaterThan(100);
    expect(tracker.result()).toEqual(want);
  });
});
