/**
 * Find a point by its id or a prefix of it, as a person types it from `export` output or a report: a unique
 * prefix is enough; an ambiguous one is an error that lists the candidates. Point ids are hex, so the prefix
 * is a range scan of the (sweep_key, point_id) index per sweep, never a full scan.
 */
import { DisksweepError } from '../../shared/errors.js';
import type { StoreReader, SweepRecord } from '../store/index.js';

export interface FoundPoint {
  readonly sweep: SweepRecord;
  readonly pointId: string;
  /** Other sweeps of the database holding the same point (results are identical: same input, same model). */
  readonly alsoIn: readonly SweepRecord[];
}

const HEX_PREFIX = /^[0-9a-f]{1,64}$/;
const MAX_CANDIDATES = 10;

export function findPoint(reader: StoreReader, prefixText: string, sweeps: readonly SweepRecord[]): FoundPoint {
  const prefix = prefixText.trim().toLowerCase();
  if (!HEX_PREFIX.test(prefix)) {
    throw new DisksweepError('input/invalid-flag', `POINT_ID: expected a point id or a prefix of one (hex digits 0-9, a-f; got "${prefixText}")`);
  }
  const stmt = reader.connection.prepare(
    `SELECT p.point_id FROM points p JOIN sweeps s ON s.sweep_key = p.sweep_key
     WHERE s.sweep_id = ? AND p.point_id >= ? AND p.point_id < ? ORDER BY p.point_id LIMIT ?`,
  ).pluck();
  // '~' sorts after every hex digit, so [prefix, prefix~) holds exactly the ids that start with prefix.
  const hits = new Map<string, SweepRecord[]>();
  for (const sweep of sweeps) {
    for (const id of stmt.all(sweep.sweepId, prefix, `${prefix}~`, MAX_CANDIDATES + 1) as string[]) {
      hits.set(id, [...(hits.get(id) ?? []), sweep]);
    }
  }
  if (hits.size === 0) {
    const where = sweeps.length === 1 ? `sweep ${sweeps[0].name}` : `any of the ${sweeps.length} sweeps`;
    throw new DisksweepError('input/invalid-flag', `no point id starting with "${prefix}" in ${where} of ${reader.file}`);
  }
  if (hits.size > 1) {
    const ids = [...hits.keys()].sort();
    throw new DisksweepError('input/invalid-flag', `"${prefix}" is the start of ${ids.length > MAX_CANDIDATES ? `more than ${MAX_CANDIDATES}` : ids.length} point ids: give more digits`, {
      details: ids.slice(0, MAX_CANDIDATES).map((id) => `${id}  (${hits.get(id)!.map((s) => s.name).join(', ')})`),
    });
  }
  const [[pointId, holders]] = [...hits];
  return { sweep: holders[0], pointId, alsoIn: holders.slice(1) };
}
