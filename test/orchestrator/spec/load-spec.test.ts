/**
 * Reading sweep specs: every problem is reported at once, each naming its path and reason; unknown names get
 * the nearest known name; YAML is read with the core schema, aliases limited, custom tags refused; a file too
 * big or unreadable is an input error (exit 2) before anything is parsed.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DisksweepError, EXIT_BAD_INPUT, exitCodeFor } from '../../../shared/errors.js';
import { loadSpecFile, MAX_SPEC_BYTES, parseSpecText } from '../../../orchestrator/spec/load-spec.js';
import { useTempDir } from '../../support/temp-dir.js';

const tmp = useTempDir();

/** A valid spec as YAML lines; tests replace or append lines to break it. */
const BASE = [
  'name: heron-reach-disks',
  'model: { n_cells: 40, t_end_myr: 0.2, checkpoints_myr: [0.1, 0.2] }',
  'fixed: { initial_state: disk }',
];

/** The error parseSpecText throws for `text` (fails the test if it does not throw one). */
function specProblem(text: string, format: 'yaml' | 'json' = 'yaml'): DisksweepError {
  try {
    parseSpecText(text, 'test.yaml', format);
  } catch (error) {
    if (error instanceof DisksweepError) return error;
    throw error;
  }
  throw new Error(`expected the spec to be refused:\n${text}`);
}

describe('parseSpecText: valid specs', () => {
  it('fills in the sampling and chunk defaults and keeps the varied parameters in spec order', () => {
    const { spec, dimensions } = parseSpecText(
      [...BASE, 'vary:', '  m_disk_msun: { values: [0.01, 0.05] }', '  alpha_active: { log: [0.001, 0.1], count: 3 }'].join('\n'),
      'test.yaml',
    );
    expect(spec.sampling).toEqual({ plan: 'grid' });
    expect(spec.chunks).toEqual({ target_seconds: 2 });
    expect(dimensions).toEqual([
      { name: 'm_disk_msun', kind: 'values', values: [0.01, 0.05] },
      { name: 'alpha_active', kind: 'log', min: 0.001, max: 0.1, count: 3 },
    ]);
  });

  it('reads JSON, and YAML with a few aliases (limited, not forbidden)', () => {
    const json = JSON.stringify({ name: 'tern-json', fixed: { initial_state: 'disk' }, vary: { alpha_active: { values: [0.01, 0.02] } } });
    expect(parseSpecText(json, 'test.json', 'json').spec.name).toBe('tern-json');
    const aliased = [
      'name: tern-aliases',
      'fixed: { initial_state: disk }',
      'vary:',
      '  alpha_active: &levels { values: [0.01, 0.02] }',
      '  alpha_gi_max: *levels',
    ].join('\n');
    expect(parseSpecText(aliased, 'test.yaml').dimensions.map((d) => d.name)).toEqual(['alpha_active', 'alpha_gi_max']);
  });
});

interface SpecCase {
  readonly what: string;
  readonly lines: string[];
  /** Fragments that must appear in the details, each within one detail line. */
  readonly details: string[];
}

