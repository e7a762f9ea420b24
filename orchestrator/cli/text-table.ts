/** Plain-text tables and numbers for the terminal reports (model, probe, query). */

/** A number in 3 (or `digits`) significant digits, exponent form outside [1e-2, 1e4); '-' for null, yes/no for flags. */
export function num(v: number | boolean | null, digits = 3): string {
  if (v === null) return '-';
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (v === 0) return '0';
  if (!Number.isFinite(v)) return String(v);
  return Math.abs(v) >= 1e4 || Math.abs(v) < 1e-2 ? v.toExponential(digits - 1) : v.toPrecision(digits);
}

/** Right-aligned columns under a header and a rule. */
export function table(header: readonly string[], rows: readonly (readonly string[])[]): string {
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c].length)));
  const line = (cells: readonly string[]) => cells.map((cell, c) => cell.padStart(widths[c])).join('  ');
  return [line(header), line(widths.map((w) => '-'.repeat(w))), ...rows.map(line)].join('\n');
}
