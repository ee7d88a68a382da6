/**
 * The mixed example (examples/mixed/) through the command line: `plan` writes each mask's own instrument, `check`
 * and the independent Python checker (test/contract/contract_check.py, astropy) accept the folder, `export
 * --per-instrument` writes one slit list per instrument, `sky` shows each site. A plan naming a profile by path is
 * checked too, and a folder whose masks.csv gives a mask the wrong instrument is refused by both checkers.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { cpSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli, ROOT } from '../cli/runCli';
import { mixedExampleScenario, MIXED_EXAMPLE_CATALOG_FILE, MIXED_EXAMPLE_PLAN_FILE } from '../../src/core/scenario/mixedScenario';
import { generatedProfiles, shippedProfile } from './mixedCase';

const EXAMPLE = join(ROOT, 'examples/mixed');
let work: string;
let planRun: ReturnType<typeof cli>;

/** The Python checker; a missing python3/astropy fails with a clear message (nothing skipped). */
function contractCheck(dir: string) {
  const r = spawnSync('/usr/bin/python3', [join(ROOT, 'test/contract/contract_check.py'), dir], { encoding: 'utf8', maxBuffer: 64 << 20 });
  if (r.error || r.status === 3) throw new Error(`python3 with astropy is needed (apt-get install -y python3-astropy): ${r.error?.message ?? r.stderr}`);
  return { code: r.status, out: r.stdout };
}

beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'haloweave-mixed-'));
  planRun = cli(['plan', join(EXAMPLE, MIXED_EXAMPLE_PLAN_FILE), '--out', join(work, 'out'), '--quiet'], work);
}, 180_000);

