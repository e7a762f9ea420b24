/**
 * `disksweep report`: a sweep named `<script>alert(1)</script>` (a database may hold any name) renders as
 * text in the page and its SVGs; file names derived from it are sanitised; --out refuses a non-empty
 * directory unless --force; and the page opens in headless Chromium with its plots drawn, no console errors,
 * no request beyond the page itself, and a screenshot written.
 */
import { existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { safeFileStem } from '../../../orchestrator/report/report-files.js';
import { runCli } from '../../support/cli.js';
import { withChromium } from '../../support/headless-chromium.js';
import { buildQueryDb, deadZoneGridSpec, type QueryDb } from '../../support/query-db.js';
import { makeTempDir, removeTempDir } from '../../support/temp-dir.js';
import { allElements, parseXml, textOf } from '../../support/xml-tree.js';

const HOSTILE = '<script>alert(1)</script>';
let dir: string;
let made: QueryDb;
let out: string;

beforeAll(() => {
  dir = makeTempDir();
  // Three varied parameters (3 x 3 x 2 models), so the report has three pairs to map.
  const spec = deadZoneGridSpec('wren-hollow', 3, 3);
  (spec.vary as Record<string, unknown>).r1_au = { values: [10, 40] };
  made = buildQueryDb(dir, spec, 'wren.sqlite', { storedName: HOSTILE });
  out = join(dir, 'report');
  const r = runCli(['report', made.path, '--target', 'solar-split', '--out', out]);
  if (r.status !== 0) throw new Error(`report failed (${r.status}):\n${r.stderr}`);
});

afterAll(() => removeTempDir(dir));

describe('disksweep report: files and escaping', () => {
  it('writes the page and the exports under sanitised names, linked from the page', () => {
    const stem = safeFileStem(HOSTILE);
    expect(stem).toMatch(/^[A-Za-z0-9._-]+$/);
    for (const f of ['index.html', `${stem}.csv`, `${stem}.ecsv`, `${stem}-answer.json`]) expect(existsSync(join(out, f)), f).toBe(true);
    const root = parseXml(readFileSync(join(out, 'index.html'), 'utf8'));
    const hrefs = allElements(root).filter((e) => e.name === 'a').map((e) => e.attrs.href);
    expect(hrefs.sort()).toEqual([`${stem}-answer.json`, `${stem}.csv`, `${stem}.ecsv`].sort());
    expect(readFileSync(join(out, `${stem}.ecsv`), 'utf8')).toContain('- name: pass');
  });

  it('shows the sweep name as text: no script element, no event-handler attribute, in the page or its SVGs', () => {
    const html = readFileSync(join(out, 'index.html'), 'utf8');
    const root = parseXml(html);
    const els = allElements(root);
    expect(els.filter((e) => e.name === 'script')).toHaveLength(0);
    for (const e of els) for (const a of Object.keys(e.attrs)) expect(a.startsWith('on'), `${e.name} ${a}`).toBe(false);
    expect(textOf(els.find((e) => e.name === 'h1')!)).toBe(`disksweep report: ${HOSTILE}`);
    const svgs = els.filter((e) => e.name === 'svg');
    expect(svgs.length).toBeGreaterThanOrEqual(3 + 1 + 3); // marginals, trajectory, maps
    const mapTitles = svgs.map((s) => textOf(s.children.find((c) => typeof c !== 'string' && c.name === 'title')!)).filter((x) => x.startsWith(HOSTILE));
    expect(mapTitles).toHaveLength(3);
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
  });

  it('--out refuses a non-empty directory unless --force, and a path that is a file', () => {
    const again = runCli(['report', made.path, '--target', 'solar-split', '--out', out]);
    expect(again.status).toBe(2);
    expect(again.stderr).toContain('not empty');
    const other = join(dir, 'busy');
    mkdirSync(other);
    writeFileSync(join(other, 'notes.txt'), 'mine');
    expect(runCli(['report', made.path, '--target', 'solar-split', '--out', other]).status).toBe(2);
    expect(existsSync(join(other, 'index.html'))).toBe(false);
    const forced = runCli(['report', made.path, '--target', 'solar-split', '--out', other, '--force']);
    expect(forced.status).toBe(0);
    expect(readFileSync(join(other, 'notes.txt'), 'utf8')).toBe('mine');
    expect(existsSync(join(other, 'index.html'))).toBe(true);
    const file = join(dir, 'plain-file');
    writeFileSync(file, 'x');
    const r = runCli(['report', made.path, '--target', 'solar-split', '--out', file]);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('not a directory');
    expect(runCli(['report', made.path, '--out', join(dir, 'new')]).status).toBe(2); // no --target
  });
});

interface PageInfo {
  title: string;
  h1: string;
  scripts: number;
  svgs: { w: number; h: number; shapes: number }[];
  cells: number;
  contours: number;
}

/** Evaluated in the page (as text: this project's TypeScript has no DOM types). */
const PAGE_INFO = `({
  title: document.title,
  h1: document.querySelector('h1')?.textContent ?? '',
  scripts: document.querySelectorAll('script').length,
  svgs: [...document.querySelectorAll('svg')].map((s) => {
    const r = s.getBoundingClientRect();
    return { w: r.width, h: r.height, shapes: s.querySelectorAll('rect, polyline, path, circle').length };
  }),
  cells: document.querySelectorAll('g.cells rect').length,
  contours: document.querySelectorAll('polyline.contour').length,
})`;

describe('disksweep report in headless Chromium', () => {
  it('renders every plot with nonzero size, logs no error, fetches nothing, and is captured', async () => {
    const page = pathToFileURL(join(out, 'index.html')).href;
    // Kept after the test (its path is printed) so a person can look at the page as rendered; one fixed,
    // git-ignored file overwritten by each run, so runs do not pile up screenshots in the temp directory.
    const shotDir = fileURLToPath(new URL('../../../test-output/', import.meta.url));
    mkdirSync(shotDir, { recursive: true });
    const shot = join(shotDir, 'report-screenshot.png');
    const seen = await withChromium(async (context) => {
      const tab = await context.newPage();
      const problems: string[] = [];
      const requests: string[] = [];
      tab.on('console', (m) => {
        if (m.type() === 'error' || m.type() === 'warning') problems.push(`${m.type()}: ${m.text()}`);
      });
      tab.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
      tab.on('dialog', (d) => problems.push(`dialog: ${d.message()}`));
      tab.on('request', (r) => requests.push(r.url()));
      await tab.goto(page, { waitUntil: 'load' });
      const info = await tab.evaluate<PageInfo>(PAGE_INFO);
      await tab.screenshot({ path: shot, fullPage: true });
      return { info, problems, requests };
    });
    expect(seen.problems).toEqual([]);
    expect(seen.requests).toEqual([page]);
    expect(seen.info.scripts).toBe(0);
    expect(seen.info.title).toBe(`disksweep report: ${HOSTILE}`);
    expect(seen.info.h1).toBe(`disksweep report: ${HOSTILE}`);
    expect(seen.info.svgs.length).toBeGreaterThanOrEqual(7);
    for (const s of seen.info.svgs) {
      expect(s.w).toBeGreaterThan(100);
      expect(s.h).toBeGreaterThan(100);
      expect(s.shapes).toBeGreaterThan(3);
    }
    expect(seen.info.cells).toBe(3 * 3 + 3 * 2 + 3 * 2); // the three maps: m_disk x alpha, and each with r1_au
    expect(statSync(shot).size).toBeGreaterThan(50_000);
    process.stderr.write(`report screenshot: ${shot}\n`);
  });
});
