import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { galaxyModel } from '../../src/core/plan/validate';
import { targetWeights } from '../../src/core/pipeline/pipeline';
import { allocationContext } from '../../src/core/solver/allocateMasks';
import { evaluatePointings, naiveCrossLayout, objectiveUpperBound } from '../../src/core/solver/pointingSearch';
import { searchEnv } from '../../src/core/solver/searchEnv';
import { proxyModel } from '../../src/core/solver/proxyModel';
import { galaxyToSkyArcsec } from '../../src/core/sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import { PROFILE_IDS, scenario } from './helpers';

describe('the proven upper bound the search compares against', () => {
  it('is never below the full objective of the same pointings (random scenarios and pointings)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1e6 }), fc.constantFrom(...PROFILE_IDS),
        fc.array(fc.tuple(fc.double({ min: -400, max: 400, noNaN: true }), fc.double({ min: -400, max: 400, noNaN: true }), fc.double({ min: 0, max: 359, noNaN: true })), { minLength: 4, maxLength: 4 }),
        (seed, profileId, offsets) => {
          const x = scenario({ seed, candidates: 400, profileId });
          const galaxy = galaxyModel(x.plan);
          const ctx = allocationContext(x.profile, galaxy, x.plan.goals.linesA, x.catalog.targets, targetWeights(x.plan, x.catalog.targets, []));
          const env = searchEnv(x.plan, ctx);
          const c = tangentCentre(galaxy.raDeg, galaxy.decDeg);
          const pointings = naiveCrossLayout(x.plan, galaxy, x.profile).map((p, i) => {
            const [u, v, paDeg] = offsets[i];
            const s = galaxyToSkyArcsec(u, v, galaxy.paDeg);
            const q = tangentToSkyDeg(c, s.xiArcsec, s.etaArcsec);
            return { ...p, raDeg: q.raDeg, decDeg: q.decDeg, paDeg };
          });
          const proxy = proxyModel(env);
          const bound = objectiveUpperBound(env, pointings.map((p) => proxy(p, true).set));
          expect(bound).toBeGreaterThanOrEqual(evaluatePointings(env, pointings).value.total - 1e-9);
        },
      ),
      { numRuns: 6, seed: 11 },
    );
  });
});
