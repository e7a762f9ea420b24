/**
 * Axis ticks: linear ticks at 1, 2, 5 x 10^k (Heckbert 1990) covering the data, log ticks at decades (with 2
 * and 5 on short axes), labels short and exact.
 */
import { describe, expect, it } from 'vitest';
import { formatNumber, linearTicks, logTicks, niceNumber } from '../../../orchestrator/plots/ticks.js';

const values = (t: { ticks: readonly { value: number; major: boolean }[] }, major = true) => t.ticks.filter((k) => k.major || !major).map((k) => k.value);

describe('nice numbers (Heckbert 1990)', () => {
  it.each([
    [0.7, true, 0.5], [1.4, true, 1], [2.9, true, 2], [6.9, true, 5], [7.1, true, 10],
    [0.7, false, 1], [1.01, false, 2], [4.9, false, 5], [5.1, false, 10], [0.0031, false, 0.005],
  ])('niceNumber(%s, round=%s) = %s', (x, round, want) => {
    expect(niceNumber(x, round)).toBeCloseTo(want, 12);
  });
});

describe('linear ticks', () => {
  it('cover the data with a 1-2-5 step and widen the range to the outer ticks', () => {
    const t = linearTicks(0.13, 0.97);
    expect(values(t)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
    expect([t.min, t.max]).toEqual([0, 1]);
    expect(t.ticks.map((k) => k.label)).toEqual(['0', '0.2', '0.4', '0.6', '0.8', '1']);
  });

  it('print exact decimals (no 0.30000000000000004)', () => {
    const t = linearTicks(0.1, 0.7, 6);
    for (const k of t.ticks) expect(k.label).toMatch(/^\d(\.\d)?$/);
  });

  it('keep inside the range when tight', () => {
    const t = linearTicks(0.13, 0.97, 5, true);
    expect(values(t)).toEqual([0.2, 0.4, 0.6, 0.8]);
    expect([t.min, t.max]).toEqual([0.13, 0.97]);
  });

  it('handle negative ranges and a single value', () => {
    expect(values(linearTicks(-3.2, 7.9))).toEqual([-5, 0, 5, 10]);
    expect(values(linearTicks(-3.2, 7.9, 10))).toEqual([-4, -2, 0, 2, 4, 6, 8]);
    const one = linearTicks(5, 5);
    expect(one.min).toBeLessThan(5);
    expect(one.max).toBeGreaterThan(5);
  });
});

describe('log ticks', () => {
  it('put labelled ticks at decades over many decades, with unlabelled minor ticks', () => {
    const t = logTicks(3e-9, 2e-6);
    expect(values(t)).toEqual([1e-9, 1e-8, 1e-7, 1e-6, 1e-5]);
    expect(t.ticks.filter((k) => k.major).map((k) => k.label)).toEqual(['1e-9', '1e-8', '1e-7', '1e-6', '1e-5']);
    expect(t.ticks.some((k) => !k.major && k.label === '' && Math.abs(k.value - 2e-9) < 1e-21)).toBe(true);
    expect([t.min, t.max]).toEqual([1e-9, 1e-5]);
  });

  it('add 2 and 5 on a short axis', () => {
    expect(values(logTicks(0.5, 2))).toEqual([0.1, 0.2, 0.5, 1, 2, 5, 10]);
    expect(values(logTicks(0.5, 2, true))).toEqual([0.5, 1, 2]);
  });

  it('label every n-th decade on a very long axis', () => {
    const t = logTicks(1e-20, 1e20);
    const labelled = t.ticks.filter((k) => k.label !== '').map((k) => k.value);
    expect(labelled.length).toBeLessThanOrEqual(9);
    expect(labelled[0]).toBe(1e-20);
  });

  it('refuse non-positive bounds', () => {
    expect(() => logTicks(0, 1)).toThrow(/positive/);
  });
});

describe('number labels', () => {
  it.each([[0, '0'], [0.25, '0.25'], [1234, '1234'], [1234.56, '1235'], [0.123456, '0.123'], [1e5, '1e5'], [2.5e30, '2.5e30'], [-3e-9, '-3e-9'], [0.001, '0.001'], [1e-4, '1e-4']])(
    'formatNumber(%s) = %s',
    (v, s) => expect(formatNumber(v)).toBe(s),
  );
});
