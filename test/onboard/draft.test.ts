/**
 * `haloweave draft` on generated catalogs whose columns carry other names and units than the contract's (RA in hours,
 * positions under unknown names with units stated by an ECSV header, sexagesimal text, the role column renamed):
 * each draft is a plan that `haloweave plan` solves and `haloweave check` passes, reading every row.
 * The catalogs come from the seeded scenario generator (src/core/scenario), about a galaxy placed elsewhere on the sky.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/main';
import { generateScenario } from '../../src/core/scenario/generator';
import { formatDecDms, formatRaHms } from '../../src/core/sky/sexagesimal';
import type { Target } from '../../src/core/catalog/types';

function capture() {
  const out: string[] = [], err: string[] = [];
  return { out, err, io: { out: (t: string) => out.push(t), err: (t: string) => err.push(t) } };
}

const GALAXY = { raDeg: 203.25, decDeg: 12.4, reArcsec: 30, axisRatio: 0.7, paDeg: 120, vsysKms: 1500, distanceMpc: 20 };
const scenario = generateScenario({ seed: 'onboard-draft', candidates: 900, alignmentStars: 160, galaxy: { ...GALAXY, id: 'Draft Test' }, alignmentMagRange: [16, 20], instrument: 'quad8-square' });
const rows: Target[] = scenario.targets;
const dir = mkdtempSync(join(tmpdir(), 'haloweave-draft-'));
const galaxyArgs = ['--ra', formatRaHms(GALAXY.raDeg, 3), '--dec', formatDecDms(GALAXY.decDeg, 2), '--re', '30', '--axis-ratio', '0.7', '--pa', '120', '--vsys', '1500', '--mu-e', '20.8', '--id', 'Draft Test'];

function write(name: string, text: string): string {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}

/** Draft, solve and check one catalog; returns the draft's streams, the plan and the exit statuses. */
async function draftSolveCheck(catalog: string, extra: string[] = []) {
  const name = catalog.replace(/\W/g, '_');
  const d = capture();
  const planPath = join(dir, `${name}.plan.json`);
  const draftCode = await main(['draft', join(dir, catalog), '--profile', 'quad8-square', ...galaxyArgs, '--out', planPath, ...extra], d.io);
  if (draftCode !== 0) return { draftCode, d, plan: null, planCode: -1, checkCode: -1, p: capture() };
  const plan = JSON.parse(readFileSync(planPath, 'utf8'));
  const p = capture();
  const out = join(dir, `${name}-out`);
  const planCode = await main(['plan', planPath, '--out', out, '--quiet'], p.io);
  const c = capture();
  const checkCode = await main(['check', out], c.io);
  return { draftCode, d, plan, planCode, checkCode, p, c, out };
}

const results: Record<string, Awaited<ReturnType<typeof draftSolveCheck>>> = {};

beforeAll(async () => {
  // A: RA in decimal hours under "alpha", Dec under "delta", the magnitude and role columns renamed.
  write('hours.csv', ['NAME,alpha,delta,i_total_mag,colour_vi,type', ...rows.map((t) => `${t.id},${(t.raDeg / 15).toFixed(8)},${t.decDeg.toFixed(7)},${t.mag},${t.color ?? ''},${t.role}`)].join('\n') + '\n');
  // B: ECSV, positions under unknown names with their unit in the header (RA in hours there), space-separated.
  write('units.ecsv', [
    '# %ECSV 1.0', '# ---', '# datatype:', '# - {name: objname, datatype: string}', '# - {name: lon_sky, unit: h, datatype: float64}',
    '# - {name: lat_sky, unit: deg, datatype: float64}', '# - {name: rmag, datatype: float64}', '# - {name: role, datatype: string}', '# schema: astropy-2.0',
    'objname lon_sky lat_sky rmag role', ...rows.map((t) => `${t.id} ${(t.raDeg / 15).toFixed(8)} ${t.decDeg.toFixed(7)} ${t.mag} ${t.role}`),
  ].join('\n') + '\n');
  // C: sexagesimal text under unknown names, a TSV with a magnitude named only by "mag" inside its name.
  write('sexa.tsv', ['source\tpos_ra\tpos_dec\tiband_mag\trole', ...rows.map((t) => `${t.id}\t${formatRaHms(t.raDeg, 4)}\t${formatDecDms(t.decDeg, 3)}\t${t.mag}\t${t.role}`)].join('\n') + '\n');
  // D: a profile of the user's own, given as a file path.
  const profile = JSON.parse(readFileSync(join(__dirname, '../../instrument-profiles/quad8-square.json'), 'utf8'));
  writeFileSync(join(dir, 'my-profile.json'), JSON.stringify({ ...profile, id: 'my-square', label: 'my square field' }));
  copyFileSync(join(dir, 'hours.csv'), join(dir, 'hours2.csv'));
  results.hours = await draftSolveCheck('hours.csv');
  results.units = await draftSolveCheck('units.ecsv');
  results.sexa = await draftSolveCheck('sexa.tsv');
}, 600_000);

