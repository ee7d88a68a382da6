/**
 * File-system faults met by `haloweave plan` and `haloweave export`, each run as the real command: one line saying
 * what, where and how to fix, exit 2, no stack trace, nothing half-written left looking complete, no input
 * overwritten. Places that cannot be written are made real: system folders (/proc, /sys), paths under a file, and
 * folders without write permission for an unprivileged user (the runs switch to uid 65534 when the tests run as root,
 * whom permissions do not stop).
 */
import { describe, expect, it, beforeAll } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { chmodSync, cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { BIN, FIXTURES, cli } from './runCli';

let work: string;
const asRoot = process.getuid?.() === 0;

/** Run the CLI as an unprivileged user (uid/gid 65534 when the tests run as root, else as the current user). */
function cliUnprivileged(args: string[]) {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd: work, encoding: 'utf8', ...(asRoot ? { uid: 65534, gid: 65534 } : {}) });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

/** One problem line on stderr, naming the --out, no stack trace. */
function expectOneLine(err: string, pattern: RegExp) {
  const lines = err.trim().split('\n').filter((l) => !/catalog .* rows read/.test(l));
  expect(lines, err).toHaveLength(1);
  expect(lines[0]).toMatch(pattern);
  expect(err).not.toMatch(/internal error|\n\s+at /);
}

beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'haloweave-fsfaults-'));
  chmodSync(work, 0o777);
  cpSync(FIXTURES, join(work, 'plans'), { recursive: true });
  for (const f of readdirSync(join(work, 'plans'))) chmodSync(join(work, 'plans', f), 0o644);
  chmodSync(join(work, 'plans'), 0o755);
  expect(cli(['plan', 'plans/small.plan.json', '--out', 'good', '--quiet'], work).code).toBe(0);
  writeFileSync(join(work, 'afile'), 'not a folder');
}, 60_000);

describe('plan --out in a place that cannot hold the output folder', () => {
  it.each([
    ['under a file', 'afile/out', /--out afile\/out: .*afile is a file, so no folder can be made under it \(choose a path whose parent folders are folders\)/],
    ['a file', 'afile', /--out afile: exists and is a file \(choose a folder name for --out\)/],
    ['in /proc', '/proc/haloweave-out', /--out \/proc\/haloweave-out: cannot make the output folder: .* \(in \/proc\)/],
    ['in /sys', '/sys/haloweave-out', /--out \/sys\/haloweave-out: cannot make the output folder: .*\(in \/sys\)/],
  ])('%s: one line, exit 2', (_name, out, pattern) => {
    const r = cli(['plan', 'plans/small.plan.json', '--out', out, '--quiet'], work);
    expect(r.code).toBe(2);
    expectOneLine(r.err, pattern);
  });

  it('an output folder the user may not write: one line, exit 2, the folder untouched', () => {
    mkdirSync(join(work, 'locked'));
    writeFileSync(join(work, 'locked', 'masks.csv'), 'old');
    chmodSync(join(work, 'locked'), 0o555);
    const r = cliUnprivileged(['plan', 'plans/small.plan.json', '--out', 'locked/new', '--quiet']);
    expect(r.code).toBe(2);
    expectOneLine(r.err, /--out locked\/new: cannot make the output folder: permission denied \(in .*locked\) \(choose a place you may write to/);
    expect(readdirSync(join(work, 'locked'))).toEqual(['masks.csv']);
  });

  it('a parent folder that is not writable around a writable --out: the run works inside --out and leaves no temporary folder', () => {
    mkdirSync(join(work, 'shared', 'mine'), { recursive: true });
    chmodSync(join(work, 'shared', 'mine'), 0o777);
    chmodSync(join(work, 'shared'), 0o555);
    const first = cliUnprivileged(['plan', 'plans/small.plan.json', '--out', 'shared/mine', '--quiet']);
    expect(first.code, first.err).toBe(0);
    // ...and again over its own earlier output.
    const again = cliUnprivileged(['plan', 'plans/small.plan.json', '--out', 'shared/mine', '--quiet']);
    expect(again.code, again.err).toBe(0);
    expect(readdirSync(join(work, 'shared', 'mine')).sort()).toEqual(readdirSync(join(work, 'good')).sort());
    expect(cli(['check', 'shared/mine'], work).code).toBe(0);
  });

  it('foreign files in --out are refused before the solve starts', () => {
    mkdirSync(join(work, 'notes'));
    writeFileSync(join(work, 'notes', 'observing-log.txt'), 'mine');
    const r = cli(['plan', 'plans/small.plan.json', '--out', 'notes'], work);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--out notes: the folder exists and is not a Haloweave output folder .*observing-log\.txt/);
    expect(r.err).not.toMatch(/%\]/); // no progress line: the solve never started
    expect(readdirSync(join(work, 'notes'))).toEqual(['observing-log.txt']);
  });
});

