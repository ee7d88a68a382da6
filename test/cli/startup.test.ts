/**
 * The prebuilt command line (bin/build-cli.js, docs/startup.md): the bundle gives the very outputs of the sources,
 * also when it starts from its V8 code cache and when that cache is damaged, made for other bytes or refused by V8;
 * and the launcher runs it only while no bundled source has changed; otherwise it falls back to the sources.
 * Start-up time is measured in bench/startup.bench.ts, not here.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cpSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, symlinkSync, utimesSync, writeFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { BIN, ROOT } from './runCli';
import { bundleStaleReason } from '../../bin/cli-bundle.js';
import { SURVEY_FILE, surveyScenario } from '../../src/core/survey/exampleSurvey';

const BUILD = `dist/test-cli-${process.pid}`;
const work = mkdtempSync(join(tmpdir(), 'haloweave-startup-'));
const ENV = { ...process.env, HALOWEAVE_CLI: '' };
const LOADER = pathToFileURL(join(ROOT, 'bin/cli-loader.js')).href;
const DEMO_PLAN = join(ROOT, 'examples/demo/halo-demo.plan.json');

/**
 * Run the bundle in `dir` (default the test build) on argv from `cwd` as the launcher does, through bin/cli-loader.js
 * with the code cache; `cache` says per bundled file whether its cache was used (bundleLoader's report).
 */
function runBundle(args: string[], cwd: string, dir = join(ROOT, BUILD)) {
  const tag = Math.random().toString(36).slice(2);
  const reportFile = join(work, `cache-report-${tag}.json`);
  // A script file, not `node -e`: the survey's worker threads inherit node's options, and --input-type fails them.
  const script = join(work, `run-bundle-${tag}.mjs`);
  writeFileSync(script, [
    `const { bundleFileFor, bundleLoader } = await import(${JSON.stringify(LOADER)});`,
    `const dir = ${JSON.stringify(dir)}, argv = process.argv.slice(2), loader = bundleLoader(dir);`,
    'process.exitCode = await loader.load(bundleFileFor(dir, argv)).main(argv);',
    `(await import('node:fs')).writeFileSync(${JSON.stringify(reportFile)}, JSON.stringify(loader.report));`,
  ].join('\n'));
  const r = spawnSync(process.execPath, [script, ...args], { cwd, encoding: 'utf8', env: ENV, maxBuffer: 64 << 20 });
  const cache = JSON.parse(readFileSync(reportFile, 'utf8')) as Record<string, string>;
  return { code: r.status, out: r.stdout, err: r.stderr, cache };
}

