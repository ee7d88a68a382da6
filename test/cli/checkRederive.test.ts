/**
 * `haloweave check` re-derives what it can from the catalog, the plan and the profile: each case edits a good folder
 * of `haloweave plan` in one way, re-hashes the manifest (so the edit is not caught by the hashes alone), and check
 * must name the rule the edit breaks. A last group leaves the manifest as it was: an edited or incomplete folder.
 */
import { describe, expect, it, beforeAll } from 'vitest';
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { FIXTURES, ROOT, cli } from './runCli';
import { resealManifest } from './sealFolder';
import { maskToSkyArcsec } from '../../src/core/sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';

let work: string;
let good: string;
beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'haloweave-rederive-'));
  cpSync(FIXTURES, join(work, 'plans'), { recursive: true });
  const r = cli(['plan', 'plans/small.plan.json', '--out', 'good', '--quiet'], work);
  expect(r.code).toBe(0);
  good = join(work, 'good');
}, 60_000);

type Rows = string[][];
const readRows = (dir: string, f: string): Rows => readFileSync(join(dir, f), 'utf8').trim().split('\n').map((l) => l.split(','));
const writeRows = (dir: string, f: string, rows: Rows) => writeFileSync(join(dir, f), rows.map((r) => r.join(',')).join('\n') + '\n');

/** A copy of the good folder edited by `edit`, manifest re-hashed unless `reseal` is false. */
function variant(name: string, edit: (dir: string) => void, reseal = true): string {
  const dir = join(work, name);
  cpSync(good, dir, { recursive: true });
  edit(dir);
  if (reseal) resealManifest(dir);
  return name;
}

/** Edit the first slits.csv row of `role`; returns its file line. */
function editSlit(dir: string, role: string, f: (cells: string[], header: string[]) => void): number {
  const rows = readRows(dir, 'slits.csv');
  const i = rows.findIndex((c) => c[3] === role);
  f(rows[i], rows[0]);
  writeRows(dir, 'slits.csv', rows);
  return i + 1;
}

const col = (header: string[], name: string) => header.indexOf(name);

function expectRule(name: string, rule: string, pattern?: RegExp): string {
  const r = cli(['check', name], work);
  expect(r.code, r.err).toBe(1);
  expect(r.err).toContain(`[${rule}]`);
  if (pattern) expect(r.err).toMatch(pattern);
  return r.err;
}

