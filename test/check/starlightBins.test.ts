/**
 * `haloweave check`'s re-derivation of coverage.json `starlightBins` (src/core/check/starlightRecount.ts) on a
 * hand-built mask, against numbers this test computes itself from the documented definitions:
 * - Sérsic profile, n = 1: mu(R) = muE + 2.5 b_1 / ln 10 (R/Re - 1), b_1 = 1.67834699 (Graham & Driver 2005, PASA 22,
 *   118 list b_1 = 1.678; the extra digits are the root of P(2, b) = 1/2, i.e. (1 + b) e^-b = 1/2, solved below);
 * - AB photon flux f_nu / (h lambda) with 3631 Jy (Oke & Gunn 1983);
 * - Howell's CCD equation with the sky-estimate term (Handbook of CCD Astronomy, 2nd ed. 2006, sec. 4.4), co-added
 *   with the systematic sky floor f (docs/signal-to-noise.md): S/N = sum N* / sqrt(sum var + (f sum N_sky)^2).
 * The mask is centred on a round galaxy (q = 1) at PA 0, so mask x = xi (East) = v and y = eta (North) = u.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkStarlightBins } from '../../src/core/check/starlightRecount';
import { parsePlan, galaxyModel } from '../../src/core/plan/validate';
import { parseProfileText } from '../../src/core/profile/load';
import type { Slit, SlitRole } from '../../src/core/geometry/maskSolution';
import { maskToSkyArcsec } from '../../src/core/sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';

const profile = parseProfileText(readFileSync(join(__dirname, '../../instrument-profiles/ridge10-narrow.json'), 'utf8'));
const plan = parsePlan({
  format: 'haloweave.plan/1',
  galaxy: { id: 'Round test galaxy', ra: 150, dec: 0, reArcsec: 20, axisRatio: 1, paDeg: 0, distanceMpc: 15, vsysKms: 0, sersicN: 1, muE: 20 },
  instrument: 'ridge10-narrow', catalog: 'none.csv',
  goals: { masks: 1, tracerReachRe: 5, starlightReachRe: 2, linesA: [8500] },
  starlight: { exposureS: 3600, skyMagPerArcsec2: 20, targetSnPerA: 5 },
});
const galaxy = galaxyModel(plan);
const mask = { maskId: 'm', instrument: 'ridge10-narrow', raDeg: 150, decDeg: 0, paDeg: 0 };

function row(slitId: string, role: SlitRole, x: number, y: number, below: number, above: number): Slit {
  const t = maskToSkyArcsec(x, y, 0);
  const p = tangentToSkyDeg(tangentCentre(150, 0), t.xiArcsec, t.etaArcsec);
  return { maskId: 'm', slitId, objectId: role === 'tracer' ? `t-${slitId}` : '', role, raDeg: p.raDeg, decDeg: p.decDeg, xArcsec: x, yArcsec: y, lenBelowArcsec: below, lenAboveArcsec: above, widthArcsec: 1, tiltDeg: 0, priority: 1, mag: role === 'tracer' ? 21 : null };
}
// A starlight slit at x = 15, y 30..40 (midpoint R = sqrt(15^2 + 35^2) = 38.08" = 1.90 Re, azimuth atan2(15, 35) =
// 23.2 deg: bin 1-2 Re, 0-45 deg); a tracer at (-15, 30), 5" each side, whose parts beside its 1.6" extraction (2 x the
// default seeing 0.8") have midpoints (-15, 27.1) and (-15, 32.9): 1.55 and 1.81 Re at 331 and 335 deg (bin 1-2 Re,
// 315-360 deg); a sky slit of 10" far out (not a spectrum of galaxy light).
const slits = [row('S1', 'starlight', 15, 35, 5, 5), row('T1', 'tracer', -15, 30, 5, 5), row('K1', 'sky', -100, -95, 5, 5)];

// ---- the test's own numbers ------------------------------------------------------------------------------------
const b1 = (() => { let lo = 1, hi = 2; for (let i = 0; i < 100; i++) { const m = (lo + hi) / 2; if ((1 + m) * Math.exp(-m) > 0.5) lo = m; else hi = m; } return lo; })();
const mu = (rArcsec: number) => 20 + ((2.5 * b1) / Math.LN10) * (rArcsec / 20 - 1);
const meanMu = (x: number, y0: number, y1: number) => {
  let f = 0;
  for (let k = 0; k < 5; k++) f += Math.pow(10, -0.4 * mu(Math.hypot(x, y0 + ((k + 0.5) / 5) * (y1 - y0))));
  return -2.5 * Math.log10(f / 5);
};
const wavelengthA = 8500, t = 3600, yScale = 0.1185, disp = 0.33, readE = 2.6, darkE = 0.0008 * 3600;
const effCm2 = Math.PI * 500 * 500 * 0.18; // 10 m aperture, throughput 0.18 (ridge10-narrow)
const photons = (m: number) => (3631e-23 * Math.pow(10, -0.4 * m)) / (6.62607015e-27 * wavelengthA * 1e-8) * 1e-8;
const skyLength = 10;
function part(x: number, y0: number, y1: number) {
  const len = y1 - y0, nPix = len / yScale / disp, nB = skyLength / yScale / disp;
  const signal = photons(meanMu(x, y0, y1)) * len * 1 * effCm2 * t;
  const skyPerPix = photons(20) * 1 * yScale * disp * effCm2 * t;
  return { signal, variance: signal + nPix * (1 + nPix / nB) * (skyPerPix + darkE + readE * readE), sky: nPix * skyPerPix };
}
function sn(parts: ReturnType<typeof part>[], f = 0.01) {
  const s = parts.reduce((a, p) => a + p.signal, 0), v = parts.reduce((a, p) => a + p.variance, 0), k = parts.reduce((a, p) => a + p.sky, 0);
  return { snPerA: s / Math.sqrt(v + f * k * f * k), snPerAWithoutFloor: s / Math.sqrt(v) };
}
const round2 = (v: number) => Math.round(v * 100) / 100;
const starlightBin = sn([part(15, 30, 40)]);
const tracerBin = sn([part(-15, 25, 29.2), part(-15, 30.8, 35)]);
const cap = Math.pow(10, -0.4 * (mu(20) - 20)) / 0.01; // at the bin's inner edge, 1 Re: galaxy over sky, over f

function coverage() {
  const bin = (sectorDeg: number, s: { snPerA: number; snPerAWithoutFloor: number }, starlightSlits: number, tracerSkyParts: number, reachRe: number) => ({
    fromRe: 1, toRe: 2, sectorDeg, starlightSlits, tracerSkyParts, reachRe: Math.round(reachRe * 1e4) / 1e4,
    snPerA: round2(s.snPerA), snPerAWithoutFloor: round2(s.snPerAWithoutFloor), targetSnPerA: 5, met: s.snPerA >= 5, floorCapSnPerA: round2(cap),
  });
  const bins = [bin(0, starlightBin, 1, 0, Math.hypot(15, 35) / 20), bin(315, tracerBin, 0, 2, Math.hypot(15, 32.9) / 20)];
  const short = bins.filter((b) => !b.met);
  return {
    starlightBins: { targetSnPerA: 5, skySystematicFraction: 0.01, goalRe: 2, bins },
    goals: [{ name: 'starlightBins', target: 2, achieved: 2 - short.length, met: short.length === 0, reason: short.map((b) => `${b.fromRe}-${b.toRe} Re ${b.sectorDeg}-${b.sectorDeg + 45} deg for want of free slit space`).join(', ') }],
  };
}
const run = (cov: unknown) => checkStarlightBins({ coverage: cov, plan, galaxy, masks: [mask], slits, profileFor: () => profile });

describe('starlight bins re-derived from the slits, the plan and the profile', () => {
  it('the test\'s b_1 is the Graham & Driver value and the S/N are of a plausible size', () => {
    expect(b1).toBeCloseTo(1.678, 3);
    expect(starlightBin.snPerA).toBeGreaterThan(1);
    expect(starlightBin.snPerA).toBeLessThan(starlightBin.snPerAWithoutFloor);
  });

  it('accepts the bins computed by hand', () => {
    expect(run(coverage())).toEqual([]);
  });

  it.each([
    ['one bin\'s S/N', (c: ReturnType<typeof coverage>) => { c.starlightBins.bins[1].snPerA = round2(c.starlightBins.bins[1].snPerA * 1.1); }, 'coverage.json starlightBins.bins[1] (1-2 Re, 315-360 deg)', /^snPerA .*, but the spectra of slits.csv in this bin co-add to /],
    ['one count', (c: ReturnType<typeof coverage>) => { c.starlightBins.bins[0].starlightSlits = 2; }, 'coverage.json starlightBins.bins[0] (1-2 Re, 0-45 deg)', /^starlightSlits 2, but slits.csv gives 1 starlight slits there$/],
    ['one met flag', (c: ReturnType<typeof coverage>) => { c.starlightBins.bins[0].met = !c.starlightBins.bins[0].met; }, 'coverage.json starlightBins.bins[0] (1-2 Re, 0-45 deg)', /^met (true|false), but its S\/N .* the target 5$/],
    ['the reach', (c: ReturnType<typeof coverage>) => { c.starlightBins.bins[0].reachRe += 0.01; }, 'coverage.json starlightBins.bins[0] (1-2 Re, 0-45 deg)', /^reachRe .*, but its spectra reach 1\.9039 Re$/],
    ['the floor cap', (c: ReturnType<typeof coverage>) => { c.starlightBins.bins[0].floorCapSnPerA += 1; }, 'coverage.json starlightBins.bins[0] (1-2 Re, 0-45 deg)', /^floorCapSnPerA .*, but the sky floor caps this bin at /],
  ])('names the bin of a changed value: %s', (_name, edit, where, what) => {
    const c = coverage();
    edit(c);
    const v = run(c).filter((x) => x.where === where);
    expect(v.length, JSON.stringify(run(c))).toBeGreaterThan(0);
    expect(v[0].rule).toBe('starlight bins');
    expect(v[0].what).toMatch(what);
  });

  it('names a bin the slits fill but the file leaves out, and a bin no slit fills', () => {
    const c = coverage();
    const [first] = c.starlightBins.bins.splice(0, 1);
    c.starlightBins.bins.push({ ...first, sectorDeg: 90 });
    const where = run(c).map((x) => x.where);
    expect(where).toContain('coverage.json starlightBins (1-2 Re, 0-45 deg)');
    expect(where).toContain('coverage.json starlightBins.bins[1] (1-2 Re, 90-135 deg)');
  });

  it('checks the goal: counts, and each short bin named with its cause', () => {
    const c = coverage();
    c.goals[0].achieved = 0;
    expect(run(c).map((x) => `${x.where}: ${x.what}`)).toContainEqual(expect.stringMatching(/^coverage.json goals \(starlightBins\): target 2 \/ achieved 0, but 2 bins inside 2 Re/));
    // A target above the floor cap (cap computed above: galaxy over sky at 1 Re, over f) makes both bins short for that
    // cause: the reason must name each one with it.
    const hard = parsePlan({ ...plan, starlight: { ...plan.starlight, targetSnPerA: 1e3 } });
    const c2 = coverage();
    for (const b of c2.starlightBins.bins) { b.targetSnPerA = 1e3; b.met = false; }
    c2.starlightBins.targetSnPerA = 1e3;
    Object.assign(c2.goals[0], { achieved: 0, met: false, reason: 'the sky-subtraction floor caps 1-2 Re 0-45 deg' });
    const v = checkStarlightBins({ coverage: c2, plan: hard, galaxy, masks: [mask], slits, profileFor: () => profile });
    expect(cap).toBeLessThan(1e3);
    expect(v.map((x) => x.what)).toEqual(['the short bin 1-2 Re, 315-360 deg is not named with its cause (the sky-subtraction floor) in the reason']);
  });

  it('a mask without sky slits gives no starlight spectrum (no sky estimate)', () => {
    const v = checkStarlightBins({ coverage: coverage(), plan, galaxy, masks: [mask], slits: slits.slice(0, 2), profileFor: () => profile });
    expect(v.filter((x) => x.what === 'no starlight slit or tracer sky part of slits.csv lies in this bin')).toHaveLength(2);
  });
});
