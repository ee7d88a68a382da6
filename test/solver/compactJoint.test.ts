import { describe, expect, it } from 'vitest';
import { allocateGreedyMaskByMask, allocateJoint, compactJointProblem, jointObjective, resolveOneMask } from '../../src/core/solver/jointAllocation';
import { weightedIntervalScheduling } from '../../src/core/solver/intervalScheduling';
import { randomJointProblem } from './randomJoint';

describe('the joint problem over the objects on the masks only', () => {
  it('renumbers only the objects on some mask, in catalog order, and the allocation chooses the same slits with the same total', () => {
    for (const [c, integerWeights] of [[0, false], [1, true], [2, false]] as const) {
      // 3 000 objects of which the masks see a few hundred, as when a catalog is far larger than the masks' fields.
      const problem = randomJointProblem(`compact-${c}`, { objects: 3000, masks: 4, perMask: 180, lengthArcsec: 700, integerWeights });
      const compact = compactJointProblem(problem.weights, problem.masks);
      const used = new Set<number>();
      for (const set of problem.masks) for (const o of set.objects) used.add(o);
      expect(compact.weights.length).toBe(used.size);
      const sorted = [...used].sort((a, b) => a - b);
      problem.masks.forEach((set, m) => set.objects.forEach((o, k) => {
        expect(sorted[compact.masks[m].objects[k]]).toBe(o);
        expect(compact.weights[compact.masks[m].objects[k]]).toBe(problem.weights[o]);
      }));
      const a = allocateJoint(problem), b = allocateJoint(compact);
      expect(b.chosen).toEqual(a.chosen);
      expect(jointObjective(compact, b.chosen)).toBe(jointObjective(problem, a.chosen));
      // A second call reuses its scratch map: the same result again.
      expect(compactJointProblem(problem.weights, problem.masks).masks[0].objects).toEqual(compact.masks[0].objects);
    }
  });

  it('re-solves one mask of a large catalog exactly with the others fixed, and leaves its scratch clean', () => {
    const problem = randomJointProblem('resolve-large', { objects: 5000, masks: 4, perMask: 200, lengthArcsec: 600 });
    const base = allocateGreedyMaskByMask(problem).chosen;
    for (let round = 0; round < 2; round++) {
      for (let m = 0; m < 4; m++) {
        const next = resolveOneMask(problem, base, m);
        // The other masks keep their slits; mask m gets the optimum over the objects no other mask holds.
        for (let b = 0; b < 4; b++) if (b !== m) expect(next[b]).toEqual(base[b]);
        const held = new Set(base.flatMap((sel, b) => (b === m ? [] : sel.map((k) => problem.masks[b].objects[k]))));
        const set = problem.masks[m];
        const w = Array.from(set.objects, (o) => (held.has(o) ? 0 : problem.weights[o]));
        const opt = weightedIntervalScheduling(set.starts, set.ends, w).total;
        expect(next[m].reduce((a, k) => a + w[k], 0)).toBeCloseTo(opt, 9);
        expect(next[m].every((k) => !held.has(set.objects[k]))).toBe(true);
      }
    }
  });
});
