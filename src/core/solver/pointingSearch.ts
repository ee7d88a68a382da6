/**
 * Pointing search (docs/search.md): centres and PAs of the unlocked masks that maximise the objective of
 * solver/objective.ts, with the allocation engine (alignment boxes, exact per-mask interval scheduling, joint
 * allocation) inside the loop. Locked masks stay and count. Masks may overlap; an object is still used once.
 *
 * Method: start from the naive cross layout (or the plan's own positions for placed-but-unlocked masks), evaluated
 * with the full joint allocation and starlight placement. Then a seeded pattern search: for step sizes halving
 * level by level, each unlocked mask in turn tries radial, tangential and PA moves plus a few seeded random moves;
 * a move is evaluated by re-solving that one mask exactly with the others fixed (objects owned by other masks
 * are unavailable) and re-estimating its starlight slits; the first move that raises the objective is kept.
 * Masks short of alignment stars count first: a move may never add one, and a move that removes one is kept even
 * if the objective drops. Finally the best pointings are re-allocated jointly; if that full evaluation does not have
 * fewer alignment problems, or as few and a higher objective, than the starting layout, the starting layout is
 * returned, so the search never ends worse than its start.
 * Speed: target positions are cached in the galaxy's tangent plane (xi East, eta North, arcsec), and each trial
 * projects exactly only the targets inside the mask's rotated bounding box (plus a margin).
 */
import type { GalaxyModel, PlanFile } from '../plan/schema';
import type { InstrumentProfile } from '../profile/schema';
import { polygonBounds } from '../geometry/polygon';
import { RAD_PER_DEG, wrap360Deg } from '../sky/angles';
import { galaxyToSkyArcsec } from '../sky/frames';
import { skyToTangentArcsec, tangentCentre, tangentToSkyDeg } from '../sky/tangentPlane';
import { sersicBn } from '../sky/sersic';
import { galaxyRadiusAndAzimuth } from '../coverage/coverage';
import { allocateForPointings, type AllocationContext, type PointingsAllocation } from './allocateMasks';
import { solveIntervalIndex } from './intervalScheduling';
import { allocateGreedyMaskByMask, improveByBestResponse, maskCandidateSet, resolveOneMask, type JointProblem, type MaskCandidateSet } from './jointAllocation';
import { wavelengthOk } from '../geometry/eligibility';
import { footprintRaster, rasterFits } from './footprintRaster';
import { maskBasis, maskCosC, maskPointToSkyDeg, unitToMaskArcsec } from './maskTargets';
import { chooseSlots, freeSlots, galaxyOnMask, starlightSettings, type RowSpan, type StarlightRules, type StarlightSettings, type StarlightTrade } from './starlight';
import { addStarlight, addTracer, emptyTally, mergeTallies, objectiveContext, objectiveValue, type ObjectiveContext, type ObjectiveValue, type SearchRules, type Tally } from './objective';
import { makeRng } from '../scenario/random';
import type { MaskPointing, MaskSolution } from './types';
import { PMath } from '../numeric/portableMath';
import { contextFor, tracerRowValue } from './maskContext';
import { envFor, footprintScaleArcsec, instrumentsProxyModel, placeStarlightForMasks } from './instrumentSearch';

/**
 * The naive layout: the plan's placed masks kept; the k-th unplaced mask (k = 0, 1, ...) goes in direction
 * +u, -u, +v, -v (galaxy frame, u major axis) in ring floor(k/4) + 1, its long side along that direction, centred
 * ring x half the long side from the galaxy centre so the first four masks form a cross from the centre outwards.
 * A plan of one mask is centred on the galaxy with its long side on the major axis.
 */
