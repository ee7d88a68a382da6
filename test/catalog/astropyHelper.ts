/**
 * Runs Python snippets with Debian's astropy (python3-astropy 5.2.1 on the reference machine, installed by .ci/run),
 * for the cross-checks of Haloweave's ECSV against an implementation the project did not write.
 * A missing interpreter or astropy is a failure with a clear message, never a skip.
 */
import { spawnSync } from 'node:child_process';

export const PYTHON = '/usr/bin/python3';

/** Run `script` with /usr/bin/python3 (stdin = `input`), return its stdout; throw with stderr on failure. */
export function runPython(script: string, input = ''): string {
  const r = spawnSync(PYTHON, ['-c', script], { input, encoding: 'utf8', maxBuffer: 64 << 20 });
  if (r.error) throw new Error(`cannot run ${PYTHON} (${r.error.message}); install python3 and python3-astropy (apt-get install -y python3-astropy), as .ci/run does`);
  if (r.status !== 0) {
    if (/ModuleNotFoundError: No module named 'astropy'/.test(r.stderr)) {
      throw new Error(`astropy is not installed for ${PYTHON}; install it with apt-get install -y python3-astropy (as .ci/run does)`);
    }
    throw new Error(`python failed (exit ${r.status}):\n${r.stderr}`);
  }
  return r.stdout;
}

/** The astropy version string (the checks were written against 5.2.1). */
export function astropyVersion(): string {
  return runPython('import astropy; print(astropy.__version__)').trim();
}
