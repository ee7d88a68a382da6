/**
 * Joint allocation against the exact integer optimum (HiGHS, the `highs` npm package) on problems with real mask
 * geometry: generated galaxies, every instrument profile, and the search's start layouts with heavy overlap (every
 * mask on the galaxy centre, turned from each other; masks half a footprint out in a ring; the cross). The random
 * synthetic problems of test/solver/jointAllocation.test.ts have uniform overlap; here the shared objects cluster
 * where the galaxy's clusters are dense, which is where a heuristic is most likely to trade badly.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import highsLoader from 'highs';
import { readFileSync } from 'node:fs';
import { generateScenario, scenarioCatalog } from '../../src/core/scenario/generator';
import { galaxyModel, parsePlan } from '../../src/core/plan/validate';
import { parseProfile } from '../../src/core/profile/load';
import { targetWeights } from '../../src/core/pipeline/pipeline';
import { allocateForPointings, allocationContext, jointProblemOf } from '../../src/core/solver/allocateMasks';
import { jointObjective } from '../../src/core/solver/jointAllocation';
import { solveJointExact, type HighsLike } from '../../src/core/solver/jointIlp';
import { startLayouts } from '../../src/core/solver/pointingSearch';

let highs: HighsLike;
beforeAll(async () => {
  highs = (await highsLoader()) as unknown as HighsLike;
});

const CASES = [
  { profileId: 'ridge10-narrow', seed: 41, candidates: 400, masks: 4, galaxy: { raDeg: 359.95, decDeg: 33.1, reArcsec: 35, axisRatio: 0.5, paDeg: 75 } },
  { profileId: 'quad8-square', seed: 42, candidates: 350, masks: 5, galaxy: { raDeg: 44.5, decDeg: -62.3, reArcsec: 20, axisRatio: 0.9, paDeg: 5 } },
  { profileId: 'broad65-wide', seed: 43, candidates: 450, masks: 3, galaxy: { raDeg: 233.3, decDeg: 8.2, reArcsec: 60, axisRatio: 0.7, paDeg: 160 } },
];
const LAYOUTS = ['centred star', 'inner ring', 'cross'];

describe('joint allocation vs the HiGHS optimum on real mask geometry', () => {
  it('stays within 0.6 % of the optimum on every profile and overlapping layout, and records the worst ratio', () => {
    // Measured (printed): 1.00000 on the three crosses (little overlap), 0.99457-0.99999 with heavy overlap — worst on
    // the narrow profile's inner ring (202 objects, 169 of them on several masks), just under the 0.995 that the random
    // synthetic cases reach. Floor 0.994. HiGHS needs 0.1-12 s per problem here; the largest cases are kept small so
    // it proves optimality well inside its 60 s limit (900 rows with 4 centred masks did not finish in 120 s).
    let worst = 1, n = 0, shared = 0;
    const rows: string[] = [];
    for (const c of CASES) {
      const profile = parseProfile(JSON.parse(readFileSync(new URL(`../../instrument-profiles/${c.profileId}.json`, import.meta.url), 'utf8')), c.profileId);
      const s = generateScenario({ seed: c.seed, candidates: c.candidates, alignmentMagRange: profile.alignment.magRange, instrument: c.profileId, masks: c.masks, galaxy: { ...c.galaxy, id: `Ilp Galaxy ${c.seed}` } });
      const plan = parsePlan(s.plan);
      const catalog = scenarioCatalog(s);
      const galaxy = galaxyModel(plan);
      const ctx = allocationContext(profile, galaxy, plan.goals.linesA, catalog.targets, targetWeights(plan, catalog.targets, []));
      for (const layout of startLayouts(plan, galaxy, profile).filter((l) => LAYOUTS.includes(l.name))) {
        const a = allocateForPointings(ctx, layout.pointings);
        const problem = jointProblemOf(ctx, a.prepared);
        // Objects that fall on several masks: the part of the problem the joint allocation has to trade.
        const seen = new Map<number, number>();
        for (const m of problem.masks) for (const o of m.objects) seen.set(o, (seen.get(o) ?? 0) + 1);
        const multi = [...seen.values()].filter((k) => k > 1).length;
        shared += multi;
        const exact = solveJointExact(highs, problem, 60);
        expect(exact.status).toBe('Optimal');
        expect(jointObjective(problem, exact.chosen)).toBeCloseTo(exact.objective, 6);
        expect(a.joint.objective).toBeLessThanOrEqual(exact.objective + 1e-6);
        expect(a.joint.upperBound).toBeGreaterThanOrEqual(exact.objective - 1e-6);
        const ratio = a.joint.objective / exact.objective;
        worst = Math.min(worst, ratio);
        n++;
        rows.push(`${c.profileId} ${c.masks} masks, ${layout.name}: ${seen.size} objects, ${multi} on several masks, ratio ${ratio.toFixed(5)}`);
      }
    }
    console.log(`joint allocation vs HiGHS on ${n} real-geometry problems: worst ratio ${worst.toFixed(5)}\n  ${rows.join('\n  ')}`);
    expect(n).toBe(CASES.length * LAYOUTS.length);
    // Overlap is really there (otherwise every mask is solved exactly on its own and the check says nothing).
    expect(shared).toBeGreaterThan(100);
    expect(worst).toBeGreaterThanOrEqual(0.994);
  }, 600_000);
});
