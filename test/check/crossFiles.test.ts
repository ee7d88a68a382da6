/** The checker's cross-file rules: coverage recount, solved.plan.json masks vs masks.csv, used objects vs catalog-report. */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { checkCoverage, radiusReAndAzimuthDeg } from '../../src/core/check/coverageRecount';
import { checkCatalogUse, checkPlanMasks } from '../../src/core/check/consistency';
import { coverageReport } from '../../src/core/coverage/coverage';
import type { GalaxyModel } from '../../src/core/plan/schema';
import type { Slit, SlitRole } from '../../src/core/geometry/maskSolution';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';

// Galaxy with q = 0.5, Re = 10", major axis at PA 30 deg, near RA 0 so the projection crosses 0/360.
const galaxy: GalaxyModel = { id: 'g', raDeg: 359.999, decDeg: 20, reArcsec: 10, axisRatio: 0.5, paDeg: 30, distanceMpc: 10, vsysKms: 0, sersicN: 4, muE: 21 };
const goals = { tracerReachRe: 3, starlightReachRe: 2 };
const DEG = Math.PI / 180;

/** A row at galaxy-frame (u, v) arcsec, from the contract's inverse: xi = u sin th + v cos th, eta = u cos th - v sin th. */
function rowAt(role: SlitRole, u: number, v: number, id = ''): Slit {
  const th = galaxy.paDeg * DEG;
  const p = tangentToSkyDeg(tangentCentre(galaxy.raDeg, galaxy.decDeg), u * Math.sin(th) + v * Math.cos(th), u * Math.cos(th) - v * Math.sin(th));
  return { maskId: 'm', slitId: id || `${u},${v}`, objectId: id, role, raDeg: p.raDeg, decDeg: p.decDeg, xArcsec: 0, yArcsec: 0, lenBelowArcsec: 2, lenAboveArcsec: 2, widthArcsec: 1, tiltDeg: 0, priority: 1, mag: 20 };
}

const bins = (counts: number[], goal: number) => counts.map((count, i) => ({ fromRe: i, toRe: Math.min(i + 1, goal), count }));
const sectors = (counts: number[]) => counts.map((count, i) => ({ fromDeg: 45 * i, toDeg: 45 * (i + 1), count }));
const role = (goal: number, radial: number[], sector: number[], maxReachRe: number) => ({ radialBins: bins(radial, goal), sectors: sectors(sector), maxReachRe });

describe('coverage recount', () => {
  // Hand-computed, R = sqrt(q u^2 + v^2/q) / Re and phi = atan2(v, u), every point away from bin edges:
  // (25, 1): 1.773 Re, 2.3 deg. (1, 10): 1.416 Re, 84.3 deg. (-30, 1): 2.126 Re, 178.1 deg. (1, -3): 0.430 Re, 288.4 deg.
  // (20, -21): sqrt(200 + 882) / 10 = 3.289 Re (beyond the 3 Re goal), 313.6 deg.
  const rows = [rowAt('tracer', 25, 1, 't1'), rowAt('tracer', 1, 10, 't2'), rowAt('tracer', -30, 1, 't3'), rowAt('tracer', 1, -3, 't4'), rowAt('tracer', 20, -21, 't5'), rowAt('starlight', 1, 10)];
  const hand = {
    roles: {
      tracer: role(3, [1, 2, 1], [1, 1, 0, 1, 0, 0, 2, 0], Math.sqrt(1082) / 10),
      starlight: role(2, [0, 1], [0, 1, 0, 0, 0, 0, 0, 0], Math.sqrt(200.5) / 10),
      sky: role(3, [0, 0, 0], [0, 0, 0, 0, 0, 0, 0, 0], 0),
      alignment: role(3, [0, 0, 0], [0, 0, 0, 0, 0, 0, 0, 0], 0),
    },
  };

  it('the frame formulas give the hand-computed radius and azimuth', () => {
    const r = radiusReAndAzimuthDeg(galaxy, rows[4].raDeg, rows[4].decDeg);
    expect(r.rRe).toBeCloseTo(Math.sqrt(1082) / 10, 6);
    expect(r.phiDeg).toBeCloseTo(360 + Math.atan2(-21, 20) / DEG, 5);
  });

  it('passes hand-computed counts and names each wrong key', () => {
    expect(checkCoverage({ coverage: hand, galaxy, goals, slits: rows })).toEqual([]);
    const bad = structuredClone(hand);
    bad.roles.tracer.radialBins[1].count = 1;
    bad.roles.tracer.sectors[6].count = 1;
    bad.roles.starlight.maxReachRe = 1.5;
    const v = checkCoverage({ coverage: bad, galaxy, goals, slits: rows });
    expect(v.map((x) => x.where)).toEqual(['coverage.json roles.tracer.radialBins[1].count', 'coverage.json roles.tracer.sectors[6].count', 'coverage.json roles.tracer.sectors', 'coverage.json roles.starlight.maxReachRe']);
    expect(v[0].what).toBe('1, but slits.csv has 2 tracer rows with 1 <= R/Re < 2 (recounted from ra_deg/dec_deg about the galaxy of solved.plan.json)');
    expect(v[1].what).toBe('1, but slits.csv has 2 tracer rows with azimuth 270 <= phi < 315 deg from the major axis');
  });

  it('finds bins that do not follow the goal and a missing role', () => {
    const bad = structuredClone(hand) as any;
    bad.roles.starlight.radialBins = bins([0, 1, 0], 3);
    delete bad.roles.sky;
    const v = checkCoverage({ coverage: bad, galaxy, goals, slits: rows });
    expect(v.map((x) => x.where)).toEqual(['coverage.json roles.starlight.radialBins', 'coverage.json roles.sky']);
    expect(v[0].what).toMatch(/the goal of 2 Re in solved\.plan\.json needs 2 bins of 1 Re/);
  });

  it('a row on a sector edge may be counted in either neighbour, but not in both or neither', () => {
    // (0, -3): phi = atan2(-3, 0) = 270 deg, the edge between sectors 5 and 6; R = 0.424 Re, bin 0.
    const slits = [rowAt('tracer', 0, -3, 'e1')];
    const cov = (s5: number, s6: number) => ({ roles: { ...hand.roles, starlight: role(2, [0, 0], [0, 0, 0, 0, 0, 0, 0, 0], 0), tracer: role(3, [1, 0, 0], [0, 0, 0, 0, 0, s5, s6, 0], Math.sqrt(18) / 10) } });
    expect(checkCoverage({ coverage: cov(1, 0), galaxy, goals, slits })).toEqual([]);
    expect(checkCoverage({ coverage: cov(0, 1), galaxy, goals, slits })).toEqual([]);
    expect(checkCoverage({ coverage: cov(1, 1), galaxy, goals, slits }).map((v) => v.what)).toEqual(['the sector counts sum to 2, but slits.csv has 1 tracer rows']);
    expect(checkCoverage({ coverage: cov(0, 0), galaxy, goals, slits }).map((v) => v.what)).toEqual(['the sector counts sum to 0, but slits.csv has 1 tracer rows']);
  });

  it('a row lost from the radial bins is found by the sum with beyondGoal', () => {
    const c = { roles: { ...hand.roles, tracer: { ...hand.roles.tracer, beyondGoal: 0 } } };
    expect(checkCoverage({ coverage: c, galaxy, goals, slits: rows }).map((v) => `${v.where}: ${v.what}`)).toEqual([
      'coverage.json roles.tracer.beyondGoal: 0, but slits.csv has 1 tracer rows at R/Re >= 3',
      'coverage.json roles.tracer.radialBins: the bin counts plus beyondGoal sum to 4, but slits.csv has 5 tracer rows',
    ]);
  });

  it('agrees with the solver\'s coverage report on random rows (two routes to the same counts)', () => {
    fc.assert(fc.property(fc.array(fc.tuple(fc.constantFrom<SlitRole>('tracer', 'starlight', 'sky', 'alignment'), fc.double({ min: -400, max: 400, noNaN: true }), fc.double({ min: -400, max: 400, noNaN: true })), { maxLength: 40 }), (pts) => {
      const slits = pts.map(([r, u, v], i) => rowAt(r, u, v, `o${i}`));
      expect(checkCoverage({ coverage: coverageReport(galaxy, { tracerReachRe: 10, starlightReachRe: 3 }, slits), galaxy, goals: { tracerReachRe: 10, starlightReachRe: 3 }, slits })).toEqual([]);
    }), { numRuns: 60 });
  });
});

