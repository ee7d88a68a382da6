/**
 * Pointing search (docs/search.md): centres and PAs of the unlocked masks that maximise the objective of
 * solver/objective.ts, with the allocation engine (alignment boxes, exact per-mask interval scheduling, joint
 * allocation) inside the loop. Locked masks stay and count. Masks may overlap; an object is still used once.
 *
 * Method (docs/search.md): several start layouts (the naive cross, turned crosses, rings, masks turned about the
 * centre) ranked on a fast proxy model; masks short of alignment boxes are repaired (pulls, shifts and turns towards
 * alignment stars, then a grid over the field), since alignment feasibility is a hard constraint of the search with
 * the allocation's own rule (alignmentCapacity: a move adding a missing box is always kept, one removing a box never);
 * then a seeded pattern search: for step sizes halving level by level, each unlocked mask in turn tries radial,
 * tangential and PA moves plus seeded random moves, a move being evaluated by re-solving that one mask exactly with
 * the others fixed; then kicks (one mask jumps elsewhere, is searched locally, and the jump stays only if the layout
 * ends better). The effort budget (search.effort) scales all counts. While the naive cross is a valid layout, a layout
 * short of its tracer weight or capped tracer reach ranks below any that is not. Finally the best pointings are
 * re-allocated jointly; unless that full evaluation has fewer alignment problems than the naive cross, or as few and
 * at least the cross's objective, tracer weight and capped tracer reach (one of them higher), the cross is returned:
 * the search never ends worse than it on any of the three.
 * Speed: target positions are cached in the galaxy's tangent plane (xi East, eta North, arcsec), binned in 60" cells
 * (solver/proxyCells.ts, built in O(n)), and each trial projects exactly only the targets of the cells inside the mask's
 * rotated bounding box (plus a margin). Cost of one trial move: O(cells of the field) for the cell test, plus
 * O(k) for the k tracers of the visited cells (projection, bucket sort by y, the interval index, the moved mask's exact
 * re-solve; resolveOneMask adds the slits chosen on the other masks), plus the starlight estimate on the mask's free
 * space (independent of n). k is bounded: when the cells a trial can visit would hold more than PROXY_TRIAL_BUDGET
 * (40 000) tracers, every cell keeps only twice the slits a mask can take from it (most valuable first), so
 * k <= max(40 000, cells per trial x 2 x slots per cell), 6 384 (168 cells x 38) for a 300" x 1000" footprint with 4.5" slit
 * pitch, whatever the catalog's size. Only the proxy is thinned: the final full evaluation, the proven bounds and the
 * comparison with the naive cross see every tracer, and a catalog of at most 40 000 tracers is never thinned.
 */
import type { GalaxyModel, PlanFile } from '../plan/schema';
import type { InstrumentProfile } from '../profile/schema';
import { polygonBounds } from '../geometry/polygon';
import { RAD_PER_DEG, wrap360Deg } from '../sky/angles';
import { galaxyToSkyArcsec } from '../sky/frames';
import { skyToTangentArcsec, tangentCentre, tangentToSkyDeg } from '../sky/tangentPlane';
import { galaxyRadiusAndAzimuth } from '../sky/galaxyRadius';
import { alignmentCapacity, allocateForPointings, type PointingsAllocation } from './allocateMasks';
import { solveIntervalIndex } from './intervalScheduling';
import { allocateGreedyMaskByMask, improveByBestResponse, resolveOneMask, type JointProblem, type MaskCandidateSet } from './jointAllocation';
import { chooseSlots, freeSlotsOfTracers, galaxyOnMask, starlightRadiusCeilingRe, withoutSkySlits, type GalaxyOnMask, type Span } from './starlight';
import { addStarlight, addTracer, emptyTally, mergeTallies, objectiveValue, starlightCeiling, type ObjectiveContext, type ObjectiveValue, type Tally } from './objective';
import type { SearchRules } from '../plan/searchSection';
import { makeRng } from '../numeric/random';
import type { MaskPointing, MaskSolution } from '../geometry/maskSolution';
import { PMath } from '../numeric/portableMath';
import { contextFor, tracerRowValue } from './maskContext';
import { envFor, footprintScaleArcsec, instrumentsProxyModel, placeStarlightForMasks } from './instrumentSearch';
import { starlightTrade, targetAzimuthDeg, type SearchEnv } from './searchEnv';
import { proxyModel, type ProxyMask } from './proxyModel';

/** Where a start layout puts its k-th free mask (of nFree): offset (u major, v minor, arcsec) and the long side's direction (degrees from the major axis). */
type FreePlacement = (k: number, nFree: number, halfLongArcsec: number) => { uArcsec: number; vArcsec: number; longDirDeg: number };

/** The cross: directions +u, -u, +v, -v in ring floor(k/4) + 1, long side along the direction, turned by turnDeg about the centre. */
const crossPlacement = (turnDeg: number): FreePlacement => (k, nFree, halfLong) => {
  if (nFree <= 1) return { uArcsec: 0, vArcsec: 0, longDirDeg: turnDeg };
  const ring = Math.floor(k / 4) + 1, dirDeg = [0, 180, 90, 270][k % 4] + turnDeg;
  return { uArcsec: ring * halfLong * PMath.cos(dirDeg * RAD_PER_DEG), vArcsec: ring * halfLong * PMath.sin(dirDeg * RAD_PER_DEG), longDirDeg: dirDeg };
};

