/**
 * A worked example small enough to do by hand (the arithmetic is written beside each expectation).
 * Profile: square footprint +-50 arcsec, minimal slit 4 arcsec, gap 1, width 1, box 2, one alignment box.
 * Detector: 2000 px, 1 A/px, centre 8600 A, 0.1 arcsec/px, gap [900, 1000], margin 10 px; one line 8500 A, vsys 0:
 *   p = 1000 + 10 x + (8500 - 8600) = 900 + 10 x, usable for p <= 890 or p >= 1010, i.e. x <= -1 or x >= 11.
 * Mask at the galaxy centre, PA 0, so x is East and y is North.
 */
import { describe, expect, it } from 'vitest';
import { parseProfile } from '../../src/core/profile/load';
import { parsePlan } from '../../src/core/plan/validate';
import { solvePlan } from '../../src/core/pipeline/pipeline';
import { catalogOf, checkSolution, targetAt } from './helpers';

const profile = parseProfile({
  id: 'hand-square', label: 'hand-worked square field',
  telescope: { apertureM: 4 },
  site: { latDeg: -30, lonDeg: -70, elevationM: 2000, pressureHPa: 780, temperatureC: 10, relativeHumidity: 0.2 },
  footprint: [[-50, -50], [50, -50], [50, 50], [-50, 50]],
  slits: { minLengthArcsec: 4, gapArcsec: 1, widthArcsec: 1, maxTiltDeg: 30 },
  alignment: { boxSizeArcsec: 2, minCount: 1, magRange: [15, 19] },
  detector: { pixels: 2000, dispersionAPerPixel: 1, centralWavelengthA: 8600, xArcsecPerPixel: 0.1, gapsPixels: [[900, 1000]], edgeMarginPixels: 10 },
});
const mask = { raDeg: 10, decDeg: 0, paDeg: 0 };
const plan = parsePlan({
  format: 'haloweave.plan/1',
  galaxy: { id: 'hand', ra: 10, dec: 0, reArcsec: 10, axisRatio: 1, paDeg: 0, distanceMpc: 10, vsysKms: 0, sersicN: 4, muE: 21 },
  instrument: 'hand-square', catalog: 'hand.csv',
  goals: { masks: 1, tracerReachRe: 6, starlightReachRe: 0, linesA: [8500] },
  masks: [{ id: 'm1', raDeg: 10, decDeg: 0, paDeg: 0, locked: true }],
  allocation: { maxSlitLengthArcsec: 10 },
  starlight: { skyPerMask: 0 }, // no sky slits, so that only the tracers and the box share the mask
});
const t = (id: string, x: number, y: number, priority: number) => targetAt(id, mask, x, y, { priority });
const catalog = catalogOf([
  targetAt('star', mask, -20, -40, { role: 'alignment', mag: 17 }), // box spans y -41..-39
  t('T1', -10, -38, 1), // needs |y - (-40)| >= 4/2 + 2/2 + 1 = 4 from the box: |2| < 4, out
  t('T2', 20, -30, 2), // overlaps T3 (|dy| = 4 < 4 + 1): the heavier T3 wins
  t('T3', -30, -26, 3),
  t('T4', 30, -21, 1), // dy = 5 from T3: just compatible
  t('T5', 5, 0, 10), // p = 950, inside the gap band (890, 1010): not usable despite weight 10
  t('T6', -5, 0, 2), // T6 + T8 = 3 beats T7 = 1.5 (T7 overlaps both)
  t('T7', 15, 3, 1.5),
  t('T8', -15, 6, 1),
  t('T9', 60, 10, 5), // outside the footprint
  t('T10', 40, 48.5, 5), // its minimal slit would reach y = 50.5 > 50
  t('T11', 40, 47, 1), // minimal slit 45..49 fits
]);

describe('worked example by hand', () => {
  const sol = solvePlan({ plan, profile, catalog });
  const slits = sol.masks[0].slits;
  const byId = new Map(slits.map((s) => [s.objectId, s]));

  it('chooses exactly the slits worked out by hand (total weight 3 + 1 + 2 + 1 + 1 = 8)', () => {
    expect(sol.problems).toEqual([]);
    expect(slits.filter((s) => s.role === 'tracer').map((s) => [s.slitId, s.objectId])).toEqual([
      ['S001', 'T3'], ['S002', 'T4'], ['S003', 'T6'], ['S004', 'T8'], ['S005', 'T11'],
    ]);
    expect(sol.stats.tracerWeight).toBe(8);
    const box = byId.get('star')!;
    expect([box.slitId, box.role, box.lenBelowArcsec, box.lenAboveArcsec, box.widthArcsec]).toEqual(['A01', 'alignment', 1, 1, 2]);
    expect(box.xArcsec).toBeCloseTo(-20, 9);
    expect(box.yArcsec).toBeCloseTo(-40, 9);
  });

  it('lengthens as worked out by hand (cap 10 arcsec: at most 5 on either side)', () => {
    // Minimal spans: T3 [-28,-24], T4 [-23,-19], T6 [-2,2], T8 [4,8], T11 [45,49]; box [-41,-39] fixed.
    // box|T3: clear 11 - gap 1 = 10, the box cannot grow, T3 takes its cap 3 -> below 5.
    // T3|T4: clear exactly the gap, neither grows.  T4|T6: 17 - 1 = 16, each takes its cap 3.
    // T6|T8: 2 - 1 = 1, half each -> 2.5.  T8|T11: 37 - 1 = 36, cap 3 each.  T11 to the top edge: 50 - 49 = 1 -> above 3.
    const expected: Record<string, [number, number]> = { T3: [5, 2], T4: [2, 5], T6: [5, 2.5], T8: [2.5, 5], T11: [5, 3] };
    for (const [id, [below, above]] of Object.entries(expected)) {
      const s = byId.get(id)!;
      expect(s.lenBelowArcsec).toBeCloseTo(below, 5);
      expect(s.lenAboveArcsec).toBeCloseTo(above, 5);
      expect(s.widthArcsec).toBe(1);
      expect(s.tiltDeg).toBe(0);
    }
  });

  it('passes the independent checker', () => {
    expect(checkSolution(sol, profile)).toEqual([]);
  });
});
