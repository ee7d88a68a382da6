#!/usr/bin/env node
// Launcher for the `haloweave` command. Runs the prebuilt bundle dist/cli/ (made by bin/build-cli.js, which `npm ci`
// runs as the "prepare" script) from its V8 code cache (bin/cli-loader.js) while every source file it was built from
// is unchanged; otherwise, or with HALOWEAVE_CLI=sources in the environment, runs the TypeScript sources through tsx
// (slower to start, never stale).
// `haloweave --version` says which one ran. See docs/startup.md.
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { BUNDLE_DIR, bundleStaleReason } from './cli-bundle.js';
import { runBundle } from './cli-loader.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const wantSources = process.env.HALOWEAVE_CLI === 'sources';
const stale = wantSources ? 'HALOWEAVE_CLI=sources' : bundleStaleReason(root);
if (stale === null) {
  process.env.HALOWEAVE_RUNNING_FROM = 'prebuilt bundle';
  process.exitCode = await runBundle(join(root, BUNDLE_DIR), process.argv.slice(2));
} else {
  process.env.HALOWEAVE_RUNNING_FROM = `sources (${stale})`;
  // A developer at a terminal learns why this start is slow; scripts and tests see the same output either way.
  if (!wantSources && process.stderr.isTTY) {
    process.stderr.write(`haloweave: running from the sources, ${stale} since the bundle was built (\`npm run build:cli\` makes start-up fast again)\n`);
  }
  const { register } = await import('tsx/esm/api');
  register();
  const { main } = await import('../src/cli/main.ts');
  process.exitCode = await main(process.argv.slice(2));
}
