/**
 * Which sweep of a database a command means. A database may hold several sweeps (an edited spec is a new
 * sweep); `--sweep` names one by id prefix or exact name.
 */
import { DisksweepError } from '../../shared/errors.js';
import type { StoreReader } from './sweep-store.js';
import type { SweepRecord } from './store-types.js';

/**
 * The sweep `selector` names (id prefix or exact name), or, without a selector, the only sweep; with several,
 * `whenSeveral: 'latest'` takes the most recently registered one (readers such as `query`), and 'refuse' (the
 * default: commands that write) asks for --sweep. Errors are `input/invalid-flag` (exit 2) listing the sweeps.
 */
export function pickSweep(store: StoreReader, selector: string | undefined, whenSeveral: 'refuse' | 'latest' = 'refuse'): SweepRecord {
  const sweeps = store.listSweeps();
  if (sweeps.length === 0) throw new DisksweepError('input/invalid-flag', `${store.file} holds no sweep yet`);
  const matches = selector === undefined ? sweeps : sweeps.filter((s) => s.sweepId.startsWith(selector) || s.name === selector);
  if (matches.length === 1) return matches[0];
  if (selector === undefined && whenSeveral === 'latest') return sweeps[sweeps.length - 1]; // listSweeps is oldest first
  const list = sweeps.map((s) => `${s.sweepId.slice(0, 12)}  ${s.name}`);
  if (matches.length === 0) throw new DisksweepError('input/invalid-flag', `--sweep ${selector}: no such sweep in ${store.file}`, { details: list });
  throw new DisksweepError('input/invalid-flag', `${store.file} holds ${matches.length} sweeps${selector === undefined ? '' : ` matching "${selector}"`}: choose one with --sweep`, { details: list });
}

/**
 * The note a reader prints when `pickSweep(..., 'latest')` chose for the user among several sweeps (null when the
 * user named one or there was only one): one wording for every read-only command.
 */
export function latestSweepNote(store: StoreReader, selector: string | undefined, chosen: SweepRecord): string | null {
  if (selector !== undefined || store.listSweeps().length < 2) return null;
  return `${store.file} holds several sweeps: using the latest, ${chosen.name} (${chosen.sweepId.slice(0, 12)}); choose another with --sweep`;
}
