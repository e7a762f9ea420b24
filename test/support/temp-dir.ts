/**
 * Temporary directories for tests that need real files (SQLite stores, specs). Each test gets its own
 * directory; `useTempDir()` creates one before each test and removes it after.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach } from 'vitest';

export function makeTempDir(prefix = 'disksweep-test-'): string {
  return mkdtempSync(join(tmpdir(), prefix));
}

export function removeTempDir(dir: string): void {
  rmSync(dir, { recursive: true, force: true });
}

/** A fresh directory per test: read `.path` inside the test (it changes before every test). */
export function useTempDir(prefix?: string): { readonly path: string; file(name: string): string } {
  let current = '';
  beforeEach(() => {
    current = makeTempDir(prefix);
  });
  afterEach(() => {
    removeTempDir(current);
  });
  return {
    get path() {
      return current;
    },
    file(name: string) {
      return join(current, name);
    },
  };
}
