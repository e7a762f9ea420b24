/**
 * Readers for the files in deploy/, so a test can check them without a Docker engine or systemd: Dockerfile
 * stages and instructions, a systemd unit's sections and keys, durations in either's syntax, compose variable
 * defaults, and the flags a built `disksweep` subcommand accepts (from its --help).
 */
import { cpSync, mkdirSync, readFileSync, symlinkSync } from 'node:fs';
import { dirname, join, posix } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runCli } from './cli.js';

export const DEPLOY_DIR = fileURLToPath(new URL('../../deploy/', import.meta.url));
export const REPO_DIR = fileURLToPath(new URL('../../', import.meta.url));
export const readDeploy = (name: string): string => readFileSync(DEPLOY_DIR + name, 'utf8');

export interface Instruction {
  readonly op: string;
  readonly args: string;
}
export interface DockerStage {
  readonly from: string;
  readonly name: string | null;
  readonly instructions: readonly Instruction[];
}

/** Stages of a Dockerfile (comments dropped, continuation lines joined), in order. */
export function dockerStages(text: string): DockerStage[] {
  const logical = text.replace(/\\\r?\n/g, ' ').split(/\r?\n/).map((l) => l.trim()).filter((l) => l !== '' && !l.startsWith('#'));
  const stages: { from: string; name: string | null; instructions: Instruction[] }[] = [];
  for (const line of logical) {
    const m = /^(\S+)\s+(.*)$/.exec(line);
    if (m === null) throw new Error(`Dockerfile line without arguments: ${line}`);
    const op = m[1].toUpperCase();
    if (op === 'FROM') {
      const from = /^(\S+)(?:\s+AS\s+(\S+))?$/i.exec(m[2]);
      if (from === null) throw new Error(`cannot read FROM ${m[2]}`);
      stages.push({ from: from[1], name: from[2] ?? null, instructions: [] });
    } else {
      const stage = stages.at(-1);
      if (stage === undefined) throw new Error(`${op} before any FROM`);
      stage.instructions.push({ op, args: m[2] });
    }
  }
  return stages;
}

/** Sections of a systemd unit: section -> key -> every value given (comments and blank lines dropped). */
export function unitSections(text: string): Map<string, Map<string, string[]>> {
  const sections = new Map<string, Map<string, string[]>>();
  let current: Map<string, string[]> | undefined;
  for (const raw of text.split(/\r?\n/)) {
    const line = raw.trim();
    if (line === '' || line.startsWith('#') || line.startsWith(';')) continue;
    const header = /^\[(.+)\]$/.exec(line);
    if (header !== null) {
      current = new Map();
      sections.set(header[1], current);
      continue;
    }
    const kv = /^([A-Za-z0-9]+)\s*=\s*(.*)$/.exec(line);
    if (kv === null || current === undefined) throw new Error(`not a unit file line: ${line}`);
    current.set(kv[1], [...(current.get(kv[1]) ?? []), kv[2]]);
  }
  return sections;
}

const UNIT_SECONDS: Record<string, number> = { '': 1, s: 1, sec: 1, m: 60, min: 60, h: 3600, hr: 3600 };

/** A duration as systemd ("15min", "90s") or compose ("15m", "1m30s") writes it, in seconds. */
export function durationSeconds(text: string): number {
  const parts = [...text.trim().matchAll(/(\d+(?:\.\d+)?)\s*([a-z]*)/g)];
  if (parts.length === 0 || parts.map((p) => p[0]).join('') !== text.trim().replace(/\s+/g, '')) throw new Error(`not a duration: ${text}`);
  return parts.reduce((sum, [, n, unit]) => {
    const factor = UNIT_SECONDS[unit];
    if (factor === undefined) throw new Error(`unknown time unit "${unit}" in ${text}`);
    return sum + Number(n) * factor;
  }, 0);
}

/** Replace compose's `${NAME:-default}` by its default (what runs when the variable is not set). */
export const composeDefaults = (text: string): string => text.replace(/\$\{[A-Z0-9_]+:-([^}]*)\}/g, '$1');

let subcommands: string[] | undefined;

/** The subcommands of the built CLI (from `disksweep --help`, read once). */
export function cliSubcommands(): string[] {
  if (subcommands !== undefined) return subcommands;
  const help = runCli(['--help']);
  if (help.status !== 0) throw new Error(`disksweep --help failed: ${help.stderr}`);
  const block = help.stdout.split(/\nCommands:\n/)[1]?.split(/\n\n/)[0] ?? '';
  subcommands = [...block.matchAll(/^ {2}([a-z][a-z-]*)/gm)].map((m) => m[1]);
  return subcommands;
}

const flagsBySubcommand = new Map<string, Set<string>>();

/** The long flags a subcommand of the built CLI accepts (from `disksweep SUB --help`, read once). */
export function cliFlags(subcommand: string): Set<string> {
  const known = flagsBySubcommand.get(subcommand);
  if (known !== undefined) return known;
  const help = runCli([subcommand, '--help']);
  if (help.status !== 0) throw new Error(`disksweep ${subcommand} --help failed: ${help.stderr}`);
  const options = help.stdout.split(/\nOptions:\n/)[1]?.split(/\n\n/)[0] ?? '';
  const flags = new Set([...options.matchAll(/^ {2}(?:-[a-zA-Z], )?(--[a-z][a-z-]*)/gm)].map((m) => m[1]));
  flagsBySubcommand.set(subcommand, flags);
  return flags;
}

/** Where a stage of a Dockerfile lives on this machine: its root directory, and its WORKDIR inside the image. */
export interface StageDir {
  readonly root: string;
  readonly workdir: string;
}

/**
 * Replay a COPY line (`[--from=STAGE] SRC... DEST`) from one directory tree into another, as Docker would:
 * several sources or a DEST ending in / go into DEST, a single source becomes DEST. `node_modules` is linked,
 * not copied (the test's own modules stand in for the image's).
 */
export function replayCopy(line: string, from: StageDir, to: StageDir): void {
  const parts = line.split(/\s+/).filter((p) => !p.startsWith('--'));
  const dest = parts.pop() ?? '';
  const into = parts.length > 1 || dest.endsWith('/');
  for (const src of parts) {
    const source = join(from.root, posix.isAbsolute(src) ? posix.relative(from.workdir, src) : src);
    const destPath = posix.isAbsolute(dest) ? posix.relative(to.workdir, dest) : dest;
    const target = join(to.root, destPath, into ? posix.basename(src) : '');
    mkdirSync(dirname(target), { recursive: true });
    if (posix.basename(src) === 'node_modules') symlinkSync(source, target);
    else cpSync(source, target, { recursive: true });
  }
}
