/**
 * Joint slit allocation over several masks, each object used at most once over all masks (see docs/allocation.md).
 * Each mask is an exact weighted interval scheduling over y (intervals [y - L/2, y + L/2 + gap)). The coupling
 * "at most once" is handled by Lagrangian relaxation: per-object multipliers (only for objects that fall on
 * several masks) are subtracted from their weights, every mask is solved exactly, and the multipliers follow a
 * subgradient (Polyak step). Each round's per-mask picks are repaired into a feasible plan (duplicates go to one
 * mask) and improved by best-response sweeps (re-solve one mask exactly with the others fixed, which never lowers
 * the total) and, for the first plan within 0.2 % of the best and for the final plan, by steal moves (improveBySteals).
 * The best feasible plan is returned with the Lagrangian upper bound as an optimality certificate.
 */
import { buildIntervalIndex, optimumWithoutEach, solveIntervalIndex, solveSortedWeights, type IntervalIndex } from './intervalScheduling';

/** The candidates of one mask: object index (into the joint weight list) and the half-open y interval of each. */
export interface MaskCandidateSet {
  objects: Int32Array;
  starts: Float64Array;
  ends: Float64Array;
  index: IntervalIndex;
  /** Value of each candidate on this mask when it differs by mask (plans of several spectrographs); else the object's weight. */
  values?: Float64Array;
}

/** Value of candidate k of mask m: the mask's own value when given, else the object's weight. */
export function candidateValue(problem: JointProblem, m: number, k: number): number {
  const set = problem.masks[m];
  return set.values ? set.values[k] : problem.weights[set.objects[k]];
}

/** A joint problem: weights per object (positive), and each mask's candidates. */
export interface JointProblem {
  weights: Float64Array;
  masks: MaskCandidateSet[];
}

/** Chosen candidate positions (into each mask's candidate arrays), the total weight and the Lagrangian bound. */
export interface JointSolution {
  chosen: number[][];
  objective: number;
  /** An upper bound on the integer optimum (Infinity when not computed). */
  upperBound: number;
  iterations: number;
}

/** Build a mask's candidate set from object indices and y intervals (arcsec); sorts once. */
export function maskCandidateSet(objects: ArrayLike<number>, starts: ArrayLike<number>, ends: ArrayLike<number>): MaskCandidateSet {
  const s = Float64Array.from(starts), e = Float64Array.from(ends);
  return { objects: Int32Array.from(objects), starts: s, ends: e, index: buildIntervalIndex(s, e) };
}

/** Scratch map from catalog object index to compact index (-1 when unused); every entry set is reset before return. */
let compactIndexOf = new Int32Array(0);

/**
 * The joint problem over only the objects that fall on some mask, renumbered 0.. in increasing catalog order (so every
 * loop over objects keeps its order and the solution is the same), each mask's candidates keeping their positions:
 * chosen positions mean the same in both problems. The allocation's per-object arrays then grow with the candidates
 * on the masks, not with the catalog. O(candidates on the masks, plus a sort of the distinct objects).
 */
export function compactJointProblem(weights: Float64Array, masks: readonly MaskCandidateSet[]): JointProblem {
  if (compactIndexOf.length < weights.length) compactIndexOf = new Int32Array(weights.length).fill(-1);
  const map = compactIndexOf;
  const seen: number[] = [];
  for (const set of masks) for (const o of set.objects) if (map[o] === -1) { map[o] = 0; seen.push(o); }
  const ids = Int32Array.from(seen).sort();
  const local = new Float64Array(ids.length);
  for (let i = 0; i < ids.length; i++) { map[ids[i]] = i; local[i] = weights[ids[i]]; }
  const out = masks.map((set) => ({ ...set, objects: set.objects.map((o) => map[o]) }));
  for (let i = 0; i < ids.length; i++) map[ids[i]] = -1;
  return { weights: local, masks: out };
}