const BAD_SPECS: SpecCase[] = [
  { what: 'a log range reaching 0', lines: ['vary: { alpha_active: { log: [0.001, 0], count: 3 } }'], details: ['vary.alpha_active.log[1]: must be > 0 (got 0)'] },
  { what: 'a log range starting below 0', lines: ['vary: { m_disk_msun: { log: [-1, 0.1], count: 3 } }'], details: ['vary.m_disk_msun.log[0]: must be > 0 (got -1)'] },
  { what: 'a decreasing range', lines: ['vary: { alpha_active: { linear: [0.1, 0.01], count: 3 } }'], details: ['vary.alpha_active.linear: must be an increasing range [min, max] (got [0.1, 0.01])'] },
  { what: 'an empty range', lines: ['vary: { alpha_active: { linear: [0.05, 0.05], count: 3 } }'], details: ['vary.alpha_active.linear: must be an increasing range [min, max] (got [0.05, 0.05])'] },
  { what: 'an unknown varied name', lines: ['vary: { alpah_active: { values: [0.01] } }'], details: ['vary.alpah_active: unknown parameter (did you mean alpha_active?)'] },
  { what: 'an unknown fixed name', lines: ['vary: { alpha_active: { values: [0.01] } }', 'fixed: { initial_state: disk, m_dsk_msun: 0.1 }'], details: ['fixed.m_dsk_msun: unknown parameter (did you mean m_disk_msun?)'] },
  { what: 'an unknown model setting', lines: ['vary: { alpha_active: { values: [0.01] } }', 'model: { n_cell: 40 }'], details: ['model.n_cell: unknown parameter (did you mean n_cells?)'] },
  { what: 'a range on an integer parameter', lines: ['vary: { max_steps: { linear: [10, 100], count: 2 } }'], details: ['vary.max_steps: integer parameters take { values: [...] }'] },
  { what: 'a range on a choice', lines: ['vary: { active_layer: { linear: [0, 1], count: 2 } }'], details: ['vary.active_layer: is a choice'] },
  { what: 'a list parameter varied', lines: ['vary: { checkpoints_myr: { values: [0.1] } }'], details: ['vary.checkpoints_myr: list parameters cannot be varied'] },
  { what: 'a value outside the range', lines: ['vary: { alpha_active: { values: [0.01, 2] } }'], details: ['vary.alpha_active.values[1]: must be (0, 1] (got 2)'] },
  { what: 'a wrong type among the values', lines: ['vary: { alpha_active: { values: [0.01, true] } }'], details: ['vary.alpha_active: expected one of'] },
  { what: 'a choice value not on offer', lines: ['vary: { active_layer: { values: [uniform, patchy] } }'], details: ['vary.active_layer.values[1]: must be one of "uniform", "fixed_column"', '(got "patchy")'] },
  { what: 'repeated values', lines: ['vary: { alpha_active: { values: [0.01, 0.01] } }'], details: ['vary.alpha_active.values: has repeated values'] },
  { what: 'a count missing on a grid', lines: ['vary: { alpha_active: { log: [0.001, 0.1] } }'], details: ['vary.alpha_active.count: a grid needs a count for each range'] },
  { what: 'a count on a Sobol plan', lines: ['vary: { alpha_active: { log: [0.001, 0.1], count: 4 } }', 'sampling: { plan: sobol, points: 8 }'], details: ['vary.alpha_active.count: is only for grids; sobol takes sampling.points'] },
  { what: 'a fractional count', lines: ['vary: { alpha_active: { log: [0.001, 0.1], count: 2.5 } }'], details: ['vary.alpha_active: expected one of'] },
  { what: 'a Latin hypercube without a seed', lines: ['vary: { alpha_active: { log: [0.001, 0.1] } }', 'sampling: { plan: latin_hypercube, points: 8 }'], details: ['sampling.seed: ', 'expected number'] },
  { what: 'an unknown plan', lines: ['vary: { alpha_active: { values: [0.01] } }', 'sampling: { plan: halton, points: 8 }'], details: ['sampling.plan: plan must be one of "grid", "latin_hypercube", "sobol", "random"'] },
  { what: 'a chunk size of 0', lines: ['vary: { alpha_active: { values: [0.01] } }', 'chunks: { size: 0 }'], details: ['chunks.size: must be at least 1'] },
  { what: 'a physical parameter under model:', lines: ['vary: { m_disk_msun: { values: [0.01] } }', 'model: { alpha_active: 0.1 }'], details: ['model.alpha_active: is a physical parameter: put it under fixed:'] },
  { what: 'a model setting under fixed:', lines: ['vary: { m_disk_msun: { values: [0.01] } }', 'fixed: { initial_state: disk, n_cells: 40 }'], details: ['fixed.n_cells: is a model setting: put it under model:'] },
  { what: 'a name both fixed and varied', lines: ['vary: { m_disk_msun: { values: [0.01] } }', 'fixed: { initial_state: disk, m_disk_msun: 0.05 }'], details: ['vary.m_disk_msun: is already given under fixed:'] },
  { what: 'a number as name', lines: ['name: 42', 'vary: { alpha_active: { values: [0.01] } }'], details: ['name: ', 'expected string'] },
  { what: 'a name with spaces', lines: ['name: heron reach', 'vary: { alpha_active: { values: [0.01] } }'], details: ['name: use letters, digits, ".", "_" and "-"'] },
  { what: 'nothing varied', lines: ['vary: {}'], details: ['vary: must vary at least one parameter'] },
  { what: 'an unknown top-level key', lines: ['vary: { alpha_active: { values: [0.01] } }', 'sampeling: { plan: grid }'], details: ['(top level): unknown key "sampeling"'] },
];

/** Replace BASE lines that a case redefines (same top-level key), then append the rest. */
function specText(lines: readonly string[]): string {
  const keyOf = (l: string) => l.split(':')[0];
  const keys = new Set(lines.map(keyOf));
  return [...BASE.filter((l) => !keys.has(keyOf(l))), ...lines].join('\n');
}

