/**
 * Outside cross-check of `haloweave plan` outputs against the contract (../shared/spec/interfaces.md, "Output of
 * `haloweave plan PLAN --out DIR`"), by test/contract/contract_check.py: an independent Python implementation on
 * astropy (astropy.wcs RA---TAN/DEC--TAN projection, astropy 5.2.1 from Debian's python3-astropy) that shares no code
 * with the TypeScript checker. Missing python3 or astropy fails these tests with a clear message; nothing is skipped.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import { maskToSkyArcsec } from '../../src/core/sky/frames';
import { makeRng } from '../../src/core/numeric/random';

/** Seeded uniform numbers in [0, 1), the same on every run (the project's mulberry32 stream). */
const seededUniform = (seed: number): (() => number) => makeRng(seed).next;

const ROOT = resolve(__dirname, '../..');
const BIN = join(ROOT, 'bin/haloweave.js');
const CHECKER = join(ROOT, 'test/contract/contract_check.py');
const PYTHON = '/usr/bin/python3';
const PROFILE_DIR = join(ROOT, 'instrument-profiles');
const C_KMS = 299792.458; // SI definition

interface Profile {
  id: string;
  footprint: [number, number][];
  slits: { minLengthArcsec: number; gapArcsec: number; maxTiltDeg: number };
  alignment: { boxSizeArcsec: number; minCount: number; magRange: [number, number] };
  detector: { pixels: number; dispersionAPerPixel: number; centralWavelengthA: number; xArcsecPerPixel: number; gapsPixels: [number, number][] };
}
const profile = (id: string): Profile => JSON.parse(readFileSync(join(PROFILE_DIR, `${id}.json`), 'utf8'));

/** Run the checker on folders; throws a clear error when python3 or astropy is missing (exit 3). */
function check(...dirs: string[]): { code: number | null; out: string; err: string } {
  const r = spawnSync(PYTHON, [CHECKER, ...dirs], { encoding: 'utf8', maxBuffer: 64 << 20 });
  if (r.error) throw new Error(`cannot run ${PYTHON} (${r.error.message}): install python3 and python3-astropy (apt-get install -y python3-astropy), as .ci/run does`);
  if (r.status === 3) throw new Error(`astropy missing for ${PYTHON}: ${r.stderr.trim()}; install python3-astropy (as .ci/run does)`);
  return { code: r.status, out: r.stdout, err: r.stderr };
}

/** `haloweave plan PLAN --out DIR`; throws with stderr when it fails. */
function plan(planPath: string, outDir: string): void {
  const r = spawnSync(process.execPath, [BIN, 'plan', planPath, '--out', outDir], { cwd: ROOT, encoding: 'utf8', maxBuffer: 64 << 20 });
  if (r.status !== 0) throw new Error(`haloweave plan ${planPath} failed (exit ${r.status}):\n${r.stderr.split('\n').slice(-8).join('\n')}`);
}


/** `customProfile`: write a modified copy of the profile with a new id beside the plan and name it by path. */
/** `extra`: plan sections added (observing, photometry...), e.g. a Moon that brightens the sky of the starlight bins. */
interface Scenario { name: string; profileId: string; customProfile?: { id: string; gapArcsec: number; minLengthArcsec: number }; raDeg: number; decDeg: number; reArcsec: number; galaxyPaDeg: number; maskPaDeg: number; seed: number; extra?: Record<string, unknown> }

