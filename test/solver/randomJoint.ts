/** Random joint-allocation problems for tests and the benchmark: masks with overlapping object sets along y. */
import { maskCandidateSet, type JointProblem } from '../../src/core/solver/jointAllocation';
import { makeRng } from '../../src/core/numeric/random';

/**
 * `objects` objects with random weights; each mask sees a random share of them (shared objects fall on several
 * masks, as where masks overlap) at random y in [0, lengthArcsec), intervals [y - L/2, y + L/2 + gap).
 */
export function randomJointProblem(seed: string | number, opts: { objects: number; masks: number; perMask: number; lengthArcsec: number; minLengthArcsec?: number; gapArcsec?: number; integerWeights?: boolean }): JointProblem {
  const rng = makeRng(seed);
  const L = opts.minLengthArcsec ?? 5, g = opts.gapArcsec ?? 1;
  const weights = Float64Array.from({ length: opts.objects }, () => (opts.integerWeights ? 1 + rng.int(3) : Math.round(rng.uniform(0.2, 3) * 1000) / 1000));
  const masks = Array.from({ length: opts.masks }, () => {
    const objs = new Set<number>();
    while (objs.size < Math.min(opts.perMask, opts.objects)) objs.add(rng.int(opts.objects));
    const list = [...objs];
    const ys = list.map(() => rng.uniform(0, opts.lengthArcsec));
    return maskCandidateSet(list, ys.map((y) => y - L / 2), ys.map((y) => y + L / 2 + g));
  });
  return { weights, masks };
}
