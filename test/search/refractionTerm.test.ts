/**
 * The search's refraction term (search.objective.aRefraction, solver/refractionTerm.ts): for a free mask it weighs the
 * PA against the light lost to refraction across the slits. Scenario: one free mask over a single tracer at the galaxy
 * centre (so every PA holds the same tracer, bins and sectors: PA choices differ only by refraction), a wide science
 * range (4000-9000 A) and a galaxy that transits at zenith distance 60 degrees (airmass 2) north of the zenith.
 * Common practice (Filippenko 1982, PASP 94, 715): a slit along the parallactic angle loses nothing to the spread;
 * for an object transiting north of the zenith the parallactic angle at transit is 180 degrees (the zenith lies
 * due South of it; geometry of the astronomical triangle), so the best slit PA is 0 or 180 modulo 180.
 */
import { describe, expect, it } from 'vitest';
import { solvePlan } from '../../src/core/pipeline/pipeline';
import { loadProfile, scenario } from './helpers';

const LAT_DEG = -31.4; // quad8-square's site
const DEC_DEG = LAT_DEG + 60; // transits 60 degrees from the zenith, north of it
// At 3000 km/s the calcium-triplet windows of a target at the mask centre clear the detector gap there, so the
// tracer at the galaxy centre is eligible at every PA of a mask centred on it.

function singleTracerCase(aRefraction?: number) {
  const profile = loadProfile('quad8-square');
  const noBoxes = { ...profile, alignment: { ...profile.alignment, minCount: 0 } };
  const x = scenario({ seed: 4, candidates: 400, profileId: 'quad8-square', masks: 1, galaxy: { raDeg: 150, decDeg: DEC_DEG, paDeg: 90, axisRatio: 0.8, vsysKms: 3000 } }, (p) => {
    p.goals.masks = 1;
    p.goals.starlightReachRe = 0;
    p.observing = { scienceRangeA: [4000, 9000], exposureTimeS: 3600 };
    p.search = { seed: 1, ...(aRefraction === undefined ? {} : { objective: { aRefraction } }) };
  });
  // Keep the tracer candidate nearest the galaxy centre and drop everything else (alignment stars too: minCount 0).
  const g = x.plan.galaxy;
  const d2 = (t: { raDeg: number; decDeg: number }) => ((t.raDeg - 150) * Math.cos((DEC_DEG * Math.PI) / 180)) ** 2 + (t.decDeg - DEC_DEG) ** 2;
  const tracers = x.catalog.targets.filter((t) => t.role !== 'alignment' && (t.extra.kind ?? '').startsWith('gc')).sort((a, b) => d2(a) - d2(b));
  expect(g).toBeDefined();
  expect(tracers.length).toBeGreaterThan(0);
  return { ...x, profile: noBoxes, catalog: { ...x.catalog, targets: tracers.slice(0, 1) } };
}

/** PA distance (degrees) from the nearest of 0 and 180. */
const offParallactic = (paDeg: number) => { const m = ((paDeg % 180) + 180) % 180; return Math.min(m, 180 - m); };

describe('PA against refraction in the search', () => {
  it('turns a free mask from across the parallactic angle to along it when PA choices differ only by refraction', () => {
    const sol = solvePlan(singleTracerCase(), { skipObservingReport: true });
    expect(sol.problems).toEqual([]);
    expect(sol.search.objective.yieldWeight).toBeGreaterThan(0);
    // The start (the one-mask cross) lies along the major axis, PA 90: across the parallactic angle, the worst PA.
    expect(sol.search.startObjective?.refractionTerm ?? -Infinity).toBeLessThan(sol.search.objective.refractionTerm);
    expect(offParallactic(sol.masks[0].mask.paDeg)).toBeLessThan(15);
    // The tracer is kept: the turn cost nothing else.
    expect(sol.masks[0].slits.filter((s) => s.role === 'tracer').length).toBe(1);
  });

  it('costs nothing when aRefraction is 0: the term is 0 and the mask keeps its PA', () => {
    const sol = solvePlan(singleTracerCase(0), { skipObservingReport: true });
    const o = sol.search.objective;
    expect(o.yieldWeight).toBeGreaterThan(0);
    expect(o.refractionTerm).toBe(0);
    expect(o.total).toBe(o.yieldWeight + o.binTerm + o.sectorTerm + o.starlightTerm);
    expect(sol.masks[0].mask.paDeg).toBeCloseTo(90, 9);
  });
});