/** The problem itself when most of its objects fall on a mask, else compactJointProblem of it (the same solutions). */
function overMaskObjects(problem: JointProblem): JointProblem {
  let n = 0;
  for (const set of problem.masks) n += set.objects.length;
  return problem.weights.length > 2 * n + 1024 ? compactJointProblem(problem.weights, problem.masks) : problem;
}

/** Total weight of a joint selection (summed mask by mask, each mask's picks in their order). */
export function jointObjective(problem: JointProblem, chosen: readonly (readonly number[])[]): number {
  let t = 0;
  for (let m = 0; m < chosen.length; m++) {
    const sel = chosen[m], set = problem.masks[m], values = set.values;
    if (values) for (let q = 0; q < sel.length; q++) t += values[sel[q]];
    else for (let q = 0; q < sel.length; q++) t += problem.weights[set.objects[sel[q]]];
  }
  return t;
}

function ownerOf(problem: JointProblem, chosen: readonly (readonly number[])[], into?: Int32Array): Int32Array {
  const owner = into ? into.fill(-1) : new Int32Array(problem.weights.length).fill(-1);
  chosen.forEach((sel, m) => { for (const k of sel) owner[problem.masks[m].objects[k]] = m; });
  return owner;
}

/**
 * Per-mask weight buffers for repeated exact re-solves of one problem: only objects on several masks can be held by
 * another mask, so each buffer keeps the plain weights and a re-solve rewrites only the shared positions.
 */
export interface ResponseWork {
  /** Per mask, its candidates' weights in the order of its interval index (buffers[m][k] for candidate index.order[k]). */
  buffers: Float64Array[];
  /** Per mask, the sorted positions k whose candidate's object is shared, and that object and the candidate's value. */
  sharedPositions: Int32Array[];
  sharedObjects: Int32Array[];
  sharedValues: Float64Array[];
  /** The problem's sharedObjects, the lists above were built from. */
  shared: Uint8Array;
}

/** Build the re-solve buffers of a problem (O(total candidates)); worth it when a problem is re-solved many times. */
export function responseWork(problem: JointProblem, shared: Uint8Array = sharedObjects(problem)): ResponseWork {
  const work: ResponseWork = { buffers: [], sharedPositions: [], sharedObjects: [], sharedValues: [], shared };
  for (const set of problem.masks) {
    const { order } = set.index, n = order.length;
    const w = new Float64Array(n);
    let nShared = 0;
    for (let k = 0; k < n; k++) {
      const i = order[k];
      w[k] = set.values ? set.values[i] : problem.weights[set.objects[i]];
      if (shared[set.objects[i]] === 1) nShared++;
    }
    const positions = new Int32Array(nShared), objects = new Int32Array(nShared), values = new Float64Array(nShared);
    for (let k = 0, q = 0; k < n; k++) {
      const o = set.objects[order[k]];
      if (shared[o] !== 1) continue;
      positions[q] = k; objects[q] = o; values[q] = w[k]; q++;
    }
    work.buffers.push(w); work.sharedPositions.push(positions); work.sharedObjects.push(objects); work.sharedValues.push(values);
  }
  return work;
}

/** A second set of re-solve buffers for the same problem (its own weight buffers, the read-only shared lists of `work`). */
function copyOfWork(work: ResponseWork): ResponseWork {
  return { ...work, buffers: work.buffers.map((b) => b.slice()) };
}

let brBuf = new Float64Array(0);

/** Weights of mask m's candidates (original order) with objects owned by another mask set to 0, in a scratch buffer reused by the next call. */
function availableWeights(problem: JointProblem, owner: Int32Array, m: number): Float64Array {
  const set = problem.masks[m];
  const n = set.objects.length;
  if (brBuf.length < n) brBuf = new Float64Array(Math.max(n, brBuf.length * 2));
  const { objects, values } = set, weights = problem.weights;
  for (let k = 0; k < n; k++) {
    const o = objects[k], b = owner[o];
    brBuf[k] = b === -1 || b === m ? (values ? values[k] : weights[o]) : 0;
  }
  return brBuf;
}

