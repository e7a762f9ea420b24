/**
 * Marching squares on fields whose level sets are known: a Gaussian bump exp(-r^2 / 2 sigma^2), whose 0.5
 * level is the circle r = sigma sqrt(2 ln 2); a plane, whose levels are straight lines; a saddle; and a field
 * with a hole of missing data.
 */
import { describe, expect, it } from 'vitest';
import { marchingSquares, type ContourLine } from '../../../orchestrator/plots/contour.js';

const SIGMA = 1;
const R_HALF = SIGMA * Math.sqrt(2 * Math.LN2); // exp(-r^2/2) = 1/2

function gaussianField(n: number, half = 3) {
  const h = (2 * half) / (n - 1);
  const values = new Float64Array(n * n);
  for (let j = 0; j < n; j++) for (let i = 0; i < n; i++) {
    const x = -half + i * h;
    const y = -half + j * h;
    values[j * n + i] = Math.exp(-(x * x + y * y) / (2 * SIGMA * SIGMA));
  }
  const toXY = ([u, v]: [number, number]): [number, number] => [-half + u * h, -half + v * h];
  return { field: { nx: n, ny: n, values }, toXY, h };
}

/** Shoelace area of a closed polyline. */
const area = (line: readonly [number, number][]): number =>
  Math.abs(line.slice(0, -1).reduce((s, [x, y], k) => s + x * line[k + 1][1] - line[k + 1][0] * y, 0)) / 2;

const radiusErrors = (line: ContourLine, toXY: (p: [number, number]) => [number, number]): number[] =>
  line.map((p) => Math.abs(Math.hypot(...toXY(p)) - R_HALF));
const maxRadiusError = (line: ContourLine, toXY: (p: [number, number]) => [number, number]): number => Math.max(...radiusErrors(line, toXY));
const rmsRadiusError = (line: ContourLine, toXY: (p: [number, number]) => [number, number]): number => {
  const e = radiusErrors(line, toXY);
  return Math.sqrt(e.reduce((s, x) => s + x * x, 0) / e.length);
};

describe('marching squares', () => {
  it('traces the 0.5 level of a Gaussian as one closed circle of radius sigma sqrt(2 ln 2)', () => {
    const { field, toXY } = gaussianField(61);
    const lines = marchingSquares(field, 0.5);
    expect(lines).toHaveLength(1);
    const [line] = lines;
    expect(line[0]).toEqual(line[line.length - 1]); // closed
    expect(maxRadiusError(line, toXY)).toBeLessThan(2e-3);
    const a = area(line.map(toXY));
    // The inscribed polygon of a circle loses a little area; 0.5 % at this resolution.
    expect(a / (Math.PI * R_HALF * R_HALF)).toBeGreaterThan(0.995);
    expect(a / (Math.PI * R_HALF * R_HALF)).toBeLessThan(1.0001);
  });

  it('converges at second order in the grid spacing (linear interpolation)', () => {
    // RMS over the vertices: the maximum depends on where single crossings happen to fall.
    const coarse = gaussianField(41);
    const fine = gaussianField(81);
    const eCoarse = rmsRadiusError(marchingSquares(coarse.field, 0.5)[0], coarse.toXY);
    const eFine = rmsRadiusError(marchingSquares(fine.field, 0.5)[0], fine.toXY);
    const order = Math.log2(eCoarse / eFine) / Math.log2((coarse.h / fine.h));
    expect(order).toBeGreaterThan(1.7);
  });

  it('gives a straight open line for a plane, from border to border', () => {
    const nx = 5;
    const ny = 4;
    const values = Array.from({ length: nx * ny }, (_, k) => (k % nx) / (nx - 1)); // f = i / 4
    const lines = marchingSquares({ nx, ny, values }, 0.5);
    expect(lines).toHaveLength(1);
    const [line] = lines;
    expect(line).toHaveLength(ny);
    for (const [u] of line) expect(u).toBeCloseTo(2, 12);
    expect(line.map(([, v]) => v).sort()).toEqual([0, 1, 2, 3]);
  });

  it('resolves a saddle by the centre value into two separate segments', () => {
    // Corners: bottom-left 1, bottom-right 0, top-right 1, top-left 0; centre 0.5 + e is "above".
    const lines = marchingSquares({ nx: 2, ny: 2, values: [1, 0, 0, 1.1] }, 0.5);
    expect(lines).toHaveLength(2);
    for (const l of lines) expect(l).toHaveLength(2);
    // Centre above: the below corners (bottom-right, top-left) are cut off: segments bottom-right and top-left.
    const mids = lines.map((l) => [(l[0][0] + l[1][0]) / 2, (l[0][1] + l[1][1]) / 2]).sort((a, b) => a[1] - b[1]);
    expect(mids[0][0]).toBeGreaterThan(0.5); // near the bottom-right corner
    expect(mids[1][0]).toBeLessThan(0.5); // near the top-left corner
  });

  it('does not draw through cells without data', () => {
    const { field, toXY } = gaussianField(31);
    const values = Float64Array.from(field.values);
    // Knock out the grid point nearest (R_HALF, 0): the circle must open there.
    const h = 6 / 30;
    const i = Math.round((R_HALF + 3) / h);
    const j = Math.round(3 / h);
    values[j * 31 + i] = NaN;
    const lines = marchingSquares({ ...field, values }, 0.5);
    expect(lines).toHaveLength(1);
    const [line] = lines;
    expect(line[0]).not.toEqual(line[line.length - 1]);
    for (const p of line) {
      const [x, y] = toXY(p);
      // No vertex inside the four squares around the missing point.
      expect(Math.abs(x - (-3 + i * h)) < h - 1e-9 && Math.abs(y - (-3 + j * h)) < h - 1e-9).toBe(false);
    }
  });

  it('finds nothing when the level is outside the field, and rejects a wrong size', () => {
    expect(marchingSquares({ nx: 3, ny: 3, values: new Array(9).fill(0.2) }, 0.5)).toEqual([]);
    expect(() => marchingSquares({ nx: 3, ny: 3, values: [1, 2] }, 0.5)).toThrow(/expected 3 x 3/);
  });
});
