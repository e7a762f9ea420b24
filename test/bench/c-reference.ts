/**
 * Builds and runs the C reference of the implicit step (implicit-step.c): compiled at bench time with the C
 * compiler on PATH ($CC, else `cc`) into a temporary directory, timed with the same n, steps per batch and
 * batch count as the JavaScript, and checked against the JavaScript solution of the same input.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { solveStepCase, type StepCaseName, type StepSamples } from './implicit-step-case.js';

/** Flags beyond -O2: keep the arithmetic IEEE-identical to JavaScript (no fused multiply-add). */
export const C_FLAGS = ['-O2', '-ffp-contract=off'];

export interface CompiledReference {
  readonly compiler: string;
  readonly version: string;
  readonly binary: string;
  dispose(): void;
}

/** The repository root: the nearest folder above this file holding package.json (works from src and dist). */
function repoRoot(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  while (!existsSync(join(dir, 'package.json'))) {
    const up = dirname(dir);
    if (up === dir) throw new Error('bench: no package.json above ' + fileURLToPath(import.meta.url));
    dir = up;
  }
  return dir;
}

function errorText(e: unknown): string {
  if (e instanceof Error) {
    const stderr = (e as Error & { stderr?: Buffer | string }).stderr;
    const detail = stderr === undefined ? '' : String(stderr).trim();
    return detail === '' ? e.message : `${e.message}: ${detail}`;
  }
  return String(e);
}

/** Compile the reference, or say why it cannot be. */
export function compileReference(): CompiledReference | { reason: string } {
  const compiler = process.env.CC !== undefined && process.env.CC !== '' ? process.env.CC : 'cc';
  let version: string;
  try {
    const out = execFileSync(compiler, ['--version'], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
    version = out.split('\n')[0].trim();
  } catch (e) {
    return { reason: `no C compiler: running "${compiler} --version" failed (${errorText(e)})` };
  }
  const source = join(repoRoot(), 'test', 'bench', 'implicit-step.c');
  if (!existsSync(source)) return { reason: `C source not found at ${source}` };
  const dir = mkdtempSync(join(tmpdir(), 'disksweep-bench-'));
  const binary = join(dir, 'implicit-step');
  try {
    execFileSync(compiler, [...C_FLAGS, '-o', binary, source, '-lm'], { stdio: ['ignore', 'pipe', 'pipe'] });
  } catch (e) {
    rmSync(dir, { recursive: true, force: true });
    return { reason: `compiling ${source} with ${compiler} failed: ${errorText(e)}` };
  }
  return { compiler, version, binary, dispose: () => rmSync(dir, { recursive: true, force: true }) };
}

interface CTimingLine {
  n: number;
  reps: number;
  sink: number;
  ns_per_cell_step: number[];
}

function isTimingLine(v: unknown): v is CTimingLine {
  if (typeof v !== 'object' || v === null) return false;
  const o = v as Record<string, unknown>;
  const samples = o.ns_per_cell_step;
  return (
    typeof o.n === 'number' && typeof o.reps === 'number' && typeof o.sink === 'number' &&
    Array.isArray(samples) && samples.every((x) => typeof x === 'number')
  );
}

/** Run the C loop once: `batches` timed batches of `reps` steps on n cells (after its own warm-up). */
export function timeReference(ref: CompiledReference, n: number, reps: number, batches: number): StepSamples {
  const text = execFileSync(ref.binary, [String(n), String(reps), String(batches)], { encoding: 'utf8' });
  const parsed: unknown = JSON.parse(text);
  if (!isTimingLine(parsed) || parsed.ns_per_cell_step.length !== batches) {
    throw new Error(`unexpected output from the C reference: ${text.slice(0, 200)}`);
  }
  if (!Number.isFinite(parsed.sink)) throw new Error(`the C reference produced a non-finite result at n = ${n}`);
  return { n: parsed.n, reps: parsed.reps, nsPerCellStep: parsed.ns_per_cell_step };
}

export interface CaseCheck {
  case: StepCaseName;
  n: number;
  /** Largest relative difference over every Σ'_i and both boundary flows. */
  max_rel_diff: number;
  /** Relative difference of the checksum Σ_i Σ'_i A_i (the disk mass after the step), C's against JS's. */
  checksum_rel_diff: number;
}

const relDiff = (a: number, b: number): number => (a === b ? 0 : Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b)));

/** Solve one step of a case in C and in JavaScript and compare every number. */
export function checkReference(ref: CompiledReference, n: number, name: StepCaseName): CaseCheck {
  const text = execFileSync(ref.binary, ['--check', String(n), name], { encoding: 'utf8' });
  const lines = text.trim().split('\n');
  const [flowTag, inner, outer] = lines[0].split(' ');
  const [sumTag, sum] = (lines[1] ?? '').split(' ');
  if (flowTag !== 'flows' || sumTag !== 'checksum' || lines.length !== n + 2) {
    throw new Error(`unexpected check output from the C reference: ${lines.length} lines for n = ${n}`);
  }
  const cSigma = lines.slice(2).map(Number);
  const js = solveStepCase(n, name);
  let maxRel = Math.max(relDiff(js.flows.mdotInner, Number(inner)), relDiff(js.flows.mdotOuter, Number(outer)));
  let jsSum = 0;
  for (let i = 0; i < n; i++) {
    maxRel = Math.max(maxRel, relDiff(js.sigma[i], cSigma[i]));
    jsSum += js.sigma[i] * js.area[i];
  }
  if (cSigma.some((v) => !Number.isFinite(v))) maxRel = Number.POSITIVE_INFINITY;
  return { case: name, n, max_rel_diff: maxRel, checksum_rel_diff: relDiff(jsSum, Number(sum)) };
}