export function naiveCrossLayout(plan: PlanFile, galaxy: GalaxyModel, profile: InstrumentProfile): MaskPointing[] {
  const given = plan.masks ?? [];
  const ids = new Set(given.map((m) => m.id));
  const all = given.map((m) => ({ ...m }));
  for (let i = 1; all.length < plan.goals.masks; i++) {
    const id = `m${i}`;
    if (!ids.has(id)) { all.push({ id }); ids.add(id); }
  }
  const b = polygonBounds(profile.footprint);
  const longIsY = b.maxY - b.minY >= b.maxX - b.minX;
  const halfLong = (longIsY ? b.maxY - b.minY : b.maxX - b.minX) / 2;
  const centre = tangentCentre(galaxy.raDeg, galaxy.decDeg);
  let k = 0;
  return all.map((m) => {
    if (m.raDeg !== undefined && m.decDeg !== undefined) {
      return { id: m.id, raDeg: wrap360Deg(m.raDeg), decDeg: m.decDeg, paDeg: wrap360Deg(m.paDeg ?? galaxy.paDeg), locked: m.locked ?? false };
    }
    let u = 0, v = 0, alongMajor = true;
    if (plan.goals.masks > 1) {
      const ring = Math.floor(k / 4) + 1, dir = k % 4;
      alongMajor = dir < 2;
      if (alongMajor) u = (dir === 0 ? 1 : -1) * ring * halfLong;
      else v = (dir === 2 ? 1 : -1) * ring * halfLong;
      k++;
    }
    // Mask +y points at PA; mask +x at PA + 90. Long side along the direction of the offset.
    const dirPa = alongMajor ? galaxy.paDeg : galaxy.paDeg + 90;
    const paDeg = wrap360Deg(m.paDeg ?? (longIsY ? dirPa : dirPa - 90));
    const s = galaxyToSkyArcsec(u, v, galaxy.paDeg);
    const p = tangentToSkyDeg(centre, s.xiArcsec, s.etaArcsec);
    return { id: m.id, raDeg: p.raDeg, decDeg: p.decDeg, paDeg, locked: m.locked ?? false };
  });
}

/** Objective evaluation shared by the search, the pipeline report and the benchmark. */
export interface SearchEnv {
  ctx: AllocationContext;
  objective: ObjectiveContext;
  starlight: StarlightSettings;
  plan: PlanFile;
  /** R/Re and azimuth (degrees) of every target (index as ctx.targets). */
  radiusRe: Float64Array;
  azimuthDeg: Float64Array;
  /** Galaxy tangent-plane position of every target (arcsec). */
  xi: Float64Array;
  eta: Float64Array;
  bn: number;
}

/** Build the evaluation environment (cached target positions) for a plan and an allocation context. */
export function searchEnv(plan: PlanFile, ctx: AllocationContext): SearchEnv {
  const g = ctx.galaxy, n = ctx.targets.length;
  const radiusRe = new Float64Array(n), azimuthDeg = new Float64Array(n), xi = new Float64Array(n), eta = new Float64Array(n);
  const c = tangentCentre(g.raDeg, g.decDeg);
  for (let i = 0; i < n; i++) {
    const t = skyToTangentArcsec(c, ctx.raDeg[i], ctx.decDeg[i]);
    xi[i] = t ? t.xiArcsec : NaN;
    eta[i] = t ? t.etaArcsec : NaN;
    const r = galaxyRadiusAndAzimuth(g, ctx.raDeg[i], ctx.decDeg[i]);
    radiusRe[i] = r.rRe;
    azimuthDeg[i] = r.phiDeg;
  }
  const tracerWeights = Array.from(ctx.tracerIndices, (i) => ctx.weights[i]);
  return {
    ctx, plan, radiusRe, azimuthDeg, xi, eta, bn: sersicBn(g.sersicN),
    objective: objectiveContext(plan.goals, plan.search as SearchRules | undefined, tracerWeights),
    starlight: starlightSettings(plan.starlight as StarlightRules | undefined, ctx.profile, plan),
  };
}

/** Objective of finished masks (tracer rows weighted by their allocation weight; starlight rows by their radius). */
export function planObjective(env: SearchEnv, masks: readonly MaskSolution[]): ObjectiveValue {
  const t = emptyTally(env.objective);
  const g = env.ctx.galaxy;
  for (const ms of masks) for (const s of ms.slits) {
    if (s.role !== 'tracer' && s.role !== 'starlight') continue;
    const r = galaxyRadiusAndAzimuth(g, s.raDeg, s.decDeg);
    if (s.role === 'tracer') addTracer(t, tracerRowValue(contextFor(env.ctx, ms.mask), s.priority, s.mag), r.rRe, r.phiDeg);
    else addStarlight(t, r.rRe);
  }
  return objectiveValue(env.objective, t);
}