describe('interrupted and concurrent runs', () => {
  it('a killed run leaves a temporary folder that check refuses; the next run removes it', async () => {
    const child = spawn(process.execPath, [BIN, 'plan', 'plans/small.plan.json', '--out', 'killed', '--quiet'], { cwd: work, stdio: 'ignore' });
    let tmp: string | undefined;
    for (let k = 0; k < 500 && !tmp; k++) {
      await new Promise((r) => setTimeout(r, 10));
      tmp = readdirSync(work).find((e) => e.startsWith('killed.tmp-'));
    }
    expect(tmp).toBeDefined();
    child.kill('SIGKILL');
    await new Promise((r) => child.on('exit', r));
    expect(existsSync(join(work, 'killed'))).toBe(false);
    // Some files written, as a run killed half-way leaves them: still not a complete folder.
    for (const f of ['masks.csv', 'slits.csv', 'coverage.json', 'solved.plan.json', 'catalog-report.csv']) writeFileSync(join(work, tmp!, f), readFileSync(join(work, 'good', f)));
    const c = cli(['check', tmp!], work);
    expect(c.code).toBe(1);
    expect(c.err).toMatch(/manifest\.json: \[manifest\] file not found: the folder is incomplete/);
    const r = cli(['plan', 'plans/small.plan.json', '--out', 'killed', '--quiet'], work);
    expect(r.code).toBe(0);
    expect(r.err).toContain(`note: removed ${tmp}, a temporary folder left by an interrupted run`);
    expect(readdirSync(work).filter((e) => e.startsWith('killed.'))).toEqual([]);
    expect(cli(['check', 'killed'], work).code).toBe(0);
  }, 60_000);

  it('a folder moved aside by a run killed just before its new version arrived is put back', () => {
    cpSync(join(work, 'good'), join(work, 'aside.old-999999-0'), { recursive: true });
    const r = cli(['plan', 'plans/small.plan.json', '--out', 'aside', '--quiet'], work);
    expect(r.code).toBe(0);
    expect(r.err).toContain('note: put back aside, which an interrupted run had moved aside to aside.old-999999-0');
    expect(readdirSync(work).filter((e) => e.startsWith('aside.'))).toEqual([]);
  });

  it('two runs racing into one new folder: each ends with exit 0 or one line, and the folder is complete', async () => {
    const run = () => new Promise<{ code: number | null; err: string }>((res) => {
      const c = spawn(process.execPath, [BIN, 'plan', 'plans/small.plan.json', '--out', 'race', '--quiet'], { cwd: work });
      let err = '';
      c.stderr.on('data', (d) => { err += d; });
      c.on('exit', (code) => res({ code, err }));
    });
    const results = await Promise.all([run(), run()]);
    for (const r of results) {
      if (r.code !== 0) {
        expect(r.code).toBe(2);
        expectOneLine(r.err, /--out race: .*(another run|the folder exists)/);
      }
      expect(r.err).not.toMatch(/internal error/);
    }
    expect(results.some((r) => r.code === 0)).toBe(true);
    expect(cli(['check', 'race'], work).code).toBe(0);
    expect(readdirSync(work).filter((e) => e.startsWith('race.'))).toEqual([]);
  }, 60_000);
});

describe('export never overwrites an input and refuses places it cannot write', () => {
  it.each([
    ['the folder\'s own slits.csv', 'good/slits.csv', /--out good\/slits\.csv is .*good\/slits\.csv, an input of this export; it is never overwritten/],
    ['the catalog the plan names', 'plans/small.catalog.csv', /--out plans\/small\.catalog\.csv is .*small\.catalog\.csv, an input of this export/],
    ['a folder', 'good', /--out good is a folder; give the name of the file to write/],
    ['under a file', 'afile/slits.fits', /--out afile\/slits\.fits: .*afile is a file, so nothing can be written under it/],
    ['in /proc', '/proc/slits.fits', /--out \/proc\/slits\.fits: cannot write the exported file: .*\(in \/proc\)/],
  ])('%s: exit 2, one line, the input unchanged', (_name, out, pattern) => {
    const before = readFileSync(join(work, 'good', 'slits.csv'));
    const r = cli(['export', 'good', '--format', 'fits', '--out', out], work);
    expect(r.code).toBe(2);
    expect(r.err.split('\n')[0]).toMatch(pattern);
    expect(r.err).not.toMatch(/internal error|\n\s+at /);
    expect(readFileSync(join(work, 'good', 'slits.csv'))).toEqual(before);
    expect(cli(['check', 'good'], work).code).toBe(0);
  });

  it('a place the user may not write', () => {
    const r = cliUnprivileged(['export', 'good', '--format', 'fits', '--out', 'locked/slits.fits']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--out locked\/slits\.fits: cannot write the exported file: permission denied/);
  });
});
