/**
 * Exact weighted interval scheduling along the mask's y axis (arcsec). Intervals are half-open [start, end):
 * two intervals are compatible when one ends at or before the other starts. For slits, start = y - minLength/2
 * and end = y + minLength/2 + gap, which is exactly the contract's gap rule between minimal slits.
 * Building the index sorts once (O(n log n)); each solve for a new set of weights is O(n).
 */
import { lowerBound, orderOf } from '../numeric/orderByValue';

/** Intervals sorted by end, with the predecessor count of each: pred[k] = number of sorted intervals ending at or before start of the k-th. */
export interface IntervalIndex {
  /** order[k] = original index of the k-th interval by end. */
  order: Int32Array;
  pred: Int32Array;
}

/** Sort intervals by end and find each one's last compatible predecessor (binary search). */
export function buildIntervalIndex(starts: ArrayLike<number>, ends: ArrayLike<number>): IntervalIndex {
  const n = starts.length;
  const order = orderOf(ends);
  const sortedEnds = new Float64Array(n);
  for (let k = 0; k < n; k++) sortedEnds[k] = ends[order[k]];
  const pred = new Int32Array(n);
  for (let k = 0, prevS = Infinity, lo = 0; k < n; k++) {
    const s = starts[order[k]];
    // Number of sorted ends <= s (upper bound): scanning on from the previous one while the starts rise (they do for
    // intervals of one length), else by binary search.
    if (s >= prevS) { while (lo < k && sortedEnds[lo] <= s) lo++; } else {
      let hi = k;
      lo = 0;
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if (sortedEnds[mid] <= s) lo = mid + 1;
        else hi = mid;
      }
    }
    prevS = s;
    pred[k] = lo;
  }
  return { order, pred };
}

/** Scratch buffers reused across solves of indexes up to a given size (the solver is called many times). */
let bestBuf = new Float64Array(0);

/**
 * Maximum-weight set of pairwise compatible intervals for `weights` (by original index; weights <= 0 are never
 * taken). Returns the chosen original indices in ascending end order and their total weight.
 */
export function solveIntervalIndex(index: IntervalIndex, weights: ArrayLike<number>): { chosen: number[]; total: number } {
  const { order, pred } = index;
  const n = order.length;
  if (bestBuf.length < n + 1) bestBuf = new Float64Array(Math.max(n + 1, bestBuf.length * 2));
  const best = bestBuf; // best[k] = optimum over the first k sorted intervals
  best[0] = 0;
  for (let k = 0; k < n; k++) {
    const w = weights[order[k]];
    const take = w > 0 ? w + best[pred[k]] : -Infinity;
    best[k + 1] = take > best[k] ? take : best[k];
  }
  return chosenFromBest(index, best);
}

/**
 * solveIntervalIndex with the weights given in the index's sorted order (sortedWeights[k] is the weight of interval
 * order[k]): the same sums in the same order, so the same choice, without the indirection in the loop.
 */
export function solveSortedWeights(index: IntervalIndex, sortedWeights: Float64Array): { chosen: number[]; total: number } {
  const { pred } = index;
  const n = index.order.length;
  if (bestBuf.length < n + 1) bestBuf = new Float64Array(Math.max(n + 1, bestBuf.length * 2));
  const best = bestBuf;
  best[0] = 0;
  for (let k = 0; k < n; k++) {
    const w = sortedWeights[k];
    const take = w > 0 ? w + best[pred[k]] : -Infinity;
    best[k + 1] = take > best[k] ? take : best[k];
  }
  return chosenFromBest(index, best);
}

/** The chosen original indices (ascending end order) and total from the filled optimum table best[0..n]. */
function chosenFromBest(index: IntervalIndex, best: Float64Array): { chosen: number[]; total: number } {
  const { order, pred } = index;
  const n = order.length;
  const total = best[n];
  const chosen: number[] = [];
  let k = n;
  while (k > 0) {
    if (best[k] === best[k - 1]) k--;
    else {
      chosen.push(order[k - 1]);
      k = pred[k - 1];
    }
  }
  chosen.reverse();
  return { chosen, total };
}

/** One-shot exact weighted interval scheduling over half-open intervals [start, end). */
export function weightedIntervalScheduling(starts: ArrayLike<number>, ends: ArrayLike<number>, weights: ArrayLike<number>): { chosen: number[]; total: number } {
  return solveIntervalIndex(buildIntervalIndex(starts, ends), weights);
}