/** The objective's price of a starlight slit in tracer weight (for the starlight stage's trades). */
export function starlightTrade(o: ObjectiveContext): StarlightTrade {
  return { unitWeight: o.unitWeight, aStarlightBin: o.weights.aStarlightBin, aStarlightReach: o.weights.aStarlightReach };
}

/** Full evaluation of pointings: joint allocation then starlight and sky slits, and the objective of the result. */
export function evaluatePointings(env: SearchEnv, pointings: readonly MaskPointing[]): { value: ObjectiveValue; masks: MaskSolution[]; allocation: PointingsAllocation; warnings: string[] } {
  const allocation = allocateForPointings(env.ctx, pointings);
  const sl = placeStarlightForMasks(env.ctx, env.plan, allocation.masks, starlightTrade(env.objective));
  return { value: planObjective(env, sl.masks), masks: sl.masks, allocation, warnings: sl.warnings };
}

/** A pointing in the galaxy tangent plane: centre offset (xi East, eta North, arcsec) and PA (degrees East of North). */
interface PlanePointing { xi: number; eta: number; paDeg: number }

export interface SearchReport {
  /**
   * Objective of the starting (naive) layout in full, when it was evaluated; when the result beat a proven upper
   * bound of it instead (objectiveUpperBound), that bound. `objective` is the returned layout's, in full.
   */
  startObjective?: ObjectiveValue;
  startObjectiveUpperBound?: number;
  objective: ObjectiveValue;
  evaluations: number;
  acceptedMoves: number;
  /** true when the search's own best was not better than the start and the start was kept. */
  keptStart: boolean;
}

export interface SearchResult {
  pointings: MaskPointing[];
  report: SearchReport;
  /** The full allocation of the returned pointings (before starlight), for the pipeline to reuse. */
  allocation: PointingsAllocation;
  /** The returned pointings' masks with starlight and sky slits (before lengthening), and that stage's warnings. */
  masks: MaskSolution[];
  starlightWarnings: string[];
}

/**
 * The candidate set of intervals already sorted by end (equal lengths, sorted by start): the interval index of
 * solver/intervalScheduling (order by end, pred[k] = number of intervals ending at or before start k) in one pass.
 */
function equalLengthCandidateSet(objects: Int32Array, starts: Float64Array, ends: Float64Array): MaskCandidateSet {
  const n = objects.length;
  const order = new Int32Array(n), pred = new Int32Array(n);
  let j = 0;
  for (let k = 0; k < n; k++) {
    order[k] = k;
    while (j < k && ends[j] <= starts[k]) j++;
    pred[k] = j;
  }
  return { objects, starts, ends, index: { order, pred } };
}

/** The search's fast model of one mask: its tracer candidates (exact projection, raster footprint test), no boxes. */
export interface ProxyMask {
  set: MaskCandidateSet;
  y: Float64Array;
  alignmentAvailable: number;
  /** Boxes the mask's profile needs (alignment.minCount), when it is not the plan's first profile's. */
  alignmentNeeded?: number;
}

/**
 * The search's fast model of masks for an environment: `proxy(pointing)` gives a mask's tracer candidates (exact
 * gnomonic projection by dot products of cached unit vectors, the wavelength rule exactly, the footprint by a
 * conservative column raster; no alignment boxes) and a count of alignment stars whose box fits. With `liberal`
 * the footprint test is only the bounds box: every truly eligible tracer is then in the set (for upper bounds).
 */
