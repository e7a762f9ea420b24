/**
 * The embedded thread pool against the transport conformance suite. Pool threads load compiled JavaScript,
 * so this runs the built transport from dist/ (`npm run build` first; `npm test` does it).
 */
import { existsSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type * as Embedded from '../../../orchestrator/transport/embedded-transport.js';
import { transportConformance } from './transport-conformance.js';

const BUILT = fileURLToPath(new URL('../../../dist/orchestrator/transport/embedded-transport.js', import.meta.url));

async function built(): Promise<typeof Embedded> {
  if (!existsSync(BUILT)) throw new Error(`${BUILT} is missing: run \`npm run build\` before the tests`);
  return (await import(pathToFileURL(BUILT).href)) as typeof Embedded;
}

transportConformance('embedded, 1 thread', async () => (await built()).createEmbeddedTransport({ threads: 1 }));
transportConformance('embedded, 2 threads', async () => (await built()).createEmbeddedTransport({ threads: 2 }));
