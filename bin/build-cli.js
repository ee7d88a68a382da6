#!/usr/bin/env node
// Bundles the `haloweave` command line (src/cli/main.ts and everything it imports, dependencies included) into
// dist/cli/ with esbuild, so the command starts without compiling TypeScript or resolving hundreds of small modules,
// then writes V8's code cache of every bundled file (docs/startup.md).
// Run by `npm ci` / `npm install` (the "prepare" script) and by `npm run build:cli`. One CommonJS file per command
// (dist/cli/plan.cjs, check.cjs, ...; main.cjs is the dispatcher and loads one of them), each with all it needs, so
// bin/cli-loader.js can compile them with vm.Script and their cache. The cache (NAME.cjs.cache) is taken after a run of
// each command on the demo scenario (bin/cli-cache-run.js), so it holds every function that run compiled.
// dist/cli/build-info.json lists every source file bundled with its size and modification time; bin/haloweave.js
// runs the bundle only while all of them are unchanged.
// `--out dist/NAME` builds elsewhere (tests); the folder must sit two levels below the package root, as dist/cli does,
// because the command finds instrument-profiles/ relative to its own files.
import { build } from 'esbuild';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { basename, dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { BUNDLE_DIR, BUNDLE_ENTRY } from './cli-bundle.js';
import { CACHE_SUFFIX } from './cli-loader.js';

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
const COMMANDS_DIR = join(root, 'src/cli/commands');

/**
 * The runs whose compiled functions go into the code cache, in folder `t`: the commands on the demo scenario (demo
 * itself, which solves the same plan, and draft and survey get the cache of their top-level code only).
 */
function trainingRuns(t) {
  const demoPlan = join(root, 'examples/demo/halo-demo.plan.json');
  const out = join(t, 'plan');
  return [
    ['plan', demoPlan, '--out', out],
    ['check', out],
    ['export', out, '--format', 'fits', '--out', join(t, 'slits.fits')],
    ['forecast', out, '--trials', '20'],
    ['sky', demoPlan, '--from', '2027-03-01', '--to', '2027-03-03'],
    ['profile', join(root, 'instrument-profiles/quad8-square.json')],
  ];
}

const startedMs = Date.now();
const t0 = performance.now();
rmSync(tmpDir, { recursive: true, force: true });
mkdirSync(tmpDir, { recursive: true });
// Any failure leaves no half-built folder behind (the bundle in place, if any, stays as it was).
let sources;
try {
  const commands = readdirSync(COMMANDS_DIR).filter((f) => f.endsWith('.ts')).map((f) => basename(f, '.ts'));
  const MAIN_TS = join(root, 'src/cli/main.ts');
  // Each command's file holds the dispatcher too (main.ts loaded again under this namespace, its path the command's
  // name), so the command and the dispatcher share one copy of every module (one InputError class for instanceof); a
  // dispatcher given another command hands the whole command line to that command's file (DELEGATE), which reports
  // its own errors.
  const DISPATCHER = 'haloweave-dispatcher';
  const DELEGATE = 'haloweave-command';
  const SURVEY_WORKER = 'survey.worker';
  const result = await build({
    entryPoints: Object.fromEntries([
      ['main', MAIN_TS],
      ...commands.map((c) => [c, `${DISPATCHER}:${c}`]),
      // The survey's planning worker thread (src/cli/survey/pool.ts starts ./workerBoot.mjs beside its own file); the
      // dot keeps the launcher from taking it for a command.
      [SURVEY_WORKER, join(root, 'src/cli/survey/planWorker.ts')],
    ]),
    outdir: tmpDir,
    outExtension: { '.js': '.cjs' },
    bundle: true,
    // CommonJS, which vm.Script compiles with a code cache (ES modules have none in Node 20). One file per command with
    // all it needs and the dispatcher; main.cjs, the dispatcher alone, answers --help and --version and hands commands on.
    format: 'cjs',
    platform: 'node',
    target: 'node20',
    supported: { 'dynamic-import': false },
    charset: 'ascii',
    // Dependencies are bundled too: resolving hundreds of small modules in node_modules costs more than parsing one file.
    external: EXTERNAL,
    define: { 'import.meta.url': '__haloweaveFileUrl' },
    banner: { js: 'var __haloweaveFileUrl = require("node:url").pathToFileURL(__filename).href;' },
    plugins: [{
      name: 'haloweave-commands',
      setup(b) {
        b.onResolve({ filter: new RegExp(`^${DISPATCHER}:`) }, (a) => ({ path: a.path.slice(DISPATCHER.length + 1), namespace: DISPATCHER }));
        b.onLoad({ filter: /.*/, namespace: DISPATCHER }, () => ({ contents: readFileSync(MAIN_TS, 'utf8'), loader: 'ts', resolveDir: dirname(MAIN_TS) }));
        // Another command, from a dispatcher: a stand-in whose run() hands the command line to that command's own file.
        b.onResolve({ filter: /^\.\/commands\/[\w-]+$/ }, (a) => {
          const name = basename(a.path);
          if (a.namespace === DISPATCHER && a.importer === name) return { path: join(COMMANDS_DIR, `${name}.ts`) };
          if (a.namespace === DISPATCHER || a.importer === MAIN_TS) return { path: name, namespace: DELEGATE };
          return undefined;
        });
        b.onLoad({ filter: /.*/, namespace: DELEGATE }, (a) => ({
          contents: `export const run = (argv, io) => require('./${a.path}.cjs').main([${JSON.stringify(a.path)}, ...argv], io);`,
          loader: 'js',
        }));
        b.onResolve({ filter: /^\.\/[\w-]+\.cjs$/, namespace: DELEGATE }, (a) => ({ path: a.path, external: true }));
      },
    }],
    metafile: true,
    logLevel: 'warning',
  });
  // esbuild writes strings and names in ASCII (charset) but leaves other characters in comments and regular
  // expressions, where a \uXXXX escape means the same: with those escaped, each file is ASCII and the loader reads it
  // as Latin-1, faster than UTF-8 (bin/cli-loader.js).
  for (const f of readdirSync(tmpDir).filter((n) => n.endsWith('.cjs'))) {
    const text = readFileSync(join(tmpDir, f), 'utf8');
    // A character after a backslash would need its escape rewritten too: none is, and the build says so if one comes.
    const ascii = text.replace(/\\?[^\x00-\x7f]/g, (c) => {
      if (c.length > 1) throw new Error(`haloweave build: ${f} has an escaped non-ASCII character (${c}): escape it as \\uXXXX in the source`);
      return `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`;
    });
    if (ascii !== text) writeFileSync(join(tmpDir, f), ascii);
  }
  writeFileSync(join(tmpDir, 'workerBoot.mjs'), [
    '// Entry of a survey planning worker thread run from the prebuilt bundle, written by bin/build-cli.js (the sources',
    '// use src/cli/survey/workerBoot.mjs): the worker\'s file from its code cache, as the launcher loads a command.',
    "import { dirname } from 'node:path';",
    "import { fileURLToPath } from 'node:url';",
    "import { bundleLoader } from '../../bin/cli-loader.js';",
    '',
    `bundleLoader(dirname(fileURLToPath(import.meta.url))).load('${SURVEY_WORKER}.cjs');`,
    '',
  ].join('\n'));
  // The launcher runs NAME.cjs for `haloweave NAME`: every command of the dispatcher must have its file.
  const dispatched = Object.keys(createRequire(import.meta.url)(join(tmpDir, BUNDLE_ENTRY)).COMMANDS).sort();
  if (dispatched.join() !== [...commands].sort().join()) {
    throw new Error(`haloweave build: the commands of src/cli/main.ts (${dispatched.join(', ')}) must be the files of src/cli/commands/ (${commands.join(', ')})`);
  }

  // The code cache: each command run once from the new bundle (a fresh process each, so V8's flags are the launcher's),
  // then every bundled file no run loaded compiled once.
  const scratch = mkdtempSync(join(tmpdir(), 'haloweave-cache-'));
  const cacheRun = (args) => {
    const r = spawnSync(process.execPath, [join(root, 'bin/cli-cache-run.js'), tmpDir, outDir, ...args], { cwd: scratch, encoding: 'utf8', env: { ...process.env, HALOWEAVE_CLI: '', HALOWEAVE_CODE_CACHE: '' } });
    if (r.status !== 0) throw new Error(`haloweave build: the bundle failed on \`haloweave ${args.join(' ')}\` while making its code cache (exit ${r.status}):\n${r.stderr}`);
  };
  try {
    for (const argv of trainingRuns(scratch)) cacheRun(['--', ...argv]);
    // (Not the survey worker: its top level waits for the main thread's messages, so it runs only as a worker.)
    const uncached = readdirSync(tmpDir).filter((f) => f.endsWith('.cjs') && f !== `${SURVEY_WORKER}.cjs` && !existsSync(join(tmpDir, f + CACHE_SUFFIX)));
    if (uncached.length) cacheRun(['--load', ...uncached]);
  } finally {
    rmSync(scratch, { recursive: true, force: true });
  }

  sources = Object.keys(result.metafile.inputs)
    .filter((p) => !p.startsWith(`${DISPATCHER}:`) && !p.startsWith(`${DELEGATE}:`))
    .map((p) => resolve(root, p))
    .filter((p) => !p.split(/[\\/]/).includes('node_modules'))
    .sort()
    .map((p) => {
      const s = statSync(p);
      return { path: relative(root, p), size: s.size, mtimeMs: s.mtimeMs };
    });
  // A file saved while esbuild read it may be bundled in its old state: record it as changed so the bundle is not used.
  for (const s of sources) if (s.mtimeMs >= startedMs) s.mtimeMs = -1;
  writeFileSync(join(tmpDir, 'build-info.json'), JSON.stringify({ builtAt: new Date().toISOString(), entry: BUNDLE_ENTRY, sources }, null, 1));
} catch (e) {
  rmSync(tmpDir, { recursive: true, force: true });
  throw e;
}
try {
  renameSync(outDir, oldDir);
} catch {
  // no earlier bundle
}
renameSync(tmpDir, outDir);
rmSync(oldDir, { recursive: true, force: true });
console.log(`haloweave: command line bundled into ${relative(root, outDir)}/ from ${sources.length} source files in ${(performance.now() - t0).toFixed(0)} ms`);