describe('check re-derives values from the profile', () => {
  it('a tracer slit 50" wide', () => {
    let line = 0;
    const d = variant('wide', (dir) => { line = editSlit(dir, 'tracer', (c, h) => { c[col(h, 'width_arcsec')] = '50'; }); });
    expectRule(d, 'width', new RegExp(`wide/slits\\.csv line ${line} .*width_arcsec 50, but the profile's slits\\.widthArcsec is 0\\.75`));
  });

  it('an alignment star outside the profile magnitude range (catalog edited alike, so only the range rule can catch it)', () => {
    const d = variant('faintstar', (dir) => {
      let id = '';
      editSlit(dir, 'alignment', (c, h) => { c[col(h, 'mag')] = '23.5'; id = c[col(h, 'object_id')]; });
      // The catalog copy beside the folder is not part of it: point solved.plan.json at an edited copy.
      const cat = readFileSync(join(work, 'plans/small.catalog.csv'), 'utf8').split('\n').map((l) => (l.startsWith(`${id},`) ? l.split(',').map((v, k) => (k === 3 ? '23.5' : v)).join(',') : l));
      writeFileSync(join(dir, 'edited.catalog.csv'), cat.join('\n'));
      const plan = JSON.parse(readFileSync(join(dir, 'solved.plan.json'), 'utf8'));
      plan.catalog = 'edited.catalog.csv';
      writeFileSync(join(dir, 'solved.plan.json'), JSON.stringify(plan, null, 2));
    });
    const err = expectRule(d, 'alignment magnitude', /mag 23\.5 is outside the profile's alignment\.magRange/);
    expect(err).not.toContain('[catalog mag]');
  });
});

describe('check re-derives values from the catalog and the plan', () => {
  it('a slit moved 3" along y, its sky position changed consistently', () => {
    const d = variant('moved', (dir) => {
      const masks = readRows(dir, 'masks.csv');
      editSlit(dir, 'tracer', (c, h) => {
        const m = masks.find((r) => r[0] === c[0])!;
        const y = Number(c[col(h, 'y_arcsec')]) + 3;
        const sky = maskToSkyArcsec(Number(c[col(h, 'x_arcsec')]), y, Number(m[4]));
        const p = tangentToSkyDeg(tangentCentre(Number(m[2]), Number(m[3])), sky.xiArcsec, sky.etaArcsec);
        c[col(h, 'y_arcsec')] = String(y);
        c[col(h, 'ra_deg')] = String(p.raDeg);
        c[col(h, 'dec_deg')] = String(p.decDeg);
      });
    });
    const err = expectRule(d, 'catalog position', /ra_deg\/dec_deg is 3\.000 arcsec from object/);
    expect(err).not.toContain('[sky position]');
  });

  it('a mag that no longer matches the catalog', () => {
    const d = variant('mag', (dir) => { editSlit(dir, 'tracer', (c, h) => { c[col(h, 'mag')] = String(Number(c[col(h, 'mag')]) + 0.5); }); });
    expectRule(d, 'catalog mag', /mag \d+\.\d+, but \.\.\/plans\/small\.catalog\.csv line \d+ gives/);
  });

  it('a priority that no longer matches the weighting of the plan', () => {
    const d = variant('prio', (dir) => { editSlit(dir, 'tracer', (c, h) => { c[col(h, 'priority')] = '9'; }); });
    expectRule(d, 'catalog priority', /priority 9, but the plan's weighting gives object/);
  });
});

describe('check re-derives the file conventions', () => {
  it('a changed sector convention in coverage.json', () => {
    const d = variant('sectors', (dir) => {
      const p = join(dir, 'coverage.json');
      const c = JSON.parse(readFileSync(p, 'utf8'));
      c.sectorConvention.zero = 'minor axis';
      for (const r of Object.values<any>(c.roles)) r.sectors.forEach((s: any) => { s.fromDeg += 90; s.toDeg += 90; });
      writeFileSync(p, JSON.stringify(c, null, 2));
    });
    expectRule(d, 'sector convention', /sectorConvention\.zero: \[sector convention\] "minor axis", but sectors count from the major axis/);
  });

  it('mask_id and slit_id columns swapped (header and cells alike)', () => {
    const d = variant('swapped', (dir) => {
      writeRows(dir, 'slits.csv', readRows(dir, 'slits.csv').map(([a, b, ...rest]) => [b, a, ...rest]));
    });
    expectRule(d, 'column order', /swapped\/slits\.csv line 1: \[column order\] column 1 is "slit_id"/);
  });

  it('solved.plan.json pointing at a different profile file inside the folder', () => {
    const d = variant('otherprofile', (dir) => {
      const prof = JSON.parse(readFileSync(join(ROOT, 'instrument-profiles/quad8-square.json'), 'utf8'));
      prof.slits.gapArcsec = 0.1;
      writeFileSync(join(dir, 'my.profile.json'), JSON.stringify(prof, null, 2));
      const plan = JSON.parse(readFileSync(join(dir, 'solved.plan.json'), 'utf8'));
      plan.instrument = 'my.profile.json';
      writeFileSync(join(dir, 'solved.plan.json'), JSON.stringify(plan, null, 2));
    });
    expectRule(d, 'profile identity', /is not the profile "quad8-square" the masks were designed with/);
  });
});

describe('check refuses an incomplete or altered folder', () => {
  it('a run killed before its end (no manifest: 5 of 6 files)', () => {
    const d = variant('killed', (dir) => { rmSync(join(dir, 'manifest.json')); rmSync(join(dir, 'coverage.json')); }, false);
    const r = cli(['check', d], work);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/killed\/manifest\.json: \[manifest\] file not found: the folder is incomplete/);
  });

  it('a file edited after the run, its manifest left as written', () => {
    const d = variant('edited', (dir) => { writeFileSync(join(dir, 'catalog-report.csv'), readFileSync(join(dir, 'catalog-report.csv'), 'utf8') + '\n'); }, false);
    const r = cli(['check', d], work);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/edited\/catalog-report\.csv: \[manifest\] was changed after the run wrote it/);
  });

  it('a file the manifest lists is missing', () => {
    const d = variant('missing', (dir) => { rmSync(join(dir, 'excluded-targets.csv')); }, false);
    const r = cli(['check', d], work);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/missing\/excluded-targets\.csv: \[manifest\] file not found, but .* lists it/);
  });
});
