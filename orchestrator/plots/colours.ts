/**
 * Colours. Series use the Okabe & Ito (2008) colour-blind-safe palette; pass fractions use viridis
 * (van der Walt & Smith 2015, matplotlib), perceptually uniform and readable in grey, interpolated between
 * nine stops (the stops as commonly published, e.g. d3-scale-chromatic; from memory).
 */

export const SERIES_COLOURS = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#000000'] as const;

export const seriesColour = (k: number): string => SERIES_COLOURS[k % SERIES_COLOURS.length];

const VIRIDIS_STOPS = ['#440154', '#472d7b', '#3b528b', '#2c728e', '#21918c', '#28ae80', '#5ec962', '#addc30', '#fde725'] as const;

const rgb = (hex: string): [number, number, number] => [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16)) as [number, number, number];
const STOPS = VIRIDIS_STOPS.map(rgb);
const hex2 = (v: number): string => Math.round(v).toString(16).padStart(2, '0');

/** Viridis at t in [0, 1] (clamped) as #rrggbb. */
export function viridis(t: number): string {
  const u = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0)) * (STOPS.length - 1);
  const i = Math.min(STOPS.length - 2, Math.floor(u));
  const f = u - i;
  const [a, b] = [STOPS[i], STOPS[i + 1]];
  return `#${hex2(a[0] + f * (b[0] - a[0]))}${hex2(a[1] + f * (b[1] - a[1]))}${hex2(a[2] + f * (b[2] - a[2]))}`;
}

/** Cells with no points at all. */
export const NO_DATA_FILL = '#d9d9d9';
