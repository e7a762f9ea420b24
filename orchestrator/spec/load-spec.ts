/**
 * Reading a sweep spec from a file: size-limited, YAML with the core schema (no custom tags, aliases
 * limited) or JSON, then the zod shape, then the semantic rules, then the parameter rules on the corners of
 * the parameter box. Every problem is reported with its path, all at once, as an `input/*` error (exit 2), and
 * nothing is written before this succeeds.
 */
import { readFileSync, statSync } from 'node:fs';
import { extname } from 'node:path';
import { parseDocument, YAMLError } from 'yaml';
import type { z } from 'zod';
import { DisksweepError } from '../../shared/errors.js';
import { checkSpecSemantics, dimensionsOf, sweepSpecSchema, type Dimension, type SweepSpec } from '../../shared/sweep-spec.js';
import { checkParameterBox } from '../sweep/points.js';

/** Specs are hand-written files; anything bigger is a mistake (or an attack on the YAML parser). */
export const MAX_SPEC_BYTES = 1 << 20;

export interface LoadedSpec {
  readonly spec: SweepSpec;
  readonly dimensions: readonly Dimension[];
}

const pathText = (path: readonly PropertyKey[]): string =>
  path.map((seg, i) => (typeof seg === 'number' ? `[${seg}]` : `${i === 0 ? '' : '.'}${String(seg)}`)).join('');

function specError(source: string, details: string[]): DisksweepError {
  return new DisksweepError('input/invalid-spec', `${source}: the sweep spec is not valid (${details.length} problem${details.length === 1 ? '' : 's'})`, { details });
}

/** Parse and validate spec text. `format` picks the parser; YAML also reads JSON. */
export function parseSpecText(text: string, source: string, format: 'yaml' | 'json' = 'yaml'): LoadedSpec {
  let raw: unknown;
  try {
    raw = format === 'json' ? JSON.parse(text) : readYaml(text);
  } catch (error) {
    const what = error instanceof YAMLError ? error.message.split('\n')[0] : error instanceof Error ? error.message : String(error);
    throw specError(source, [`cannot parse ${format.toUpperCase()}: ${what}`]);
  }
  const shaped = sweepSpecSchema.safeParse(raw);
  if (!shaped.success) throw specError(source, zodDetails(shaped.error));
  const spec = shaped.data;
  const semantic = checkSpecSemantics(spec).map((i) => `${pathText(i.path)}: ${i.message}`);
  if (semantic.length > 0) throw specError(source, semantic);
  const dimensions = dimensionsOf(spec);
  const box = checkParameterBox(spec, dimensions);
  if (box.length > 0) throw specError(source, box);
  return { spec, dimensions };
}

/**
 * YAML with the core schema. `yaml`'s own parse() only warns about an unresolved (custom) tag and keeps the
 * plain value, so `!include other.yaml` would silently become the string "other.yaml"; a spec has no use for
 * custom tags, so every warning is refused like an error.
 */
function readYaml(text: string): unknown {
  const doc = parseDocument(text, { schema: 'core', uniqueKeys: true, prettyErrors: true });
  const [first] = [...doc.errors, ...doc.warnings];
  if (first !== undefined) throw first;
  return doc.toJS({ maxAliasCount: 64 });
}

function zodDetails(error: z.ZodError): string[] {
  return error.issues.map((iss) => {
    if (iss.code === 'unrecognized_keys') return `${pathText(iss.path) || '(top level)'}: unknown key${iss.keys.length > 1 ? 's' : ''} ${iss.keys.map((k) => `"${k}"`).join(', ')}`;
    return `${pathText(iss.path) || '(top level)'}: ${iss.message}`;
  });
}

/** Read a spec file (`.json` as JSON, anything else as YAML). */
export function loadSpecFile(file: string): LoadedSpec {
  let text: string;
  try {
    const size = statSync(file).size;
    if (size > MAX_SPEC_BYTES) throw specError(file, [`file is ${size} bytes; a spec may be at most ${MAX_SPEC_BYTES}`]);
    text = readFileSync(file, 'utf8');
  } catch (error) {
    if (error instanceof DisksweepError) throw error;
    const code = (error as NodeJS.ErrnoException).code ?? 'unknown';
    throw new DisksweepError('input/unreadable-file', `cannot read spec file ${file} (${code})`, { cause: error });
  }
  return parseSpecText(text, file, extname(file).toLowerCase() === '.json' ? 'json' : 'yaml');
}