describe('the mixed example', () => {
  it('is exactly what the generator writes', () => {
    const s = mixedExampleScenario(shippedProfile('ridge10-narrow'), shippedProfile('broad65-wide'));
    expect(readFileSync(join(EXAMPLE, MIXED_EXAMPLE_PLAN_FILE), 'utf8')).toBe(JSON.stringify(s.plan, null, 2) + '\n');
    expect(readFileSync(join(EXAMPLE, MIXED_EXAMPLE_CATALOG_FILE), 'utf8')).toBe(s.catalogCsv);
  });

  it('plans with each mask on its own instrument; check and the Python checker accept the folder', () => {
    expect(planRun.code, planRun.err).toBe(0);
    expect(planRun.out).toMatch(/yield per instrument:\n  ridge10-narrow \(masks m1, m2 at latitude 28.10, longitude -112.70\): \d+ tracer slits[^\n]*\n  broad65-wide \(masks m3, m4 at latitude -27.80/);
    const masks = readFileSync(join(work, 'out/masks.csv'), 'utf8').trim().split('\n').slice(1).map((l) => l.split(','));
    expect(masks.map((m) => m[1]).sort()).toEqual(['broad65-wide', 'broad65-wide', 'ridge10-narrow', 'ridge10-narrow']);
    const solved = JSON.parse(readFileSync(join(work, 'out/solved.plan.json'), 'utf8'));
    expect(solved.instruments).toEqual([{ profile: 'ridge10-narrow', masks: 2 }, { profile: 'broad65-wide', masks: 2 }]);
    expect(solved.observingReport.instruments.map((p: { instrument: string; site: { latDeg: number } }) => `${p.instrument} ${p.site.latDeg}`)).toEqual(['ridge10-narrow 28.1', 'broad65-wide -27.8']);
    const check = cli(['check', join(work, 'out')], work);
    expect(check.code, check.err).toBe(0);
    const py = contractCheck(join(work, 'out'));
    expect(py.code, py.out).toBe(0);
    // The solved plan plans again, each mask keeping its instrument (unlocked masks may move on).
    const again = cli(['plan', join(work, 'out/solved.plan.json'), '--out', join(work, 'again'), '--quiet'], work);
    expect(again.code, again.err).toBe(0);
    const idAndInstrument = (dir: string) => readFileSync(join(work, dir, 'masks.csv'), 'utf8').trim().split('\n').map((l) => l.split(',').slice(0, 2).join(','));
    expect(idAndInstrument('again')).toEqual(idAndInstrument('out'));
  });

  it('a mask given the other instrument in masks.csv is refused by both checkers', () => {
    cpSync(join(work, 'out'), join(work, 'bad'), { recursive: true });
    const text = readFileSync(join(work, 'bad/masks.csv'), 'utf8');
    writeFileSync(join(work, 'bad/masks.csv'), text.replace(/broad65-wide/, 'ridge10-narrow'));
    const check = cli(['check', join(work, 'bad')], work);
    expect(check.code).toBe(1);
    expect(check.err).toMatch(/\[instruments\] 3 masks use "ridge10-narrow", the plan's instruments give it 2/);
    expect(check.err).toMatch(/\[footprint\]|\[alignment box\]|\[minimal length\]/);
    const py = contractCheck(join(work, 'bad'));
    expect(py.code).toBe(1);
    expect(py.out).toMatch(/\[instruments\] 3 masks use 'ridge10-narrow'/);
  });

  it('export --per-instrument writes one slit list per instrument with the instrument on every row', () => {
    const r = cli(['export', join(work, 'out'), '--format', 'csv', '--out', join(work, 'slits.csv'), '--per-instrument'], work);
    expect(r.code, r.err).toBe(0);
    const all = readFileSync(join(work, 'out/slits.csv'), 'utf8').trim().split('\n').length - 1;
    let rows = 0;
    for (const id of ['ridge10-narrow', 'broad65-wide']) {
      const lines = readFileSync(join(work, `slits-${id}.csv`), 'utf8').trim().split('\n');
      const col = lines[0].split(',').indexOf('instrument');
      expect(col).toBeGreaterThan(0);
      for (const l of lines.slice(1)) expect(l.split(',')[col]).toBe(id);
      rows += lines.length - 1;
    }
    expect(rows).toBe(all);
  });

  it('sky shows each site: the transit altitude is 90 - |latitude - dec| at both (common practice, geometric)', () => {
    const r = cli(['sky', join(EXAMPLE, MIXED_EXAMPLE_PLAN_FILE), '--from', '2027-03-10', '--to', '2027-03-11', '--json'], work);
    expect(r.code, r.err).toBe(0);
    const rows = JSON.parse(r.out) as { instrument: string; site: { latDeg: number }; transitAltitudeDeg: number; date: string }[];
    expect(rows.map((x) => `${x.instrument} ${x.date}`)).toEqual(['ridge10-narrow 2027-03-10', 'ridge10-narrow 2027-03-11', 'broad65-wide 2027-03-10', 'broad65-wide 2027-03-11']);
    // The galaxy's J2000 Dec is -21.405 deg; transit altitude (no refraction) = 90 - |lat - dec|. Tolerance 0.2 deg:
    // the rows use the place of date, and precession moves Dec by at most about 20 arcsec a year (0.15 deg by 2027).
    for (const x of rows) expect(Math.abs(x.transitAltitudeDeg - (90 - Math.abs(x.site.latDeg - -21.405)))).toBeLessThan(0.2);
  });

  it('a plan naming one profile by a file path: solved.plan.json names it relative to the folder; both checkers accept it', () => {
    const dir = join(work, 'bypath');
    cpSync(EXAMPLE, dir, { recursive: true });
    const strip = generatedProfiles()[1];
    writeFileSync(join(dir, 'strip.json'), JSON.stringify(strip, null, 2));
    const plan = JSON.parse(readFileSync(join(dir, MIXED_EXAMPLE_PLAN_FILE), 'utf8'));
    plan.instruments = [{ profile: './strip.json', masks: 2 }, { profile: 'broad65-wide', masks: 2 }];
    plan.search = { ...plan.search, levels: 1, passes: 1 };
    writeFileSync(join(dir, 'bypath.plan.json'), JSON.stringify(plan, null, 2));
    const r = cli(['plan', join(dir, 'bypath.plan.json'), '--out', join(work, 'bypath-out'), '--quiet'], work);
    expect(r.code, r.err).toBe(0);
    const solved = JSON.parse(readFileSync(join(work, 'bypath-out/solved.plan.json'), 'utf8'));
    expect(solved.instruments[0].profile).toBe('../bypath/strip.json');
    expect(readFileSync(join(work, 'bypath-out/masks.csv'), 'utf8')).toMatch(/,gen-strip8,/);
    const check = cli(['check', join(work, 'bypath-out')], work);
    expect(check.code, check.err).toBe(0);
    const py = contractCheck(join(work, 'bypath-out'));
    expect(py.code, py.out).toBe(0);
  });
});

