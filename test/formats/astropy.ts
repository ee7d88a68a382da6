/**
 * Runs Python scripts with astropy as an outside reference for the format tests.
 * Source: Debian's python3-astropy (5.2.1 on this machine) run by /usr/bin/python3; .ci/run installs it.
 * When python or astropy is missing the calling test FAILS with this message (it is never skipped).
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export const PYTHON = '/usr/bin/python3';
const MISSING = `astropy is needed by this cross-check: install Debian's python3-astropy for ${PYTHON} (apt-get install -y python3-astropy; .ci/run does it)`;

/** Run a Python script (astropy imported by it) with JSON on stdin; returns its stdout parsed as JSON. */
export function runPython<T = unknown>(script: string, input: unknown = null): T {
  if (!existsSync(PYTHON)) throw new Error(`${MISSING}; ${PYTHON} does not exist`);
  let out: string;
  try {
    out = execFileSync(PYTHON, ['-c', script], { input: JSON.stringify(input), encoding: 'utf8', maxBuffer: 1 << 28, stdio: ['pipe', 'pipe', 'pipe'] });
  } catch (e) {
    const err = e as { stderr?: string; message: string };
    const stderr = String(err.stderr ?? '');
    if (/No module named .?astropy/.test(stderr)) throw new Error(`${MISSING}\n${stderr}`);
    throw new Error(`python script failed: ${err.message}\n${stderr}`);
  }
  return JSON.parse(out) as T;
}

/** The installed astropy version (e.g. "5.2.1"); throws the clear message when astropy is missing. */
export function astropyVersion(): string {
  return runPython<string>('import json, astropy; print(json.dumps(astropy.__version__))');
}

/** A fresh temporary directory for files exchanged with astropy. */
export function tempDir(prefix: string): string {
  return mkdtempSync(join(tmpdir(), `haloweave-${prefix}-`));
}
