/**
 * deploy/ checked without Docker or systemd (neither runs here): the compose file parses and every command it
 * runs is a real subcommand with real flags of the built CLI; the Dockerfile builds in one stage and runs the
 * built CLI from a slim, non-root second stage whose file layout really works (assembled here from the COPY
 * lines and run); the systemd unit has the keys a worker service needs; Redis accepts deploy/redis.conf.
 */
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { join, posix } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { z } from 'zod';
import { chunkSpecSchema } from '../../shared/sweep-spec.js';
import {
  DEPLOY_DIR, REPO_DIR, cliFlags, cliSubcommands, composeDefaults, dockerStages, durationSeconds, readDeploy, replayCopy, unitSections,
} from '../support/deploy-files.js';
import { freePort, hasRedisServer } from '../support/redis-harness.js';
import { resultsPerPoint } from '../support/sweep-db.js';
import { gridSpec, writeSpec } from '../support/sweep-specs.js';
import { useTempDir } from '../support/temp-dir.js';
import { waitFor } from '../support/wait.js';

const tmp = useTempDir();
const PACKAGE = z.object({ bin: z.object({ disksweep: z.string() }) }).parse(JSON.parse(readFileSync(join(REPO_DIR, 'package.json'), 'utf8')));
const BIN = PACKAGE.bin.disksweep;

/** True when a stop timeout outlasts every chunk a spec may ask for (the schema refuses a longer target). */
const outlastsAnyChunk = (seconds: number): boolean => !chunkSpecSchema.safeParse({ target_seconds: seconds }).success;

/** Check one command line of the CLI: a subcommand, then flags it has; secrets it reads are given to it. */
function expectCliCommand(argv: readonly string[], where: string): void {
  const [sub, ...rest] = argv;
  expect(cliSubcommands(), `${where}: subcommand`).toContain(sub);
  const flags = cliFlags(sub);
  for (const arg of rest.filter((a) => a.startsWith('--'))) expect(flags, `${where}: flag ${arg} of disksweep ${sub}`).toContain(arg.split('=')[0]);
}

const serviceSchema = z.object({
  image: z.string(),
  build: z.object({ context: z.string(), dockerfile: z.string() }).optional(),
  command: z.array(z.string()),
  secrets: z.array(z.string()).optional(),
  ports: z.array(z.string()).optional(),
  container_name: z.string().optional(),
  stop_signal: z.string().optional(),
  stop_grace_period: z.string().optional(),
  restart: z.string().optional(),
  volumes: z.array(z.string()).optional(),
  deploy: z.object({ replicas: z.number().int() }).optional(),
}).passthrough();
const composeSchema = z.object({
  services: z.object({ redis: serviceSchema, orchestrator: serviceSchema, worker: serviceSchema }).passthrough(),
  secrets: z.record(z.string(), z.object({ file: z.string() })),
});