describe('solved.plan.json masks against masks.csv', () => {
  const csv = [{ maskId: 'a', instrument: 'p', raDeg: 359.5, decDeg: 10, paDeg: 0 }, { maskId: 'b', instrument: 'p', raDeg: 1, decDeg: 10, paDeg: 359.9 }];
  it('accepts the same values (RA and PA compared on the circle)', () => {
    expect(checkPlanMasks([{ id: 'a', raDeg: 359.5, decDeg: 10, paDeg: 360 }, { id: 'b', raDeg: 1, decDeg: 10, paDeg: 359.9 }], csv)).toEqual([]);
  });
  it('names the mask key and the masks.csv line for a difference, an unplaced and an unknown mask', () => {
    const v = checkPlanMasks([{ id: 'a', raDeg: 359.5, decDeg: 10.001, paDeg: 0 }, { id: 'b', raDeg: 1, decDeg: 10 }, { id: 'c', raDeg: 0, decDeg: 0, paDeg: 0 }], csv, { maskLines: [2, 4] });
    expect(v.map((x) => `${x.where}: ${x.what}`)).toEqual([
      'solved.plan.json masks[0] (id a).decDeg: 10.001, but masks.csv line 2 has dec_deg 10',
      'solved.plan.json masks[1] (id b).paDeg: missing, but masks.csv line 4 has pa_deg 359.9',
      'solved.plan.json masks[2] (id c): mask c has no row in masks.csv',
    ]);
  });
});

describe('used objects against catalog-report.csv', () => {
  const slits = [rowAt('tracer', 1, 1, 'gc1'), rowAt('alignment', 2, 2, 'st1'), rowAt('sky', 3, 3), rowAt('tracer', 4, 4, 'gc2')];
  const lines = new Map([['gc1', [5]], ['st1', [9]], ['gc2', [7, 8]]]);
  it('passes when no used line is listed; a duplicate id with one usable line passes', () => {
    expect(checkCatalogUse(slits, lines, [{ catalogLine: 8, column: 'ra', reason: 'x', reportLine: 2 }])).toEqual([]);
  });
  it('names the slits.csv line, the catalog line and the report line', () => {
    const v = checkCatalogUse(slits, lines, [{ catalogLine: 9, column: 'mag', reason: 'not a number', reportLine: 3 }], { catalogSource: 'cat.csv' });
    expect(v.map((x) => `${x.where}: ${x.what}`)).toEqual(['slits.csv line 3 (mask m, slit st1): object st1 is on cat.csv line 9, which catalog-report.csv line 3 lists as not used (mag: not a number)']);
    const missing = checkCatalogUse(slits, new Map([['st1', [9]], ['gc2', [7]]]), []);
    expect(missing.map((x) => x.what)).toEqual(['object gc1 is not a usable row of the catalog']);
  });
});
