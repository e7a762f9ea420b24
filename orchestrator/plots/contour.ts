/**
 * Contour lines of a field sampled on a regular grid, by marching squares (Lorensen & Cline 1987 in 2-D;
 * saddle cells resolved by the mean of their four corners). Squares with an undefined corner (NaN: a map cell
 * without points) are skipped, so a contour never runs through missing data.
 *
 * Coordinates are in index space: grid point (i, j) is at x = i, y = j; a crossing on an edge is placed by
 * linear interpolation. Segments are joined into polylines through the edge each pair of squares shares;
 * closed loops repeat their first point at the end.
 */

export type ContourLine = [number, number][];

/** Field values row by row: value(i, j) = values[j * nx + i], i along x, j along y. */
export interface GridField {
  readonly nx: number;
  readonly ny: number;
  readonly values: ArrayLike<number>;
}

// Edge ids: the bottom edge of square (i, j) is the horizontal edge from (i, j) to (i + 1, j): id 2(j nx + i);
// the left edge is the vertical edge from (i, j) to (i, j + 1): id 2(j nx + i) + 1.
type Edge = 'b' | 'r' | 't' | 'l';

// For each of the 16 corner cases (bit 1 = bottom-left above the level, 2 = bottom-right, 4 = top-right,
// 8 = top-left), the pairs of edges the level crosses. 5 and 10 are saddles, handled apart.
const CASES: readonly (readonly [Edge, Edge][])[] = [
  [], [['l', 'b']], [['b', 'r']], [['l', 'r']], [['r', 't']], [], [['b', 't']], [['l', 't']],
  [['t', 'l']], [['t', 'b']], [], [['t', 'r']], [['r', 'l']], [['r', 'b']], [['b', 'l']], [],
];

export function marchingSquares(field: GridField, level: number): ContourLine[] {
  const { nx, ny, values } = field;
  if (values.length !== nx * ny) throw new RangeError(`field has ${values.length} values, expected ${nx} x ${ny}`);
  const v = (i: number, j: number): number => values[j * nx + i];
  const points = new Map<number, [number, number]>();
  const links = new Map<number, number[]>();

  const edgePoint = (i: number, j: number, e: Edge): number => {
    // Normalise to the owning square's bottom or left edge.
    const [ei, ej, vertical] = e === 'b' ? [i, j, false] : e === 't' ? [i, j + 1, false] : e === 'l' ? [i, j, true] : [i + 1, j, true];
    const id = 2 * (ej * nx + ei) + (vertical ? 1 : 0);
    if (!points.has(id)) {
      const a = v(ei, ej);
      const b = vertical ? v(ei, ej + 1) : v(ei + 1, ej);
      const t = a === b ? 0.5 : (level - a) / (b - a);
      points.set(id, vertical ? [ei, ej + t] : [ei + t, ej]);
    }
    return id;
  };
  const link = (a: number, b: number): void => {
    (links.get(a) ?? links.set(a, []).get(a)!).push(b);
    (links.get(b) ?? links.set(b, []).get(b)!).push(a);
  };

  for (let j = 0; j + 1 < ny; j++) {
    for (let i = 0; i + 1 < nx; i++) {
      const c = [v(i, j), v(i + 1, j), v(i + 1, j + 1), v(i, j + 1)];
      if (c.some((x) => !Number.isFinite(x))) continue;
      const code = (c[0] >= level ? 1 : 0) | (c[1] >= level ? 2 : 0) | (c[2] >= level ? 4 : 0) | (c[3] >= level ? 8 : 0);
      let pairs = CASES[code];
      if (code === 5 || code === 10) {
        const centreAbove = (c[0] + c[1] + c[2] + c[3]) / 4 >= level;
        // With the centre on the same side as the diagonal corners that are above, those corners connect.
        pairs = (code === 5) === centreAbove ? [['l', 't'], ['b', 'r']] : [['l', 'b'], ['r', 't']];
      }
      for (const [a, b] of pairs) link(edgePoint(i, j, a), edgePoint(i, j, b));
    }
  }
  return joinSegments(points, links);
}

function joinSegments(points: Map<number, [number, number]>, links: Map<number, number[]>): ContourLine[] {
  const used = new Set<number>();
  const lines: ContourLine[] = [];
  const walk = (start: number): number[] => {
    const chain = [start];
    used.add(start);
    let prev = -1;
    let cur = start;
    for (;;) {
      const next = (links.get(cur) ?? []).find((n) => n !== prev && !used.has(n));
      if (next === undefined) {
        // Closed loop: the start is a neighbour of the last point.
        if (chain.length > 2 && (links.get(cur) ?? []).includes(start)) chain.push(start);
        return chain;
      }
      chain.push(next);
      used.add(next);
      prev = cur;
      cur = next;
    }
  };
  // Open chains start at an end (one link); loops are what is left.
  for (const [id, ns] of links) if (ns.length === 1 && !used.has(id)) lines.push(walk(id).map((k) => points.get(k)!));
  for (const id of links.keys()) if (!used.has(id)) lines.push(walk(id).map((k) => points.get(k)!));
  return lines;
}
