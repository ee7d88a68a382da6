#!/usr/bin/env node
// Step of bin/build-cli.js: writes the V8 code cache of a bundle folder (docs/startup.md).
//   node bin/cli-cache-run.js DIR FINAL -- COMMAND ARGS...  runs that command from DIR, then writes the cache of
//                                                           every file it loaded, with each function the run compiled;
//   node bin/cli-cache-run.js DIR FINAL --load FILE...      loads the files only (their top-level code), then the same.
// FINAL is the folder DIR becomes once built: the names the cached code is compiled with.
import { resolve } from 'node:path';
import { bundleFileFor, bundleLoader } from './cli-loader.js';

const [dir, final, mode, ...rest] = process.argv.slice(2);
if (!dir || !final || (mode !== '--' && mode !== '--load')) {
  console.error('usage: node bin/cli-cache-run.js DIR FINAL -- COMMAND ARGS... | DIR FINAL --load FILE...');
  process.exit(2);
}
const loader = bundleLoader(resolve(dir), resolve(final));
let status = 0;
if (mode === '--') status = await loader.load(bundleFileFor(dir, rest)).main(rest);
else for (const name of rest) loader.load(name);
if (status === 0) loader.writeCaches();
process.exitCode = status;