export function proxyModel(env: SearchEnv): (p: MaskPointing, liberal?: boolean) => ProxyMask {
  const { ctx } = env;
  const profile = ctx.profile;
  const b = polygonBounds(profile.footprint);
  const L = profile.slits.minLengthArcsec, gap = profile.slits.gapArcsec, box = profile.alignment.boxSizeArcsec;
  const slitRaster = footprintRaster(profile.footprint, profile.slits.widthArcsec / 2, L / 2);
  const boxRaster = footprintRaster(profile.footprint, box / 2, box / 2);
  const { x: ux, y: uy, z: uz } = ctx.unit;
  const bufObj = new Int32Array(ctx.tracerIndices.length), bufY = new Float64Array(ctx.tracerIndices.length);
  // Tracers binned in square cells of the galaxy's tangent plane, so a trial only visits cells near the mask.
  const cell = 60, gc = tangentCentre(ctx.galaxy.raDeg, ctx.galaxy.decDeg);
  const cells = new Map<number, number[]>();
  const key = (cx: number, cy: number) => (cx + 32768) * 65536 + (cy + 32768);
  for (const i of ctx.tracerIndices) {
    const xi = env.xi[i], eta = env.eta[i];
    const k = Number.isFinite(xi) && Number.isFinite(eta) && Math.abs(xi) < 1e6 && Math.abs(eta) < 1e6 ? key(Math.floor(xi / cell), Math.floor(eta / cell)) : -1;
    let list = cells.get(k);
    if (!list) cells.set(k, (list = []));
    list.push(i);
  }
  const cellList = [...cells.entries()].map(([k, list]) => ({ k, list: Int32Array.from(list), cxi: (Math.floor(k / 65536) - 32768 + 0.5) * cell, ceta: ((k % 65536) - 32768 + 0.5) * cell }));
  // A cell is visited when its centre, in the mask frame, lies within the footprint bounds grown by the cell's
  // half-diagonal and a margin for the difference between the galaxy's and the mask's tangent planes.
  const grow = cell * Math.SQRT1_2 + 30;

  return (p: MaskPointing, liberal = false): ProxyMask => {
    const basis = maskBasis(p);
    const at = { xArcsec: 0, yArcsec: 0 };
    const pc = skyToTangentArcsec(gc, p.raDeg, p.decDeg);
    // The mask's +y direction as seen in the galaxy's tangent plane (North turns between the two tangent points).
    const up = maskPointToSkyDeg(p, 0, 60), pu = skyToTangentArcsec(gc, up.raDeg, up.decDeg);
    const upA = pc && pu ? PMath.atan2(pu.xiArcsec - pc.xiArcsec, pu.etaArcsec - pc.etaArcsec) : p.paDeg * RAD_PER_DEG;
    const gsp = PMath.sin(upA), gcp = PMath.cos(upA);
    // Candidates in y order (so that the interval index's sort by end is a single pass), no allocation per target.
    let n = 0;
    for (const c of cellList) {
      if (pc && c.k >= 0) {
        const dxi = c.cxi - pc.xiArcsec, deta = c.ceta - pc.etaArcsec;
        const mx = dxi * gcp - deta * gsp, my = dxi * gsp + deta * gcp;
        if (mx < b.minX - grow || mx > b.maxX + grow || my < b.minY - grow || my > b.maxY + grow) continue;
      }
      for (const i of c.list) {
      const px = ux[i], py = uy[i], pz = uz[i];
      const cosC = maskCosC(basis, px, py, pz);
      if (cosC < 0.9) continue; // farther than ~25 degrees: never on a mask
      unitToMaskArcsec(basis, px, py, pz, cosC, at);
      const x = at.xArcsec, y = at.yArcsec;
      if (x < b.minX || x > b.maxX || y < b.minY || y > b.maxY) continue;
      if (!wavelengthOk(ctx.rules, x) || (!liberal && !rasterFits(slitRaster, x, y))) continue;
      bufObj[n] = i; bufY[n] = y; n++;
      }
    }
    // Order by y quantised to 1e-4 arcsec (ordering only), ties by position: a bucket sort, O(n) for spread-out y.
    const keys = new Float64Array(n);
    for (let k = 0; k < n; k++) keys[k] = Math.floor((bufY[k] + 1e4) * 1e4);
    const byY = orderByKey(keys);
    const objects = new Int32Array(n), y = new Float64Array(n), starts = new Float64Array(n), ends = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      const j = byY[k];
      objects[k] = bufObj[j]; y[k] = bufY[j];
      starts[k] = y[k] - L / 2; ends[k] = y[k] + L / 2 + gap;
    }
    let alignmentAvailable = 0;
    for (const i of ctx.alignmentIndices) {
      const px = ux[i], py = uy[i], pz = uz[i];
      const cosC = maskCosC(basis, px, py, pz);
      if (cosC < 0.9) continue;
      unitToMaskArcsec(basis, px, py, pz, cosC, at);
      if (rasterFits(boxRaster, at.xArcsec, at.yArcsec)) alignmentAvailable++;
    }
    // The liberal set feeds a proven bound: its interval index is built exactly (sorted by end), not from the packed keys.
    return { set: liberal ? maskCandidateSet(objects, starts, ends) : equalLengthCandidateSet(objects, starts, ends), y, alignmentAvailable };
  };
}