/** Exact re-solve of mask m with every other mask fixed (objects owned by another mask are unavailable); updates owner. */
function bestResponse(problem: JointProblem, owner: Int32Array, chosen: number[][], m: number, work?: ResponseWork): void {
  const set = problem.masks[m];
  let pick: number[];
  if (work) {
    // availableWeights' rule, written in the index's order at the shared positions only.
    const w = work.buffers[m], positions = work.sharedPositions[m], objects = work.sharedObjects[m], values = work.sharedValues[m];
    for (let q = 0; q < positions.length; q++) {
      const o = objects[q];
      w[positions[q]] = owner[o] === -1 || owner[o] === m ? values[q] : 0;
    }
    pick = solveSortedWeights(set.index, w).chosen;
  } else pick = solveIntervalIndex(set.index, availableWeights(problem, owner, m)).chosen;
  for (const k of chosen[m]) owner[set.objects[k]] = -1;
  chosen[m] = pick;
  for (const k of chosen[m]) owner[set.objects[k]] = m;
}

/** Scratch owner per catalog object for resolveOneMask (-1: no mask); every entry set is reset before return. */
let ownerScratch = new Int32Array(0);

/**
 * Re-solve one mask exactly with the others fixed (the editor's drag, the search's trial move); returns a new
 * selection, never a worse total. O(candidates of mask m + slits chosen on all masks): only the chosen objects are
 * marked in a scratch owner array kept between calls, so nothing of the catalog's size is built or scanned.
 */
export function resolveOneMask(problem: JointProblem, chosen: readonly (readonly number[])[], m: number): number[][] {
  const next = chosen.map((s) => s.slice());
  if (ownerScratch.length < problem.weights.length) ownerScratch = new Int32Array(problem.weights.length).fill(-1);
  const owner = ownerScratch;
  // As ownerOf: masks in order, a later mask's claim overwriting an earlier one's.
  next.forEach((sel, b) => { for (const k of sel) owner[problem.masks[b].objects[k]] = b; });
  try {
    bestResponse(problem, owner, next, m);
  } finally {
    for (const sels of [chosen, next]) sels.forEach((sel, b) => { for (const k of sel) owner[problem.masks[b].objects[k]] = -1; });
  }
  return next;
}

/** Best-response sweeps over all masks until a sweep gains nothing (or maxSweeps); `work` only speeds it up. */
export function improveByBestResponse(problem: JointProblem, chosen: number[][], maxSweeps = 10, work?: ResponseWork): number[][] {
  sweepBestResponses(overMaskObjects(problem), chosen, maxSweeps, work);
  return chosen;
}

/** improveByBestResponse in place on a problem over its mask objects, returning jointObjective of the result (the same sum). */
function sweepBestResponses(problem: JointProblem, chosen: number[][], maxSweeps: number, work?: ResponseWork, owner?: Int32Array): number {
  owner = ownerOf(problem, chosen, owner);
  let value = jointObjective(problem, chosen);
  for (let sweep = 0; sweep < maxSweeps; sweep++) {
    for (let m = 0; m < problem.masks.length; m++) bestResponse(problem, owner, chosen, m, work);
    const v = jointObjective(problem, chosen);
    if (v <= value * (1 + 1e-12)) { value = v; break; }
    value = v;
  }
  return value;
}

function maskValue(problem: JointProblem, chosen: readonly (readonly number[])[], m: number): number {
  let v = 0;
  for (const k of chosen[m]) v += candidateValue(problem, m, k);
  return v;
}

/** 1 for every object that is a candidate on more than one mask (the only objects a steal can move), else 0. */
export function sharedObjects(problem: JointProblem): Uint8Array {
  const count = new Uint8Array(problem.weights.length);
  for (const set of problem.masks) for (const o of set.objects) if (count[o] < 2) count[o]++;
  for (let o = 0; o < count.length; o++) count[o] = count[o] > 1 ? 1 : 0;
  return count;
}

/**
 * What each held shared object is worth to its holder: the holder's value minus its exact optimum without that
 * object. Fills `loss` for the shared objects (`shared` from sharedObjects) held by any mask; others are untouched.
 */