/** An invented scenario: plan JSON + CSV catalog (tracers around the galaxy, alignment stars in the profile's magRange). */
function writeScenario(dir: string, s: Scenario): string {
  const prof = profile(s.profileId);
  const rnd = seededUniform(s.seed);
  const q = 0.75, th = (s.galaxyPaDeg * Math.PI) / 180;
  const centre = tangentCentre(s.raDeg, s.decDeg);
  const fp = Math.max(...prof.footprint.map(([x, y]) => Math.hypot(x, y)));
  const rows = ['id,ra,dec,mag,color,priority,role'];
  const sky = (xi: number, eta: number) => tangentToSkyDeg(centre, xi, eta); // only to place invented objects
  for (let i = 0; i < 500; i++) {
    // circularised radius out to 12 Re, concentrated inwards; (u, v) on the ellipse, rotated to (xi, eta)
    const rArcsec = 12 * s.reArcsec * Math.pow(rnd(), 0.8), ph = 2 * Math.PI * rnd();
    const uA = (rArcsec / Math.sqrt(q)) * Math.cos(ph), vA = rArcsec * Math.sqrt(q) * Math.sin(ph);
    const p = sky(uA * Math.sin(th) + vA * Math.cos(th), uA * Math.cos(th) - vA * Math.sin(th));
    rows.push(`t${i},${p.raDeg.toFixed(8)},${p.decDeg.toFixed(8)},${(20 + 2.5 * rnd()).toFixed(3)},${(0.8 + 0.5 * rnd()).toFixed(3)},${1 + Math.floor(5 * rnd())},tracer`);
  }
  const [bright, faint] = prof.alignment.magRange;
  for (let i = 0; i < 160; i++) {
    const r = 1.6 * fp * Math.sqrt(rnd()), ph = 2 * Math.PI * rnd();
    const p = sky(r * Math.sin(ph), r * Math.cos(ph));
    rows.push(`a${i},${p.raDeg.toFixed(8)},${p.decDeg.toFixed(8)},${(bright + 0.1 + (faint - bright - 0.2) * rnd()).toFixed(3)},,,alignment`);
  }
  writeFileSync(join(dir, `${s.name}.catalog.csv`), rows.join('\n') + '\n');
  let instrument = s.profileId;
  if (s.customProfile) {
    const custom = { ...prof, id: s.customProfile.id, slits: { ...prof.slits, gapArcsec: s.customProfile.gapArcsec, minLengthArcsec: s.customProfile.minLengthArcsec } };
    writeFileSync(join(dir, `${s.customProfile.id}.json`), JSON.stringify(custom, null, 2));
    instrument = `./${s.customProfile.id}.json`;
  }
  const planJson = {
    format: 'haloweave.plan/1',
    galaxy: { id: `Invented ${s.name}`, ra: s.raDeg, dec: s.decDeg, reArcsec: s.reArcsec, axisRatio: q, paDeg: s.galaxyPaDeg,
              distanceMpc: 15, vsysKms: 1300, sersicN: 4, muE: 21.3 },
    instrument,
    catalog: `${s.name}.catalog.csv`,
    goals: { masks: 2, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498.0, 8542.1, 8662.1] },
    // one mask locked on the galaxy centre, one left to the solver
    masks: [{ id: 'c', raDeg: s.raDeg, decDeg: s.decDeg, paDeg: s.maskPaDeg, locked: true }, { id: 'free' }],
    ...s.extra,
  };
  const path = join(dir, `${s.name}.plan.json`);
  writeFileSync(path, JSON.stringify(planJson, null, 2));
  return path;
}

// RA across 0/360 and Dec from -80 to +80, each of the three profiles.
const SCENARIOS: Scenario[] = [
  { name: 'south80-quad', profileId: 'quad8-square', raDeg: 359.995, decDeg: -80, reArcsec: 18, galaxyPaDeg: 20, maskPaDeg: 20, seed: 11 },
  { name: 'north80-ridge', profileId: 'ridge10-narrow', raDeg: 0.004, decDeg: 80, reArcsec: 40, galaxyPaDeg: 140, maskPaDeg: 300, seed: 22 },
  { name: 'equator-broad', profileId: 'broad65-wide', raDeg: 0.0, decDeg: -1.5, reArcsec: 45, galaxyPaDeg: 75, maskPaDeg: 75, seed: 33 },
  { name: 'mid-ridge', profileId: 'ridge10-narrow', raDeg: 359.9, decDeg: -45, reArcsec: 35, galaxyPaDeg: 95, maskPaDeg: 5, seed: 44 },
  { name: 'north40-quad', profileId: 'quad8-square', raDeg: 180.2, decDeg: 41, reArcsec: 16, galaxyPaDeg: 0, maskPaDeg: 200, seed: 55 },
  // a profile named by path (not in instrument-profiles/): the checker must follow solved.plan.json's instrument path
  { name: 'path-profile', profileId: 'ridge10-narrow', customProfile: { id: 'test-ridge-wide-gap', gapArcsec: 2.0, minLengthArcsec: 6.0 },
    raDeg: 0.02, decDeg: 12, reArcsec: 30, galaxyPaDeg: 60, maskPaDeg: 150, seed: 66 },
  // Starlight bins under a given Moon (Krisciunas & Schaefer sky), Vega I magnitudes and a sky floor of 2 % that caps
  // the outer bins below the target: the checker re-derives the moonlit S/N and names the floor as the cause.
  { name: 'moonlit-ridge', profileId: 'ridge10-narrow', raDeg: 150.3, decDeg: -20, reArcsec: 38, galaxyPaDeg: 35, maskPaDeg: 35, seed: 77,
    extra: { observing: { moon: { phaseAngleDeg: 70, separationDeg: 50, altitudeDeg: 35 }, skySystematicFraction: 0.02 }, photometry: { band: 'I', system: 'Vega' } } },
  // A Moon computed for the middle night of a range (near full, about 25 deg from the galaxy): the checker computes it
  // with astropy's own ephemeris.
  { name: 'dated-quad', profileId: 'quad8-square', raDeg: 161.8, decDeg: -21.4, reArcsec: 22, galaxyPaDeg: 120, maskPaDeg: 120, seed: 88,
    extra: { observing: { dateRange: ['2027-03-18', '2027-03-23'], designHourAngleH: 0.5 } } },
];

