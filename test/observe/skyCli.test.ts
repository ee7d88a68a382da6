import { describe, expect, it, beforeAll } from 'vitest';
import { mkdtempSync, writeFileSync, copyFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { execFileSync } from 'node:child_process';
import { main } from '../../src/cli/main';

const CONTRACT_KEYS = ['date', 'sunsetUtc', 'astroDuskUtc', 'astroDawnUtc', 'sunriseUtc', 'transitUtc', 'darkHours', 'minAirmass', 'moonIllumination', 'moonSeparationDeg'];
let dir = '';

function planWith(galaxy: { ra: number | string; dec: number | string }, instrument = 'ridge10-narrow') {
  return {
    format: 'haloweave.plan/1',
    galaxy: { id: 'test-gal', ...galaxy, reArcsec: 45, axisRatio: 0.8, paDeg: 30, distanceMpc: 18, vsysKms: 1250, sersicN: 4, muE: 21.5 },
    instrument, catalog: 'missing.csv', // sky does not read the catalog
    goals: { masks: 4, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498.0, 8542.1, 8662.1] },
  };
}

async function runSky(args: string[]) {
  const out: string[] = [], err: string[] = [];
  const code = await main(['sky', ...args], { out: (t) => out.push(t), err: (t) => err.push(t) });
  return { code, out: out.join('\n'), err: err.join('\n'), errLines: err.flatMap((e) => e.split('\n')).filter(Boolean) };
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'hw-sky-'));
  writeFileSync(join(dir, 'ok.plan.json'), JSON.stringify(planWith({ ra: '02:00:00', dec: '+10:00:00' })));
  writeFileSync(join(dir, 'south.plan.json'), JSON.stringify(planWith({ ra: 80, dec: -75 })));
  copyFileSync('instrument-profiles/ridge10-narrow.json', join(dir, 'my-profile.json'));
  writeFileSync(join(dir, 'path.plan.json'), JSON.stringify(planWith({ ra: 30, dec: 10 }, 'my-profile.json')));
});