/** The files of output folder `dir` under `work`, by name; the manifest without the time it was written. */
function folderTexts(dir: string): Record<string, string> {
  return Object.fromEntries(readdirSync(join(work, dir)).sort().map((f) => {
    const t = readFileSync(join(work, dir, f), 'utf8');
    return [f, f === 'manifest.json' ? t.replace(/"writtenUtc": "[^"]*"/, '"writtenUtc": ""') : t];
  }));
}

/** Run the launcher on the sources. */
function runSources(args: string[], cwd: string) {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd, encoding: 'utf8', env: { ...process.env, HALOWEAVE_CLI: 'sources' }, maxBuffer: 64 << 20 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

beforeAll(() => {
  const r = spawnSync(process.execPath, [join(ROOT, 'bin/build-cli.js'), '--out', BUILD], { cwd: ROOT, encoding: 'utf8' });
  expect(r.stderr).toBe('');
  expect(r.status).toBe(0);
}, 120_000);

afterAll(() => {
  rmSync(join(ROOT, BUILD), { recursive: true, force: true });
  rmSync(work, { recursive: true, force: true });
});

describe('the bundle behaves as the sources', () => {
  it('lists the command-line sources it was built from, none from node_modules', () => {
    const info = JSON.parse(readFileSync(join(ROOT, BUILD, 'build-info.json'), 'utf8'));
    const paths = info.sources.map((s: { path: string }) => s.path);
    expect(paths).toContain('src/cli/main.ts');
    expect(paths).toContain('src/core/pipeline/pipeline.ts');
    expect(paths.some((p: string) => p.includes('node_modules'))).toBe(false);
  });

  it('one file per command, each with its code cache; main.cjs itself holds no solver code', () => {
    const files = readdirSync(join(ROOT, BUILD));
    for (const c of ['main', 'plan', 'check', 'export', 'sky', 'demo', 'draft', 'profile', 'forecast', 'survey']) {
      expect(files).toContain(`${c}.cjs`);
      expect(files).toContain(`${c}.cjs.cache`);
    }
    const mainJs = readFileSync(join(ROOT, BUILD, 'main.cjs'), 'utf8');
    expect(mainJs).not.toMatch(/solvePlan|zod/);
  });

  it('a missing plan file: same exit status and message, from the code cache', () => {
    const { cache, ...a } = runBundle(['plan', 'missing.plan.json', '--out', 'o'], work);
    const b = runSources(['plan', 'missing.plan.json', '--out', 'o'], work);
    expect(a.code).toBe(2);
    expect(a).toEqual(b);
    expect(a.err).toMatch(/plan file not found/);
    expect(cache).toEqual({ 'plan.cjs': 'used' });
  });

  it('the demo: byte-identical output folders from the code cache, and the bundled check passes the folder', () => {
    const a = runBundle(['demo', '--out', 'bundle', '--quiet'], work);
    const b = runSources(['demo', '--out', 'sources', '--quiet'], work);
    expect(a.code).toBe(0);
    expect(b.code).toBe(0);
    expect(a.cache).toEqual({ 'demo.cjs': 'used' });
    expect(folderTexts('bundle')).toEqual(folderTexts('sources'));
    const c = runBundle(['check', 'bundle'], work);
    expect(c.code).toBe(0);
    // Formats that load dependencies of their own (FITS, VOTable) run from the bundle too.
    expect(runBundle(['export', 'bundle', '--format', 'votable', '--out', 'slits.vot'], work).code).toBe(0);
    expect(runBundle(['export', 'bundle', '--format', 'fits', '--out', 'slits.fits'], work).code).toBe(0);
  }, 120_000);

  it('a survey: its planning worker threads run from the bundle too, with the galaxy folders of the sources', () => {
    const files = surveyScenario({ galaxies: 2, candidates: 300, seed: 11, from: '2027-03-01', to: '2027-03-06', surveyKeys: { hoursPerMask: 1.5 } });
    for (const [n, t] of Object.entries(files)) writeFileSync(join(work, n), t);
    const a = runBundle(['survey', SURVEY_FILE, '--out', 'survey-bundle', '--jobs', '2', '--quiet'], work);
    const b = runSources(['survey', SURVEY_FILE, '--out', 'survey-sources', '--jobs', '2', '--quiet'], work);
    expect(a.err).not.toMatch(/FAILED|internal error/);
    expect(a.code).toBe(0);
    expect(b.code).toBe(0);
    const galaxies = readdirSync(join(work, 'survey-sources')).filter((f) => statSync(join(work, 'survey-sources', f)).isDirectory()).sort();
    expect(galaxies).toHaveLength(2);
    for (const g of galaxies) expect(folderTexts(join('survey-bundle', g)), g).toEqual(folderTexts(join('survey-sources', g)));
  }, 120_000);

  it('the dispatcher alone (main.cjs) hands a command to its file, with the same errors', () => {
    const url = pathToFileURL(join(ROOT, BUILD, 'main.cjs')).href;
    const code = `const { main } = await import(${JSON.stringify(url)}); process.exitCode = await main(process.argv.slice(1));`;
    const r = spawnSync(process.execPath, ['--input-type=module', '-e', code, 'plan', 'missing.plan.json', '--out', 'o'], { cwd: work, encoding: 'utf8', env: ENV });
    expect({ code: r.status, out: r.stdout, err: r.stderr }).toEqual(runSources(['plan', 'missing.plan.json', '--out', 'o'], work));
  });
});

describe('the code cache: a bad one is ignored', () => {
  it('damaged, made for another file, refused by V8 (other flags) or missing: the same plan folder each time', () => {
    const dir = join(ROOT, `${BUILD}-cache`);
    cpSync(join(ROOT, BUILD), dir, { recursive: true });
    try {
      const plan = (out: string) => runBundle(['plan', DEMO_PLAN, '--out', out, '--quiet'], work, dir);
      const good = plan('cached');
      expect(good.code).toBe(0);
      expect(good.cache).toEqual({ 'plan.cjs': 'used' });
      const expected = folderTexts('cached');
      const cacheFile = join(dir, 'plan.cjs.cache');
      const bytes = readFileSync(cacheFile);
      const cases: [string, () => void, string][] = [
        ['a flipped byte', () => { const b = Buffer.from(bytes); b[b.length >> 1] ^= 0x5a; writeFileSync(cacheFile, b); }, 'damaged'],
        ['cut short', () => writeFileSync(cacheFile, bytes.subarray(0, bytes.length - 100)), 'damaged'],
        ['the cache of another file', () => cpSync(join(dir, 'check.cjs.cache'), cacheFile), 'other source'],
        ['made with other V8 flags', () => {
          const r = spawnSync(process.execPath, ['--no-opt', join(ROOT, 'bin/cli-cache-run.js'), dir, dir, '--load', 'plan.cjs'], { encoding: 'utf8', env: ENV });
          expect(r.status, r.stderr).toBe(0);
        }, 'rejected'],
        ['missing', () => rmSync(cacheFile), 'absent'],
      ];
      for (const [what, spoil, report] of cases) {
        spoil();
        const r = plan(what.replace(/ /g, '-'));
        expect(r.code, what).toBe(0);
        expect(r.err, what).toBe(good.err);
        expect(r.cache, what).toEqual({ 'plan.cjs': report });
        expect(folderTexts(what.replace(/ /g, '-')), what).toEqual(expected);
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 120_000);
});

describe('staleness: the launcher never runs an old bundle', () => {
  it('bundleStaleReason: current, then the changed, the removed file, then no bundle at all', () => {
    const root = join(work, 'fake');
    mkdirSync(join(root, 'dist/cli'), { recursive: true });
    mkdirSync(join(root, 'src'), { recursive: true });
    writeFileSync(join(root, 'src/a.ts'), 'export const a = 1;\n');
    writeFileSync(join(root, 'src/b.ts'), 'export const b = 2;\n');
    const entry = (p: string) => {
      const st = statSync(join(root, p));
      return { path: p, size: st.size, mtimeMs: st.mtimeMs };
    };
    writeFileSync(join(root, 'dist/cli/build-info.json'), JSON.stringify({ sources: [entry('src/a.ts'), entry('src/b.ts')] }));
    expect(bundleStaleReason(root)).toBeNull();
    // Same size, new time (an edit saved again, a checkout).
    const later = new Date(Date.now() + 5000);
    utimesSync(join(root, 'src/b.ts'), later, later);
    expect(bundleStaleReason(root)).toBe('src/b.ts changed');
    writeFileSync(join(root, 'dist/cli/build-info.json'), JSON.stringify({ sources: [entry('src/a.ts'), entry('src/b.ts')] }));
    writeFileSync(join(root, 'src/a.ts'), 'export const a = 10;\n');
    expect(bundleStaleReason(root)).toBe('src/a.ts changed');
    rmSync(join(root, 'src/a.ts'));
    expect(bundleStaleReason(root)).toBe('src/a.ts was removed');
    rmSync(join(root, 'dist'), { recursive: true });
    expect(bundleStaleReason(root)).toBe('no prebuilt bundle');
  });

  it('the launcher runs the bundle while it is current and the sources once a bundled file differs', () => {
    // A copy of the package whose dist/cli is the test build, sharing the real sources and node_modules.
    const pkg = join(work, 'pkg');
    mkdirSync(join(pkg, 'dist'), { recursive: true });
    cpSync(join(ROOT, 'bin'), join(pkg, 'bin'), { recursive: true });
    cpSync(join(ROOT, BUILD), join(pkg, 'dist/cli'), { recursive: true });
    for (const d of ['src', 'node_modules', 'instrument-profiles', 'package.json']) symlinkSync(join(ROOT, d), join(pkg, d));
    const version = () => spawnSync(process.execPath, [join(pkg, 'bin/haloweave.js'), '--version'], { cwd: work, encoding: 'utf8', env: ENV });
    const fresh = version();
    expect(fresh.status).toBe(0);
    expect(fresh.stdout.trim()).toBe('haloweave 0.1.0 (prebuilt bundle)');
    const infoPath = join(pkg, 'dist/cli/build-info.json');
    const info = JSON.parse(readFileSync(infoPath, 'utf8'));
    const i = info.sources.findIndex((s: { path: string }) => s.path === 'src/cli/main.ts');
    info.sources[i].mtimeMs -= 1000;
    writeFileSync(infoPath, JSON.stringify(info));
    const stale = version();
    expect(stale.status).toBe(0);
    expect(stale.stdout.trim()).toBe('haloweave 0.1.0 (sources (src/cli/main.ts changed))');
    // Not a terminal: nothing extra on stderr, so scripts see the same output either way.
    expect(stale.stderr).toBe('');
  }, 60_000);
});