function holderLosses(problem: JointProblem, chosen: readonly (readonly number[])[], shared: Uint8Array, loss: Float64Array, ownerBuf?: Int32Array): void {
  const owner = ownerOf(problem, chosen, ownerBuf);
  for (let b = 0; b < problem.masks.length; b++) {
    const set = problem.masks[b];
    const held = chosen[b].filter((k) => shared[set.objects[k]] === 1);
    if (!held.length) continue;
    // A view of the scratch buffer: nothing else writes it before optimumWithoutEach returns.
    const w = availableWeights(problem, owner, b).subarray(0, set.objects.length);
    const without = optimumWithoutEach(set.index, set.starts, set.ends, w, held);
    const v = maskValue(problem, chosen, b);
    for (const k of held) loss[set.objects[k]] = Math.max(0, v - without[k]);
  }
}

/**
 * Mask a's weights for a steal (into w): its own value for a free or own object, less the holder's loss for an object
 * another mask holds. True when some held object is worth taking at that price.
 */
function stealWeights(problem: JointProblem, a: number, owner: Int32Array, loss: Float64Array, w: Float64Array): boolean {
  const { objects, values } = problem.masks[a], weights = problem.weights;
  let anyPriced = false;
  for (let k = 0; k < w.length; k++) {
    const o = objects[k];
    const b = owner[o];
    const v = values ? values[k] : weights[o];
    if (b === -1 || b === a) { w[k] = v; continue; }
    w[k] = v - loss[o];
    if (w[k] > 1e-12) anyPriced = true;
  }
  return anyPriced;
}

/**
 * Steal moves: mask A may take objects that other masks hold, each priced at what its holder loses without it
 * (computed exactly by re-solving the holder without that one object); the holders then re-solve without the
 * stolen objects, and the move is kept only when the total weight rises. Repeats until no move helps.
 */
export function improveBySteals(problem: JointProblem, chosen: number[][], maxRounds = 3, work?: ResponseWork): number[][] {
  problem = overMaskObjects(problem);
  const M = problem.masks.length;
  let total = jointObjective(problem, chosen);
  const shared = work ? work.shared : sharedObjects(problem);
  work ??= responseWork(problem, shared);
  const loss = new Float64Array(problem.weights.length);
  const ownerBuf = new Int32Array(problem.weights.length), trialOwnerBuf = new Int32Array(problem.weights.length);
  for (let round = 0; round < maxRounds; round++) {
    let accepted = false;
    // Holder's loss per held shared object (exact, one pass per mask), priced once per round: prices are a guide,
    // and every move is verified on the true total, so a price made stale by an earlier move of the round costs nothing.
    holderLosses(problem, chosen, shared, loss, ownerBuf);
    for (let a = 0; a < M; a++) {
      const owner = ownerOf(problem, chosen, ownerBuf);
      const setA = problem.masks[a];
      const w = new Float64Array(setA.objects.length);
      if (!stealWeights(problem, a, owner, loss, w)) continue;
      const pick = solveIntervalIndex(setA.index, w).chosen;
      const stolenFrom = new Set<number>();
      for (const k of pick) { const b = owner[setA.objects[k]]; if (b !== -1 && b !== a) stolenFrom.add(b); }
      if (stolenFrom.size === 0) continue;
      const trial = chosen.map((x) => x.slice());
      const taken = new Set(pick.map((k) => setA.objects[k]));
      for (const b of stolenFrom) trial[b] = trial[b].filter((j) => !taken.has(problem.masks[b].objects[j]));
      trial[a] = pick;
      const trialOwner = ownerOf(problem, trial, trialOwnerBuf);
      for (const b of stolenFrom) bestResponse(problem, trialOwner, trial, b, work);
      bestResponse(problem, trialOwner, trial, a, work);
      const v = jointObjective(problem, trial);
      if (v > total + 1e-9 * Math.max(1, Math.abs(total))) {
        for (let m = 0; m < M; m++) chosen[m] = trial[m];
        total = v;
        accepted = true;
      }
    }
    if (!accepted) break;
  }
  return chosen;
}

