/**
 * Elision of unchanged masks between consecutive solver results (worker/protocol.ts `keptMasks`): the worker sends
 * null for a mask whose solution object is the one it sent last time, and the client restores it from the previous
 * result it delivered. Both sides see every result in order, so "the previous result" is the same on both.
 */
import type { MaskSolution } from '../../core/geometry/maskSolution';

/** The masks to post and the indices left out, given what was posted last (compared by identity). */
export function elideKeptMasks(masks: readonly MaskSolution[], lastPosted: readonly MaskSolution[] | null): { masks: (MaskSolution | null)[]; kept: number[] } {
  if (!lastPosted || lastPosted.length !== masks.length) return { masks: [...masks], kept: [] };
  const kept: number[] = [];
  const out = masks.map((m, i) => {
    if (m === lastPosted[i]) { kept.push(i); return null; }
    return m;
  });
  return { masks: out, kept };
}

/** The full masks of a received result: the kept indices filled from the previous delivered result. */
export function restoreKeptMasks(masks: readonly (MaskSolution | null)[], kept: readonly number[] | undefined, previous: readonly MaskSolution[] | null): MaskSolution[] {
  if (!kept || kept.length === 0) return masks as MaskSolution[];
  if (!previous || previous.length !== masks.length) throw new Error('solver result refers to masks of a previous result that the client does not have');
  const out = masks.slice();
  for (const i of kept) out[i] = previous[i];
  return out as MaskSolution[];
}
