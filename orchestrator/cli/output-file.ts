/**
 * Writing a file a command was asked for (--svg, --png, --out): a missing directory or an unwritable path is
 * the user's to fix (exit 2) and the message names the flag and the path.
 */
import { writeFileSync } from 'node:fs';
import { DisksweepError } from '../../shared/errors.js';

export function writeOutputFile(flag: string, path: string, data: string | Uint8Array): void {
  try {
    writeFileSync(path, data);
  } catch (error) {
    throw unwritableFile(flag, path, error);
  }
}

/** The exit-2 error for a file `flag` asked for that cannot be written (also for streams opened elsewhere). */
export function unwritableFile(flag: string, path: string, error: unknown): DisksweepError {
  const code = (error as NodeJS.ErrnoException).code ?? 'error';
  return new DisksweepError('input/unwritable-file', `${flag} ${path}: cannot write the file (${code})`, { cause: error });
}
