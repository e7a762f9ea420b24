/**
 * What every transport promises the sweep runner (transport.ts), as one suite to run against each
 * implementation: the embedded thread pool now, the distributed transport when it comes.
 *
 * - every submitted chunk comes back to the commit callback, each point with its index and id, from the chunk it
 *   was submitted in;
 * - `pending()` counts chunks submitted and not yet committed; a graceful close resolves after every commit;
 * - a commit that fails stops the transport, and close reports the failure;
 * - an immediate close abandons chunks in flight: no commit arrives after it has resolved.
 */
import { describe, expect, it } from 'vitest';
import type { ChunkOutcomePayload, ChunkTaskPayload } from '../../../shared/job-payload.js';
import { parseSpecText } from '../../../orchestrator/spec/load-spec.js';
import { planSweep } from '../../../orchestrator/sweep/sweep-plan.js';
import { buildChunk, chunkCount } from '../../../orchestrator/sweep/sweep-runner.js';
import type { Transport } from '../../../orchestrator/transport/transport.js';
import { gridSpec } from '../../support/sweep-specs.js';
import { waitFor } from '../../support/wait.js';

/** Makes a fresh transport for one test (the suite closes it), for the sweep whose chunks it will carry. */
export type TransportFactory = (sweepId: string) => Promise<Transport>;

const plan = planSweep(parseSpecText(JSON.stringify(gridSpec('transport', 4, 3, 1)), 'test.json', 'json'));
const CHUNK = 2;

function allChunks(): ChunkTaskPayload[] {
  const none = new Uint8Array(plan.source.size);
  const chunks: ChunkTaskPayload[] = [];
  for (let k = 0; k < chunkCount(plan.source.size, CHUNK); k++) {
    const c = buildChunk({ sweepId: plan.sweepId, chunkSize: CHUNK, source: plan.source, hasResult: none }, k);
    if (c !== null) chunks.push(c);
  }
  return chunks;
}

const pointsOf = (c: ChunkTaskPayload | ChunkOutcomePayload): string[] => c.points.map((p) => `${p.point_index}:${p.point_id}`);

export function transportConformance(name: string, make: TransportFactory): void {
  describe(`transport conformance: ${name}`, () => {
    it('delivers every chunk with its own points; pending counts what is not committed; graceful close waits', async () => {
      const transport = await make(plan.sweepId);
      expect(transport.window).toBeGreaterThanOrEqual(1);
      expect(transport.description.length).toBeGreaterThan(0);
      const committed: ChunkOutcomePayload[] = [];
      let pendingAtCommit = -1;
      transport.onOutcome(async (o) => {
        pendingAtCommit = Math.max(pendingAtCommit, transport.pending());
        committed.push(o);
      });
      const chunks = allChunks();
      for (const c of chunks) await transport.submit(c);
      expect(transport.pending()).toBeLessThanOrEqual(chunks.length);
      await transport.close('graceful');
      expect(transport.pending()).toBe(0);
      expect(pendingAtCommit).toBeGreaterThanOrEqual(1); // a chunk being committed is still pending
      const byChunk = new Map(committed.map((o) => [o.chunk_index, o]));
      expect([...byChunk.keys()].sort((a, b) => a - b)).toEqual(chunks.map((c) => c.chunk_index));
      for (const c of chunks) {
        const o = byChunk.get(c.chunk_index);
        expect(o?.sweep_id).toBe(plan.sweepId);
        expect(o === undefined ? [] : pointsOf(o)).toEqual(pointsOf(c));
        for (const p of o?.points ?? []) expect(p.outcome.kind).toBe('model');
      }
    });

    it('a commit that fails stops the transport and close reports it', async () => {
      const transport = await make(plan.sweepId);
      transport.onOutcome(async () => {
        throw new Error('the store is full');
      });
      const [first, ...rest] = allChunks();
      await transport.submit(first);
      await waitFor(() => transport.pending() === 0, { timeoutMs: 60_000, what: 'the first chunk to come back' });
      await expect((async () => {
        for (const c of rest) await transport.submit(c);
        await transport.close('graceful');
      })()).rejects.toThrow('the store is full');
    });

    it('an immediate close abandons chunks in flight: nothing is committed after it resolves', async () => {
      const transport = await make(plan.sweepId);
      let afterClose = 0;
      let closed = false;
      transport.onOutcome(async () => {
        if (closed) afterClose++;
      });
      for (const c of allChunks()) await transport.submit(c);
      await transport.close('immediate');
      closed = true;
      expect(transport.pending()).toBe(0);
      expect(afterClose).toBe(0);
    });
  });
}