describe('haloweave sky', () => {
  it('--json prints one object a night with the contract keys; times ISO 8601 UTC or null', async () => {
    const r = await runSky([join(dir, 'ok.plan.json'), '--from', '2026-10-01', '--to', '2026-10-07', '--json']);
    expect(r.code).toBe(0);
    const rows = JSON.parse(r.out);
    expect(rows).toHaveLength(7);
    expect(rows.map((x: { date: string }) => x.date)).toEqual(['2026-10-01', '2026-10-02', '2026-10-03', '2026-10-04', '2026-10-05', '2026-10-06', '2026-10-07']);
    for (const row of rows) {
      for (const k of CONTRACT_KEYS) expect(row).toHaveProperty(k);
      for (const k of ['sunsetUtc', 'astroDuskUtc', 'astroDawnUtc', 'sunriseUtc', 'transitUtc']) {
        expect(row[k] === null || /^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ$/.test(row[k])).toBe(true);
      }
      expect(row.moonIllumination).toBeGreaterThanOrEqual(0);
      expect(row.moonIllumination).toBeLessThanOrEqual(1);
      expect(row.darkHours).toBeGreaterThan(5);
      expect(Date.parse(row.sunsetUtc) < Date.parse(row.astroDuskUtc) && Date.parse(row.astroDuskUtc) < Date.parse(row.astroDawnUtc) && Date.parse(row.astroDawnUtc) < Date.parse(row.sunriseUtc)).toBe(true);
    }
  });

  it('--max-airmass lowers the dark hours', async () => {
    const a = JSON.parse((await runSky([join(dir, 'ok.plan.json'), '--from', '2026-11-01', '--to', '2026-11-01', '--json'])).out)[0];
    const b = JSON.parse((await runSky([join(dir, 'ok.plan.json'), '--from', '2026-11-01', '--to', '2026-11-01', '--json', '--max-airmass', '1.2'])).out)[0];
    expect(b.darkHours).toBeLessThan(a.darkHours);
  });

  it('prints a readable aligned table, one row a night', async () => {
    const r = await runSky([join(dir, 'ok.plan.json'), '--from', '2026-12-30', '--to', '2027-01-02']);
    expect(r.code).toBe(0);
    const lines = r.out.split('\n');
    const head = lines.findIndex((l) => l.startsWith('date'));
    expect(head).toBeGreaterThan(0);
    const body = lines.slice(head + 2, head + 6);
    expect(body.map((l) => l.slice(0, 10))).toEqual(['2026-12-30', '2026-12-31', '2027-01-01', '2027-01-02']);
    for (const l of [lines[head + 1], ...body]) expect(l.length).toBe(lines[head].length);
    expect(lines[head]).toMatch(/sunset .*dusk18 .*dawn18 .*sunrise .*transit/);
    expect(r.out).toMatch(/4 nights, 4 with dark time/);
  });

  it('bad dates give one clear line each and a non-zero exit', async () => {
    const r = await runSky([join(dir, 'ok.plan.json'), '--from', '2026-02-30', '--to', '2026-03-01']);
    expect(r.code).toBe(2);
    expect(r.errLines).toHaveLength(1);
    expect(r.errLines[0]).toMatch(/^haloweave sky: --from: "2026-02-30" has day 30; 2026-02 has 28 days \(write the date as YYYY-MM-DD/);
    const r2 = await runSky([join(dir, 'ok.plan.json'), '--from', 'next week', '--to', '2026-03-01']);
    expect(r2.errLines).toHaveLength(1);
    expect(r2.errLines[0]).toMatch(/--from: "next week" is not a date of the form YYYY-MM-DD/);
    const r3 = await runSky([join(dir, 'ok.plan.json'), '--from', '2026-03-05', '--to', '2026-03-01']);
    expect(r3.errLines[0]).toMatch(/--to: 2026-03-01 is before --from 2026-03-05/);
    const r4 = await runSky([join(dir, 'ok.plan.json'), '--to', '2026-03-01']);
    expect(r4.errLines[0]).toMatch(/--from: missing date/);
  });

  it('other bad input: unknown option, no plan file, a plan that does not exist, a bad airmass', async () => {
    expect((await runSky([join(dir, 'ok.plan.json'), '--from', '2026-03-01', '--to', '2026-03-01', '--colour'])).errLines[0]).toMatch(/--colour: unknown option/);
    expect((await runSky(['--from', '2026-03-01', '--to', '2026-03-01'])).errLines[0]).toMatch(/PLAN: no plan file given/);
    const nf = await runSky([join(dir, 'nope.plan.json'), '--from', '2026-03-01', '--to', '2026-03-01']);
    expect(nf.code).toBe(2);
    expect(nf.errLines[0]).toMatch(/plan file not found/);
    expect((await runSky([join(dir, 'ok.plan.json'), '--from', '2026-03-01', '--to', '2026-03-01', '--max-airmass', '0.5'])).errLines[0]).toMatch(/--max-airmass: "0.5" is not a number from 1 to 10/);
  });

  it('a galaxy that never rises is reported "not observable" with exit 0 (table and JSON)', async () => {
    const t = await runSky([join(dir, 'south.plan.json'), '--from', '2026-10-01', '--to', '2026-10-03']);
    expect(t.code).toBe(0);
    expect(t.out).toMatch(/not observable: the target \(Dec -75.00 deg\) never rises at latitude 28.10 deg/);
    const j = await runSky([join(dir, 'south.plan.json'), '--from', '2026-10-01', '--to', '2026-10-03', '--json']);
    expect(j.code).toBe(0);
    const rows = JSON.parse(j.out);
    expect(rows.every((r: { darkHours: number; minAirmass: null; observable: boolean }) => r.darkHours === 0 && r.minAirmass === null && !r.observable)).toBe(true);
    expect(j.err).toMatch(/not observable/);
  });

  it('finds a profile given as a path relative to the plan file', async () => {
    const r = await runSky([join(dir, 'path.plan.json'), '--from', '2026-10-01', '--to', '2026-10-01', '--json']);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out)).toHaveLength(1);
  });

  it('runs as the package bin (bin/haloweave.js sky ... --json)', () => {
    const text = execFileSync(process.execPath, ['bin/haloweave.js', 'sky', join(dir, 'ok.plan.json'), '--from', '2026-10-01', '--to', '2026-10-02', '--json'], { encoding: 'utf8' });
    const rows = JSON.parse(text);
    expect(rows).toHaveLength(2);
    expect(Object.keys(rows[0])).toEqual(expect.arrayContaining(CONTRACT_KEYS));
  });
});

describe('haloweave sky options', () => {
  it('--curve adds the sampled altitude and airmass (Hardie and sec z) of each night to the JSON', async () => {
    const r = await runSky([join(dir, 'ok.plan.json'), '--from', '2026-10-01', '--to', '2026-10-01', '--json', '--curve', '--step-min', '30']);
    expect(r.code).toBe(0);
    const [row] = JSON.parse(r.out);
    expect(row.curve).toHaveLength(49);
    const up = row.curve.filter((p: { airmass: number | null }) => p.airmass !== null);
    expect(up.length).toBeGreaterThan(5);
    for (const p of up) expect(p.airmassSecZ).toBeGreaterThanOrEqual(p.airmass);
    expect((await runSky([join(dir, 'ok.plan.json'), '--from', '2026-10-01', '--to', '2026-10-01', '--curve'])).errLines[0]).toMatch(/--curve: only goes with --json/);
  });

  it('takes the airmass limit from the plan\'s observing section unless --max-airmass is given', async () => {
    const plan = { ...planWith({ ra: '02:00:00', dec: '+10:00:00' }), observing: { maxAirmass: 1.2 } };
    writeFileSync(join(dir, 'strict.plan.json'), JSON.stringify(plan));
    const a = JSON.parse((await runSky([join(dir, 'strict.plan.json'), '--from', '2026-11-01', '--to', '2026-11-01', '--json'])).out)[0];
    const b = JSON.parse((await runSky([join(dir, 'ok.plan.json'), '--from', '2026-11-01', '--to', '2026-11-01', '--json', '--max-airmass', '1.2'])).out)[0];
    const c = JSON.parse((await runSky([join(dir, 'strict.plan.json'), '--from', '2026-11-01', '--to', '2026-11-01', '--json', '--max-airmass', '2'])).out)[0];
    expect(a.darkHours).toBe(b.darkHours);
    expect(c.darkHours).toBeGreaterThan(a.darkHours);
  });
});