describe('haloweave draft: generated catalogs with other column names and units give plans that solve', () => {
  it('RA in hours under another name: found by its values, raUnit "hour" written, every row used', () => {
    const r = results.hours;
    expect(r.d.err.join('\n')).not.toMatch(/error/);
    expect(r.draftCode).toBe(0);
    expect(r.plan.catalogColumns).toEqual({ id: 'NAME', ra: 'alpha', raUnit: 'hour', dec: 'delta', mag: 'i_total_mag', color: 'colour_vi', role: 'type' });
    expect(r.d.out.join('\n')).toMatch(new RegExp(`${rows.length} rows, ${rows.length} usable, 0 rows with problems`));
    expect(r.planCode).toBe(0);
    expect(r.checkCode).toBe(0);
    expect(r.p.err.join('\n')).toMatch(new RegExp(`${rows.length} rows read, ${rows.length} used, 0 rejected`));
  });

  it('ECSV with units in the header: the unknown names are taken by their converted values', () => {
    const r = results.units;
    expect(r.draftCode).toBe(0);
    expect(r.plan.catalogColumns).toEqual({ id: 'objname', ra: 'lon_sky', dec: 'lat_sky', mag: 'rmag' });
    expect(r.planCode).toBe(0);
    expect(r.checkCode).toBe(0);
  });

  it('sexagesimal text in a TSV: read as such, the magnitude found by "mag" in its name', () => {
    const r = results.sexa;
    expect(r.draftCode).toBe(0);
    expect(r.plan.catalogColumns).toEqual({ id: 'source', ra: 'pos_ra', dec: 'pos_dec', mag: 'iband_mag' });
    expect(r.d.out.join('\n')).toMatch(/pos_ra: sexagesimal text/);
    expect(r.planCode).toBe(0);
    expect(r.checkCode).toBe(0);
  });

  it('explains every goal it chose, and counts the alignment stars near the galaxy', () => {
    const text = results.hours.d.out.join('\n');
    for (const key of ['goals.masks', 'goals.tracerReachRe', 'goals.starlightReachRe', 'goals.linesA', 'galaxy.sersicN']) expect(text).toContain(`  ${key} = `);
    const stars = rows.filter((t) => t.role === 'alignment').length;
    expect(text).toMatch(new RegExp(`alignment stars: ${stars} in the catalog, \\d+ of mag 16-20 within`));
    const plan = results.hours.plan;
    expect(plan.galaxy.distanceMpc).toBe(21.4); // 1500 km/s / 70 km/s/Mpc, rounded to 0.1 Mpc
    expect(plan.goals.starlightReachRe).toBe(3);
    expect(plan.instrument).toBe('quad8-square');
  });
});

describe('haloweave draft: what a user can get wrong', () => {
  it('a profile of their own, given by path, is written relative to the plan', async () => {
    const d = capture();
    const code = await main(['draft', join(dir, 'hours2.csv'), '--profile', join(dir, 'my-profile.json'), ...galaxyArgs, '--out', join(dir, 'own.plan.json')], d.io);
    expect(code).toBe(0);
    expect(JSON.parse(readFileSync(join(dir, 'own.plan.json'), 'utf8')).instrument).toBe('my-profile.json');
  });

  it('RA in radians: exit 2, saying so and how to fix it', async () => {
    write('rad.csv', ['id,ra,dec,mag,role', ...rows.slice(0, 50).map((t) => `${t.id},${(t.raDeg * Math.PI) / 180},${t.decDeg},${t.mag},${t.role}`)].join('\n') + '\n');
    const d = capture();
    const code = await main(['draft', join(dir, 'rad.csv'), '--profile', 'quad8-square', ...galaxyArgs, '--out', join(dir, 'rad.plan.json')], d.io);
    expect(code).toBe(2);
    expect(d.err.join('\n')).toMatch(/ra: the values \(median [\d.]+\) look like radians.*convert the column to degrees/);
  });

  it('a galaxy centre far from the catalog: exit 2 naming both', async () => {
    const d = capture();
    const args = galaxyArgs.map((a) => (a === formatDecDms(GALAXY.decDeg, 2) ? '+40:00:00' : a));
    const code = await main(['draft', join(dir, 'hours.csv'), '--profile', 'quad8-square', ...args, '--out', join(dir, 'far.plan.json')], d.io);
    expect(code).toBe(2);
    expect(d.err.join('\n')).toMatch(/no column holds Dec values near the galaxy's Dec 40\.0000 deg/);
  });

  it('missing options are each named with what to give; an existing plan is not replaced without --force', async () => {
    const d = capture();
    expect(await main(['draft', join(dir, 'hours.csv'), '--profile', 'quad8-square'], d.io)).toBe(2);
    const text = d.err.join('\n');
    for (const k of ['--ra', '--dec', '--re', '--axis-ratio', '--pa', '--vsys', '--out']) expect(text).toContain(`${k}: is required`);
    const e = capture();
    expect(await main(['draft', join(dir, 'hours.csv'), '--profile', 'quad8-square', ...galaxyArgs, '--out', join(dir, 'hours_csv.plan.json')], e.io)).toBe(2);
    expect(e.err.join('\n')).toMatch(/exists already.*--force/);
  });
});
