import { beforeAll, describe, expect, it } from 'vitest';
import highsLoader from 'highs';
import { allocateGreedyMaskByMask, allocateJoint, jointObjective, resolveOneMask, type JointProblem } from '../../src/core/solver/jointAllocation';
import { intervalCliques, solveJointExact, type HighsLike } from '../../src/core/solver/jointIlp';
import { randomJointProblem } from './randomJoint';

let highs: HighsLike;
beforeAll(async () => {
  highs = (await highsLoader()) as unknown as HighsLike;
});

function assertFeasible(problem: JointProblem, chosen: number[][]): void {
  const used = new Set<number>();
  chosen.forEach((sel, m) => {
    const set = problem.masks[m];
    for (const k of sel) {
      const o = set.objects[k];
      expect(used.has(o)).toBe(false);
      used.add(o);
    }
    const sorted = [...sel].sort((a, b) => set.starts[a] - set.starts[b]);
    for (let i = 1; i < sorted.length; i++) expect(set.ends[sorted[i - 1]]).toBeLessThanOrEqual(set.starts[sorted[i]]);
  });
}

describe('joint allocation against the exact integer optimum (HiGHS, the highs npm package)', () => {
  it('stays within 0.5 % of the HiGHS optimum on medium random cases, and records the worst ratio', () => {
    let worst = 1, worstGreedy = 1;
    const cases = 20;
    for (let c = 0; c < cases; c++) {
      const problem = randomJointProblem(`joint-${c}`, {
        objects: 250 + 20 * c, masks: 2 + (c % 4), perMask: 100 + 10 * c, lengthArcsec: 330 + 30 * (c % 5), integerWeights: c % 3 === 0,
      });
      const exact = solveJointExact(highs, problem);
      expect(exact.status).toBe('Optimal');
      assertFeasible(problem, exact.chosen);
      expect(jointObjective(problem, exact.chosen)).toBeCloseTo(exact.objective, 6);
      const fast = allocateJoint(problem);
      assertFeasible(problem, fast.chosen);
      expect(jointObjective(problem, fast.chosen)).toBeCloseTo(fast.objective, 9);
      // The Lagrangian bound is a true upper bound and the fast path never beats the optimum.
      expect(fast.objective).toBeLessThanOrEqual(exact.objective + 1e-6);
      expect(fast.upperBound).toBeGreaterThanOrEqual(exact.objective - 1e-6);
      worst = Math.min(worst, fast.objective / exact.objective);
      worstGreedy = Math.min(worstGreedy, allocateGreedyMaskByMask(problem).objective / exact.objective);
    }
    console.log(`joint allocation vs HiGHS optimum over ${cases} random cases: worst ratio ${worst.toFixed(5)} (greedy mask-by-mask worst ${worstGreedy.toFixed(5)})`);
    expect(worst).toBeGreaterThanOrEqual(0.995);
  }, 300_000);

  it('with one mask the fast path is the exact optimum', () => {
    const problem = randomJointProblem('single', { objects: 200, masks: 1, perMask: 200, lengthArcsec: 400 });
    expect(allocateJoint(problem).objective).toBeCloseTo(solveJointExact(highs, problem).objective, 6);
  });

  it('re-solving one mask never lowers the total and keeps every object once', () => {
    const problem = randomJointProblem('resolve', { objects: 400, masks: 4, perMask: 200, lengthArcsec: 330 });
    const base = allocateGreedyMaskByMask(problem);
    for (let m = 0; m < 4; m++) {
      const next = resolveOneMask(problem, base.chosen, m);
      assertFeasible(problem, next);
      expect(jointObjective(problem, next)).toBeGreaterThanOrEqual(base.objective - 1e-9);
    }
  });

  it('finds the maximal cliques of an interval set', () => {
    // [0,6) [2,8) [7,9) [10,12): cliques {0,1}, {1,2}; the last interval is alone.
    const c = intervalCliques([0, 2, 7, 10], [6, 8, 9, 12]).map((s) => [...s].sort());
    expect(c).toEqual([[0, 1], [1, 2]]);
  });
});
