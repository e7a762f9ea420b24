/** Open a database for writing and take its lock as this process (throws `store/locked` naming a live owner). */
import { hostname } from 'node:os';
import { openStore, type SweepStore } from '../store/index.js';

export function lockStore(dbFile: string): SweepStore {
  const store = openStore(dbFile, { mode: 'write' });
  try {
    store.acquireLock({ host: hostname(), pid: process.pid });
  } catch (error) {
    store.close();
    throw error;
  }
  return store;
}
