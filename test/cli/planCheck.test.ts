/** `haloweave plan` and `haloweave check` end to end on a hand-written plan file, plus every bad-input case. */
import { describe, expect, it, beforeAll } from 'vitest';
import { cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parsePlanText } from '../../src/core/plan/validate';
import { FIXTURES, ROOT, cli } from './runCli';


let work: string;
beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'haloweave-cli-'));
  cpSync(FIXTURES, join(work, 'plans'), { recursive: true });
});

const header = (text: string) => text.split('\n')[0];

describe('haloweave plan and check on a hand-written plan', () => {
  it('writes every output file exactly as the contract says, and check passes', () => {
    const r = cli(['plan', 'plans/small.plan.json', '--out', 'out/small'], work);
    expect(r.err).toMatch(/99 rows read, 97 used, 2 rejected/);
    expect(r.err).toMatch(/\[100%\] done/);
    expect(r.code).toBe(0);
    const dir = join(work, 'out/small');
    // The contract's five files (other parts of the project may add more).
    expect(readdirSync(dir)).toEqual(expect.arrayContaining(['catalog-report.csv', 'coverage.json', 'masks.csv', 'slits.csv', 'solved.plan.json']));
    expect(readdirSync(join(work, 'out'))).toEqual(['small']); // no temporary folder left behind
    expect(header(readFileSync(join(dir, 'masks.csv'), 'utf8'))).toBe('mask_id,instrument,ra_deg,dec_deg,pa_deg');
    expect(header(readFileSync(join(dir, 'slits.csv'), 'utf8'))).toBe('mask_id,slit_id,object_id,role,ra_deg,dec_deg,x_arcsec,y_arcsec,len_below_arcsec,len_above_arcsec,width_arcsec,tilt_deg,priority,mag');
    const report = readFileSync(join(dir, 'catalog-report.csv'), 'utf8').trim().split('\n');
    expect(report[0]).toBe('line,column,reason');
    expect(report.slice(1).map((l) => l.split(',').slice(0, 2).join(','))).toEqual(['99,ra', '100,dec']);
    const masks = readFileSync(join(dir, 'masks.csv'), 'utf8').trim().split('\n').slice(1);
    expect(masks.map((l) => l.split(',')[0])).toEqual(['centre', 'north']);
    expect(masks[0]).toBe('centre,quad8-square,359.9875,-12.5,30'); // the locked mask stays where it is
    const coverage = JSON.parse(readFileSync(join(dir, 'coverage.json'), 'utf8'));
    expect(coverage.roles.tracer.radialBins).toHaveLength(10);
    expect(coverage.roles.starlight.radialBins).toHaveLength(3);
    expect(coverage.roles.tracer.sectors).toHaveLength(8);
    expect(coverage.sectorConvention.folded).toBe(false);
    const slitRows = readFileSync(join(dir, 'slits.csv'), 'utf8').trim().split('\n').slice(1);
    expect(coverage.roles.tracer.count).toBe(slitRows.filter((l) => l.split(',')[3] === 'tracer').length);
    const solved = parsePlanText(readFileSync(join(dir, 'solved.plan.json'), 'utf8'), 'solved.plan.json');
    expect(solved.masks!.every((m) => m.raDeg !== undefined && m.decDeg !== undefined && m.paDeg !== undefined)).toBe(true);
    expect(solved.catalog).toBe('../../plans/small.catalog.csv');

    const c = cli(['check', 'out/small'], work);
    expect(c.err).toBe('');
    expect(c.code).toBe(0);
    expect(c.out).toMatch(/passes/);
  });

  it('loads solved.plan.json again, and the re-solved folder passes check', () => {
    const r = cli(['plan', 'out/small/solved.plan.json', '--out', 'out/again'], work);
    expect(r.code).toBe(0);
    expect(cli(['check', 'out/again'], work).code).toBe(0);
  });

  it('check reports a tampered slit and exits non-zero', () => {
    const dir = join(work, 'out/tampered');
    cpSync(join(work, 'out/small'), dir, { recursive: true });
    const lines = readFileSync(join(dir, 'slits.csv'), 'utf8').split('\n');
    const tracerRows = lines.map((l, k) => [l, k] as const).filter(([l]) => l.startsWith('centre,') && l.includes(',tracer,'));
    const i = tracerRows[Math.floor(tracerRows.length / 2)][1]; // a slit in the middle of its mask
    const cells = lines[i].split(',');
    cells[8] = '500'; // len_below_arcsec far beyond the footprint
    lines[i] = cells.join(',');
    writeFileSync(join(dir, 'slits.csv'), lines.join('\n'));
    const c = cli(['check', 'out/tampered'], work);
    expect(c.code).toBe(1);
    expect(c.err).toMatch(/\[footprint\]/);
    expect(c.err).toMatch(/\[gap\]/);
  });

  it('resolves a profile given as a path relative to the plan file, and check finds it through solved.plan.json', () => {
    const dir = join(work, 'custom');
    mkdirSync(join(dir, 'profiles'), { recursive: true });
    const prof = JSON.parse(readFileSync(join(ROOT, 'instrument-profiles/quad8-square.json'), 'utf8'));
    prof.id = 'my-own-square';
    writeFileSync(join(dir, 'profiles/mine.json'), JSON.stringify(prof));
    cpSync(join(FIXTURES, 'small.catalog.csv'), join(dir, 'small.catalog.csv'));
    const plan = JSON.parse(readFileSync(join(FIXTURES, 'small.plan.json'), 'utf8'));
    plan.instrument = 'profiles/mine.json';
    writeFileSync(join(dir, 'custom.plan.json'), JSON.stringify(plan));
    expect(cli(['plan', 'custom/custom.plan.json', '--out', 'out/custom'], work).code).toBe(0);
    expect(readFileSync(join(work, 'out/custom/masks.csv'), 'utf8')).toMatch(/,my-own-square,/);
    expect(cli(['check', 'out/custom'], work).code).toBe(0);
  });
});