/**
 * Positions 0..n-1 of `keys` ordered by (key, position) ascending, the order of a stable sort: a counting sort into
 * n equal-width buckets over [min, max] key (monotone in the key), then insertion sort inside each bucket.
 */
export function orderByKey(keys: Float64Array): Int32Array {
  const n = keys.length;
  const out = new Int32Array(n);
  if (n === 0) return out;
  let lo = Infinity, hi = -Infinity;
  for (let k = 0; k < n; k++) { if (keys[k] < lo) lo = keys[k]; if (keys[k] > hi) hi = keys[k]; }
  const scale = hi > lo ? (n - 1) / (hi - lo) : 0;
  const bucketOf = (k: number) => Math.min(n - 1, Math.floor((keys[k] - lo) * scale));
  const start = new Int32Array(n + 1);
  for (let k = 0; k < n; k++) start[bucketOf(k) + 1]++;
  for (let b = 0; b < n; b++) start[b + 1] += start[b];
  const fill = start.slice(0, n);
  // Positions enter their bucket in increasing order, so equal keys keep position order (a stable insertion sort).
  for (let k = 0; k < n; k++) out[fill[bucketOf(k)]++] = k;
  for (let b = 0; b < n; b++) {
    for (let i = start[b] + 1; i < start[b + 1]; i++) {
      const v = out[i], kv = keys[v];
      let j = i - 1;
      while (j >= start[b] && keys[out[j]] > kv) { out[j + 1] = out[j]; j--; }
      out[j + 1] = v;
    }
  }
  return out;
}

/**
 * Search the unlocked masks' pointings (see the module comment). Deterministic for a given plan and `search.seed`.
 * onProgress receives fractions in [0, 1].
 */