/** Greedy mask-by-mask allocation: each mask in turn takes its exact optimum among objects not yet used. */
export function allocateGreedyMaskByMask(problem: JointProblem, order?: readonly number[]): JointSolution {
  problem = overMaskObjects(problem);
  const chosen = problem.masks.map(() => [] as number[]);
  const owner = new Int32Array(problem.weights.length).fill(-1);
  for (const m of order ?? problem.masks.map((_, i) => i)) bestResponse(problem, owner, chosen, m);
  return { chosen, objective: jointObjective(problem, chosen), upperBound: Infinity, iterations: 0 };
}

export interface JointOptions {
  /** Maximum subgradient rounds (default 150). */
  maxIterations?: number;
  /** A feasible selection to start from (e.g. the previous solution while dragging). */
  initial?: number[][];
  /** Use steal moves (improveBySteals) on promising plans and on the final plan (default true). */
  steals?: boolean;
  /** Stop when (upperBound - objective) <= relativeGap * upperBound (default 1e-4, 50 times tighter than the 0.5 % goal). */
  relativeGap?: number;
}

// The rounds of allocateJoint, each a small function of its own: the engine optimises a short hot loop as soon as it
// runs hot, where one long function would wait for (and be re-optimised at) every branch it has not run yet.

/**
 * The relaxed problem's state between rounds: its weight buffers (ResponseWork), where each shared object sits in them
 * (per object o, entries start[o]..start[o + 1]: mask, position in that mask's buffer, value there), and each mask's
 * last exact solution with whether its weights changed since.
 */
interface RelaxedState {
  work: ResponseWork;
  start: Int32Array;
  mask: Int32Array;
  position: Int32Array;
  value: Float64Array;
  picks: number[][];
  totals: Float64Array;
  dirty: Uint8Array;
}

/** The relaxed state of a problem with multipliers 0 (every mask to solve). O(total shared candidates). */
function relaxedState(problem: JointProblem, work: ResponseWork): RelaxedState {
  const nObj = problem.weights.length, M = problem.masks.length;
  const start = new Int32Array(nObj + 1);
  for (let m = 0; m < M; m++) { const objects = work.sharedObjects[m]; for (let q = 0; q < objects.length; q++) start[objects[q] + 1]++; }
  for (let o = 0; o < nObj; o++) start[o + 1] += start[o];
  const fill = start.slice(0, nObj);
  const mask = new Int32Array(start[nObj]), position = new Int32Array(start[nObj]), value = new Float64Array(start[nObj]);
  for (let m = 0; m < M; m++) {
    const objects = work.sharedObjects[m], positions = work.sharedPositions[m], values = work.sharedValues[m];
    for (let q = 0; q < objects.length; q++) { const e = fill[objects[q]]++; mask[e] = m; position[e] = positions[q]; value[e] = values[q]; }
  }
  return { work, start, mask, position, value, picks: problem.masks.map(() => []), totals: new Float64Array(M), dirty: new Uint8Array(M).fill(1) };
}

/**
 * One relaxed round: every mask solved exactly with its shared objects' weights reduced by their multipliers (in
 * `state`'s buffers), each mask's pick pushed to `picks`; returns the Lagrangian value (the masks' optima, then
 * each shared object's multiplier, summed in that order). `changed` (null: all) lists the objects whose multiplier
 * changed since the last round: only their weights are rewritten, and a mask none of them sits on keeps its solution.
 */