describe('check uses the plan\'s own profile file even when it reuses a package profile id', () => {
  it('a wider footprint under the id quad8-square: slits beyond the package footprint still pass', () => {
    const dir = join(work, 'sameid');
    mkdirSync(dir, { recursive: true });
    const prof = JSON.parse(readFileSync(join(ROOT, 'instrument-profiles/quad8-square.json'), 'utf8'));
    prof.footprint = [[-300, -300], [300, -300], [300, 300], [-300, 300]];
    writeFileSync(join(dir, 'wide.json'), JSON.stringify(prof));
    cpSync(join(FIXTURES, 'small.catalog.csv'), join(dir, 'small.catalog.csv'));
    const plan = JSON.parse(readFileSync(join(FIXTURES, 'small.plan.json'), 'utf8'));
    plan.instrument = 'wide.json';
    writeFileSync(join(dir, 'wide.plan.json'), JSON.stringify(plan));
    const r = cli(['plan', 'sameid/wide.plan.json', '--out', 'out/sameid', '--quiet'], work);
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/warning: the profile file .*wide\.json has the id "quad8-square" of a different profile/);
    const rows = readFileSync(join(work, 'out/sameid/slits.csv'), 'utf8').trim().split('\n').slice(1).map((l) => l.split(','));
    expect(rows.some((c) => Math.abs(Number(c[7])) > 165 || Math.abs(Number(c[6])) > 165)).toBe(true);
    const k = cli(['check', 'out/sameid'], work);
    expect(k.err).toBe('');
    expect(k.code).toBe(0);
  });
});

