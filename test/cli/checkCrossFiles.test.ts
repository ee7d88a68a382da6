/**
 * `haloweave check DIR` across the folder's files: a good folder from `haloweave plan` is corrupted one way at a time
 * (coverage.json counts, solved.plan.json masks, catalog-report.csv), and check must name the file and the line or
 * key, and exit non-zero. Line numbers count the header, as catalog-report.csv does.
 */
import { describe, expect, it, beforeAll } from 'vitest';
import { cpSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { FIXTURES, cli } from './runCli';
import { resealManifest } from './sealFolder';


let work: string;
let good: string;
beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'haloweave-check-'));
  cpSync(FIXTURES, join(work, 'plans'), { recursive: true });
  const r = cli(['plan', 'plans/small.plan.json', '--out', 'good', '--quiet'], work);
  expect(r.code).toBe(0);
  good = join(work, 'good');
}, 60_000);

/** A copy of the good folder with one file edited and its manifest re-hashed; returns the folder name (relative to work). */
function corrupt(name: string, file: string, edit: (text: string) => string): string {
  cpSync(good, join(work, name), { recursive: true });
  const p = join(work, name, file);
  writeFileSync(p, edit(readFileSync(p, 'utf8')));
  resealManifest(join(work, name)); // the manifest made to match, so that the rule itself must catch the edit
  return name;
}

const editJson = (f: (j: any) => void) => (text: string) => {
  const j = JSON.parse(text);
  f(j);
  return JSON.stringify(j, null, 2);
};

describe('haloweave check recounts coverage.json from slits.csv', () => {
  it('the good folder passes and says what it cross-checked', () => {
    const r = cli(['check', 'good'], work);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/coverage recount, co-added starlight bins, solved\.plan\.json masks, objects, positions, mags and weights against .*small\.catalog\.csv and catalog-report\.csv/);
  });

  it('a radial bin count one too high', () => {
    const cov = JSON.parse(readFileSync(join(good, 'coverage.json'), 'utf8'));
    const n = cov.roles.tracer.radialBins[2].count as number;
    const dir = corrupt('cov-bin', 'coverage.json', editJson((j) => { j.roles.tracer.radialBins[2].count = n + 1; }));
    const r = cli(['check', dir], work);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`cov-bin/coverage.json roles.tracer.radialBins[2].count: [coverage] ${n + 1}, but cov-bin/slits.csv has ${n} tracer rows with 2 <= R/Re < 3`);
    // ...and the bins no longer add up to the rows.
    expect(r.err).toMatch(/cov-bin\/coverage\.json roles\.tracer\.radialBins: \[coverage\] the bin counts plus beyondGoal sum to \d+, but cov-bin\/slits\.csv has \d+ tracer rows/);
    expect(r.err).toMatch(/2 violations in cov-bin/);
  });

  it('a sector count and a maximum reach that disagree with the rows', () => {
    const cov = JSON.parse(readFileSync(join(good, 'coverage.json'), 'utf8'));
    const n = cov.roles.starlight.sectors[0].count as number;
    const reach = cov.roles.tracer.maxReachRe as number;
    const dir = corrupt('cov-sector', 'coverage.json', editJson((j) => { j.roles.starlight.sectors[0].count = n + 2; j.roles.tracer.maxReachRe = reach + 0.5; }));
    const r = cli(['check', dir], work);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`cov-sector/coverage.json roles.starlight.sectors[0].count: [coverage] ${n + 2}, but cov-sector/slits.csv has ${n} starlight rows with azimuth 0 <= phi < 45 deg`);
    expect(r.err).toMatch(/coverage\.json roles\.tracer\.maxReachRe: \[coverage\] [\d.]+, but the tracer rows of cov-sector\/slits\.csv reach [\d.]+ Re/);
    expect(r.err).toMatch(/cov-sector\/coverage\.json roles\.starlight\.sectors: \[coverage\] the sector counts sum to \d+/);
    expect(r.err).toMatch(/3 violations in cov-sector/);
  });

  it('a galaxy moved in solved.plan.json: the recount no longer matches', () => {
    const dir = corrupt('cov-galaxy', 'solved.plan.json', editJson((j) => { j.galaxy.reArcsec = j.galaxy.reArcsec * 2; }));
    const r = cli(['check', dir], work);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/cov-galaxy\/coverage\.json roles\.tracer\.radialBins\[\d\]\.count: \[coverage\]/);
    expect(r.err).toMatch(/roles\.tracer\.maxReachRe/);
  });
});