let work: string;
let demoDir: string;
let demoCommandDir: string;
let smallDir: string;
const scenarioDirs = new Map<string, string>();

beforeAll(() => {
  // Fail first, and clearly, without python3 + astropy.
  const r = spawnSync(PYTHON, [CHECKER, '--self-test'], { encoding: 'utf8' });
  if (r.error || r.status === 3) throw new Error(`the contract checker needs ${PYTHON} with astropy (apt-get install -y python3-astropy, as .ci/run does): ${r.error?.message ?? r.stderr}`);
  work = mkdtempSync(join(tmpdir(), 'haloweave-contract-'));
  demoDir = join(work, 'demo');
  plan(join(ROOT, 'examples/demo/halo-demo.plan.json'), demoDir);
  smallDir = join(work, 'small');
  plan(join(ROOT, 'test/cli/fixtures/small.plan.json'), smallDir); // RA across 0/360, two rejected catalog rows
  demoCommandDir = join(work, 'demo-command');
  const d = spawnSync(process.execPath, [BIN, 'demo', '--out', demoCommandDir], { cwd: ROOT, encoding: 'utf8', maxBuffer: 64 << 20 });
  if (d.status !== 0) throw new Error(`haloweave demo failed (exit ${d.status}):\n${d.stderr.split('\n').slice(-8).join('\n')}`);
  mkdirSync(join(work, 'plans'));
  for (const s of SCENARIOS) {
    const out = join(work, 'out', s.name);
    plan(writeScenario(join(work, 'plans'), s), out);
    scenarioDirs.set(s.name, out);
  }
}, 600_000);

// The work folder is removed afterwards; set HALOWEAVE_KEEP_TMP=1 to keep it for a look.
afterAll(() => {
  if (work && !process.env.HALOWEAVE_KEEP_TMP) rmSync(work, { recursive: true, force: true });
});

