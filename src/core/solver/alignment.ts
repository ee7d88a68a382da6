/**
 * Alignment boxes, chosen before any slit: at least `count` boxes per mask whose stars spread over the mask in both
 * x and y (mask frame, arcsec), so that they fix rotation as well as translation. Two boxes obey the gap rule when
 * their centres differ in y by at least boxSize + gap. The spread score is the area of the convex hull of the chosen
 * centres plus a small term for the sum of pairwise distances (so that collinear sets are still ranked).
 */
import type { Corner } from '../geometry/polygon';
import { PMath } from '../numeric/portableMath';

export interface AlignmentCandidate {
  /** Index of the object in the caller's target list. */
  object: number;
  xArcsec: number;
  yArcsec: number;
}

export type AlignmentChoice =
  | { ok: true; chosen: AlignmentCandidate[] }
  | { ok: false; available: number; compatibleMax: number; chosen: AlignmentCandidate[] };

/** Area (arcsec^2) of the convex hull of points (monotone chain). */
export function convexHullAreaArcsec2(points: readonly Corner[]): number {
  if (points.length < 3) return 0;
  const p = [...points].sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  const cross = (o: Corner, a: Corner, b: Corner) => (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
  const lower: Corner[] = [], upper: Corner[] = [];
  for (const q of p) {
    while (lower.length >= 2 && cross(lower[lower.length - 2], lower[lower.length - 1], q) <= 0) lower.pop();
    lower.push(q);
  }
  for (let i = p.length - 1; i >= 0; i--) {
    const q = p[i];
    while (upper.length >= 2 && cross(upper[upper.length - 2], upper[upper.length - 1], q) <= 0) upper.pop();
    upper.push(q);
  }
  const hull = lower.slice(0, -1).concat(upper.slice(0, -1));
  let a = 0;
  for (let i = 0; i < hull.length; i++) {
    const [x1, y1] = hull[i], [x2, y2] = hull[(i + 1) % hull.length];
    a += x1 * y2 - x2 * y1;
  }
  return Math.abs(a) / 2;
}

/** Spread score of a set of box centres: hull area (arcsec^2) + 1e-3 x sum of pairwise distances (arcsec). */
export function alignmentSpreadScore(set: readonly AlignmentCandidate[]): number {
  if (set.length === 3) {
    // Fast path (the common minCount): the hull of three points is their triangle.
    const [a, b, c] = set;
    const area = Math.abs((b.xArcsec - a.xArcsec) * (c.yArcsec - a.yArcsec) - (c.xArcsec - a.xArcsec) * (b.yArcsec - a.yArcsec)) / 2;
    const per = PMath.hypot(a.xArcsec - b.xArcsec, a.yArcsec - b.yArcsec) + PMath.hypot(a.xArcsec - c.xArcsec, a.yArcsec - c.yArcsec) + PMath.hypot(b.xArcsec - c.xArcsec, b.yArcsec - c.yArcsec);
    return area + 1e-3 * per;
  }
  let d = 0;
  for (let i = 0; i < set.length; i++) for (let j = i + 1; j < set.length; j++) d += PMath.hypot(set[i].xArcsec - set[j].xArcsec, set[i].yArcsec - set[j].yArcsec);
  return convexHullAreaArcsec2(set.map((c) => [c.xArcsec, c.yArcsec] as Corner)) + 1e-3 * d;
}

/**
 * Choose `count` boxes among candidates (each already fits in the footprint) with pairwise y-separation of at
 * least minSepArcsec (= boxSize + gap), maximising the spread score: a greedy farthest-point start, then swaps
 * until no single swap improves the score. Reports how many are available when `count` cannot be met.
 */
export function chooseAlignmentBoxes(candidates: readonly AlignmentCandidate[], count: number, minSepArcsec: number): AlignmentChoice {
  if (count <= 0) return { ok: true, chosen: [] };
  const compatible = (a: AlignmentCandidate, set: readonly AlignmentCandidate[], skip?: AlignmentCandidate) =>
    set.every((b) => b === skip || Math.abs(a.yArcsec - b.yArcsec) >= minSepArcsec);
  const byY = [...candidates].sort((a, b) => a.yArcsec - b.yArcsec || a.object - b.object);
  const maxSet = largestClearSet(byY, minSepArcsec);
  if (maxSet.length < count) return { ok: false, available: candidates.length, compatibleMax: maxSet.length, chosen: maxSet };

  // Small sets: every combination (exact). Larger: greedy farthest-point starts, then single swaps.
  if (binomial(byY.length, count) <= 4000) {
    let best: AlignmentCandidate[] | null = null, bestScore = -1;
    const pick: AlignmentCandidate[] = [];
    const rec = (from: number) => {
      if (pick.length === count) {
        const sc = alignmentSpreadScore(pick);
        if (sc > bestScore) { bestScore = sc; best = pick.slice(); }
        return;
      }
      for (let i = from; i <= byY.length - (count - pick.length); i++) {
        // byY is sorted by y: the next box must clear the last one picked.
        if (pick.length && byY[i].yArcsec - pick[pick.length - 1].yArcsec < minSepArcsec) continue;
        pick.push(byY[i]);
        rec(i + 1);
        pick.pop();
      }
    };
    rec(0);
    return { ok: true, chosen: best! };
  }
  let chosen = improveBySwaps(greedyStart(byY, byY.reduce((a, b) => (PMath.hypot(b.xArcsec, b.yArcsec) > PMath.hypot(a.xArcsec, a.yArcsec) ? b : a)), count, compatible) ?? maxSet.slice(0, count), byY, compatible);
  // A second start from the lowest candidate in y, keeping the better of the two.
  const alt = greedyStart(byY, byY[0], count, compatible);
  if (alt) {
    const other = improveBySwaps(alt, byY, compatible);
    if (alignmentSpreadScore(other) > alignmentSpreadScore(chosen)) chosen = other;
  }
  return { ok: true, chosen: chosen.sort((a, b) => a.yArcsec - b.yArcsec) };
}

/**
 * A largest set of boxes whose centres are at least minSepArcsec apart along y (mask frame), from candidates sorted
 * by y: unweighted interval scheduling by earliest end, which is optimal. Its size decides whether a mask can hold
 * alignment.minCount boxes, for the allocation and the pointing search alike.
 */
export function largestClearSet(byY: readonly AlignmentCandidate[], minSepArcsec: number): AlignmentCandidate[] {
  const maxSet: AlignmentCandidate[] = [];
  for (const c of byY) if (!maxSet.length || c.yArcsec - maxSet[maxSet.length - 1].yArcsec >= minSepArcsec) maxSet.push(c);
  return maxSet;
}

type Compatible = (a: AlignmentCandidate, set: readonly AlignmentCandidate[], skip?: AlignmentCandidate) => boolean;

function binomial(n: number, k: number): number {
  let r = 1;
  for (let i = 0; i < k; i++) r = (r * (n - i)) / (i + 1);
  return r;
}

/** Farthest-point greedy from `first`: each next box maximises its distance to the nearest chosen one. */
function greedyStart(byY: readonly AlignmentCandidate[], first: AlignmentCandidate, count: number, compatible: Compatible): AlignmentCandidate[] | null {
  const chosen = [first];
  while (chosen.length < count) {
    let best: AlignmentCandidate | null = null, bestD = -1;
    for (const c of byY) {
      if (chosen.includes(c) || !compatible(c, chosen)) continue;
      const d = Math.min(...chosen.map((s) => PMath.hypot(c.xArcsec - s.xArcsec, c.yArcsec - s.yArcsec)));
      if (d > bestD) { bestD = d; best = c; }
    }
    if (!best) return null;
    chosen.push(best);
  }
  return chosen;
}

/** Single swaps (one chosen box for one other candidate) while the spread score rises. */
function improveBySwaps(start: AlignmentCandidate[], byY: readonly AlignmentCandidate[], compatible: Compatible): AlignmentCandidate[] {
  let chosen = start.slice();
  let score = alignmentSpreadScore(chosen);
  for (let round = 0; round < 50; round++) {
    let improved = false;
    for (let s = 0; s < chosen.length; s++) {
      for (const c of byY) {
        if (chosen.includes(c) || !compatible(c, chosen, chosen[s])) continue;
        const trial = chosen.slice();
        trial[s] = c;
        const t = alignmentSpreadScore(trial);
        if (t > score * (1 + 1e-12) + 1e-12) { chosen = trial; score = t; improved = true; }
      }
    }
    if (!improved) break;
  }
  return chosen;
}