describe('haloweave check compares solved.plan.json masks with masks.csv', () => {
  it('a position angle and a centre that differ, naming the key and the masks.csv line', () => {
    const dir = corrupt('plan-masks', 'solved.plan.json', editJson((j) => { j.masks[1].paDeg = j.masks[1].paDeg + 1; j.masks[0].decDeg = -12.6; }));
    const csv = readFileSync(join(good, 'masks.csv'), 'utf8').trim().split('\n');
    const pa = csv[2].split(',')[4];
    const r = cli(['check', dir], work);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`plan-masks/solved.plan.json masks[1] (id north).paDeg: [plan masks] ${Number(pa) + 1}, but plan-masks/masks.csv line 3 has pa_deg ${pa}`);
    expect(r.err).toContain('plan-masks/solved.plan.json masks[0] (id centre).decDeg: [plan masks] -12.6, but plan-masks/masks.csv line 2 has dec_deg -12.5');
  });

  it('a mask missing from solved.plan.json', () => {
    const dir = corrupt('plan-nomask', 'solved.plan.json', editJson((j) => { j.masks = j.masks.slice(0, 1); }));
    const r = cli(['check', dir], work);
    expect(r.code).toBe(1);
    expect(r.err).toContain('plan-nomask/masks.csv line 3 (mask north): [plan masks] mask north is not among the masks of plan-nomask/solved.plan.json');
  });
});

describe('haloweave check: no used object comes from a line catalog-report.csv lists', () => {
  it('a report row naming the catalog line of a used tracer', () => {
    const slits = readFileSync(join(good, 'slits.csv'), 'utf8').trim().split('\n');
    const k = slits.findIndex((l) => l.split(',')[3] === 'tracer');
    const id = slits[k].split(',')[2];
    const [maskId, slitId] = slits[k].split(',');
    const catalog = readFileSync(join(FIXTURES, 'small.catalog.csv'), 'utf8').split('\n');
    const catLine = catalog.findIndex((l) => l.startsWith(`${id},`)) + 1;
    expect(catLine).toBeGreaterThan(1);
    const reportLines = readFileSync(join(good, 'catalog-report.csv'), 'utf8').trim().split('\n').length;
    const dir = corrupt('report', 'catalog-report.csv', (t) => `${t.trimEnd()}\n${catLine},mag,not a number\n`);
    const r = cli(['check', dir], work);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`report/slits.csv line ${k + 1} (mask ${maskId}, slit ${slitId}): [catalog] object ${id} is on ../plans/small.catalog.csv line ${catLine}, which report/catalog-report.csv line ${reportLines + 1} lists as not used (mag: not a number)`);
    expect(r.err).toMatch(/1 violation in report/);
  });

  it('a report line that is not a line number', () => {
    const dir = corrupt('report-bad', 'catalog-report.csv', (t) => `${t.trimEnd()}\nsome,mag,x\n`);
    const r = cli(['check', dir], work);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/report-bad\/catalog-report\.csv line \d+: \[catalog report\] line "some" is not a 1-based line number/);
  });

  it('an unreadable catalog is said, not silently passed', () => {
    const dir = corrupt('nocat', 'solved.plan.json', editJson((j) => { j.catalog = 'gone.csv'; }));
    const r = cli(['check', dir], work);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/catalog not cross-checked \(gone\.csv could not be read from nocat/);
  });
});

describe('haloweave check names slits.csv rows by file line, counting the header', () => {
  it('a tampered slit on file line N is reported as "slits.csv line N"', () => {
    const lines = readFileSync(join(good, 'slits.csv'), 'utf8').split('\n');
    const i = lines.findIndex((l) => l.split(',')[3] === 'tracer');
    const cells = lines[i].split(',');
    cells[9] = '0.5'; // len_above_arcsec below minLengthArcsec/2
    const dir = corrupt('short', 'slits.csv', () => [...lines.slice(0, i), cells.join(','), ...lines.slice(i + 1)].join('\n'));
    const r = cli(['check', dir], work);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`short/slits.csv line ${i + 1} (mask ${cells[0]}, slit ${cells[1]}): [minimal length] len_above_arcsec 0.5`);
  });
});
