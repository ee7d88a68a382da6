#!/usr/bin/env node
// Bundles the `haloweave` command line (src/cli/main.ts and everything it imports, dependencies included) into
// dist/cli/ with esbuild, so the command starts without compiling TypeScript or resolving hundreds of small modules.
// Run by `npm ci` / `npm install` (the "prepare" script) and by `npm run build:cli`. One chunk per command (code
// splitting follows main.ts's lazy imports). dist/cli/build-info.json lists every source file bundled with its size
// and modification time; bin/haloweave.js runs the bundle only while all of them are unchanged (docs/startup.md).
// `--out dist/NAME` builds elsewhere (tests); the folder must sit two levels below the package root, as dist/cli does,
// because the command finds instrument-profiles/ relative to its own files.
import { build } from 'esbuild';
import { mkdirSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { BUNDLE_DIR } from './cli-bundle.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const outArg = process.argv.indexOf('--out');
const outDir = resolve(root, outArg > 0 ? process.argv[outArg + 1] : BUNDLE_DIR);
if (relative(root, outDir).split(/[\\/]/).length !== 2) {
  console.error(`haloweave build: the bundle folder must be two levels below the package root (like ${BUNDLE_DIR}), not ${outDir}`);
  process.exit(2);
}
// Built beside the final folder and moved into place at the end, so a command started meanwhile never sees half a bundle.
const tmpDir = `${outDir}-build-${process.pid}`;
const oldDir = `${outDir}-old-${process.pid}`;

// Packages that load files of their own at run time stay in node_modules.
const EXTERNAL = ['highs', 'tsx'];

const startedMs = Date.now();
const t0 = performance.now();
rmSync(tmpDir, { recursive: true, force: true });
mkdirSync(tmpDir, { recursive: true });
const result = await build({
  entryPoints: [join(root, 'src/cli/main.ts')],
  outdir: tmpDir,
  bundle: true,
  splitting: true,
  format: 'esm',
  platform: 'node',
  target: 'node20',
  // Dependencies are bundled too: resolving hundreds of small modules in node_modules costs more than parsing one file.
  external: EXTERNAL,
  chunkNames: '[name]-[hash]',
  metafile: true,
  logLevel: 'warning',
  // CommonJS dependencies inside the ESM bundle call require() for Node's own modules.
  banner: { js: "import { createRequire as __haloweaveRequire } from 'node:module'; const require = __haloweaveRequire(import.meta.url);" },
});
const sources = Object.keys(result.metafile.inputs)
  .map((p) => resolve(root, p))
  .filter((p) => !p.split(/[\\/]/).includes('node_modules'))
  .sort()
  .map((p) => {
    const s = statSync(p);
    return { path: relative(root, p), size: s.size, mtimeMs: s.mtimeMs };
  });
// A file saved while esbuild read it may be bundled in its old state: record it as changed so the bundle is not used.
for (const s of sources) if (s.mtimeMs >= startedMs) s.mtimeMs = -1;
writeFileSync(join(tmpDir, 'build-info.json'), JSON.stringify({ builtAt: new Date().toISOString(), entry: 'main.js', sources }, null, 1));
try {
  renameSync(outDir, oldDir);
} catch {
  // no earlier bundle
}
renameSync(tmpDir, outDir);
rmSync(oldDir, { recursive: true, force: true });
console.log(`haloweave: command line bundled into ${relative(root, outDir)}/ from ${sources.length} source files in ${(performance.now() - t0).toFixed(0)} ms`);
