import { describe, expect, it } from 'vitest';
import { allocateJoint, compactJointProblem, jointObjective } from '../../src/core/solver/jointAllocation';
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
});
