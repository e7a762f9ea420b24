/**
 * A private CA and a server certificate for 127.0.0.1/localhost, made with openssl in a directory of the
 * test's own, for a TLS redis-server (redis-harness.ts) and clients that trust the CA (DISKSWEEP_REDIS_CA).
 */
import { spawnSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';

export interface TestCerts {
  readonly ca: string;
  readonly cert: string;
  readonly key: string;
}

function openssl(dir: string, args: readonly string[]): void {
  const r = spawnSync('openssl', args, { cwd: dir, encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`openssl ${args.join(' ')} failed (${r.status}): ${r.stderr}`);
}

export function makeTestCerts(dir: string): TestCerts {
  openssl(dir, ['req', '-x509', '-newkey', 'rsa:2048', '-nodes', '-keyout', 'ca.key', '-out', 'ca.pem', '-days', '2', '-subj', '/CN=disksweep test CA']);
  openssl(dir, ['req', '-newkey', 'rsa:2048', '-nodes', '-keyout', 'server.key', '-out', 'server.csr', '-subj', '/CN=127.0.0.1']);
  writeFileSync(join(dir, 'san.cnf'), 'subjectAltName=IP:127.0.0.1,DNS:localhost\n');
  openssl(dir, ['x509', '-req', '-in', 'server.csr', '-CA', 'ca.pem', '-CAkey', 'ca.key', '-CAcreateserial', '-out', 'server.pem', '-days', '2', '-extfile', 'san.cnf']);
  return { ca: join(dir, 'ca.pem'), cert: join(dir, 'server.pem'), key: join(dir, 'server.key') };
}
