/** Shared by the CLI tests: run `bin/haloweave.js` as a child process and capture its exit status and streams. */
import { spawnSync } from 'node:child_process';
import { join, resolve } from 'node:path';

export const ROOT = resolve(__dirname, '../..');
export const BIN = join(ROOT, 'bin/haloweave.js');
export const FIXTURES = join(ROOT, 'test/cli/fixtures');

/** Run the CLI from `cwd` (a folder away from the package, so nothing depends on the working directory). */
export function cli(args: string[], cwd: string): { code: number | null; out: string; err: string } {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd, encoding: 'utf8', maxBuffer: 64 << 20 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}