describe('bad input: one line per problem naming the field, non-zero exit, no complete-looking folder', () => {
  const base = () => JSON.parse(readFileSync(join(FIXTURES, 'small.plan.json'), 'utf8'));
  function runBad(name: string, edit: (p: Record<string, any>) => void) {
    const p = base();
    edit(p);
    writeFileSync(join(work, 'plans', `${name}.plan.json`), JSON.stringify(p));
    const r = cli(['plan', `plans/${name}.plan.json`, '--out', `out/${name}`], work);
    expect(r.code).not.toBe(0);
    expect(existsSync(join(work, 'out', name))).toBe(false);
    expect(readdirSync(join(work, 'out')).some((f) => f.startsWith(`${name}.tmp`))).toBe(false);
    return r.err.trim().split('\n');
  }

  it('a missing key', () => {
    const lines = runBad('nogoals', (p) => { delete p.goals; });
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/goals/);
  });

  it('a wrong key', () => {
    const lines = runBad('wrongformat', (p) => { p.format = 'other/9'; p.galaxy.axisRatio = 'round'; });
    expect(lines).toHaveLength(2);
    expect(lines.some((l) => /format/.test(l))).toBe(true);
    expect(lines.some((l) => /galaxy\.axisRatio/.test(l))).toBe(true);
  });

  it('an unknown profile', () => {
    const lines = runBad('noprofile', (p) => { p.instrument = 'no-such-spectrograph'; });
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/instrument: unknown instrument profile "no-such-spectrograph" \(known: .*quad8-square/);
  });

  it('a catalog path that does not exist', () => {
    const lines = runBad('nocatalog', (p) => { p.catalog = 'missing/cat.csv'; });
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/catalog: catalog file "missing\/cat.csv" not found/);
  });

  it('a galaxy with Re of 0', () => {
    const lines = runBad('re0', (p) => { p.galaxy.reArcsec = 0; });
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/galaxy\.reArcsec: must be greater than 0/);
  });

  it('a wrong allocation.maxSlitLengthArcsec', () => {
    const lines = runBad('alloc', (p) => { p.allocation = { maxSlitLengthArcsec: -4 }; });
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/allocation\.maxSlitLengthArcsec: must be a positive length in arcsec/);
  });

  it('all of them at once: one line each', () => {
    const lines = runBad('all', (p) => { p.galaxy.reArcsec = 0; p.instrument = 'nope'; p.catalog = 'nope.csv'; });
    expect(lines).toHaveLength(3);
    expect(lines.map((l) => l.match(/(galaxy\.reArcsec|instrument|catalog):/)?.[1]).sort()).toEqual(['catalog', 'galaxy.reArcsec', 'instrument']);
  });

  it('a mask with too few alignment stars is refused with the mask named, found vs needed', () => {
    const lines = runBad('fewstars', (p) => { p.masks = [{ id: 'far', raDeg: 1.0, decDeg: -12.5, paDeg: 0, locked: true }]; p.goals.masks = 1; });
    expect(lines.some((l) => /mask far: 0 alignment star\(s\) .* needs at least 3 alignment boxes per mask/.test(l))).toBe(true);
  });

  it('leaves a previous output folder intact when a later run fails, and refuses to overwrite a foreign folder', () => {
    const keep = join(work, 'out/small/masks.csv');
    const before = readFileSync(keep, 'utf8');
    const p = base();
    p.galaxy.reArcsec = 0;
    writeFileSync(join(work, 'plans/bad-again.plan.json'), JSON.stringify(p));
    expect(cli(['plan', 'plans/bad-again.plan.json', '--out', 'out/small'], work).code).not.toBe(0);
    expect(readFileSync(keep, 'utf8')).toBe(before);
    mkdirSync(join(work, 'foreign'), { recursive: true });
    writeFileSync(join(work, 'foreign/notes.txt'), 'mine');
    const r = cli(['plan', 'plans/small.plan.json', '--out', 'foreign'], work);
    expect(r.code).not.toBe(0);
    expect(r.err).toMatch(/not a Haloweave output folder/);
    expect(readdirSync(join(work, 'foreign'))).toEqual(['notes.txt']);
  });

  it('check on a folder without the files says which file is missing', () => {
    mkdirSync(join(work, 'empty'), { recursive: true });
    const r = cli(['check', 'empty'], work);
    expect(r.code).not.toBe(0);
    expect(r.err).toMatch(/masks\.csv: file not found/);
  });
});

describe('haloweave check passes what haloweave plan writes for random galaxies, profiles and catalogs', () => {
  it('three random cases through the command line', async () => {
    const { randomCase } = await import('../solver/randomCase');
    const { toCsv } = await import('../../src/core/export/csvText');
    let checked = 0;
    for (const seed of [11, 202, 3003, 40004, 500005]) {
      if (checked === 3) break;
      const c = randomCase(seed);
      const dir = join(work, `random-${seed}`);
      mkdirSync(dir, { recursive: true });
      writeFileSync(join(dir, 'profile.json'), JSON.stringify(c.profile));
      writeFileSync(join(dir, 'cat.csv'), toCsv(['id', 'ra', 'dec', 'mag', 'priority', 'role'], c.catalog.targets.map((t) => [t.id, t.raDeg, t.decDeg, t.mag, t.priority, t.role])));
      writeFileSync(join(dir, 'r.plan.json'), JSON.stringify({ ...c.plan, instrument: 'profile.json', catalog: 'cat.csv' }));
      const r = cli(['plan', `random-${seed}/r.plan.json`, '--out', `out/random-${seed}`, '--quiet'], work);
      if (r.code !== 0) {
        // The only refusal: a mask with too few alignment stars (named in the message).
        expect(r.err).toMatch(/mask .*alignment star/);
        continue;
      }
      const k = cli(['check', `out/random-${seed}`], work);
      expect(k.err).toBe('');
      expect(k.code).toBe(0);
      checked++;
    }
    expect(checked).toBe(3);
  }, 180_000);
});