describe('deploy/compose.yaml', () => {
  const compose = composeSchema.parse(parse(readDeploy('compose.yaml'), { merge: true }));
  const { redis, orchestrator, worker } = compose.services;

  it('runs only real subcommands and flags of the built CLI, with the secrets they read', () => {
    for (const [name, service] of [['orchestrator', orchestrator], ['worker', worker]] as const) {
      const argv = service.command.map(composeDefaults);
      expectCliCommand(argv, `service ${name}`);
      for (const secret of argv.flatMap((a) => /^\/run\/secrets\/(.+)$/.exec(a)?.[1] ?? [])) expect(service.secrets, `service ${name}`).toContain(secret);
      const url = argv[argv.indexOf('--redis') + 1];
      expect(new URL(url).hostname, `service ${name} reaches Redis by its service name`).toBe('redis');
      // Both run the image deploy/Dockerfile builds from the repository root.
      expect(service.image).toBe(orchestrator.image);
      expect(posix.join('deploy', service.build?.context ?? '', service.build?.dockerfile ?? '')).toBe('deploy/Dockerfile');
    }
    expect(orchestrator.command[0]).toBe('run');
    expect(worker.command[0]).toBe('work');
  });

  it('keeps the password in a secret file that git ignores, and gives it to Redis as requirepass', () => {
    const secret = compose.secrets.redis_password;
    expect(secret.file).toBe('./redis-password.txt');
    expect(readDeploy('.gitignore').split('\n')).toContain('redis-password.txt');
    expect(redis.secrets).toContain('redis_password');
    const script = redis.command.join(' ');
    expect(script).toMatch(/requirepass/);
    expect(script).toContain('/run/secrets/redis_password');
    expect(script).toMatch(/redis-server \/usr\/local\/etc\/redis\/redis\.conf/);
    expect(redis.volumes).toContain('./redis.conf:/usr/local/etc/redis/redis.conf:ro');
    // Published on the host's loopback unless the user opens it on purpose.
    expect(composeDefaults(redis.ports?.[0] ?? '')).toBe('127.0.0.1:6379:6379');
  });

  it('scales the worker service and stops it gracefully, after the longest chunk', () => {
    expect(worker.container_name, 'a fixed container name prevents --scale').toBeUndefined();
    expect(worker.ports, 'published ports prevent --scale').toBeUndefined();
    expect(worker.deploy?.replicas).toBeGreaterThanOrEqual(1);
    expect(worker.restart).toBe('on-failure');
    expect(['SIGTERM', 'SIGINT']).toContain(worker.stop_signal);
    expect(outlastsAnyChunk(durationSeconds(worker.stop_grace_period ?? '10s'))).toBe(true);
    expect(orchestrator.restart, 'a finished sweep must not start again').toBe('no');
    expect(orchestrator.stop_signal).toBe('SIGINT');
  });
});

