/**
 * "Nothing was written": a fingerprint of every file under a directory (relative path, size, SHA-256),
 * directories and empty directories included, to compare before and after a command.
 */
import { createHash } from 'node:crypto';
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';

export function treeSnapshot(root: string): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (dir: string): void => {
    for (const name of readdirSync(dir).sort()) {
      const path = join(dir, name);
      const rel = relative(root, path);
      const st = statSync(path);
      if (st.isDirectory()) {
        out[`${rel}/`] = 'directory';
        walk(path);
      } else {
        out[rel] = `${st.size}:${createHash('sha256').update(readFileSync(path)).digest('hex')}`;
      }
    }
  };
  walk(root);
  return out;
}