/** A ring: nFree masks at equal azimuths from turnDeg, centred half the long side out, long side radial. */
const ringPlacement = (turnDeg: number, radiusFactor: number): FreePlacement => (k, nFree, halfLong) => {
  const dirDeg = turnDeg + (360 * k) / Math.max(1, nFree);
  return { uArcsec: radiusFactor * halfLong * PMath.cos(dirDeg * RAD_PER_DEG), vArcsec: radiusFactor * halfLong * PMath.sin(dirDeg * RAD_PER_DEG), longDirDeg: dirDeg };
};

/** Masks on the galaxy centre, turned by 180/nFree degrees from each other (a star: suits a galaxy small against the footprint). */
const centredPlacement: FreePlacement = (k, nFree) => ({ uArcsec: 0, vArcsec: 0, longDirDeg: (180 * k) / Math.max(1, nFree) });

/**
 * Masks for a plan with free masks put by `place`: the plan's placed masks kept (locked or not); masks m1, m2, ...
 * added up to goals.masks. The galaxy frame's azimuth is measured from +u (major axis) towards +v.
 */
function layoutWith(plan: PlanFile, galaxy: GalaxyModel, profile: InstrumentProfile, place: FreePlacement): MaskPointing[] {
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
  const nFree = all.filter((m) => m.raDeg === undefined || m.decDeg === undefined).length;
  let k = 0;
  return all.map((m) => {
    if (m.raDeg !== undefined && m.decDeg !== undefined) {
      return { id: m.id, raDeg: wrap360Deg(m.raDeg), decDeg: m.decDeg, paDeg: wrap360Deg(m.paDeg ?? galaxy.paDeg), locked: m.locked ?? false };
    }
    const at = place(k++, plan.goals.masks > 1 ? nFree : 1, halfLong);
    // The galaxy-frame direction d (from +u towards +v) points at PA theta + d (+u is at PA theta, +v at theta + 90);
    // a mask turned by 180 degrees covers the same field, so the long side takes d modulo 180.
    const dirPa = galaxy.paDeg + (((at.longDirDeg % 180) + 180) % 180);
    // Mask +y points at PA; mask +x at PA + 90. Long side along the direction.
    const paDeg = wrap360Deg(m.paDeg ?? (longIsY ? dirPa : dirPa - 90));
    const s = galaxyToSkyArcsec(at.uArcsec, at.vArcsec, galaxy.paDeg);
    const p = tangentToSkyDeg(centre, s.xiArcsec, s.etaArcsec);
    return { id: m.id, raDeg: p.raDeg, decDeg: p.decDeg, paDeg, locked: m.locked ?? false };
  });
}

/**
 * The naive layout: the plan's placed masks kept; the k-th unplaced mask (k = 0, 1, ...) goes in direction
 * +u, -u, +v, -v (galaxy frame, u major axis) in ring floor(k/4) + 1, its long side along that direction, centred
 * ring x half the long side from the galaxy centre so the first four masks form a cross from the centre outwards.
 * A plan of one mask is centred on the galaxy with its long side on the major axis.
 */
export function naiveCrossLayout(plan: PlanFile, galaxy: GalaxyModel, profile: InstrumentProfile): MaskPointing[] {
  return layoutWith(plan, galaxy, profile, crossPlacement(0));
}

/**
 * The search's starting layouts (docs/search.md): the naive cross first, the cross turned by 45 and 22.5 degrees
 * about the galaxy centre, rings of the free masks at equal azimuths (half and one long side out), and every free mask
 * on the centre turned by 180/n degrees from the next. Placed masks stay in every layout.
 */
export function startLayouts(plan: PlanFile, galaxy: GalaxyModel, profile: InstrumentProfile): { name: string; pointings: MaskPointing[] }[] {
  const layouts: [string, FreePlacement][] = [
    ['cross', crossPlacement(0)],
    ['cross turned 45', crossPlacement(45)],
    ['cross turned 22.5', crossPlacement(22.5)],
    ['ring', ringPlacement(0, 1)],
    ['ring turned', ringPlacement(180 / Math.max(1, plan.goals.masks), 1)],
    ['inner ring', ringPlacement(0, 0.5)],
    ['outer ring', ringPlacement(90 / Math.max(1, plan.goals.masks), 1.6)],
    ['centred star', centredPlacement],
  ];
  return layouts.map(([name, place]) => ({ name, pointings: layoutWith(plan, galaxy, profile, place) }));
}

