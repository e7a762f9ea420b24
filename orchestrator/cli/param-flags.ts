/**
 * `--set name=value` flags → raw parameter object, typed per the parameter schema. Only the text-to-value
 * step happens here; ranges and cross-field rules are the schema's (shared/model-params.ts).
 */
import { DisksweepError } from '../../shared/errors.js';
import { PARAMS, allowedText, suggestionFor, type ParamDescriptor, type ParamName } from '../../shared/model-params.js';

// A decimal number with optional exponent; rejects '', '0x10', 'Infinity' and other things Number() accepts.
const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

function isParamName(name: string): name is ParamName {
  return Object.hasOwn(PARAMS, name);
}

/** One flag text to a value of the descriptor's kind, or a problem line naming the flag and what it expects. */
export function parseValue(name: string, p: ParamDescriptor, text: string): { value?: unknown; problem?: string } {
  switch (p.kind) {
    case 'number':
      return NUMBER.test(text) ? { value: Number(text) } : { problem: `${name}: expected a number, ${allowedText(p)} (got "${text}")` };
    case 'list': {
      const parts = text.split(',').map((s) => s.trim());
      const bad = parts.find((s) => !NUMBER.test(s));
      return bad === undefined
        ? { value: parts.map(Number) }
        : { problem: `${name}: expected comma-separated numbers (got "${bad}" in "${text}")` };
    }
    case 'choice':
      return { value: text };
  }
}

/** Parse repeated `name=value` strings; every problem is collected, then reported together (exit 2). */
export function paramsFromFlags(assignments: readonly string[]): Record<string, unknown> {
  const raw: Record<string, unknown> = {};
  const problems: string[] = [];
  for (const assignment of assignments) {
    const eq = assignment.indexOf('=');
    if (eq <= 0) {
      problems.push(`--set ${assignment}: expected name=value, e.g. --set alpha_active=0.01`);
      continue;
    }
    const name = assignment.slice(0, eq).trim();
    const text = assignment.slice(eq + 1).trim();
    if (!isParamName(name)) {
      problems.push(`${name}: unknown parameter${suggestionFor(name)}`);
      continue;
    }
    if (Object.hasOwn(raw, name)) {
      problems.push(`${name}: given twice (${JSON.stringify(raw[name])} and "${text}")`);
      continue;
    }
    const { value, problem } = parseValue(name, PARAMS[name], text);
    if (problem !== undefined) problems.push(problem);
    else raw[name] = value;
  }
  if (problems.length > 0) {
    const unknown = problems.some((d) => d.includes('unknown parameter'));
    throw new DisksweepError(
      unknown ? 'input/unknown-parameter' : 'input/invalid-parameter',
      'could not read --set flags; run `disksweep model --list` for names, units and ranges',
      { details: problems },
    );
  }
  return raw;
}
