// Runs the prebuilt command line (dist/cli/*.cjs, made by bin/build-cli.js) from V8's code cache: each bundled file is
// compiled with vm.Script and the `cachedData` written beside it at build time (NAME.cjs.cache), so a command starts
// with the bytecode of its functions instead of parsing and compiling them as they first run (docs/startup.md).
// A cache that is missing, damaged, made for other source bytes, or refused by V8 (another Node version or other V8
// flags) is ignored: the file is then compiled from its source as usual, with the same results. HALOWEAVE_CODE_CACHE=off
// in the environment ignores every cache (to measure what it saves: bench/startup.bench.ts).
// Plain JavaScript and Node built-ins only: the launcher loads this before anything else.
import { existsSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import vm from 'node:vm';
import { isAscii } from 'node:buffer';
import { crc32 } from 'node:zlib';
import { BUNDLE_ENTRY } from './cli-bundle.js';

/** Suffix of a bundled file's code cache: dist/cli/plan.cjs has dist/cli/plan.cjs.cache. */
export const CACHE_SUFFIX = '.cache';
/** First bytes of a cache file; the version changes whenever the header does. */
const MAGIC = 0x31435748; // "HWC1", little-endian
const HEADER_BYTES = 16; // magic, CRC-32 of the source, CRC-32 of the V8 data, length of the V8 data (uint32 LE each)
// Node's own CommonJS wrapper: the bundled files are CommonJS, run with a require() that loads their siblings from here.
const WRAP_HEAD = '(function (exports, require, module, __filename, __dirname) { ';
const WRAP_TAIL = '\n})';
// A sibling bundled file, as bin/build-cli.js names them in require() calls: "./plan.cjs".
const SIBLING = /^\.\/[\w-]+\.cjs$/;
// A command name as the dispatcher knows it (src/cli/main.ts, COMMANDS); bin/build-cli.js names its file NAME.cjs.
const COMMAND = /^[a-z][\w-]*$/;

/** V8 cache data stored in `buf` for `source`, or the reason it cannot be used ('damaged' or 'other source'). */
function cacheData(buf, source) {
  if (buf.length < HEADER_BYTES || buf.readUInt32LE(0) !== MAGIC) return 'damaged';
  const length = buf.readUInt32LE(12);
  if (buf.length !== HEADER_BYTES + length) return 'damaged';
  const data = buf.subarray(HEADER_BYTES);
  if (crc32(data) !== buf.readUInt32LE(8)) return 'damaged';
  if (crc32(source) !== buf.readUInt32LE(4)) return 'other source';
  return data;
}

/** The cache file bytes for V8 cache `data` of `source` (header and data), as cacheData reads them. */
function cacheFileBytes(source, data) {
  const header = Buffer.alloc(HEADER_BYTES);
  header.writeUInt32LE(MAGIC, 0);
  header.writeUInt32LE(crc32(source), 4);
  header.writeUInt32LE(crc32(data), 8);
  header.writeUInt32LE(data.length, 12);
  return Buffer.concat([header, data]);
}

/**
 * A loader of the bundled files in `dir`. `load(name)` runs NAME once and returns its exports; `report` says per file
 * whether its cache was 'used', 'absent', 'damaged', made for 'other source' bytes, 'rejected' by V8, or 'off';
 * `writeCaches()` writes each loaded file's cache as V8 has it now (after a run: with every function compiled so far).
 * The files are named as if in `nameDir` (stack traces, __filename): the build makes the cache before moving its
 * folder into place, and V8 keeps the file name it compiled a cache with.
 */
export function bundleLoader(dir, nameDir = dir) {
  const loaded = new Map();
  const report = {};
  const cacheOff = process.env.HALOWEAVE_CODE_CACHE === 'off';
  function load(name) {
    const done = loaded.get(name);
    if (done) return done.module.exports;
    const filename = join(nameDir, name);
    const source = readFileSync(join(dir, name));
    let cached = 'off';
    if (!cacheOff) {
      try {
        cached = cacheData(readFileSync(join(dir, name + CACHE_SUFFIX)), source);
      } catch {
        cached = 'absent';
      }
    }
    // Plain ASCII (most of a bundle) decodes as Latin-1 several times faster than as UTF-8, to the same text.
    const text = isAscii(source) ? source.latin1Slice() : source.toString('utf8');
    const script = new vm.Script(WRAP_HEAD + text + WRAP_TAIL, {
      filename,
      cachedData: typeof cached === 'string' ? undefined : cached,
    });
    report[name] = typeof cached === 'string' ? cached : script.cachedDataRejected ? 'rejected' : 'used';
    const module = { exports: {}, filename, loaded: false };
    loaded.set(name, { module, script, source });
    const nodeRequire = createRequire(filename);
    const require = (id) => (SIBLING.test(id) ? load(id.slice(2)) : nodeRequire(id));
    require.resolve = nodeRequire.resolve;
    script.runInThisContext().call(module.exports, module.exports, require, module, filename, dirname(filename));
    module.loaded = true;
    return module.exports;
  }
  function writeCaches() {
    for (const [name, { script, source }] of loaded) {
      const file = join(dir, name + CACHE_SUFFIX);
      // Written whole then renamed, so a command started meanwhile reads the old cache or the new one, never half.
      writeFileSync(`${file}.${process.pid}`, cacheFileBytes(source, script.createCachedData()));
      renameSync(`${file}.${process.pid}`, file);
    }
  }
  return { load, report, writeCaches };
}

/** The file of the bundle in `dir` that runs argv: NAME.cjs for command NAME (it holds the dispatcher too), else the dispatcher alone. */
export function bundleFileFor(dir, argv) {
  const first = argv[0] ?? '';
  return COMMAND.test(first) && existsSync(join(dir, `${first}.cjs`)) ? `${first}.cjs` : BUNDLE_ENTRY;
}

/** Run the bundled command line in `dir` on argv (without node and script) from the code cache; returns the exit status. */
export async function runBundle(dir, argv) {
  return bundleLoader(dir).load(bundleFileFor(dir, argv)).main(argv);
}