describe('parseSpecText: every problem names its path and reason', () => {
  it.each(BAD_SPECS)('$what', ({ lines, details }) => {
    const error = specProblem(specText(lines));
    expect(error.code).toBe('input/invalid-spec');
    expect(exitCodeFor(error)).toBe(EXIT_BAD_INPUT);
    expect(error.message).toContain('test.yaml: the sweep spec is not valid');
    for (const d of details) expect(error.details.some((line) => line.includes(d)), `${d}\nin\n${error.details.join('\n')}`).toBe(true);
  });

  it('a name far from every parameter gets no suggestion', () => {
    const error = specProblem(specText(['vary: { frobnication_index: { values: [1] } }']));
    expect(error.details).toEqual(['vary.frobnication_index: unknown parameter']);
  });

  it('reports all problems of a spec together, with their count', () => {
    const error = specProblem(specText([
      'vary:',
      '  alpha_active: { log: [0.001, 0], count: 3 }',
      '  alpah_dead: { values: [0.0001] }',
      '  m_disk_msun: { values: [0.01, 0.01] }',
    ]));
    expect(error.message).toContain('(4 problems)');
    expect(error.details).toEqual([
      'vary.alpha_active.log[1]: must be > 0 (got 0)',
      'vary.alpha_active.log: must be an increasing range [min, max] (got [0.001, 0])',
      'vary.alpah_dead: unknown parameter (did you mean alpha_dead?)',
      'vary.m_disk_msun.values: has repeated values',
    ]);
  });

  it('checks the cross-parameter rules on the corners of the swept box, naming the corner', () => {
    // alpha_dead = 0.005 exceeds alpha_active at the low end of its range only.
    const error = specProblem(specText(['fixed: { initial_state: disk, alpha_dead: 0.005 }', 'vary: { alpha_active: { log: [0.001, 0.1], count: 3 } }']));
    expect(error.details).toHaveLength(1);
    expect(error.details[0]).toMatch(/^alpha_dead: must not exceed alpha_active = 0\.001 \(got 0\.005\)/);
    expect(error.details[0]).toContain('[at the corner alpha_active=0.001]');
  });
});

describe('parseSpecText: the YAML and JSON readers', () => {
  it('refuses a YAML syntax error, naming the line', () => {
    const error = specProblem('name: [heron\nvary: {');
    expect(error.details[0]).toMatch(/^cannot parse YAML: .*line 2/);
  });

  it('refuses repeated keys', () => {
    const error = specProblem([...BASE, 'vary: { alpha_active: { values: [0.01] } }', 'name: again'].join('\n'));
    expect(error.details[0]).toContain('cannot parse YAML: Map keys must be unique');
  });

  it('refuses an alias bomb before it expands', () => {
    const rows = ['a: &a [x, x, x, x, x, x, x, x, x]'];
    for (const [prev, next] of [['a', 'b'], ['b', 'c'], ['c', 'd'], ['d', 'e'], ['e', 'f'], ['f', 'g']]) {
      rows.push(`${next}: &${next} [${Array.from({ length: 9 }, () => `*${prev}`).join(', ')}]`);
    }
    const error = specProblem([...rows, ...BASE, 'vary: { alpha_active: { values: [0.01] } }'].join('\n'));
    expect(error.details[0]).toMatch(/^cannot parse YAML: Excessive alias count/);
  });

  it('refuses custom tags (the core schema has none), naming the tag', () => {
    const error = specProblem(specText(['vary: { alpha_active: { values: [0.01] } }', 'description: !include notes.txt']));
    expect(error.details).toHaveLength(1);
    expect(error.details[0]).toMatch(/^cannot parse YAML: Unresolved tag: !include at line 5/);
  });

  it('reads .json as JSON: a JSON syntax error is reported as such', () => {
    const error = specProblem('{"name": "tern", "vary": {', 'json');
    expect(error.details[0]).toMatch(/^cannot parse JSON: /);
  });
});

describe('loadSpecFile', () => {
  it('refuses a file larger than the limit without parsing it', () => {
    const file = tmp.file('huge.yaml');
    writeFileSync(file, `# ${'x'.repeat(MAX_SPEC_BYTES)}\n`);
    expect(() => loadSpecFile(file)).toThrow(expect.objectContaining({
      code: 'input/invalid-spec',
      details: [`file is ${MAX_SPEC_BYTES + 3} bytes; a spec may be at most ${MAX_SPEC_BYTES}`],
    }));
  });

  it.each([
    ['a missing file', 'absent.yaml', 'ENOENT'],
    ['a directory', 'specs', 'EISDIR'],
    ['a path through a file', 'plain.yaml/spec.yaml', 'ENOTDIR'],
  ])('refuses %s as an unreadable file (exit 2)', (_what, name, errno) => {
    mkdirSync(tmp.file('specs'));
    writeFileSync(tmp.file('plain.yaml'), 'name: x\n');
    const file = tmp.file(name);
    let caught: unknown;
    try {
      loadSpecFile(file);
    } catch (error) {
      caught = error;
    }
    expect(caught).toMatchObject({ code: 'input/unreadable-file', message: `cannot read spec file ${file} (${errno})` });
    expect(exitCodeFor(caught)).toBe(EXIT_BAD_INPUT);
  });
});