/** Start-sorted view of an interval set: order by start, and for each, the first start-sorted position starting at or after its end. */
interface StartView {
  order: Int32Array;
  sortedStarts: Float64Array;
  nextAfterEnd: Int32Array;
  /** Per original interval i: the end-sorted intervals ending at or before its start (index.pred at i's end position). */
  predOf: Int32Array;
  /** Per original interval i: the first start-sorted position starting at or after its end. */
  nextAfterEndOf: Int32Array;
  maxLength: number;
}

const startViews = new WeakMap<IntervalIndex, StartView>();

/**
 * The intervals ordered by (start, index): the end order itself when it is already in that order (intervals of one
 * length, as a mask's minimal slits), checked in O(n); else sorted (orderOf).
 */
function startOrder(index: IntervalIndex, starts: ArrayLike<number>): Int32Array {
  const e = index.order, n = e.length;
  let k = 1;
  while (k < n && (starts[e[k - 1]] < starts[e[k]] || (starts[e[k - 1]] === starts[e[k]] && e[k - 1] < e[k]))) k++;
  if (k >= n) return e;
  return orderOf(starts);
}

function startView(index: IntervalIndex, starts: ArrayLike<number>, ends: ArrayLike<number>): StartView {
  let v = startViews.get(index);
  if (v) return v;
  const n = starts.length;
  const order = startOrder(index, starts);
  const sortedStarts = new Float64Array(n);
  for (let k = 0; k < n; k++) sortedStarts[k] = starts[order[k]];
  const nextAfterEnd = new Int32Array(n), nextAfterEndOf = new Int32Array(n);
  let maxLength = 0;
  // lowerBound of each end, scanning on from the previous answer while the ends rise (they do for one slit length).
  for (let k = 0, p = 0, prev = -Infinity; k < n; k++) {
    const i = order[k], e = ends[i];
    if (e >= prev) { while (p < n && sortedStarts[p] < e) p++; } else p = lowerBound(sortedStarts, e);
    prev = e;
    nextAfterEnd[k] = p; nextAfterEndOf[i] = p;
    maxLength = Math.max(maxLength, e - starts[i]);
  }
  const predOf = new Int32Array(n);
  for (let k = 0; k < n; k++) predOf[index.order[k]] = index.pred[k];
  v = { order, sortedStarts, nextAfterEnd, predOf, nextAfterEndOf, maxLength };
  startViews.set(index, v);
  return v;
}

/**
 * For every interval i (or only those listed in `only`), the optimum when i is not allowed (same weights otherwise),
 * in O(n log n + m w) with m the intervals asked for and w the number of intervals overlapping one: a plan without i
 * either has nothing overlapping i (best before s_i plus best after e_i) or contains some j overlapping i, whose
 * best containing plan cannot contain i. Entries not asked for are NaN.
 */
export function optimumWithoutEach(index: IntervalIndex, starts: ArrayLike<number>, ends: ArrayLike<number>, weights: ArrayLike<number>, only?: ArrayLike<number>): Float64Array {
  const n = starts.length;
  const sv = startView(index, starts, ends);
  // F[k]: best over the first k intervals by end. G[k]: best over start-sorted positions >= k.
  const F = new Float64Array(n + 1);
  for (let k = 0; k < n; k++) {
    const w = weights[index.order[k]];
    const take = w > 0 ? w + F[index.pred[k]] : -Infinity;
    F[k + 1] = take > F[k] ? take : F[k];
  }
  const G = new Float64Array(n + 1);
  for (let k = n - 1; k >= 0; k--) {
    const w = weights[sv.order[k]];
    const take = w > 0 ? w + G[sv.nextAfterEnd[k]] : -Infinity;
    G[k] = take > G[k + 1] ? take : G[k + 1];
  }
  // Per original interval (only those asked for and their overlaps): best before its start plus best after its end,
  // and the best plan containing it.
  const { predOf, nextAfterEndOf } = sv;
  const out = new Float64Array(n).fill(NaN);
  const count = only ? only.length : n;
  for (let q = 0; q < count; q++) {
    const i = only ? only[q] : q;
    let best = F[predOf[i]] + G[nextAfterEndOf[i]];
    // Intervals overlapping i start in (s_i - maxLength, e_i).
    for (let k = lowerBound(sv.sortedStarts, starts[i] - sv.maxLength); k < n && sv.sortedStarts[k] < ends[i]; k++) {
      const j = sv.order[k];
      if (j === i || !(ends[j] > starts[i]) || !(weights[j] > 0)) continue;
      const containing = F[predOf[j]] + G[nextAfterEndOf[j]] + weights[j];
      if (containing > best) best = containing;
    }
    out[i] = best;
  }
  return out;
}