describe('README.md, "Running on several machines"', () => {
  const readme = readFileSync(join(REPO_DIR, 'README.md'), 'utf8');
  const start = readme.indexOf('\n## Running on several machines');
  const section = readme.slice(start, readme.indexOf('\n## ', start + 1));
  const commands = [...section.matchAll(/```sh\n([\s\S]*?)```/g)]
    .flatMap((m) => m[1].replace(/\\\n\s*/g, ' ').split('\n'))
    .map((l) => l.replace(/\s+#.*$/, '').trim())
    .filter((l) => l !== '' && !l.startsWith('#'));

  it('runs real subcommands and flags, compose services and files of deploy/', () => {
    expect(start).toBeGreaterThan(0);
    const services = Object.keys(composeSchema.parse(parse(readDeploy('compose.yaml'), { merge: true })).services);
    let cliCommands = 0;
    for (const line of commands) {
      const words = line.split(/\s+/);
      // `disksweep SUB ...` directly, or the image's entrypoint after `docker compose ... run --rm SERVICE`
      const cli = words.indexOf('disksweep');
      const run = words.indexOf('--rm');
      if (cli >= 0) expectCliCommand(words.slice(cli + 1), `README: ${line}`);
      if (run >= 0 && words.length > run + 2) expectCliCommand(words.slice(run + 2), `README: ${line}`);
      if (cli >= 0 || (run >= 0 && words.length > run + 2)) cliCommands++;
      if (words.includes('compose')) {
        const named = words.slice(words.indexOf('compose') + 1).filter((w, i, all) => services.includes(w) && all[i - 1] !== '-f');
        expect(named.length, `README: ${line} names a service of compose.yaml`).toBeGreaterThan(0);
      }
      for (const path of line.match(/\bdeploy\/[\w.-]+/g) ?? []) {
        if (path !== 'deploy/redis-password.txt') expect(existsSync(join(REPO_DIR, path)), `README: ${path}`).toBe(true);
      }
    }
    expect(cliCommands).toBeGreaterThanOrEqual(3);
  });
});

describe('deploy/Dockerfile', () => {
  const stages = dockerStages(readDeploy('Dockerfile'));
  const build = stages[0];
  const runtime = stages[stages.length - 1];
  const args = (stage: typeof build, op: string): string[] => stage.instructions.filter((i) => i.op === op).map((i) => i.args);

  it('builds in one stage and runs from a slim one with production dependencies and a non-root user', () => {
    expect(stages.map((s) => s.name)).toEqual(['build', 'runtime']);
    expect(runtime.from).toMatch(/-slim$/);
    const buildRuns = args(build, 'RUN').join('\n');
    expect(buildRuns).toMatch(/npm ci\b/);
    expect(buildRuns).toMatch(/npm run build/);
    expect(buildRuns).toMatch(/npm prune --omit=dev/);
    expect(args(runtime, 'RUN').join('\n')).not.toMatch(/npm (ci|install)/);
    // PNG plots need the font orchestrator/plots/png.ts loads.
    expect(args(runtime, 'RUN').join('\n')).toMatch(/apt-get install .*fonts-dejavu-core/);
    // The runtime copies built output and pruned modules from the build stage, no sources of its own.
    for (const copy of args(runtime, 'COPY')) expect(copy).toMatch(/^--from=build\s/);
    expect(args(runtime, 'COPY').join('\n')).not.toMatch(/\.ts\b/);
    const user = args(runtime, 'USER').at(-1);
    expect(user).toBeDefined();
    expect(['root', '0']).not.toContain(user?.split(':')[0]);
  });

  it('builds from exactly what it copies, and the runtime layout runs a sweep with the package bin as entrypoint', () => {
    const entry = z.array(z.string()).parse(JSON.parse(args(runtime, 'ENTRYPOINT').at(-1) ?? 'null'));
    const appDir = args(runtime, 'WORKDIR')[0];
    expect(entry).toEqual(['node', posix.join(appDir, BIN)]);

    // The build stage: its COPY lines into an empty tree (this checkout's node_modules stand in for `npm ci`),
    // then its build command. A file the build needs and the Dockerfile does not copy fails here.
    const src = { root: join(tmp.path, 'src'), workdir: args(build, 'WORKDIR')[0] };
    for (const copy of args(build, 'COPY')) replayCopy(copy, { root: REPO_DIR, workdir: '/' }, src);
    symlinkSync(join(REPO_DIR, 'node_modules'), join(src.root, 'node_modules'));
    const built = spawnSync('npm', ['run', 'build'], { cwd: src.root, encoding: 'utf8', timeout: 240_000 });
    expect(built.status, `npm run build in the build stage's files:\n${built.stdout}\n${built.stderr}`).toBe(0);

    // The runtime stage: its COPY lines from the build stage's tree, then the entrypoint runs a sweep (the store
    // reads its SQL migrations at run time, so a missing COPY of them fails here too).
    const app = { root: join(tmp.path, 'app'), workdir: appDir };
    for (const copy of args(runtime, 'COPY')) replayCopy(copy, src, app);
    const spec = writeSpec(tmp.path, 'heron.yaml', gridSpec('heron-image-layout', 2, 2, 2));
    const db = join(tmp.path, 'image.sqlite');
    const r = spawnSync(process.execPath, [join(app.root, posix.relative(appDir, entry[1])), 'run', spec, '--db', db, '--workers', '1'], { encoding: 'utf8', timeout: 120_000 });
    expect(r.status, r.stderr).toBe(0);
    expect(resultsPerPoint(db)).toEqual({ points: 4, results: 4, maxPerPoint: 1 });
  }, 300_000);

  it('sends the build stage every file it copies (Dockerfile.dockerignore)', () => {
    const allowed = readDeploy('Dockerfile.dockerignore').split('\n').filter((l) => l.startsWith('!')).map((l) => l.slice(1).replace(/\/\*\*$/, ''));
    const sources = args(build, 'COPY').filter((c) => !c.startsWith('--from')).flatMap((c) => c.split(/\s+/).slice(0, -1));
    expect(sources.length).toBeGreaterThan(3);
    for (const src of sources) expect(allowed, `COPY ${src}`).toContain(src.replace(/\/$/, ''));
    // ... and everything `npm run build` compiles (tsconfig.build.json) is among them.
    const compiled = z.object({ include: z.array(z.string()) }).parse(JSON.parse(readFileSync(join(REPO_DIR, 'tsconfig.build.json'), 'utf8'))).include;
    for (const path of compiled) expect(sources.some((src) => path === src || path.startsWith(`${src}/`)), `${path} (tsconfig.build.json) is copied`).toBe(true);
  });
});

describe('deploy/disksweep-worker.service', () => {
  const unit = unitSections(readDeploy('disksweep-worker.service'));
  const service = unit.get('Service') ?? new Map<string, string[]>();
  const one = (key: string): string => {
    const values = service.get(key) ?? [];
    expect(values, `[Service] ${key}`).toHaveLength(1);
    return values[0];
  };

  it('restarts on failure, stops with the signal `work` handles, after the longest chunk', () => {
    expect([...unit.keys()]).toEqual(['Unit', 'Service', 'Install']);
    expect(one('Restart')).toBe('on-failure');
    expect(['SIGTERM', 'SIGINT']).toContain(one('KillSignal'));
    expect(outlastsAnyChunk(durationSeconds(one('TimeoutStopSec')))).toBe(true);
    expect(unit.get('Install')?.get('WantedBy')).toEqual(['multi-user.target']);
    expect(unit.get('Unit')?.get('After')).toEqual(['network-online.target']);
  });

  it('runs `disksweep work` with real flags, its Redis settings from the environment file', () => {
    const [node, script, ...argv] = one('ExecStart').split(/\s+/);
    expect(posix.basename(node)).toBe('node');
    expect(script.endsWith(`/${BIN}`)).toBe(true);
    expect(script.startsWith(one('WorkingDirectory'))).toBe(true);
    expectCliCommand(argv.filter((a) => !a.startsWith('$')), 'ExecStart');
    // The password file arrives as a systemd credential (%d is the credentials directory).
    expect(argv[argv.indexOf('--redis-password-file') + 1]).toBe('%d/redis-password');
    expect(one('LoadCredential')).toMatch(/^redis-password:\//);

    // Every variable of the example environment file is read by the CLI or expanded by the unit.
    const envFile = one('EnvironmentFile');
    expect(envFile).toBe('/etc/disksweep/worker.env');
    const sources = spawnSync('grep', ['-rhoE', 'process\\.env\\.[A-Z_]+', 'orchestrator', 'shared', 'worker'], { cwd: REPO_DIR, encoding: 'utf8' }).stdout;
    const example = readDeploy('worker.env.example').split('\n').map((l) => /^#?([A-Z_]+)=(.*)$/.exec(l)).filter((m) => m !== null);
    expect(example.map((m) => m[1])).toContain('DISKSWEEP_REDIS_URL');
    for (const [, key, value] of example) {
      if (argv.includes(`$${key}`)) expectCliCommand(['work', ...value.split(/\s+/)], `${key} in worker.env.example`);
      else expect(sources, `${key} in worker.env.example`).toContain(`process.env.${key}`);
    }
  });
});

describe.skipIf(!hasRedisServer())(`deploy/redis.conf${hasRedisServer() ? '' : ' — skipped: no redis-server on PATH'}`, () => {
  it('is accepted by redis-server: no eviction, append-only, password required', async () => {
    writeFileSync(tmp.file('requirepass.conf'), 'requirepass "heron-test-secret"\n', { mode: 0o600 });
    const port = await freePort('127.0.0.1');
    // The same start-up as compose.yaml, on a loopback port and a temp dir of this test.
    const server = spawn('redis-server', [join(DEPLOY_DIR, 'redis.conf'), '--include', tmp.file('requirepass.conf'), '--dir', tmp.path, '--bind', '127.0.0.1', '--port', String(port)], { stdio: ['ignore', 'pipe', 'pipe'] });
    let log = '';
    server.stdout.setEncoding('utf8').on('data', (s: string) => (log += s));
    server.stderr.setEncoding('utf8').on('data', (s: string) => (log += s));
    const cli = (auth: boolean, ...a: string[]): string =>
      spawnSync('redis-cli', ['-h', '127.0.0.1', '-p', String(port), ...a], { encoding: 'utf8', env: { ...process.env, ...(auth ? { REDISCLI_AUTH: 'heron-test-secret' } : {}) } }).stdout.trim();
    try {
      await waitFor(() => {
        if (server.exitCode !== null) throw new Error(`redis-server refused deploy/redis.conf:\n${log}`);
        return /Ready to accept connections/.test(log);
      }, { timeoutMs: 15_000, what: () => `redis-server with deploy/redis.conf to start; log:\n${log}` });
      expect(cli(true, 'config', 'get', 'maxmemory-policy')).toBe('maxmemory-policy\nnoeviction');
      expect(cli(true, 'config', 'get', 'appendonly')).toBe('appendonly\nyes');
      expect(cli(false, 'ping')).toMatch(/NOAUTH/);
      expect(cli(true, 'ping')).toBe('PONG');
    } finally {
      server.kill('SIGKILL');
    }
  });
});