export function searchPointings(env: SearchEnv, start: readonly MaskPointing[], onProgress: (fraction: number, message: string) => void = () => {}): SearchResult {
  const { ctx } = env;
  const rules = (env.plan.search ?? {}) as SearchRules;
  const free = start.map((p, i) => (p.locked ? -1 : i)).filter((i) => i >= 0);
  let startEvalCache: ReturnType<typeof evaluatePointings> | null = null;
  const startEval = () => (startEvalCache ??= evaluatePointings(env, start));
  const keep = (evaluations: number, accepted: number): SearchResult => {
    const e = startEval();
    return {
      pointings: start.slice(), masks: e.masks, allocation: e.allocation, starlightWarnings: e.warnings,
      report: { startObjective: e.value, objective: e.value, evaluations, acceptedMoves: accepted, keptStart: true },
    };
  };
  if (rules.enabled === false || free.length === 0) return keep(1, 0);
  const rng = makeRng(rules.seed ?? 1);
  const levels = rules.levels ?? 3, passes = rules.passes ?? 2, randomTrials = rules.randomTrials ?? 1;
  const g = ctx.galaxy, profile = ctx.profile;
  const gc = tangentCentre(g.raDeg, g.decDeg);
  // Step scale from the largest footprint of the plan's profiles (the only one in a single-profile plan).
  const { halfDiag, halfLong } = footprintScaleArcsec(ctx);
  const proxyMask = instrumentsProxyModel(env, proxyModel);

  // Current state: plane pointings, proxy masks, joint selection over the proxies, per-mask tallies.
  const plane: PlanePointing[] = start.map((p) => {
    const t = skyToTangentArcsec(gc, p.raDeg, p.decDeg)!;
    return { xi: t.xiArcsec, eta: t.etaArcsec, paDeg: p.paDeg };
  });
  const pointings = start.map((p) => ({ ...p }));
  let proxies = pointings.map((p) => proxyMask(p));
  const problemOf = (ps: readonly ProxyMask[]): JointProblem => ({ weights: ctx.weights, masks: ps.map((p) => p.set) });
  let chosen = improveByBestResponse(problemOf(proxies), allocateGreedyMaskByMask(problemOf(proxies)).chosen, 3);
  const tallies = proxies.map((p, m) => proxyTally(env, pointings[m], p, chosen[m]));
  let current = objectiveValue(env.objective, mergeTallies(env.objective, tallies)).total;
  const minAlign = profile.alignment.minCount;
  // Masks short of alignment stars (proxy count: one box per star); fewer is always better, then the objective.
  const short = (p: ProxyMask) => (p.alignmentAvailable < (p.alignmentNeeded ?? minAlign) ? 1 : 0);
  let shortNow = proxies.reduce((a, p) => a + short(p), 0);

  const toPointing = (m: number, pp: PlanePointing): MaskPointing => {
    const s = tangentToSkyDeg(gc, pp.xi, pp.eta);
    return { id: start[m].id, raDeg: s.raDeg, decDeg: s.decDeg, paDeg: wrap360Deg(pp.paDeg), locked: false, ...(start[m].instrument !== undefined ? { instrument: start[m].instrument } : {}) };
  };

  let evaluations = 1, accepted = 0;
  const tryMove = (m: number, pp: PlanePointing): boolean => {
    evaluations++;
    const pointing = toPointing(m, pp);
    const prox = proxyMask(pointing);
    const shortNext = shortNow - short(proxies[m]) + short(prox);
    if (shortNext > shortNow) return false;
    const next = proxies.slice();
    next[m] = prox;
    const base = chosen.map((c, i) => (i === m ? [] : c));
    const nextChosen = resolveOneMask(problemOf(next), base, m);
    const tally = proxyTally(env, pointing, prox, nextChosen[m]);
    const nextTallies = tallies.slice();
    nextTallies[m] = tally;
    const value = objectiveValue(env.objective, mergeTallies(env.objective, nextTallies)).total;
    if (shortNext < shortNow || value > current * (1 + 1e-9) + 1e-9) {
      current = value;
      shortNow = shortNext;
      proxies = next;
      chosen = nextChosen;
      tallies[m] = tally;
      plane[m] = pp;
      pointings[m] = pointing;
      accepted++;
      return true;
    }
    return false;
  };

  const totalTrials = Math.max(1, levels * passes * free.length * (6 + randomTrials));
  let done = 0;
  const maxCentreArcsec = (env.objective.tracerReachRe * g.reArcsec) / Math.sqrt(g.axisRatio) + halfDiag;
  for (let level = 0; level < levels; level++) {
    const step = halfLong * 0.5 * PMath.pow(0.5, level);
    const stepPa = 24 * PMath.pow(0.5, level);
    for (let pass = 0; pass < passes; pass++) {
      const acceptedBefore = accepted;
      for (const m of free) {
        const p = plane[m];
        const r = PMath.hypot(p.xi, p.eta);
        // Radial unit vector (from the galaxy centre), or the mask's own +y direction at the centre.
        const ux = r > 1e-6 ? p.xi / r : PMath.sin(p.paDeg * RAD_PER_DEG), uy = r > 1e-6 ? p.eta / r : PMath.cos(p.paDeg * RAD_PER_DEG);
        const moves: PlanePointing[] = [
          { xi: p.xi + step * ux, eta: p.eta + step * uy, paDeg: p.paDeg },
          { xi: p.xi - step * ux, eta: p.eta - step * uy, paDeg: p.paDeg },
          { xi: p.xi - step * uy, eta: p.eta + step * ux, paDeg: p.paDeg },
          { xi: p.xi + step * uy, eta: p.eta - step * ux, paDeg: p.paDeg },
          { xi: p.xi, eta: p.eta, paDeg: p.paDeg + stepPa },
          { xi: p.xi, eta: p.eta, paDeg: p.paDeg - stepPa },
        ];
        for (let k = 0; k < randomTrials; k++) moves.push({ xi: p.xi + step * rng.uniform(-1, 1), eta: p.eta + step * rng.uniform(-1, 1), paDeg: p.paDeg + stepPa * rng.uniform(-1, 1) });
        for (const mv of moves) {
          done++;
          // Keep the mask over the galaxy's field: its centre within tracerReachRe (semi-major) + half the footprint.
          if (PMath.hypot(mv.xi, mv.eta) > maxCentreArcsec) continue;
          tryMove(m, mv);
        }
        onProgress(Math.min(0.95, done / totalTrials), `pointing search: step level ${level + 1}/${levels}, objective ${current.toFixed(1)}`);
      }
      if (accepted === acceptedBefore) { done += (passes - pass - 1) * free.length * (6 + randomTrials); break; }
    }
  }
  if (accepted === 0) return keep(evaluations, 0);
  const final = evaluatePointings(env, pointings);
  evaluations++;
  onProgress(1, 'pointing search done');
  const won = (report: Partial<SearchReport>): SearchResult => ({
    pointings, masks: final.masks, allocation: final.allocation, starlightWarnings: final.warnings,
    report: { objective: final.value, evaluations, acceptedMoves: accepted, keptStart: false, ...report },
  });
  // A proven bound on the start's objective often settles the comparison without allocating the start in full:
  // with no alignment problem left, beating the bound beats the start whatever its problems.
  const finalProblems = final.allocation.problems.length;
  if (finalProblems === 0) {
    const upperBound = objectiveUpperBound(env, start.map((p) => proxyMask(p, true).set));
    if (final.value.total > upperBound) return won({ startObjectiveUpperBound: upperBound });
  }
  const e = startEval();
  evaluations++;
  if (finalProblems < e.allocation.problems.length || (finalProblems === e.allocation.problems.length && final.value.total > e.value.total)) return won({ startObjective: e.value });
  return keep(evaluations, accepted);
}