describe('contract_check.py itself', () => {
  it('passes its own geometry, tilt, wavelength and projection self-test (astropy 5.x)', () => {
    const r = spawnSync(PYTHON, [CHECKER, '--self-test'], { encoding: 'utf8' });
    expect(r.stdout).toMatch(/self-test: ok \(astropy 5\./);
    expect(r.status).toBe(0);
  });
});

/** Check several folders in one python start; the output lines of each folder (prefix removed) and the exit status. */
function checkMany(dirs: string[]): { code: number | null; linesOf(dir: string): string[] } {
  const r = check(...dirs);
  const linesOf = (dir: string) => (dirs.length === 1 ? r.out.split('\n') : r.out.split('\n').filter((l) => l.startsWith(`${dir}: `)).map((l) => l.slice(dir.length + 2))).filter((l) => l !== '');
  return { code: r.code, linesOf };
}

describe('haloweave plan outputs obey the contract (checked with astropy)', () => {
  let good: ReturnType<typeof checkMany>;
  let goodDirs: string[];
  beforeAll(() => {
    goodDirs = [smallDir, demoDir, demoCommandDir, ...SCENARIOS.map((s) => scenarioDirs.get(s.name)!)];
    good = checkMany(goodDirs);
  }, 120_000);
  /** The folder's only output line is the ok summary (no violation line). */
  const expectOk = (dir: string, masks: number) => {
    const lines = good.linesOf(dir);
    expect(lines.filter((l) => !l.startsWith('contract_check: ok:')), `violations in ${dir}`).toEqual([]);
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(new RegExp(`^contract_check: ok: ${masks} masks, \\d+ rows checked, worst position residual`));
    // coverage.json's starlight bins were re-derived, S/N included
    expect(lines[0]).toMatch(/; [1-9]\d* starlight bins re-derived; astropy/);
  };

  it('the hand-written plan test/cli/fixtures/small.plan.json (with catalog-report.csv rows)', () => {
    expectOk(smallDir, 2);
    expect(readFileSync(join(smallDir, 'catalog-report.csv'), 'utf8').trim().split('\n').length).toBeGreaterThan(1);
  });

  it('the demo scenario (examples/demo) through `haloweave plan`', () => expectOk(demoDir, 4));

  it('`haloweave demo --out DIR` (DIR itself is the output folder)', () => expectOk(demoCommandDir, 4));

  it.each(SCENARIOS.map((s) => [s.name, s] as const))('generated plan %s (RA across 0/360, |Dec| up to 80, every profile)', (name, s) => {
    expectOk(scenarioDirs.get(name)!, 2);
    const masks = readFileSync(join(scenarioDirs.get(name)!, 'masks.csv'), 'utf8');
    expect(masks).toContain(`,${s.customProfile?.id ?? s.profileId},`);
  });

  it('the moonlit scenario has bins capped by the sky floor, named with that cause (so the cause rule was exercised)', () => {
    const cov = JSON.parse(readFileSync(join(scenarioDirs.get('moonlit-ridge')!, 'coverage.json'), 'utf8'));
    const capped = cov.starlightBins.bins.filter((b: { floorCapSnPerA: number | null; targetSnPerA: number; met: boolean }) => b.floorCapSnPerA !== null && b.floorCapSnPerA < b.targetSnPerA && !b.met);
    expect(capped.length).toBeGreaterThan(0);
    expect(cov.goals.find((g: { name: string }) => g.name === 'starlightBins').reason).toMatch(/floor/);
  });

  it('exit status 0 when every folder passes', () => expect(good.code).toBe(0));

  it('solved.plan.json is loadable again by `haloweave plan`, and that output obeys the contract too', () => {
    const again = join(work, 'out', 'again-south80-quad');
    plan(join(scenarioDirs.get('south80-quad')!, 'solved.plan.json'), again);
    const r = check(again);
    expect(r.out).toMatch(/contract_check: ok: 2 masks/);
    expect(r.code).toBe(0);
  }, 120_000);
});

// ---- negative tests: corrupt a good folder in one specific way each and expect that rule, naming the row --------

type Row = Record<string, string>;
interface Table { header: string[]; rows: Row[] }
function readTable(path: string): Table {
  const text = readFileSync(path, 'utf8');
  if (text.includes('"')) throw new Error(`${path}: quoted cells; this simple corruption helper does not handle them`);
  const [head, ...lines] = text.trim().split('\n');
  const header = head.split(',');
  return { header, rows: lines.map((l) => Object.fromEntries(l.split(',').map((c, i) => [header[i], c]))) };
}
function writeTable(path: string, t: Table): void {
  writeFileSync(path, [t.header.join(','), ...t.rows.map((r) => t.header.map((h) => r[h]).join(','))].join('\n') + '\n');
}
/** 1-based file line of a data row (the header is line 1). */
const lineOf = (t: Table, r: Row) => t.rows.indexOf(r) + 2;

/** Move a row to mask (x, y), with ra/dec recomputed consistently (Haloweave's own projection, only to build the case). */
function moveRow(masks: Table, r: Row, xArcsec: number, yArcsec: number): void {
  const m = masks.rows.find((mr) => mr.mask_id === r.mask_id)!;
  const t = maskToSkyArcsec(xArcsec, yArcsec, Number(m.pa_deg));
  const p = tangentToSkyDeg(tangentCentre(Number(m.ra_deg), Number(m.dec_deg)), t.xiArcsec, t.etaArcsec);
  Object.assign(r, { x_arcsec: String(xArcsec), y_arcsec: String(yArcsec), ra_deg: String(p.raDeg), dec_deg: String(p.decDeg) });
}

/** `only`: no line of another rule, except `alsoAllowed` (a moved row also moves the coverage figures a little and
 * leaves its catalog position). */
/** Move one tracer to (x, y0) on the first mask (of `maskIds`) and candidate y0 whose y window holds no alignment
 * box; other rows in the window are removed, so the gap rule cannot fire. Returns the row. */
function placeAlone(t: Table, masks: Table, maskIds: string[], x: number, below: number, above: number, tiltDeg: number, candidatesY: number[]): Row {
  const reach = Math.max(below, above) + 3;
  const hits = (o: Row, y0: number) => !(Number(o.y_arcsec) + Number(o.len_above_arcsec) < y0 - reach || Number(o.y_arcsec) - Number(o.len_below_arcsec) > y0 + reach);
  for (const maskId of maskIds) {
    const m = t.rows.filter((r) => r.mask_id === maskId);
    const r = m.find((row) => row.role === 'tracer')!;
    const y0 = candidatesY.find((y) => m.every((o) => o.role !== 'alignment' || !hits(o, y)));
    if (y0 === undefined) continue;
    t.rows = t.rows.filter((o) => o === r || o.mask_id !== maskId || !hits(o, y0));
    moveRow(masks, r, x, y0);
    Object.assign(r, { len_below_arcsec: String(below), len_above_arcsec: String(above), tilt_deg: String(tiltDeg) });
    return r;
  }
  throw new Error(`no y window on masks ${maskIds.join(', ')} free of alignment boxes to build this case`);
}

interface Corruption {
  name: string;
  /** false for rules outside `haloweave check`'s contract ("against its instrument profile"): coverage, catalog, plan. */
  profileRule?: boolean;
  apply(dir: string): { rule: string; mustName: string[]; only?: boolean; alsoAllowed?: string[] };
}
// A moved target also leaves its catalog position, and moves the galaxy light its slit's sky parts co-add.
const MOVED = ['[coverage]', '[catalog]', '[starlight-bins]'];

const ridge = profile('ridge10-narrow'); // the demo's profile

/** The demo's coverage.json with one starlight bin changed by `edit`: the bin met with the most S/N to spare. */
function tamperStarlightBin(dir: string, edit: (bin: Record<string, unknown>) => string): { rule: string; mustName: string[]; only: boolean } {
  const cov = JSON.parse(readFileSync(join(dir, 'coverage.json'), 'utf8'));
  const bins = cov.starlightBins.bins as { fromRe: number; sectorDeg: number; snPerA: number; met: boolean }[];
  const i = bins.reduce((best, b, k) => (b.met && b.snPerA > bins[best].snPerA ? k : best), 0);
  const b = bins[i];
  const field = edit(b as unknown as Record<string, unknown>);
  writeFileSync(join(dir, 'coverage.json'), JSON.stringify(cov));
  return { rule: '[starlight-bins]', mustName: [`starlightBins.bins[${i}] (${b.fromRe}-${b.fromRe + 1} Re, ${b.sectorDeg}-${b.sectorDeg + 45} deg)`, field], only: true };
}
const STARLIGHT_TAMPERING: Corruption[] = [
  { name: 'a starlight bin\'s co-added S/N raised', apply: (dir) => tamperStarlightBin(dir, (b) => { b.snPerA = Math.round((b.snPerA as number) * 115) / 100; return 'snPerA'; }) },
  { name: 'a starlight bin counting one tracer sky part more', apply: (dir) => tamperStarlightBin(dir, (b) => { b.tracerSkyParts = (b.tracerSkyParts as number) + 1; return 'tracerSkyParts'; }) },
  { name: 'a starlight bin well above its target marked not met', apply: (dir) => tamperStarlightBin(dir, (b) => { b.met = false; return 'met false'; }) },
];
const CORRUPTIONS: Corruption[] = [
  { name: 'a slit moved into its neighbour', apply(dir) {
    const masks = readTable(join(dir, 'masks.csv')), t = readTable(join(dir, 'slits.csv'));
    const m1 = t.rows.filter((r) => r.mask_id === 'm1' && r.role === 'tracer').sort((a, b) => Number(a.y_arcsec) - Number(b.y_arcsec));
    const [a, b] = [m1[10], m1[11]];
    moveRow(masks, b, Number(b.x_arcsec), Number(a.y_arcsec) + 1.0); // centre 1 arcsec above its neighbour's: spans overlap
    writeTable(join(dir, 'slits.csv'), t);
    return { rule: '[gap]', mustName: [`slit ${b.slit_id}`, `slit ${a.slit_id}`], only: true, alsoAllowed: MOVED };
  } },
  { name: 'an object on two masks', apply(dir) {
    const t = readTable(join(dir, 'slits.csv'));
    const a = t.rows.find((r) => r.mask_id === 'm1' && r.role === 'tracer')!;
    const b = t.rows.find((r) => r.mask_id === 'm2' && r.role === 'tracer')!;
    b.object_id = a.object_id;
    writeTable(join(dir, 'slits.csv'), t);
    return { rule: '[duplicate-object]', mustName: [`line ${lineOf(t, b)} `, `slit ${b.slit_id}`, `object ${a.object_id}`], only: true, alsoAllowed: ['[catalog]'] };
  } },
  { name: 'a slit pushed outside the footprint', apply(dir) {
    const masks = readTable(join(dir, 'masks.csv')), t = readTable(join(dir, 'slits.csv'));
    const top = t.rows.filter((r) => r.mask_id === 'm2').sort((a, b) => Number(b.y_arcsec) - Number(a.y_arcsec))[0];
    const yMax = Math.max(...ridge.footprint.map(([, y]) => y));
    moveRow(masks, top, Number(top.x_arcsec), yMax + 3); // beyond the top edge, still clear of every other row
    writeTable(join(dir, 'slits.csv'), t);
    return { rule: '[footprint]', mustName: [`line ${lineOf(t, top)} `, `slit ${top.slit_id}`], only: true, alsoAllowed: MOVED };
  } },
  { name: 'a slit lengthened into the footprint notch (non-convex corner)', apply(dir) {
    // ridge10-narrow has a notch x 95..150, y 420..500; a slit at x = 120 below it, lengthened upwards into it
    const masks = readTable(join(dir, 'masks.csv')), t = readTable(join(dir, 'slits.csv'));
    // 2 arcsec below and 40 above a target at y0 in [385, 418]: the top end (y0 + 40 > 420) is inside the notch
    const r = placeAlone(t, masks, ['m1', 'm2', 'm3', 'm4'], 120, 2, 40, 0, Array.from({ length: 34 }, (_, k) => 418 - k));
    writeTable(join(dir, 'slits.csv'), t);
    return { rule: '[footprint]', mustName: [`line ${lineOf(t, r)} `, `slit ${r.slit_id}`], only: true, alsoAllowed: MOVED };
  } },
  { name: 'a slit tilted by +30 deg near the +x edge (tilt turns +y towards +x, so its top leaves the footprint)', apply(dir) {
    // ridge10-narrow's edge x = 150 (y < 420); a slit at x = 147 with 8 arcsec above its target: at tilt +30 its upper
    // corners reach x = 147 + 8 sin 30 + 0.5 cos 30 = 151.4 (outside); at -30 they stay at 143.4 (see the next case)
    const masks = readTable(join(dir, 'masks.csv')), t = readTable(join(dir, 'slits.csv'));
    const r = placeAlone(t, masks, ['m3', 'm1', 'm2', 'm4'], 147, 2, 8, 30, Array.from({ length: 60 }, (_, k) => 300 - 10 * k));
    writeTable(join(dir, 'slits.csv'), t);
    return { rule: '[footprint]', mustName: [`line ${lineOf(t, r)} `, `slit ${r.slit_id}`], only: true, alsoAllowed: MOVED };
  } },
  { name: 'the same slit tilted by -30 deg stays inside (control of the tilt sign)', apply(dir) {
    const masks = readTable(join(dir, 'masks.csv')), t = readTable(join(dir, 'slits.csv'));
    const r = placeAlone(t, masks, ['m3', 'm1', 'm2', 'm4'], 147, 2, 8, -30, Array.from({ length: 60 }, (_, k) => 300 - 10 * k));
    r.tilt_deg = String(-ridge.slits.maxTiltDeg - 1); // and one degree beyond maxTiltDeg, the only violation left
    writeTable(join(dir, 'slits.csv'), t);
    return { rule: '[tilt]', mustName: [`line ${lineOf(t, r)} `, `slit ${r.slit_id}`], only: true, alsoAllowed: MOVED };
  } },
  { name: 'a changed ra_deg', apply(dir) {
    const t = readTable(join(dir, 'slits.csv'));
    // The m4 tracer nearest its mask centre: never the one that sets the reach, so coverage.json stays right.
    const d2 = (row: Record<string, string>) => Number(row.x_arcsec) ** 2 + Number(row.y_arcsec) ** 2;
    const r = t.rows.filter((row) => row.mask_id === 'm4' && row.role === 'tracer').reduce((a, b) => (d2(b) < d2(a) ? b : a));
    r.ra_deg = String(Number(r.ra_deg) + 2e-4); // about 0.67 arcsec at Dec -21
    writeTable(join(dir, 'slits.csv'), t);
    return { rule: '[position]', mustName: [`line ${lineOf(t, r)} `, `slit ${r.slit_id}`], only: true, alsoAllowed: ['[catalog]'] };
  } },
  { name: 'a tracer moved so a calcium line falls in the detector gap', apply(dir) {
    const masks = readTable(join(dir, 'masks.csv')), t = readTable(join(dir, 'slits.csv'));
    const plan = JSON.parse(readFileSync(join(dir, 'solved.plan.json'), 'utf8'));
    const d = ridge.detector, g = d.gapsPixels[0];
    const lObs = plan.goals.linesA[1] * (1 + plan.galaxy.vsysKms / C_KMS);
    const x = ((g[0] + g[1]) / 2 - d.pixels / 2 - (lObs - d.centralWavelengthA) / d.dispersionAPerPixel) * d.xArcsecPerPixel;
    const r = t.rows.find((row) => row.mask_id === 'm1' && row.role === 'tracer' && Math.abs(Number(row.x_arcsec) - x) > 20)!;
    moveRow(masks, r, x, Number(r.y_arcsec));
    writeTable(join(dir, 'slits.csv'), t);
    return { rule: '[wavelength]', mustName: [`line ${lineOf(t, r)} `, `slit ${r.slit_id}`], only: true, alsoAllowed: MOVED };
  } },
  { name: 'an alignment box of the wrong size', apply(dir) {
    const t = readTable(join(dir, 'slits.csv'));
    const r = t.rows.find((row) => row.role === 'alignment')!;
    r.width_arcsec = String(ridge.alignment.boxSizeArcsec - 1);
    writeTable(join(dir, 'slits.csv'), t);
    return { rule: '[box-size]', mustName: [`slit ${r.slit_id}`], only: true };
  } },
  { name: 'a slit shorter than minLengthArcsec/2 below its target', apply(dir) {
    const t = readTable(join(dir, 'slits.csv'));
    const r = t.rows.find((row) => row.role === 'tracer')!;
    r.len_below_arcsec = String(ridge.slits.minLengthArcsec / 2 - 0.1);
    writeTable(join(dir, 'slits.csv'), t);
    // a shorter slit also has less sky beside its tracer, co-added into a starlight bin
    return { rule: '[min-length]', mustName: [`slit ${r.slit_id}`], only: true, alsoAllowed: ['[starlight-bins]'] };
  } },
  { name: 'too few alignment boxes', apply(dir) {
    const t = readTable(join(dir, 'slits.csv'));
    const boxes = t.rows.filter((r) => r.mask_id === 'm2' && r.role === 'alignment');
    t.rows = t.rows.filter((r) => !boxes.slice(0, boxes.length - ridge.alignment.minCount + 1).includes(r));
    writeTable(join(dir, 'slits.csv'), t);
    return { rule: '[alignment-count]', mustName: ['mask m2'] };
  } },
  { name: 'an unknown role', apply(dir) {
    const t = readTable(join(dir, 'slits.csv'));
    const r = t.rows.find((row) => row.role === 'sky')!;
    r.role = 'background';
    writeTable(join(dir, 'slits.csv'), t);
    return { rule: '[role]', mustName: [`slit ${r.slit_id}`] };
  } },
  { name: 'a renamed column', apply(dir) {
    const t = readTable(join(dir, 'masks.csv'));
    t.header[4] = 'pa'; for (const r of t.rows) r.pa = r.pa_deg;
    writeTable(join(dir, 'masks.csv'), t);
    return { rule: '[columns]', mustName: ['masks.csv line 1'] };
  } },
  { name: 'a coverage count that slits.csv does not give', profileRule: false, apply(dir) {
    const cov = JSON.parse(readFileSync(join(dir, 'coverage.json'), 'utf8'));
    cov.roles.tracer.radialBins[2].count += 1;
    writeFileSync(join(dir, 'coverage.json'), JSON.stringify(cov));
    return { rule: '[coverage]', mustName: ['roles.tracer', 'bin [2, 3)'], only: true };
  } },
  ...STARLIGHT_TAMPERING,
  { name: 'a used object on a catalog line that catalog-report.csv lists as not used', profileRule: false, apply(dir) {
    const t = readTable(join(dir, 'slits.csv'));
    const r = t.rows.find((row) => row.mask_id === 'm2' && row.role === 'tracer')!;
    const catalogLines = readFileSync(join(ROOT, 'examples/demo/halo-demo.catalog.csv'), 'utf8').split('\n');
    const line = catalogLines.findIndex((l) => l.startsWith(`${r.object_id},`)) + 1; // 1-based, header is line 1
    writeFileSync(join(dir, 'catalog-report.csv'), readFileSync(join(dir, 'catalog-report.csv'), 'utf8') + `${line},dec,invented reason for this test\n`);
    return { rule: '[catalog]', mustName: [`line ${lineOf(t, r)} `, `slit ${r.slit_id}`, `catalog line(s) ${line}`], only: true };
  } },
  { name: 'solved.plan.json disagreeing with masks.csv', profileRule: false, apply(dir) {
    const p = JSON.parse(readFileSync(join(dir, 'solved.plan.json'), 'utf8'));
    p.masks[2].paDeg += 0.5;
    writeFileSync(join(dir, 'solved.plan.json'), JSON.stringify(p));
    return { rule: '[plan]', mustName: [`mask ${p.masks[2].id}`], only: true };
  } },
];

describe('contract_check.py reports each corruption of a good folder, naming the row', () => {
  let results: Map<string, { dir: string; lines: string[]; expected: ReturnType<Corruption['apply']> }>;
  beforeAll(() => {
    results = new Map();
    const demoMasks = readFileSync(join(demoDir, 'masks.csv'), 'utf8');
    if (!/^m1,ridge10-narrow,/m.test(demoMasks) || !/^m4,/m.test(demoMasks)) {
      throw new Error(`these cases are built for the demo's masks m1..m4 on ridge10-narrow; masks.csv now reads:\n${demoMasks}`);
    }
    const dirs: string[] = [];
    const expected: ReturnType<Corruption['apply']>[] = [];
    CORRUPTIONS.forEach((c, i) => {
      const dir = join(work, `bad-${i}`); // beside demo/, so solved.plan.json's relative catalog path still resolves
      cpSync(demoDir, dir, { recursive: true });
      expected.push(c.apply(dir));
      dirs.push(dir);
    });
    const r = check(...dirs); // one python start for every case
    expect(r.code).toBe(1);
    CORRUPTIONS.forEach((c, i) => {
      const prefix = `${dirs[i]}: `;
      const lines = r.out.split('\n').filter((l) => l.startsWith(prefix)).map((l) => l.slice(prefix.length));
      results.set(c.name, { dir: dirs[i], lines, expected: expected[i] });
    });
  }, 120_000);

  it.each(CORRUPTIONS.map((c) => [c.name]))('%s', (name) => {
    const { lines, expected } = results.get(name)!;
    const hits = lines.filter((l) => l.includes(expected.rule) && expected.mustName.every((n) => l.includes(n)));
    expect(hits, `expected a ${expected.rule} line naming ${expected.mustName.join(' / ')}; got:\n${lines.join('\n')}`).not.toHaveLength(0);
    // Corruptions built consistently (ra/dec moved with x/y) break only the rule they target.
    const allowed = [expected.rule, ...(expected.alsoAllowed ?? [])];
    if (expected.only) expect(lines.filter((l) => !allowed.some((a) => l.includes(a))), lines.join('\n')).toEqual([]);
  });

  // Agreement with the TypeScript checker on the rules it owns: it must reject each of these folders too.
  it.each(CORRUPTIONS.filter((c) => c.profileRule !== false).map((c) => [c.name]))('`haloweave check` rejects it too: %s', (name) => {
    const { dir, expected } = results.get(name)!;
    const r = spawnSync(process.execPath, [BIN, 'check', dir], { cwd: ROOT, encoding: 'utf8' });
    expect(r.status, r.stdout + r.stderr).not.toBe(0);
    // A changed coverage.json also fails the folder's manifest: the starlight bin itself must be named.
    if (expected.rule === '[starlight-bins]') {
      const named = r.stderr.split('\n').filter((l) => l.includes('[starlight bins]') && l.includes(expected.mustName[0]));
      expect(named, r.stderr).not.toHaveLength(0);
    }
  });
});

describe('`haloweave check` agrees on good folders', () => {
  it.each([['demo'], ['south80-quad'], ['path-profile'], ['moonlit-ridge']])('%s passes `haloweave check` as it passes contract_check.py', (name) => {
    const dir = name === 'demo' ? demoDir : scenarioDirs.get(name)!;
    const r = spawnSync(process.execPath, [BIN, 'check', dir], { cwd: ROOT, encoding: 'utf8' });
    expect(r.status, r.stdout + r.stderr).toBe(0);
  });
});
