/**
 * `disksweep map` as a process on a real 4 x 4 grid of small disk models: each cell holds one model, so the
 * map must equal the table of which models reached the solar-like split by 3 Myr (t_solar_split_myr, the
 * models' own recorded first passage); terminal, JSON, SVG and PNG outputs; a sweep name with markup stays
 * text in the SVG; bad flags exit 2.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../support/cli.js';
import { buildQueryDb, deadZoneGridSpec, type QueryDb } from '../../support/query-db.js';
import { makeTempDir, removeTempDir } from '../../support/temp-dir.js';
import { allElements, parseXml, textOf } from '../../support/xml-tree.js';

const HOSTILE = '<script>alert(1)</script>';
let dir: string;
let made: QueryDb;
let hostile: QueryDb;

beforeAll(() => {
  dir = makeTempDir();
  made = buildQueryDb(dir, deadZoneGridSpec('wren-hollow', 4, 4), 'wren.sqlite');
  hostile = buildQueryDb(dir, deadZoneGridSpec('wren-hollow', 2, 2), 'hostile.sqlite', { storedName: HOSTILE });
});

afterAll(() => removeTempDir(dir));

interface MapJson {
  x: { name: string; scale: string; edges: number[] };
  y: { name: string; scale: string; edges: number[] };
  cells: { count: number[]; pass: number[]; fraction: (number | null)[] };
  counts: { selected: number; passed: number };
}

describe('disksweep map', () => {
  it('--json: one cell per grid point, holding exactly the models that reached the split by 3 Myr', () => {
    const r = runCli(['map', made.path, '--x', 'alpha_active', '--y', 'm_disk_msun', '--target', 'solar-split', '--json']);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const m = JSON.parse(r.stdout) as MapJson;
    expect(m.x.scale).toBe('log');
    expect(m.x.edges).toHaveLength(5);
    expect(m.y.edges).toHaveLength(5);
    expect(m.cells.count).toEqual(new Array(16).fill(1));
    // Expected from the stored outcomes: grid order is m_disk_msun (slowest), then alpha_active.
    const passes: number[] = made.outcomes.map((o) => {
      const t = o.outcome.kind === 'model' && o.outcome.result.status === 'ok' ? o.outcome.result.scalars.t_solar_split_myr : null;
      return typeof t === 'number' && t <= 3 ? 1 : 0;
    });
    const want = new Array<number>(16);
    made.outcomes.forEach((o, k) => {
      const i = m.x.edges.findIndex((e, b) => (o.params.alpha_active as number) >= e && (o.params.alpha_active as number) < m.x.edges[b + 1]);
      const j = m.y.edges.findIndex((e, b) => (o.params.m_disk_msun as number) >= e && (o.params.m_disk_msun as number) < m.y.edges[b + 1]);
      want[j * 4 + i] = passes[k];
    });
    expect(m.cells.pass).toEqual(want);
    expect(m.counts.passed).toBe(passes.reduce((a, b) => a + b, 0));
    expect(m.counts.passed).toBeGreaterThan(0); // the grid has both outcomes, so the map is not trivial
    expect(m.counts.passed).toBeLessThan(16);
  });

  it('prints a block map with its legend, and writes SVG (with a 50 % contour) and PNG', () => {
    const r = runCli(['map', made.path, '--x', 'alpha_active', '--y', 'm_disk_msun', '--target', 'solar-split', '--svg', `${dir}/m.svg`, '--png', `${dir}/m.png`]);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('wren-hollow: solar-split(f_m=0.99,f_j=0.02,t_max_myr=3)');
    expect(r.stdout).toMatch(/\d+ of 16 selected points pass/);
    expect(r.stdout).toContain('[▓▓] 50–75 %');
    expect(r.stdout).toContain('alpha_active (log)');
    const root = parseXml(readFileSync(`${dir}/m.svg`, 'utf8'));
    expect(allElements(root).filter((e) => e.attrs.class === 'contour').length).toBeGreaterThan(0);
    expect(readFileSync(`${dir}/m.png`).subarray(1, 4).toString('latin1')).toBe('PNG');
  });

  it('keeps a sweep name with markup as text in the SVG (no script element)', () => {
    const r = runCli(['map', hostile.path, '--x', 'm_disk_msun', '--y', 'alpha_active', '--target', 'solar-split', '--svg', `${dir}/h.svg`]);
    expect(r.status).toBe(0);
    const svg = readFileSync(`${dir}/h.svg`, 'utf8');
    expect(svg).not.toContain('<script');
    const root = parseXml(svg);
    expect(allElements(root).filter((e) => e.name === 'script')).toHaveLength(0);
    expect(textOf(allElements(root).find((e) => e.attrs.class === 'plot-title')!)).toBe(`${HOSTILE}: solar-split(f_m=0.99,f_j=0.02,t_max_myr=3)`);
  });

  it('labels a choice parameter with its choices (terminal, JSON and SVG ticks)', () => {
    const spec = deadZoneGridSpec('wren-hollow-layers', 1, 3);
    (spec.vary as Record<string, unknown>).active_layer = { values: ['uniform', 'fixed_column'] };
    delete (spec.vary as Record<string, unknown>).m_disk_msun;
    delete (spec.fixed as Record<string, unknown>).active_layer;
    const db = buildQueryDb(dir, spec, 'layers.sqlite');
    const args = ['map', db.path, '--x', 'active_layer', '--y', 'alpha_active', '--target', 'disk-fraction(at_myr=1,max=0.01)'];
    const json = runCli([...args, '--json']);
    expect(json.stderr).toBe('');
    const m = JSON.parse(json.stdout) as MapJson & { x: { categories: string[] } };
    expect(m.x.categories).toEqual(['uniform', 'fixed_column']);
    expect(m.cells.count).toEqual([1, 1, 1, 1, 1, 1]);
    const text = runCli([...args, '--svg', `${dir}/layers.svg`]);
    expect(text.status).toBe(0);
    expect(text.stdout).toMatch(/uniform +fixed_column/);
    const ticks = allElements(parseXml(readFileSync(`${dir}/layers.svg`, 'utf8'))).filter((e) => e.attrs.class === 'tick').map(textOf);
    expect(ticks).toEqual(expect.arrayContaining(['uniform', 'fixed_column']));
  });

  it('refuses bad flags with exit 2 and a message naming them', () => {
    const base = ['map', made.path, '--x', 'alpha_active', '--y', 'm_disk_msun'];
    const cases: [string[], string][] = [
      [[...base], '--target'],
      [[...base, '--target', 'solar-spilt'], 'solar-split'],
      [[...base, '--target', 'solar-split', '--bins', '1'], '--bins'],
      [['map', made.path, '--x', 'r1_au', '--y', 'm_disk_msun', '--target', 'solar-split'], 'r1_au'],
      [[...base, '--target', 'solar-split', '--where', 'alpha_active >'], '--where'],
      [[...base, '--target', 'solar-split', '--where', 'alpha_active > 1'], 'selects none'],
    ];
    for (const [args, fragment] of cases) {
      const r = runCli(args);
      expect(r.status, args.join(' ')).toBe(2);
      expect(r.stderr).toContain(fragment);
    }
  });
});