/**
 * A proven upper bound on the objective of pointings from candidate sets that contain every tracer eligible on each
 * mask (centre inside the footprint's bounds and the wavelength rule: necessary conditions of eligibility, so a
 * superset): each mask's exact optimum alone bounds its share of the joint tracer weight (dropping "each object once",
 * alignment boxes and the footprint's shape can only raise the optimum; trading tracers for starlight only lowers it),
 * and every coverage term is bounded by its maximum (all bins and sectors full, every starlight bin, full reach).
 */
export function objectiveUpperBound(env: SearchEnv, supersets: readonly MaskCandidateSet[]): number {
  let y = 0;
  for (const set of supersets) {
    const w = new Float64Array(set.objects.length);
    for (let k = 0; k < w.length; k++) w[k] = env.ctx.weights[set.objects[k]];
    y += solveIntervalIndex(set.index, w).total;
  }
  const o = env.objective, W = o.unitWeight, a = o.weights;
  const t = emptyTally(o);
  return y + W * (a.aBin * t.tracerBins.length + a.aSector * t.tracerSectors.length + (o.starlightReachRe > 0 ? a.aStarlightBin * t.starlightBins.length + a.aStarlightReach : 0));
}

/** Tally of one proxy mask with a selection: its tracers, and its starlight slits estimated on the free space. */
function proxyTally(planEnv: SearchEnv, pointing: MaskPointing, p: ProxyMask, chosenK: readonly number[]): Tally {
  const env = envFor(planEnv, pointing);
  const t = emptyTally(env.objective);
  const { ctx } = env;
  for (const k of chosenK) {
    const o = p.set.objects[k];
    addTracer(t, p.set.values ? p.set.values[k] : ctx.weights[o], env.radiusRe[o], env.azimuthDeg[o]);
  }
  if (env.starlight.reachRe <= 0) return t;
  const g = ctx.galaxy;
  const om = galaxyOnMask(pointing, g, env.bn);
  const b = polygonBounds(ctx.profile.footprint);
  const halfDiag = PMath.hypot(Math.max(-b.minX, b.maxX), Math.max(-b.minY, b.maxY));
  // No starlight possible when even the nearest footprint point lies beyond the reach (R >= sqrt(q) x distance).
  if (Math.sqrt(g.axisRatio) * (PMath.hypot(om.gxArcsec, om.gyArcsec) - halfDiag) > env.starlight.reachRe * g.reArcsec) return t;
  const L = ctx.profile.slits.minLengthArcsec;
  const rows: RowSpan[] = chosenK.map((k) => ({ role: 'tracer' as const, yArcsec: p.y[k], lenBelowArcsec: L / 2, lenAboveArcsec: L / 2, widthArcsec: ctx.profile.slits.widthArcsec, tiltDeg: 0 }));
  const slots = freeSlots(rows, ctx.rules, ctx.profile.slits.gapArcsec, env.starlight.slitLengthArcsec);
  const { starlight } = chooseSlots(om, ctx.rules, slots, { ...env.starlight, skyPerMask: 0 }, new Set(), 1, 25);
  for (const c of starlight) addStarlight(t, c.rRe);
  return t;
}
