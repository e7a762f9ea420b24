/**
 * Run the built `disksweep` command as a real process (the way a researcher or a script runs it), so exit
 * codes, stdout and stderr are what they will see. Needs `npm run build` first; `npm test` does it.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

export const CLI_PATH = fileURLToPath(new URL('../../dist/orchestrator/cli/main.js', import.meta.url));

export interface CliRun {
  status: number | null;
  stdout: string;
  stderr: string;
}

export function runCli(args: readonly string[]): CliRun {
  if (!existsSync(CLI_PATH)) throw new Error(`${CLI_PATH} is missing: run \`npm run build\` before the tests`);
  const r = spawnSync(process.execPath, [CLI_PATH, ...args], { encoding: 'utf8', timeout: 120_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}