function relaxedRound(problem: JointProblem, state: RelaxedState, lambda: Float64Array, shared: Int32Array, picks: number[][], changed: Int32Array | null, nChanged: number): number {
  const { buffers } = state.work, { start, mask, position, value, dirty } = state;
  if (changed === null) {
    for (let m = 0; m < problem.masks.length; m++) {
      const w = buffers[m], positions = state.work.sharedPositions[m], objects = state.work.sharedObjects[m], values = state.work.sharedValues[m];
      for (let q = 0; q < positions.length; q++) w[positions[q]] = values[q] - lambda[objects[q]];
      dirty[m] = 1;
    }
  } else {
    for (let c = 0; c < nChanged; c++) {
      const o = changed[c];
      for (let e = start[o]; e < start[o + 1]; e++) { buffers[mask[e]][position[e]] = value[e] - lambda[o]; dirty[mask[e]] = 1; }
    }
  }
  let L = 0;
  for (let m = 0; m < problem.masks.length; m++) {
    if (dirty[m]) {
      const r = solveSortedWeights(problem.masks[m].index, buffers[m]);
      state.picks[m] = r.chosen; state.totals[m] = r.total; dirty[m] = 0;
    }
    picks.push(state.picks[m]);
    L += state.totals[m];
  }
  for (let q = 0; q < shared.length; q++) L += lambda[shared[q]];
  return L;
}

/** Uses per object of the relaxed picks (into `use`), for the subgradient of a round whose repaired plan is not needed. */
function countUses(problem: JointProblem, picks: readonly (readonly number[])[], use: Int32Array): void {
  use.fill(0);
  for (let m = 0; m < picks.length; m++) {
    const objects = problem.masks[m].objects, pick = picks[m];
    for (let q = 0; q < pick.length; q++) use[objects[pick[q]]]++;
  }
}

/** Round `it`'s repair of relaxed picks: a duplicated object stays on the first mask (from mask it mod M on) that took it; counts uses per object. */
function repairPicks(problem: JointProblem, picks: readonly (readonly number[])[], it: number, use: Int32Array, owner: Int32Array): number[][] {
  const M = problem.masks.length;
  use.fill(0);
  owner.fill(-1);
  const repaired: number[][] = picks.map(() => []);
  for (let j = 0; j < M; j++) {
    const m = (j + it) % M;
    const objects = problem.masks[m].objects, pick = picks[m];
    for (let q = 0; q < pick.length; q++) {
      const o = objects[pick[q]];
      use[o]++;
      if (owner[o] === -1) { owner[o] = m; repaired[m].push(pick[q]); }
    }
  }
  return repaired;
}

/** Squared norm of the subgradient 1 - use over the coupling rows that can move (violated, or with a positive multiplier). */
function subgradientNorm2(shared: Int32Array, use: Int32Array, lambda: Float64Array): number {
  let norm2 = 0;
  for (let q = 0; q < shared.length; q++) { const o = shared[q], g = 1 - use[o]; if (g < 0 || lambda[o] > 0) norm2 += g * g; }
  return norm2;
}

/** Subgradient step on the coupling rows sum_m z_om <= 1: lambda = max(0, lambda - step (1 - use)); lists the objects whose multiplier changed in `changed`, returns their number. */
function subgradientStep(shared: Int32Array, use: Int32Array, lambda: Float64Array, step: number, changed: Int32Array): number {
  let n = 0;
  for (let q = 0; q < shared.length; q++) {
    const o = shared[q], g = 1 - use[o];
    const next = Math.max(0, lambda[o] - step * g);
    if (next !== lambda[o]) changed[n++] = o;
    lambda[o] = next;
  }
  return n;
}

