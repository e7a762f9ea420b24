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
    const code = (error as NodeJS.ErrnoException).code ?? 'error';
    throw new DisksweepError('input/unwritable-file', `${flag} ${path}: cannot write the file (${code})`, { cause: error });
  }
}
