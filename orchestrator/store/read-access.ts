/**
 * Read-only use of a store by the commands that only read results (show, export, map, report): open, run,
 * close whatever happens. Opening checks the file is a disksweep store of this schema (exit 2 otherwise) and
 * never writes; `StoreReader.connection` gives the statements those commands prepare themselves.
 */
import { openStore, type StoreReader } from './sweep-store.js';

export function withReader<T>(file: string, fn: (reader: StoreReader) => T): T {
  const reader = openStore(file, { mode: 'read' });
  try {
    return fn(reader);
  } finally {
    reader.close();
  }
}

/** The same for async work: the connection stays open until `fn`'s promise settles. */
export async function withReaderAsync<T>(file: string, fn: (reader: StoreReader) => Promise<T>): Promise<T> {
  const reader = openStore(file, { mode: 'read' });
  try {
    return await fn(reader);
  } finally {
    reader.close();
  }
}
