/**
 * The mixed joint allocation against the exact integer optimum: masks of different spectrographs at fixed, strongly
 * overlapping pointings (so many tracers could go to several masks, with a different value on each telescope);
 * the Lagrangian allocation must come within 0.5 % of the optimum HiGHS (the `highs` npm package, an independent
 * MIP solver) finds for the same problem, written as an integer program by solver/jointIlp.ts.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import highsLoader from 'highs';
import { solveJointExact, type HighsLike } from '../../src/core/solver/jointIlp';
import { allocateJoint, jointObjective } from '../../src/core/solver/jointAllocation';
import { jointProblemOf, prepareMasks } from '../../src/core/solver/allocateMasks';
import { instrumentsAllocationContext } from '../../src/core/solver/instrumentContexts';
import { mixedScenario } from '../../src/core/scenario/mixedScenario';
import { parsePlan, galaxyModel } from '../../src/core/plan/validate';
import { targetWeights } from '../../src/core/pipeline/pipeline';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import { generatedProfiles, shippedProfile } from './mixedCase';
import type { InstrumentProfile } from '../../src/core/profile/schema';
import type { MaskPointing } from '../../src/core/geometry/maskSolution';

let highs: HighsLike;
beforeAll(async () => {
  highs = (await highsLoader()) as unknown as HighsLike;
});

/** A mixed problem: `profiles[k]` gets mask k, all centred within 150 arcsec of the galaxy at PAs 0, 50, 100... */
function mixedProblem(seed: string, profiles: InstrumentProfile[]) {
  const unique = profiles.filter((p, k) => profiles.findIndex((q) => q.id === p.id) === k);
  const s = mixedScenario({ seed, candidates: 2500, galaxy: { reArcsec: 50 }, maxRadiusRe: 8, fieldHalfSizeRe: 10, alignmentStars: 300 }, unique.map((p) => ({ profile: p, masks: profiles.filter((q) => q.id === p.id).length })));
  const plan = parsePlan(s.plan);
  const galaxy = galaxyModel(plan);
  const ctx = instrumentsAllocationContext(plan, unique, galaxy, s.targets, targetWeights(plan, s.targets, []));
  const c = tangentCentre(galaxy.raDeg, galaxy.decDeg);
  const pointings: MaskPointing[] = profiles.map((p, k) => {
    const at = tangentToSkyDeg(c, 150 * Math.cos(k * 2.1), 150 * Math.sin(k * 2.1));
    return { id: `m${k + 1}`, raDeg: at.raDeg, decDeg: at.decDeg, paDeg: (50 * k) % 360, locked: true, instrument: p.id };
  });
  return jointProblemOf(ctx, prepareMasks(ctx, pointings));
}

describe('mixed joint allocation within 0.5 % of the HiGHS optimum (fixed pointings)', () => {
  const [hex, strip] = generatedProfiles();
  const cases: [string, InstrumentProfile[]][] = [
    ['narrow 10 m + wide 6.5 m', [shippedProfile('ridge10-narrow'), shippedProfile('broad65-wide'), shippedProfile('ridge10-narrow')]],
    ['square 8 m + narrow 10 m + wide 6.5 m', [shippedProfile('quad8-square'), shippedProfile('ridge10-narrow'), shippedProfile('broad65-wide')]],
    ['generated hexagon 4 m + strip 8.2 m + square 8 m', [hex, strip, shippedProfile('quad8-square')]],
  ];
  for (const [name, profiles] of cases) {
    it(name, () => {
      const problem = mixedProblem(name, profiles);
      const shared = new Map<number, number>();
      for (const set of problem.masks) for (const o of set.objects) shared.set(o, (shared.get(o) ?? 0) + 1);
      const onSeveral = [...shared.values()].filter((n) => n > 1).length;
      // The case is a real joint problem: values differ by mask, and many tracers could go to several masks.
      expect(problem.masks.every((set) => set.values !== undefined)).toBe(true);
      expect(onSeveral).toBeGreaterThan(30);
      const exact = solveJointExact(highs, problem);
      expect(exact.status).toBe('Optimal');
      const ours = allocateJoint(problem);
      expect(jointObjective(problem, ours.chosen)).toBeCloseTo(ours.objective, 9);
      console.log(`${name}: ${problem.masks.map((m) => m.objects.length).join('/')} candidates, ${onSeveral} on several masks; ours ${ours.objective.toFixed(4)}, HiGHS ${exact.objective.toFixed(4)}, gap ${(100 * (1 - ours.objective / exact.objective)).toFixed(4)} %`);
      expect(ours.objective).toBeGreaterThanOrEqual(exact.objective * (1 - 0.005));
      expect(ours.objective).toBeLessThanOrEqual(exact.objective * (1 + 1e-9));
    });
  }
});
