/**
 * The editor's "start a plan" (src/editor/io/draftFromFile.ts) drafts the same plan as `haloweave draft` from the same
 * catalog, and reports what stops it (a wrong centre, a profile whose lines miss the detector) as problems.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { draftFromFile } from '../../src/editor/io/draftFromFile';
import { parseProfile } from '../../src/core/profile/load';
import { parsePlan } from '../../src/core/plan/validate';
import { demoScenario } from '../../src/core/scenario/generator';

const profile = parseProfile(JSON.parse(readFileSync(join(__dirname, '../../instrument-profiles/ridge10-narrow.json'), 'utf8')), 'ridge10-narrow');
const demo = demoScenario();
const CAT = [8498.0, 8542.1, 8662.1];
const galaxy = { id: 'Halo Demo A', raDeg: 161.8125, decDeg: -21.405, reArcsec: 40, axisRatio: 0.8, paDeg: 35, vsysKms: 1180, muE: 21.2, distanceMpc: 12 };

describe('start a plan in the editor from a catalog file', () => {
  it('RA in hours under another name: a plan the validator accepts, with the mapping and explained goals', () => {
    const lines = demo.catalogCsv.trim().split('\n');
    const text = ['NAME,alpha,delta,mag,color,role', ...lines.slice(1).map((l) => {
      const [id, ra, dec, mag, color, role] = l.split(',');
      return [id, (Number(ra) / 15).toFixed(8), dec, mag, color, role].join(',');
    })].join('\n');
    const r = draftFromFile({ name: 'my-catalog.csv', content: text }, profile, galaxy, CAT);
    expect(r.problems).toEqual([]);
    expect(r.planName).toBe('my-catalog.plan.json');
    const plan = parsePlan(JSON.parse(r.planText!), 'draft');
    expect(plan.catalog).toBe('my-catalog.csv');
    expect(plan.catalogColumns).toEqual({ id: 'NAME', ra: 'alpha', raUnit: 'hour', dec: 'delta' });
    expect(plan.instrument).toBe('ridge10-narrow');
    expect(r.choices.map((c) => c.key)).toEqual(expect.arrayContaining(['goals.masks', 'goals.tracerReachRe', 'goals.starlightReachRe', 'goals.linesA']));
    expect(r.summary!.catalog).toMatch(new RegExp(`${lines.length - 1} rows, ${lines.length - 1} usable`));
  });

  it('a galaxy centre away from the catalog, and lines off the detector, are problems with no plan', () => {
    const far = draftFromFile({ name: 'c.csv', content: demo.catalogCsv }, profile, { ...galaxy, decDeg: 30 }, CAT);
    expect(far.planText).toBeNull();
    expect(far.problems.map((p) => p.what).join('\n')).toMatch(/no column holds Dec values near the galaxy's Dec 30\.0000 deg/);
    const off = draftFromFile({ name: 'c.csv', content: demo.catalogCsv }, profile, galaxy, [5000]);
    expect(off.planText).toBeNull();
    expect(off.problems[0].where).toBe('ridge10-narrow: detector');
  });
});

describe('the role column', () => {
  const head = (cols: string, rows: string[]) => [cols, ...rows].join('\n');
  const base = demo.targets.slice(0, 400);
  it('a role column of tracers only is kept; a "kind" column of other values beside a role column is left alone', () => {
    const onlyTracers = head('id,ra,dec,mag,role', base.filter((t) => t.role === 'tracer').map((t) => `${t.id},${t.raDeg},${t.decDeg},${t.mag},tracer`));
    const r = draftFromFile({ name: 't.csv', content: onlyTracers }, profile, galaxy, CAT);
    expect(r.problems).toEqual([]);
    expect(r.guess!.fields.role).toEqual({ column: 'role', how: 'name', unit: undefined });
    expect(r.notes.join('\n')).toMatch(/no alignment star/);
  });

  it('alignment stars marked in a column of another name are found; a "kind" column of other values is then not the role', () => {
    const text = head('id,ra,dec,mag,kind,flag', base.map((t) => `${t.id},${t.raDeg},${t.decDeg},${t.mag},${t.role === 'alignment' ? 'star' : 'gc'},${t.role}`));
    const r = draftFromFile({ name: 'k.csv', content: text }, profile, galaxy, CAT);
    expect(r.problems).toEqual([]);
    expect(JSON.parse(r.planText!).catalogColumns).toEqual({ role: 'flag' });
  });

  it('a "kind" column of other values and no role column: a problem saying so', () => {
    const text = head('id,ra,dec,mag,kind', base.map((t) => `${t.id},${t.raDeg},${t.decDeg},${t.mag},${t.role === 'alignment' ? 'star' : 'gc'}`));
    const r = draftFromFile({ name: 'k2.csv', content: text }, profile, galaxy, CAT);
    expect(r.planText).toBeNull();
    expect(r.problems[0].what).toMatch(/kind: the reader takes this column as the role .* holds other values \((gc, star|star, gc)\)/);
  });
});