/** Objective of finished masks (tracer rows weighted by their allocation weight; starlight rows by their radius). */
export function planObjective(env: SearchEnv, masks: readonly MaskSolution[]): ObjectiveValue {
  const t = emptyTally(env.objective);
  const g = env.ctx.galaxy;
  for (const ms of masks) {
    const before = t.yieldWeight;
    for (const s of ms.slits) {
      if (s.role !== 'tracer' && s.role !== 'starlight') continue;
      const r = galaxyRadiusAndAzimuth(g, s.raDeg, s.decDeg);
      if (s.role === 'tracer') addTracer(t, tracerRowValue(contextFor(env.ctx, ms.mask), s.priority, s.mag), r.rRe, r.phiDeg);
      else addStarlight(t, r.rRe, r.phiDeg);
    }
    const loss = envFor(env, ms.mask).refractionLoss;
    if (loss) t.refractionLossWeight += (t.yieldWeight - before) * loss(ms.mask);
  }
  return objectiveValue(env.objective, t);
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
  /** Alignment boxes the naive starting layout lacks (then it is not a valid layout and was not evaluated in full). */
  startAlignmentShort?: number;
  /** Name of the starting layout the returned search began from (startLayouts). */
  startLayout?: string;
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

/** The search's working state: plane pointings, proxy masks, joint selection over the proxies, per-mask tallies. */
interface SearchState {
  plane: PlanePointing[];
  pointings: MaskPointing[];
  proxies: ProxyMask[];
  chosen: number[][];
  tallies: Tally[];
  value: number;
  /** Summed alignment shortfall (boxes missing below alignment.minCount over all masks): 0 is a valid layout. */
  short: number;
  /** How far the layout falls short of the valid naive cross on tracer weight and capped tracer reach (0: not short; crossDeficit). */
  deficit: number;
}

/** A trial move's outcome, committed only when kept. */
interface MoveTrial { m: number; pp: PlanePointing; pointing: MaskPointing; prox: ProxyMask; chosen: number[][]; tally: Tally; value: number; short: number; deficit: number }

/** Effort settings after defaults (plan `search`; `effort` scales every count, 10 gives the "10x longer search"). */
export interface SearchBudget { levels: number; passes: number; randomTrials: number; kicks: number; starts: number }

/** The search's budget from the plan's `search` section: explicit counts win over those derived from `effort` (default 1). */
export function searchBudget(rules: SearchRules, freeMasks: number): SearchBudget {
  const effort = rules.effort ?? 1;
  const log2 = effort > 1 ? Math.round(PMath.log(effort) / PMath.log(2)) : 0;
  return {
    levels: rules.levels ?? 4 + log2,
    passes: rules.passes ?? (effort > 1 ? 3 : 2),
    randomTrials: rules.randomTrials ?? Math.max(1, Math.round(effort)),
    kicks: rules.kicks ?? Math.round(effort * freeMasks),
    starts: rules.starts ?? (effort >= 4 ? 3 : 1),
  };
}

/**
 * Search the unlocked masks' pointings (see the module comment). Deterministic for a given plan and `search.seed`.
 * onProgress receives fractions in [0, 1].
 */
export function searchPointings(env: SearchEnv, start: readonly MaskPointing[], onProgress: (fraction: number, message: string) => void = () => {}, starts: readonly { name: string; pointings: readonly MaskPointing[] }[] = [{ name: 'cross', pointings: start }]): SearchResult {
  const { ctx } = env;
  const rules = (env.plan.search ?? {}) as SearchRules;
  const free = start.map((p, i) => (p.locked ? -1 : i)).filter((i) => i >= 0);
  let startEvalCache: ReturnType<typeof evaluatePointings> | null = null;
  const startEval = () => (startEvalCache ??= evaluatePointings(env, start));
  const keep = (evaluations: number, accepted: number, startName = 'cross'): SearchResult => {
    const e = startEval();
    return {
      pointings: start.slice(), masks: e.masks, allocation: e.allocation, starlightWarnings: e.warnings,
      report: { startObjective: e.value, objective: e.value, evaluations, acceptedMoves: accepted, keptStart: true, startLayout: startName },
    };
  };
  if (rules.enabled === false || free.length === 0) return keep(1, 0);
  const rng = makeRng(rules.seed ?? 1);
  const budget = searchBudget(rules, free.length);
  const g = ctx.galaxy, profile = ctx.profile;
  const gc = tangentCentre(g.raDeg, g.decDeg);
  // Step scale from the largest footprint of the plan's profiles (the only one in a single-profile plan).
  const { halfDiag, halfLong } = footprintScaleArcsec(ctx);
  const proxyMask = instrumentsProxyModel(env, proxyModel);
  const minAlign = profile.alignment.minCount;
  const shortOf = (p: ProxyMask) => alignmentShortOf(p, minAlign);
  // Keep the mask over the galaxy's field: its centre within tracerReachRe (semi-major) + half the footprint's diagonal.
  const maxCentreArcsec = (env.objective.tracerReachRe * g.reArcsec) / Math.sqrt(g.axisRatio) + halfDiag;
  let evaluations = 0, accepted = 0;
  const ceilingBounds = ceilingBoundsObjective(env.objective);

  const toPointing = (m: number, pp: PlanePointing): MaskPointing => {
    const sky = tangentToSkyDeg(gc, pp.xi, pp.eta);
    return { id: start[m].id, raDeg: sky.raDeg, decDeg: sky.decDeg, paDeg: wrap360Deg(pp.paDeg), locked: start[m].locked, ...(start[m].instrument !== undefined ? { instrument: start[m].instrument } : {}) };
  };
  // The floor: the naive cross on the proxy model, when it is a valid layout (rankStarts). The search keeps to layouts
  // at least as good on tracer weight and capped tracer reach (the final comparison with the fully allocated cross settles it).
  let floor: CrossFloor | null = null;
  const copy = (st: SearchState): SearchState => ({ ...st, plane: st.plane.slice(), pointings: st.pointings.slice(), proxies: st.proxies.slice(), chosen: st.chosen.slice(), tallies: st.tallies.slice() });
  /**
   * Evaluate moving mask m to pp: the moved mask re-solved exactly with the others fixed (null when off the field).
   * With `onlyIfBetter`, null also when the move cannot be better than st even with the most starlight the mask could
   * add (proxyStarlightCeiling, starlightCeiling): the mask's starlight estimate, the costly part of its tally, is then
   * not made.
   */
  const trial = (st: SearchState, m: number, pp: PlanePointing, onlyIfBetter = false): MoveTrial | null => {
    if (PMath.hypot(pp.xi, pp.eta) > maxCentreArcsec) return null;
    evaluations++;
    const pointing = toPointing(m, pp);
    const prox = proxyMask(pointing);
    const next = st.proxies.slice();
    next[m] = prox;
    const short = st.short - shortOf(st.proxies[m]) + shortOf(prox);
    if (short > st.short) return { m, pp, pointing, prox, chosen: st.chosen, tally: st.tallies[m], value: -Infinity, short, deficit: Infinity };
    const chosen = resolveOneMask(proxyProblem(ctx, next), st.chosen.map((c, i) => (i === m ? [] : c)), m);
    const tally = proxyTracerTally(env, pointing, prox, chosen[m]);
    const tallies = st.tallies.slice();
    tallies[m] = tally;
    const om = proxyStarlightGalaxy(env, pointing);
    const slots = om ? proxyFreeSlots(env, pointing, prox, chosen[m]) : [];
    if (om && onlyIfBetter && ceilingBounds) {
      // The tracer terms, the deficit and the shortfall are final; the starlight terms can only rise to the ceiling.
      const most = proxyStarlightCeiling(env, pointing, om, slots);
      const ceiling = ceilingValue(env, tallies, most.maxRe, most.slits);
      if (!better({ short, value: ceiling.total, deficit: crossDeficit(floor, ceiling, env.objective.tracerReachRe) }, st)) return null;
    }
    if (om) addProxyStarlight(env, pointing, om, slots, tally);
    const v = objectiveValue(env.objective, mergeTallies(env.objective, tallies));
    return { m, pp, pointing, prox, chosen, tally, value: v.total, short, deficit: crossDeficit(floor, v, env.objective.tracerReachRe) };
  };
  /** Alignment first (fewer boxes missing always wins), then the shortfall against the valid cross, then the objective. */
  const better = (t: { short: number; value: number; deficit: number }, st: { short: number; value: number; deficit: number }) =>
    t.short < st.short || (t.short === st.short && (t.deficit < st.deficit - 1e-12 || (t.deficit <= st.deficit + 1e-12 && t.value > st.value * (1 + 1e-9) + 1e-9)));
  const commit = (st: SearchState, t: MoveTrial) => {
    st.plane[t.m] = t.pp; st.pointings[t.m] = t.pointing; st.proxies[t.m] = t.prox; st.chosen = t.chosen; st.tallies[t.m] = t.tally;
    st.value = t.value; st.short = t.short; st.deficit = t.deficit;
    accepted++;
  };
  const tryMove = (st: SearchState, m: number, pp: PlanePointing): boolean => {
    const t = trial(st, m, pp, true);
    if (!t || !better(t, st)) return false;
    commit(st, t);
    return true;
  };

  /**
   * Repair of a mask short of alignment stars: shifts on rings around it, turns, and pulls towards the galaxy
   * centre, tested first by the alignment rule alone (cheap); of the pointings that hold enough boxes, the nearest
   * few are evaluated in full and the best kept. When none is near, a grid over the whole field is tried.
   */
  const repair = (st: SearchState, m: number): void => {
    if (shortOf(st.proxies[m]) === 0) return;
    const p = st.plane[m];
    const local: PlanePointing[] = [];
    for (const f of [0.25, 0.5, 0.75, 1]) local.push({ xi: p.xi * (1 - f), eta: p.eta * (1 - f), paDeg: p.paDeg });
    for (const rf of [0.1, 0.2, 0.35, 0.5, 0.75, 1, 1.4, 2]) {
      for (let d = 0; d < 8; d++) {
        const a = (d * 45 + rf * 10) * RAD_PER_DEG;
        for (const dPa of [0, 20, -20, 45, -45, 90]) local.push({ xi: p.xi + rf * halfLong * PMath.sin(a), eta: p.eta + rf * halfLong * PMath.cos(a), paDeg: p.paDeg + dPa });
      }
    }
    for (const dPa of [10, -10, 20, -20, 45, -45, 90]) local.push({ ...p, paDeg: p.paDeg + dPa });
    const enough = (cands: PlanePointing[]) => cands
      .filter((c) => PMath.hypot(c.xi, c.eta) <= maxCentreArcsec && alignmentCapacity(ctx, toPointing(m, c)).compatibleMax >= minAlign)
      .sort((x, y) => PMath.hypot(x.xi - p.xi, x.eta - p.eta) + 0.5 * Math.abs(x.paDeg - p.paDeg) - PMath.hypot(y.xi - p.xi, y.eta - p.eta) - 0.5 * Math.abs(y.paDeg - p.paDeg));
    let ok = enough(local);
    if (!ok.length) {
      const grid: PlanePointing[] = [];
      const step = halfLong / 2, n = Math.ceil(maxCentreArcsec / step);
      for (let i = -n; i <= n; i++) for (let j = -n; j <= n; j++) for (let k = 0; k < 8; k++) grid.push({ xi: i * step, eta: j * step, paDeg: p.paDeg + k * 22.5 });
      ok = enough(grid);
    }
    let best: MoveTrial | null = null;
    for (const c of ok.slice(0, 8)) {
      const t = trial(st, m, c);
      if (t && (!best || better(t, best))) best = t;
    }
    if (best && best.short < st.short) commit(st, best);
  };

  /** Pattern search over the free masks (`only`: one mask), step sizes halving from `firstStep` over `levels`. */
  let done = 0;
  const totalTrials = Math.max(1, budget.starts * budget.levels * budget.passes * free.length * (6 + budget.randomTrials) + budget.kicks * 30);
  const patternSearch = (st: SearchState, levels: number, firstStep: number, firstPaStep: number, masks: readonly number[], label: string) => {
    for (let level = 0; level < levels; level++) {
      const step = firstStep * PMath.pow(0.5, level);
      const stepPa = firstPaStep * PMath.pow(0.5, level);
      for (let pass = 0; pass < budget.passes; pass++) {
        const acceptedBefore = accepted;
        for (const m of masks) {
          const p = st.plane[m];
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
          for (let k = 0; k < budget.randomTrials; k++) moves.push({ xi: p.xi + step * rng.uniform(-1, 1), eta: p.eta + step * rng.uniform(-1, 1), paDeg: p.paDeg + stepPa * rng.uniform(-1, 1) });
          for (const mv of moves) { done++; tryMove(st, m, mv); }
          onProgress(Math.min(0.95, done / totalTrials), `pointing search: ${label}, step level ${level + 1}/${levels}, objective ${st.value.toFixed(1)}`);
        }
        if (accepted === acceptedBefore) { done += (budget.passes - pass - 1) * masks.length * (6 + budget.randomTrials); break; }
      }
    }
  };

  // Starts: every layout evaluated on the proxy; the best few (fewest boxes missing, then the objective) searched.
  const setup = rankStarts(env, proxyMask, start, starts, Math.max(1, budget.starts));
  evaluations += setup.evaluations;
  floor = setup.floor;
  let best: { name: string; st: SearchState } | null = null;
  for (const { name, st } of setup.ranked) {
    for (const m of free) repair(st, m);
    patternSearch(st, budget.levels, halfLong * 0.5, 24, free, `start "${name}"`);
    if (!best || better(st, best.st)) best = { name, st };
  }
  const st = best!.st;
  // Kicks: one mask jumps to a random place of the field (holding its alignment boxes), is searched locally, and the
  // jump is kept only when the whole layout ends better: a way out of local optima.
  for (let kick = 0; kick < budget.kicks; kick++) {
    const m = free[kick % free.length];
    const saved = copy(st), savedAccepted = accepted;
    const rad = maxCentreArcsec * 0.8 * Math.sqrt(rng.next()), az = rng.uniform(0, 2 * Math.PI);
    const jump = { xi: rad * PMath.sin(az), eta: rad * PMath.cos(az), paDeg: rng.uniform(0, 180) };
    const t = trial(st, m, jump);
    done += 30;
    if (!t || t.short > saved.short) continue;
    commit(st, t);
    patternSearch(st, 2, halfLong * 0.25, 12, [m], `kick ${kick + 1}/${budget.kicks}`);
    if (!better(st, saved)) { Object.assign(st, saved); accepted = savedAccepted; }
  }

  const pointings = st.pointings;
  const startName = best!.name;
  const moved = pointings.some((p, i) => p.raDeg !== start[i].raDeg || p.decDeg !== start[i].decDeg || p.paDeg !== start[i].paDeg);
  if (!moved) return keep(evaluations, 0);
  const final = evaluatePointings(env, pointings);
  evaluations++;
  // A mask still short after the repair moves has no valid pointing the search could find: say so in its problem.
  const reachArcmin = (maxCentreArcsec / 60).toFixed(1);
  final.allocation.problems = final.allocation.problems.map((pr) => {
    const m = free.find((i) => pr.where === `mask ${start[i].id}`);
    return m === undefined ? pr : { ...pr, what: `${pr.what}; no pointing tried (shifts, turns and a grid over the field within ${reachArcmin}' of the galaxy) holds ${minAlign} boxes clear of each other` };
  });
  onProgress(1, 'pointing search done');
  const won = (report: Partial<SearchReport>): SearchResult => ({
    pointings, masks: final.masks, allocation: final.allocation, starlightWarnings: final.warnings,
    report: { objective: final.value, evaluations, acceptedMoves: accepted, keptStart: false, startLayout: startName, ...report },
  });
  // A proven bound on the start's objective often settles the comparison without allocating the start in full:
  // with no alignment problem left, beating the bound beats the start whatever its problems.
  const finalProblems = final.allocation.problems.length;
  // The search's alignment rule is the allocation's (alignmentCapacity), so a start short of boxes has problems in full.
  const startShort = setup.crossShort;
  if (finalProblems === 0 && startShort > 0) return won({ startAlignmentShort: startShort });
  const goalRe = env.objective.tracerReachRe;
  if (finalProblems === 0) {
    const ub = upperBounds(env, start.map((p) => proxyMask(p, true).set));
    // Beating every bound (objective, tracer weight, capped reach) beats the cross on all three without allocating it.
    if (final.value.total > ub.total && final.value.yieldWeight >= ub.yieldWeight && Math.min(final.value.tracerReachRe, goalRe) >= Math.min(ub.tracerReachRe, goalRe)) {
      return won({ startObjectiveUpperBound: ub.total });
    }
  }
  const e = startEval();
  evaluations++;
  // With as many problems as the cross, the result must dominate it: objective, tracer weight and capped reach.
  if (finalProblems < e.allocation.problems.length || (finalProblems === e.allocation.problems.length && dominatesCross(final.value, e.value, goalRe))) return won({ startObjective: e.value });
  return keep(evaluations, accepted);
}

/** Alignment boxes a proxy mask lacks: its profile's alignment need (minAlign, the plan's, when not given) less what it can hold, at least 0. */
function alignmentShortOf(p: ProxyMask, minAlign: number): number {
  return Math.max(0, (p.alignmentNeeded ?? minAlign) - p.alignmentMax);
}

/** Whether starlightCeiling bounds the objective: only with non-negative coverage coefficients (the plan schema's rule). */
function ceilingBoundsObjective(o: ObjectiveContext): boolean {
  const w = o.weights;
  return o.unitWeight >= 0 && w.aStarlightBin >= 0 && w.aStarlightSector >= 0 && w.aStarlightReach >= 0;
}

/** The objective of masks' tallies with the most starlight their free space allows (starlightCeiling: maxRe, slits): an upper bound when ceilingBoundsObjective. */
function ceilingValue(env: SearchEnv, tallies: readonly Tally[], maxRe: number, slits: number): ObjectiveValue {
  return objectiveValue(env.objective, starlightCeiling(mergeTallies(env.objective, tallies), maxRe, slits));
}

/** The joint allocation problem of proxy masks: the context's weights, each mask's candidate set. */
function proxyProblem(ctx: SearchEnv['ctx'], ps: readonly ProxyMask[]): JointProblem {
  return { weights: ctx.weights, masks: ps.map((p) => p.set) };
}

/** Ranking of the start layouts: fewer alignment boxes missing first, then an objective higher by more than 1e-9 relative. */
function betterStart(t: { short: number; value: number }, st: { short: number; value: number }): boolean {
  return t.short < st.short || (t.short === st.short && t.value > st.value * (1 + 1e-9) + 1e-9);
}

/** Key of a pointing for the proxy model: centre, PA and instrument, exactly (bits; -0 apart from 0). */
function pointingKey(p: MaskPointing): string {
  const bits = (x: number) => (Object.is(x, -0) ? '-0' : String(x));
  return `${bits(p.raDeg)} ${bits(p.decDeg)} ${bits(p.paDeg)} ${p.instrument === undefined ? '' : `@${p.instrument}`}`;
}

/** A start layout on the proxy model, its tallies still without starlight, and per mask what its starlight estimate needs (null: none possible). */
interface StartDraft {
  name: string;
  st: SearchState;
  starlight: ({ om: GalaxyOnMask; slots: Span[] } | null)[];
  /** A proven upper bound of st.value once its starlight is estimated (Infinity when none is known). */
  ceiling: number;
}

/**
 * The search's set-up: every start layout on the proxy model (greedy allocation, 3 best-response sweeps, the
 * starlight estimate per mask) and the first `count` of them in ranking order (betterStart; stable: earlier layouts
 * first among ties), as the search state of each. `floor` is the naive cross's (start's) tracer weight and capped reach
 * when it lacks no alignment box, `crossShort` the boxes it lacks, `evaluations` the layouts evaluated. Layouts share
 * pointings (the ring is the cross with two masks swapped): each pointing's proxy is made once. A layout's starlight
 * estimate, the costly part of its tally, is made only while its proven ceiling could still rank it among the first
 * `count` (leadingStarts); `prune: false` makes every one, for comparison: the ranking is the same.
 */
export function rankStarts(
  env: SearchEnv, proxyMask: (p: MaskPointing) => ProxyMask, start: readonly MaskPointing[],
  starts: readonly { name: string; pointings: readonly MaskPointing[] }[], count: number, prune = true,
): { ranked: { name: string; st: SearchState }[]; floor: CrossFloor | null; crossShort: number; evaluations: number } {
  const { ctx } = env;
  const gc = tangentCentre(ctx.galaxy.raDeg, ctx.galaxy.decDeg);
  const minAlign = ctx.profile.alignment.minCount, goalRe = env.objective.tracerReachRe;
  const ceilingBounds = ceilingBoundsObjective(env.objective);
  const proxies = new Map<string, ProxyMask>();
  const proxyOf = (p: MaskPointing): ProxyMask => {
    const key = pointingKey(p);
    let px = proxies.get(key);
    if (!px) proxies.set(key, (px = proxyMask(p)));
    return px;
  };
  let floor: CrossFloor | null = null, evaluations = 0;
  const draft = (name: string, ps: readonly MaskPointing[]): StartDraft => {
    const plane = ps.map((p) => {
      const t = skyToTangentArcsec(gc, p.raDeg, p.decDeg)!;
      return { xi: t.xiArcsec, eta: t.etaArcsec, paDeg: p.paDeg };
    });
    const pointings = ps.map((p) => ({ ...p }));
    const px = pointings.map(proxyOf);
    const chosen = improveByBestResponse(proxyProblem(ctx, px), allocateGreedyMaskByMask(proxyProblem(ctx, px)).chosen, 3);
    const tallies = px.map((p, m) => proxyTracerTally(env, pointings[m], p, chosen[m]));
    evaluations++;
    // Starlight adds nothing to the tracer weight and reach that the deficit reads.
    const v = objectiveValue(env.objective, mergeTallies(env.objective, tallies));
    const st: SearchState = { plane, pointings, proxies: px, chosen, tallies, value: v.total, short: px.reduce((a, p) => a + alignmentShortOf(p, minAlign), 0), deficit: crossDeficit(floor, v, goalRe) };
    const starlight = px.map((p, m) => {
      const om = proxyStarlightGalaxy(env, pointings[m]);
      return om ? { om, slots: proxyFreeSlots(env, pointings[m], p, chosen[m]) } : null;
    });
    return { name, st, starlight, ceiling: startCeiling(st, starlight) };
  };
  /** The most st.value can become with its starlight: exact without any, else starlightCeiling of every mask's most (proxyStarlightCeiling). */
  const startCeiling = (st: SearchState, starlight: StartDraft['starlight']): number => {
    if (starlight.every((s) => s === null)) return st.value;
    if (!ceilingBounds) return Infinity;
    let slits = 0, maxRe = 0;
    starlight.forEach((s, m) => {
      if (!s) return;
      const most = proxyStarlightCeiling(env, st.pointings[m], s.om, s.slots);
      slits += most.slits;
      maxRe = Math.max(maxRe, most.maxRe);
    });
    const c = ceilingValue(env, st.tallies, maxRe, slits).total;
    return Number.isNaN(c) ? Infinity : c;
  };
  const finished = new Set<SearchState>();
  const finish = (d: StartDraft): void => {
    if (finished.has(d.st)) return;
    finished.add(d.st);
    d.starlight.forEach((s, m) => { if (s) addProxyStarlight(env, d.st.pointings[m], s.om, s.slots, d.st.tallies[m]); });
    d.st.value = objectiveValue(env.objective, mergeTallies(env.objective, d.st.tallies)).total;
  };
  const cross = draft('cross', start);
  const crossShort = cross.st.short;
  if (crossShort === 0) {
    const v = objectiveValue(env.objective, mergeTallies(env.objective, cross.st.tallies));
    floor = { yieldWeight: v.yieldWeight, cappedReachRe: Math.min(v.tracerReachRe, goalRe) };
  }
  const drafts = starts.map((l) => (l.pointings === start ? { ...cross, name: l.name } : draft(l.name, l.pointings)));
  const ranked = leadingStarts(drafts, count, finish, prune);
  return { ranked: ranked.map((d) => ({ name: d.name, st: d.st })), floor, crossShort, evaluations };
}

/**
 * The first `count` of `items` in the order of their stable sort by betterStart on (st.short, st.value), each
 * finished (`finish` sets st.value to its exact value, at most `ceiling`). Items are finished in order of (short,
 * ceiling descending) until `count` finished ones clearly beat the next one's ceiling (beat it, and are not
 * beaten by it: betterStart is not antisymmetric below -1): that item, and every one after it, is then clearly beaten
 * by each of the first `count` finished ones. Those finished are sorted as the full list would be: an insertion sort
 * (the engine's below 64 items) never puts an item before one that clearly beats it, and orders a consistent set the
 * same way whatever else it holds. Finished values that betterStart does not order consistently (within its tolerance
 * of each other, or equal and each beating the other), 64 items or more, or `prune: false`, finish every item and
 * sort them all.
 */
export function leadingStarts<T extends { st: { short: number; value: number }; ceiling: number }>(items: readonly T[], count: number, finish: (item: T) => void, prune = true): T[] {
  const byIndex = new Map(items.map((it, i) => [it, i]));
  const order = items.slice().sort((x, y) => x.st.short - y.st.short || (x.ceiling > y.ceiling ? -1 : x.ceiling < y.ceiling ? 1 : 0));
  const done: T[] = [];
  for (const it of order) {
    const most = { short: it.st.short, value: it.ceiling };
    if (prune && items.length < 64 && done.filter((d) => betterStart(d.st, most) && !betterStart(most, d.st)).length >= count) break;
    finish(it);
    done.push(it);
  }
  // Consistent: of two finished items with the same short, exactly one beats the other unless their values are equal (then neither).
  const consistent = done.every((a) => done.every((b) => a.st.short !== b.st.short || Number(betterStart(a.st, b.st)) + Number(betterStart(b.st, a.st)) === (a.st.value === b.st.value ? 0 : 1)));
  if (!consistent) for (const it of items) if (!done.includes(it)) finish(it);
  const sortable = consistent ? done.sort((x, y) => byIndex.get(x)! - byIndex.get(y)!) : items.slice();
  return sortable.sort((x, y) => (betterStart(x.st, y.st) ? -1 : betterStart(y.st, x.st) ? 1 : 0)).slice(0, count);
}

/**
 * A proven upper bound on the objective of pointings from candidate sets that contain every tracer eligible on each
 * mask (centre inside the footprint's bounds and the wavelength rule: necessary conditions of eligibility, so a
 * superset): each mask's exact optimum alone bounds its share of the joint tracer weight (dropping "each object once",
 * alignment boxes and the footprint's shape can only raise the optimum; trading tracers for starlight only lowers it),
 * and every coverage term is bounded by its maximum (all bins and sectors full, every starlight bin, full reach).
 */
export function objectiveUpperBound(env: SearchEnv, supersets: readonly MaskCandidateSet[]): number {
  return upperBounds(env, supersets).total;
}

/**
 * Proven upper bounds from candidate supersets (see objectiveUpperBound): the objective, the tracer weight (sum of
 * each mask's exact optimum alone) and the tracer reach (largest R/Re of any candidate in the supersets).
 * The refraction term is at most 0, so dropping it keeps the bound.
 */
export function upperBounds(env: SearchEnv, supersets: readonly MaskCandidateSet[]): { total: number; yieldWeight: number; tracerReachRe: number } {
  let y = 0, reach = 0;
  for (const set of supersets) {
    const w = new Float64Array(set.objects.length);
    for (let k = 0; k < w.length; k++) {
      w[k] = env.ctx.weights[set.objects[k]];
      if (w[k] > 0 && env.radiusRe[set.objects[k]] > reach) reach = env.radiusRe[set.objects[k]];
    }
    y += solveIntervalIndex(set.index, w).total;
  }
  const o = env.objective, W = o.unitWeight, a = o.weights;
  const t = emptyTally(o);
  const total = y + W * (a.aBin * t.tracerBins.length + a.aSector * t.tracerSectors.length + (o.starlightReachRe > 0 ? a.aStarlightBin * t.starlightBins.length + a.aStarlightSector * t.starlightSectors.length + a.aStarlightReach : 0));
  return { total, yieldWeight: y, tracerReachRe: reach };
}

/** The valid naive cross's tracer weight and tracer reach (R/Re, capped at goals.tracerReachRe) on the search's model. */
interface CrossFloor { yieldWeight: number; cappedReachRe: number }

/**
 * How far a layout falls short of the cross: relative tracer-weight shortfall plus capped-reach shortfall in units of
 * the reach goal (0 when at least as good on both, or without a valid cross).
 */
function crossDeficit(floor: CrossFloor | null, v: ObjectiveValue, goalRe: number): number {
  if (!floor) return 0;
  const dW = Math.max(0, floor.yieldWeight * (1 - 1e-12) - v.yieldWeight) / Math.max(floor.yieldWeight, 1e-300);
  const dR = Math.max(0, floor.cappedReachRe - 1e-12 - Math.min(v.tracerReachRe, goalRe)) / Math.max(goalRe, 1e-300);
  return dW + dR;
}

/** Whether a result is at least as good as the cross on the objective, the tracer weight and the capped tracer reach, and better on one. */
export function dominatesCross(v: ObjectiveValue, cross: ObjectiveValue, goalRe: number): boolean {
  const tol = (x: number) => 1e-9 * Math.max(1, Math.abs(x));
  const r = Math.min(v.tracerReachRe, goalRe), rc = Math.min(cross.tracerReachRe, goalRe);
  const atLeast = v.total >= cross.total - tol(cross.total) && v.yieldWeight >= cross.yieldWeight - tol(cross.yieldWeight) && r >= rc - 1e-9;
  return atLeast && (v.total > cross.total + tol(cross.total) || v.yieldWeight > cross.yieldWeight + tol(cross.yieldWeight) || r > rc + 1e-9);
}

/** Tally of one proxy mask with a selection before its starlight estimate (addProxyStarlight): its tracers and refraction loss. */
function proxyTracerTally(planEnv: SearchEnv, pointing: MaskPointing, p: ProxyMask, chosenK: readonly number[]): Tally {
  const env = envFor(planEnv, pointing);
  const t = emptyTally(env.objective);
  const { ctx } = env;
  for (const k of chosenK) {
    const o = p.set.objects[k];
    addTracer(t, p.set.values ? p.set.values[k] : ctx.weights[o], env.radiusRe[o], targetAzimuthDeg(env, o));
  }
  if (env.refractionLoss) t.refractionLossWeight = t.yieldWeight * env.refractionLoss(pointing);
  return t;
}

/** The galaxy on the mask when the proxy's starlight estimate can place a slit there; null when no starlight is possible. */
function proxyStarlightGalaxy(planEnv: SearchEnv, pointing: MaskPointing): GalaxyOnMask | null {
  const env = envFor(planEnv, pointing);
  if (env.starlight.reachRe <= 0) return null;
  const { ctx } = env;
  const g = ctx.galaxy;
  const om = galaxyOnMask(pointing, g, env.bn);
  const b = polygonBounds(ctx.profile.footprint);
  const halfDiag = PMath.hypot(Math.max(-b.minX, b.maxX), Math.max(-b.minY, b.maxY));
  // No starlight possible when even the nearest footprint point lies beyond the reach (R >= sqrt(q) x distance).
  if (Math.sqrt(g.axisRatio) * (PMath.hypot(om.gxArcsec, om.gyArcsec) - halfDiag) > env.starlight.reachRe * g.reArcsec) return null;
  return om;
}

/** The proxy's starlight slots (mask y, arcsec): the free space between the selection's minimal tracer slits (freeSlots). */
function proxyFreeSlots(planEnv: SearchEnv, pointing: MaskPointing, p: ProxyMask, chosenK: readonly number[]): Span[] {
  const env = envFor(planEnv, pointing);
  const { ctx } = env;
  const L = ctx.profile.slits.minLengthArcsec;
  return freeSlotsOfTracers(p.y, chosenK, L / 2, ctx.profile.slits.widthArcsec, ctx.rules, ctx.profile.slits.gapArcsec, env.starlight.slitLengthArcsec);
}

/** Add to t the starlight slits the proxy estimate chooses in the slots (chooseSlots: one sample, a 25" x grid, no sky slits). */
function addProxyStarlight(planEnv: SearchEnv, pointing: MaskPointing, om: GalaxyOnMask, slots: readonly Span[], t: Tally): void {
  const env = envFor(planEnv, pointing);
  const { ctx } = env;
  const { starlight } = chooseSlots(om, ctx.rules, slots, withoutSkySlits(env.starlight), new Set(), 1, 25, ctx.profile.slits.gapArcsec);
  for (const c of starlight) addStarlight(t, c.rRe, c.azimuthDeg);
}

/**
 * The most starlight slits, and the largest R/Re (starlightRadiusCeilingRe), addProxyStarlight can add from the slots:
 * a chosen slot or joined window reaches the galaxy (evaluateSlot: sqrt(q) |y - gy| <= maxRe x Re at its centre y), and
 * each holds a slot of its own whose centre lies within half the longest window of its centre, so at most one slit per
 * slot within that band, and at most maxPerMask.
 */
function proxyStarlightCeiling(planEnv: SearchEnv, pointing: MaskPointing, om: GalaxyOnMask, slots: readonly Span[]): { slits: number; maxRe: number } {
  const env = envFor(planEnv, pointing);
  const s = env.starlight, g = om.galaxy, sq = Math.sqrt(g.axisRatio);
  const longest = Math.max(s.slitLengthArcsec, s.maxSlitLengthArcsec) + 1e-9;
  const band = (s.maxRe * g.reArcsec + sq * longest / 2) * (1 + 1e-9) + 1e-9;
  let slits = 0;
  for (const sp of slots) if (sq * Math.abs(0.5 * (sp.lo + sp.hi) - om.gyArcsec) <= band) slits++;
  return { slits: Math.min(slits, s.maxPerMask), maxRe: starlightRadiusCeilingRe(om, env.ctx.rules.widthArcsec, s) };
}