/** Joint allocation by Lagrangian relaxation with repair and best-response sweeps (the fast path). */
export function allocateJoint(problem: JointProblem, opts: JointOptions = {}): JointSolution {
  problem = overMaskObjects(problem);
  const nObj = problem.weights.length;
  const maxIt = opts.maxIterations ?? 150;
  const relGap = opts.relativeGap ?? 1e-4;
  const steals = opts.steals ?? true;
  // Start: the given selection or greedy mask-by-mask, improved by sweeps.
  let best = opts.initial ? opts.initial.map((s) => s.slice()) : allocateGreedyMaskByMask(problem).chosen;
  best = improveByBestResponse(problem, best);
  let bestValue = jointObjective(problem, best);

  const isShared = sharedObjects(problem);
  const sharedList: number[] = [];
  for (let o = 0; o < nObj; o++) if (isShared[o]) sharedList.push(o);
  const shared = Int32Array.from(sharedList);
  if (shared.length === 0) {
    // No object falls on two masks: per-mask optima are jointly optimal.
    return { chosen: best, objective: bestValue, upperBound: bestValue, iterations: 0 };
  }
  const lambda = new Float64Array(nObj);
  const use = new Int32Array(nObj);
  const owner = new Int32Array(nObj);
  // Relaxed weights per mask (only shared objects carry a multiplier, so each round rewrites only their positions),
  // and separate buffers for the sweeps and steals of the repaired plans.
  const relaxed = relaxedState(problem, responseWork(problem, isShared));
  const work = copyOfWork(relaxed.work);
  // The objects whose multiplier the last step changed (the first round writes every weight).
  const changed = new Int32Array(shared.length);
  let nChanged = -1;
  // With whole-number weights the optimum is a whole number, so floor(upper bound) is a bound too.
  const integral = problem.weights.every((w) => Number.isInteger(w)) && problem.masks.every((set) => !set.values || set.values.every((v) => Number.isInteger(v)));
  const bound = (u: number) => (integral ? Math.floor(u + 1e-9) : u);
  let upper = Infinity;
  let theta = 1;
  let sinceImproved = 0;
  let stall = 0;
  let stealBudget = 1;
  let it = 0;
  for (; it < maxIt; it++) {
    // Relaxed problem: each mask exactly, weights reduced by the multipliers.
    const picks: number[][] = [];
    const L = relaxedRound(problem, relaxed, lambda, shared, picks, nChanged < 0 ? null : changed, nChanged);
    let improvedUpper = false;
    if (L < upper - 1e-12 * Math.abs(L)) { upper = L; sinceImproved = 0; improvedUpper = true; } else if (++sinceImproved >= 5) { theta /= 2; sinceImproved = 0; }

    // Repair: a duplicated object stays on the first mask (rotating the order) that took it; then sweeps.
    // The repair and sweeps cost more than the relaxed solve: run them when the bound improved, and every 8th round
    // (other rounds only count the uses, for the subgradient).
    let repaired: number[][] | null = null;
    if (improvedUpper || it % 8 === 0) {
      repaired = repairPicks(problem, picks, it, use, owner);
      let candidate = repaired;
      let v = sweepBestResponses(problem, candidate, 2, work, owner);
      // Steal moves are dearer: only for the first plan that comes within 0.2 % of the best so far (and the final one).
      if (steals && stealBudget > 0 && v >= bestValue * (1 - 2e-3)) {
        stealBudget--; candidate = improveBySteals(problem, candidate, 1, work); v = jointObjective(problem, candidate); }
      if (v > bestValue) { bestValue = v; best = candidate; stall = 0; }
    } else countUses(problem, picks, use);
    if (bound(upper) - bestValue <= relGap * Math.abs(upper)) break;
    // Long without a better plan while already within 0.1 % of the bound: stop (the steals below polish).
    if (++stall >= 30 && bound(upper) - bestValue <= 1e-3 * Math.abs(upper)) break;

    // Subgradient step on the coupling rows sum_m z_om <= 1.
    const norm2 = subgradientNorm2(shared, use, lambda);
    if (norm2 === 0) {
      // The relaxed picks are feasible and complementary, hence optimal: keep them (after sweeps, which cannot lose).
      const candidate = repaired ?? repairPicks(problem, picks, it, use, owner);
      const v = sweepBestResponses(problem, candidate, 1, work, owner);
      if (v > bestValue) { bestValue = v; best = candidate; }
      break;
    }
    nChanged = subgradientStep(shared, use, lambda, (theta * (L - bestValue)) / norm2, changed);
    if (theta < 1e-4) break;
  }
  // Final polish of the best plan with steal moves, unless the bound already proves it within relGap.
  if (steals && bound(upper) - bestValue > relGap * Math.abs(upper)) {
    best = improveBySteals(problem, best, 3, work);
    bestValue = jointObjective(problem, best);
  }
  return { chosen: best, objective: bestValue, upperBound: Math.max(bound(upper), bestValue), iterations: it };
}
