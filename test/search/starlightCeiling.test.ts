/** The pointing search's starlight ceilings: bounds that let a trial move skip its starlight estimate without changing a choice. */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { addStarlight, emptyTally, objectiveContext, objectiveValue, starlightCeiling } from '../../src/core/solver/objective';
import { chooseSlots, galaxyOnMask, starlightRadiusCeilingRe, starlightSettings, starlightWindows, type Span } from '../../src/core/solver/starlight';
import { eligibilityRules } from '../../src/core/profile/eligibility';
import { loadProfile } from './helpers';
import type { GalaxyModel } from '../../src/core/plan/schema';

const profile = loadProfile('ridge10-narrow');
const galaxy: GalaxyModel = { id: 'Ceiling Test', raDeg: 10, decDeg: -20, reArcsec: 30, axisRatio: 0.6, paDeg: 20, distanceMpc: 15, vsysKms: 1500, sersicN: 4, muE: 20.5 };
const linesA = [8498, 8542.1, 8662.1];
const plan = { galaxy: { ...galaxy, ra: galaxy.raDeg, dec: galaxy.decDeg }, goals: { masks: 4, tracerReachRe: 10, starlightReachRe: 3, linesA } } as never;

describe('starlightCeiling (objective.ts)', () => {
  it('bounds J of a tally with up to maxSlits starlight slits of R/Re <= maxRe added, and is reached by a best placement', () => {
    const o = objectiveContext({ tracerReachRe: 10, starlightReachRe: 3 }, undefined, [1, 2, 3]);
    const slit = fc.record({ rRe: fc.double({ min: 0, max: 4, noNaN: true }), azimuthDeg: fc.double({ min: 0, max: 359.9, noNaN: true }) });
    fc.assert(
      fc.property(fc.array(slit, { maxLength: 4 }), fc.array(slit, { maxLength: 6 }), fc.double({ min: 0, max: 4, noNaN: true }), (held, added, maxRe) => {
        const t = emptyTally(o);
        for (const s of held) addStarlight(t, s.rRe, s.azimuthDeg);
        const ceiling = objectiveValue(o, starlightCeiling(t, maxRe, added.length)).total;
        const withAdded = emptyTally(o);
        for (const s of held) addStarlight(withAdded, s.rRe, s.azimuthDeg);
        for (const s of added) addStarlight(withAdded, Math.min(s.rRe, maxRe), s.azimuthDeg);
        expect(objectiveValue(o, withAdded).total).toBeLessThanOrEqual(ceiling);
      }),
      { numRuns: 300 },
    );
    // No slit added: the tally's own J. One slit at 2.5 Re in an empty tally: one bin (the 2-3 Re one), one sector, reach 2.5/3.
    const t = emptyTally(o);
    expect(objectiveValue(o, starlightCeiling(t, 2.5, 0)).total).toBe(objectiveValue(o, t).total);
    const one = emptyTally(o);
    addStarlight(one, 2.5, 10);
    expect(objectiveValue(o, starlightCeiling(t, 2.5, 1)).total).toBeCloseTo(objectiveValue(o, one).total, 9);
  });
});

describe('starlightRadiusCeilingRe (starlight.ts)', () => {
  it('is at least the R/Re of every starlight slit chooseSlots picks, on slots and joined windows, and below maxRe when the S/N limits', () => {
    const rules = eligibilityRules(profile, linesA, galaxy.vsysKms);
    for (const exposureS of [300, 36000]) {
      const s = { ...starlightSettings({ exposureS, targetSnPerA: 5 }, profile, plan), skyPerMask: 0 };
      let largest = 0, ceiling = 0;
      for (const [dxArcsec, dyArcsec, paDeg] of [[0, 0, 0], [0, 60, 30], [40, -150, 120], [0, 200, 90]]) {
        const mask = { raDeg: galaxy.raDeg + dxArcsec / 3600 / Math.cos((galaxy.decDeg * Math.PI) / 180), decDeg: galaxy.decDeg + dyArcsec / 3600, paDeg };
        const g = galaxyOnMask(mask, galaxy);
        ceiling = starlightRadiusCeilingRe(g, rules.widthArcsec, s);
        // Contiguous slots over the whole slit direction, so that joined windows are tried too.
        const slots: Span[] = [];
        for (let y = rules.bounds.minY; y + s.slitLengthArcsec <= rules.bounds.maxY; y += s.slitLengthArcsec + profile.slits.gapArcsec) slots.push({ lo: y, hi: y + s.slitLengthArcsec });
        expect(starlightWindows(slots, profile.slits.gapArcsec, s.maxSlitLengthArcsec).length).toBeGreaterThan(slots.length);
        const { starlight } = chooseSlots(g, rules, slots, s, new Set(), 1, 25, profile.slits.gapArcsec);
        for (const c of starlight) largest = Math.max(largest, c.rRe);
        for (const c of starlight) expect(c.rRe).toBeLessThanOrEqual(ceiling);
      }
      expect(largest).toBeGreaterThan(0);
      // The short exposure's S/N limit lies inside maxRe (slits to 2.1 Re, ceiling 3.3 Re): the ceiling is then below it.
      if (exposureS === 300) { expect(ceiling).toBeLessThan(s.maxRe); expect(ceiling).toBeLessThan(largest + 2); }
    }
  });
});
