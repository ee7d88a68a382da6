/**
 * Property: every corruption of a valid output folder that breaks a contract rule makes `haloweave check` fail, even
 * when the manifest is re-hashed to match (so the rule itself, not only the file hashes, must catch it). fast-check
 * draws the row, the kind of corruption and its size; the command runs in-process (the same `main` as the binary).
 */
import { describe, expect, it, beforeAll } from 'vitest';
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { FIXTURES, cli } from './runCli';
import { resealManifest } from './sealFolder';
import { main } from '../../src/cli/main';

let work: string;
let good: string;
let rows: string[][];
beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'haloweave-checkprop-'));
  cpSync(FIXTURES, join(work, 'plans'), { recursive: true });
  expect(cli(['plan', 'plans/small.plan.json', '--out', 'good', '--quiet'], work).code).toBe(0);
  good = join(work, 'good');
  rows = readFileSync(join(good, 'slits.csv'), 'utf8').trim().split('\n').map((l) => l.split(','));
}, 60_000);

const C = { mask: 0, slit: 1, object: 2, role: 3, ra: 4, dec: 5, x: 6, y: 7, below: 8, above: 9, width: 10, tilt: 11, priority: 12, mag: 13 };

/** One corruption: what it does to the rows (header first) of slits.csv, or to another file. */
type Corruption = { name: string; apply: (dir: string, row: number, size: number) => void };

const editSlits = (f: (r: string[][], row: number, size: number) => void) => (dir: string, row: number, size: number) => {
  const r = readFileSync(join(dir, 'slits.csv'), 'utf8').trim().split('\n').map((l) => l.split(','));
  f(r, row, size);
  writeFileSync(join(dir, 'slits.csv'), r.map((c) => c.join(',')).join('\n') + '\n');
};
/** The first row at or after `i` (wrapping past the end) whose role is one of `roles`. */
function catalogRowFrom(r: string[][], i: number, roles = ['tracer', 'alignment']): number {
  for (let k = 0; k < r.length - 1; k++) {
    const j = 1 + ((i - 1 + k) % (r.length - 1));
    if (roles.includes(r[j][C.role])) return j;
  }
  throw new Error('no such row');
}
const add = (cell: string, d: number) => String(Number(cell) + d);
const sign = (size: number, row: number) => (row % 2 ? size : -size);

const CORRUPTIONS: Corruption[] = [
  // slit width differs from the profile (rows other than boxes) / box size differs from the profile (boxes)
  { name: 'width', apply: editSlits((r, i, s) => { r[i][C.width] = add(r[i][C.width], s); }) },
  // a slit shorter than the minimum, or a box of the wrong size
  { name: 'short', apply: editSlits((r, i) => { r[i][C.below] = '0.1'; }) },
  // x moved, ra/dec left: ra/dec is no longer the point (x, y) on the sky
  { name: 'x moved', apply: editSlits((r, i, s) => { r[i][C.x] = add(r[i][C.x], sign(s, i)); }) },
  // ra moved, x/y left
  { name: 'ra moved', apply: editSlits((r, i, s) => { r[i][C.ra] = add(r[i][C.ra], s * 1e-4); }) },
  // mag of a catalog object (the next tracer or alignment row from the drawn one) no longer the catalog's
  { name: 'mag', apply: editSlits((r, i, s) => { const j = catalogRowFrom(r, i); r[j][C.mag] = add(r[j][C.mag], s); }) },
  // weight of a tracer (the next tracer row) no longer the one the plan's weighting gives
  { name: 'priority', apply: editSlits((r, i, s) => { const j = catalogRowFrom(r, i, ['tracer']); r[j][C.priority] = add(r[j][C.priority], s); }) },
  // the row's role changed to another valid role: coverage counts per role no longer match
  { name: 'role', apply: editSlits((r, i) => { r[i][C.role] = r[i][C.role] === 'sky' ? 'starlight' : 'sky'; }) },
  // a row removed: coverage counts, or the alignment count, no longer match
  { name: 'row removed', apply: editSlits((r, i) => { r.splice(i, 1); }) },
  // a row doubled: same object twice, spans overlapping
  { name: 'row doubled', apply: editSlits((r, i) => { r.splice(i, 0, [...r[i]]); }) },
  // tilt beyond the profile's maxTiltDeg (45 for this profile)
  { name: 'tilt', apply: editSlits((r, i, s) => { r[i][C.tilt] = String(46 + s); }) },
  // a mask turned in masks.csv: every row's sky position is off
  { name: 'mask turned', apply: (dir, _i, s) => {
    const m = readFileSync(join(dir, 'masks.csv'), 'utf8').trim().split('\n').map((l) => l.split(','));
    m[1][4] = String((Number(m[1][4]) + s) % 360);
    writeFileSync(join(dir, 'masks.csv'), m.map((c) => c.join(',')).join('\n') + '\n');
  } },
  // a coverage count changed
  { name: 'coverage count', apply: (dir, i) => {
    const c = JSON.parse(readFileSync(join(dir, 'coverage.json'), 'utf8'));
    c.roles.tracer.sectors[i % 8].count += 1;
    writeFileSync(join(dir, 'coverage.json'), JSON.stringify(c, null, 2));
  } },
];

async function checkExit(dir: string): Promise<{ code: number; err: string }> {
  let err = '';
  const code = await main(['check', dir], { out: () => {}, err: (t) => { err += t + '\n'; } });
  return { code, err };
}

describe('check fails on every corruption that breaks a contract rule', () => {
  it('the good folder passes in-process too', async () => {
    expect((await checkExit(good)).code).toBe(0);
  });

  it('random corruptions, manifest re-hashed to match', async () => {
    let k = 0;
    await fc.assert(fc.asyncProperty(
      fc.constantFrom(...CORRUPTIONS),
      fc.integer({ min: 1, max: rows.length - 1 }),
      fc.double({ min: 0.05, max: 20, noNaN: true }),
      async (corruption, row, size) => {
        const dir = join(work, `c${k++}`);
        cpSync(good, dir, { recursive: true });
        corruption.apply(dir, row, size);
        resealManifest(dir);
        const r = await checkExit(dir);
        rmSync(dir, { recursive: true, force: true });
        expect(r.code, `${corruption.name} on slits.csv line ${row + 1} by ${size}: check passed it`).not.toBe(0);
      },
    ), { numRuns: 150, seed: 20261203 });
  }, 300_000);

  it('the same corruptions without re-hashing are caught by the manifest', async () => {
    for (const corruption of CORRUPTIONS) {
      const dir = join(work, `m-${corruption.name.replace(/ /g, '-')}`);
      cpSync(good, dir, { recursive: true });
      corruption.apply(dir, 3, 1);
      const r = await checkExit(dir);
      expect(r.code).not.toBe(0);
      expect(r.err).toMatch(/\[manifest\] was changed after the run wrote it/);
    }
  }, 120_000);
});
