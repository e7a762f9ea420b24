/**
 * Where a report goes: the --out directory (created if missing; refused when it holds anything, unless
 * --force, so a report never mixes with other files by accident) and the names of the files written into
 * it, derived from the sweep name but reduced to characters that are safe in any file system and URL.
 */
import { mkdirSync, readdirSync, statSync } from 'node:fs';
import { DisksweepError } from '../../shared/errors.js';

/** Letters, digits, '.', '_' and '-' only; no leading dot; at most 80 characters; never empty. */
export function safeFileStem(name: string): string {
  const stem = name.replace(/[^A-Za-z0-9._-]+/g, '_').replace(/^[._]+/, '').slice(0, 80).replace(/[._]+$/, '');
  return stem === '' ? 'sweep' : stem;
}

/** Make sure `dir` is a directory we may write the report into (exit 2 naming why not). */
export function prepareOutDir(dir: string, force: boolean): void {
  let entries: string[] | null = null;
  try {
    if (!statSync(dir).isDirectory()) throw new DisksweepError('input/invalid-flag', `--out ${dir}: exists and is not a directory`);
    entries = readdirSync(dir);
  } catch (error) {
    if (error instanceof DisksweepError) throw error;
    if ((error as NodeJS.ErrnoException).code !== 'ENOENT') {
      throw new DisksweepError('input/unreadable-file', `--out ${dir}: cannot read the directory (${(error as NodeJS.ErrnoException).code ?? 'error'})`, { cause: error });
    }
  }
  if (entries !== null && entries.length > 0 && !force) {
    throw new DisksweepError('input/invalid-flag', `--out ${dir} is not empty (${entries.length} entr${entries.length === 1 ? 'y' : 'ies'}): choose an empty or new directory, or add --force to write over the report files in it`, {
      details: entries.slice(0, 5),
    });
  }
  if (entries === null) {
    try {
      mkdirSync(dir, { recursive: true });
    } catch (error) {
      throw new DisksweepError('input/unwritable-file', `--out ${dir}: cannot create the directory (${(error as NodeJS.ErrnoException).code ?? 'error'})`, { cause: error });
    }
  }
}
