/**
 * The schedule heuristic for surveys beyond the exact solver's size, and an upper bound to measure it against.
 *
 * Heuristic (greedy by weight, least-contended placement, then one repair pass):
 * 1. Masks in order of priority (highest first), then fewest candidate blocks (least flexible first), then longest.
 * 2. Each mask takes, among its candidates that overlap no block already placed, the one whose slots are wanted by
 *    the fewest other masks still waiting (the "demand" of a slot = number of masks with a candidate on it);
 *    ties go to the earlier slot of the night, then the earlier night.
 * 3. Repair: each mask left out tries to enter by moving one placed block of its telescope and night to another of
 *    that block's own candidates that is free; the move is kept only if both then fit.
 *
 * Bound (valid for any schedule): per telescope, the fractional knapsack of masks (value = priority, size = the slots
 * its block occupies) into the number of distinct slots any candidate of that telescope covers; summed over
 * telescopes. A mask counts at most once, so the bound is also at most the total priority of masks with a candidate.
 */
import type { CandidateBlock, MaskRequest } from './blocks';

interface Occupancy {
  isFree(c: CandidateBlock): boolean;
  take(c: CandidateBlock, owner: number): void;
  release(c: CandidateBlock): void;
  ownersOf(c: CandidateBlock): Set<number>;
}

/** Slot occupancy per telescope and night: the candidate index holding each slot. */
function occupancy(): Occupancy {
  const held = new Map<string, Int32Array>();
  const row = (c: CandidateBlock) => {
    const key = `${c.telescope}/${c.night}`;
    let r = held.get(key);
    if (!r) {
      r = new Int32Array(1441).fill(-1);
      held.set(key, r);
    }
    return r;
  };
  return {
    isFree(c) {
      const r = row(c);
      for (let s = c.startSlot; s < c.startSlot + c.slots; s++) if (r[s] !== -1) return false;
      return true;
    },
    take(c, owner) {
      const r = row(c);
      for (let s = c.startSlot; s < c.startSlot + c.slots; s++) r[s] = owner;
    },
    release(c) {
      const r = row(c);
      for (let s = c.startSlot; s < c.startSlot + c.slots; s++) r[s] = -1;
    },
    ownersOf(c) {
      const r = row(c);
      const out = new Set<number>();
      for (let s = c.startSlot; s < c.startSlot + c.slots; s++) if (r[s] !== -1) out.add(r[s]);
      return out;
    },
  };
}

/** Candidate indices of each mask. */
export function candidatesByMask(candidates: readonly CandidateBlock[], maskCount: number): number[][] {
  const out: number[][] = Array.from({ length: maskCount }, () => []);
  candidates.forEach((c, i) => out[c.mask].push(i));
  return out;
}

/** The heuristic schedule: chosen candidate indices (at most one per mask, no overlaps). */
export function scheduleGreedy(candidates: readonly CandidateBlock[], requests: readonly MaskRequest[]): number[] {
  const byMask = candidatesByMask(candidates, requests.length);
  // Demand of each slot: the masks with a candidate covering it (counted once per mask).
  const demand = new Map<string, number>();
  byMask.forEach((list) => {
    const seen = new Set<string>();
    for (const i of list) {
      const c = candidates[i];
      for (let s = c.startSlot; s < c.startSlot + c.slots; s++) seen.add(`${c.telescope}/${c.night}/${s}`);
    }
    for (const k of seen) demand.set(k, (demand.get(k) ?? 0) + 1);
  });
  const order = requests.map((_, m) => m).filter((m) => byMask[m].length > 0)
    .sort((a, b) => requests[b].priority - requests[a].priority || byMask[a].length - byMask[b].length || requests[b].hoursNeeded - requests[a].hoursNeeded || a - b);
  const occ = occupancy();
  const placed = new Map<number, number>(); // mask -> candidate
  const cost = (c: CandidateBlock) => {
    let sum = 0;
    for (let s = c.startSlot; s < c.startSlot + c.slots; s++) sum += demand.get(`${c.telescope}/${c.night}/${s}`) ?? 0;
    return sum;
  };
  for (const m of order) {
    let best = -1, bestCost = Infinity;
    for (const i of byMask[m]) {
      const c = candidates[i];
      if (!occ.isFree(c)) continue;
      const k = cost(c);
      if (k < bestCost) { best = i; bestCost = k; }
    }
    if (best >= 0) {
      occ.take(candidates[best], best);
      placed.set(m, best);
    }
  }
  // Repair: a left-out mask enters by moving one blocking block elsewhere among its own candidates.
  for (const m of order) {
    if (placed.has(m)) continue;
    for (const i of byMask[m]) {
      const c = candidates[i];
      const owners = occ.ownersOf(c);
      if (owners.size !== 1) continue;
      const blocker = [...owners][0];
      const bc = candidates[blocker];
      occ.release(bc);
      occ.take(c, i);
      const alt = byMask[bc.mask].find((j) => j !== blocker && occ.isFree(candidates[j]));
      if (alt !== undefined) {
        occ.take(candidates[alt], alt);
        placed.set(bc.mask, alt);
        placed.set(m, i);
        break;
      }
      occ.release(c);
      occ.take(bc, blocker);
    }
  }
  return [...placed.values()].sort((a, b) => a - b);
}

/** Upper bound on the total priority of any schedule (fractional knapsack per telescope, see the module comment). */
export function scheduleUpperBound(candidates: readonly CandidateBlock[], requests: readonly MaskRequest[]): number {
  const byMask = candidatesByMask(candidates, requests.length);
  const capacity = new Map<number, Set<string>>();
  for (const c of candidates) {
    let set = capacity.get(c.telescope);
    if (!set) capacity.set(c.telescope, (set = new Set()));
    for (let s = c.startSlot; s < c.startSlot + c.slots; s++) set.add(`${c.night}/${s}`);
  }
  let bound = 0;
  for (const [telescope, slotsFree] of capacity) {
    const items = byMask.map((list, m) => ({ m, list })).filter((x) => x.list.length && candidates[x.list[0]].telescope === telescope)
      .map(({ m, list }) => ({ value: requests[m].priority, size: Math.min(...list.map((i) => candidates[i].slots)) }))
      .sort((a, b) => b.value / b.size - a.value / a.size);
    let room = slotsFree.size;
    for (const it of items) {
      if (room <= 0) break;
      const take = Math.min(1, room / it.size);
      bound += take * it.value;
      room -= take * it.size;
    }
  }
  return bound;
}
