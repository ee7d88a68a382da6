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
import { galaxyToSkyArcsec, galaxyTurn } from '../sky/frames';
import { skyToTangentArcsec, tangentCentre, tangentToSkyDeg } from '../sky/tangentPlane';
import { sersicBn } from '../sky/sersic';
import { galaxyRadiusAndAzimuth, tangentAzimuthDeg, tangentRadiusRe } from '../sky/galaxyRadius';
import { alignmentCapacity, allocateForPointings, type AllocationContext, type PointingsAllocation } from './allocateMasks';
import { solveIntervalIndex } from './intervalScheduling';
import { allocateGreedyMaskByMask, improveByBestResponse, maskCandidateSet, resolveOneMask, type JointProblem, type MaskCandidateSet } from './jointAllocation';
import { wavelengthOk } from '../profile/eligibility';
import { footprintRaster, rasterFits } from './footprintRaster';
import { maskBasis, maskCosC, maskPointToSkyDeg, unitToMaskArcsec } from './maskTargets';
import { chooseSlots, freeSlots, galaxyOnMask, starlightSettings, type RowSpan, type StarlightSettings, type StarlightTrade } from './starlight';
import { addStarlight, addTracer, emptyTally, mergeTallies, objectiveContext, objectiveValue, type ObjectiveContext, type ObjectiveValue, type Tally } from './objective';
import type { StarlightRules } from '../plan/starlightSection';
import type { SearchRules } from '../plan/searchSection';
import { makeRng } from '../numeric/random';
import type { MaskPointing, MaskSolution } from '../geometry/maskSolution';
import { PMath } from '../numeric/portableMath';
import { candidateValues, contextFor, tracerRowValue } from './maskContext';
import { envFor, footprintScaleArcsec, instrumentsProxyModel, placeStarlightForMasks } from './instrumentSearch';
import { refractionLossModel, type RefractionLoss } from './refractionTerm';
import { cellsInRectangle, PROXY_CELL_ARCSEC, PROXY_TRIAL_BUDGET, proxyCellPair, type ProxyCells } from './proxyCells';

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

/** Objective evaluation shared by the search, the pipeline report and the benchmark. */
export interface SearchEnv {
  ctx: AllocationContext;
  objective: ObjectiveContext;
  starlight: StarlightSettings;
  plan: PlanFile;
  /** R/Re of every target (index as ctx.targets). */
  radiusRe: Float64Array;
  /** Azimuth (degrees) of every target, NaN until first needed: read it through targetAzimuthDeg. */
  azimuthDeg: Float64Array;
  /** Galaxy tangent-plane position of every target (arcsec). */
  xi: Float64Array;
  eta: Float64Array;
  bn: number;
  /** Fraction of a mask's tracer light lost to refraction across its slits (solver/refractionTerm.ts); null when search.objective.aRefraction is 0. */
  refractionLoss: RefractionLoss | null;
}

/** Build the evaluation environment (cached target positions) for a plan and an allocation context. */
export function searchEnv(plan: PlanFile, ctx: AllocationContext): SearchEnv {
  const g = ctx.galaxy, n = ctx.table.length;
  const radiusRe = new Float64Array(n), azimuthDeg = new Float64Array(n).fill(NaN), xi = new Float64Array(n), eta = new Float64Array(n);
  const c = tangentCentre(g.raDeg, g.decDeg), turn = galaxyTurn(g.paDeg);
  for (let i = 0; i < n; i++) {
    const t = skyToTangentArcsec(c, ctx.raDeg[i], ctx.decDeg[i]);
    xi[i] = t ? t.xiArcsec : NaN;
    eta[i] = t ? t.etaArcsec : NaN;
    // galaxyRadiusAndAzimuth's R/Re from the projection just made (the same bits, one projection instead of two).
    radiusRe[i] = t ? tangentRadiusRe(g, t.xiArcsec, t.etaArcsec, turn) : Infinity;
  }
  const tracerWeights = tracerWeightsOf(ctx);
  const objective = objectiveContext(plan.goals, plan.search as SearchRules | undefined, tracerWeights);
  return {
    ctx, plan, radiusRe, azimuthDeg, xi, eta, bn: sersicBn(g.sersicN), objective,
    refractionLoss: refractionLossModel(plan, ctx.profile, objective.weights.aRefraction),
    starlight: starlightSettings(plan.starlight as StarlightRules | undefined, ctx.profile, plan),
  };
}

/** Azimuth of target i about the galaxy (degrees from the major axis, as galaxyRadiusAndAzimuth), computed once when first asked. */
export function targetAzimuthDeg(env: SearchEnv, i: number): number {
  const a = env.azimuthDeg[i];
  if (a === a) return a;
  return (env.azimuthDeg[i] = Number.isNaN(env.xi[i]) ? 0 : tangentAzimuthDeg(env.xi[i], env.eta[i], galaxyTurn(env.ctx.galaxy.paDeg)));
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

/** The objective's price of a starlight slit in tracer weight (for the starlight stage's trades). */
export function starlightTrade(o: ObjectiveContext): StarlightTrade {
  return { unitWeight: o.unitWeight, aStarlightBin: o.weights.aStarlightBin, aStarlightReach: o.weights.aStarlightReach, aStarlightSector: o.weights.aStarlightSector };
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

/**
 * The candidate set of intervals already sorted by end (equal lengths, sorted by start): the interval index of
 * solver/intervalScheduling (order by end, pred[k] = number of intervals ending at or before start k) in one pass.
 */
function equalLengthCandidateSet(objects: Int32Array, starts: Float64Array, ends: Float64Array, identity: Int32Array): MaskCandidateSet {
  const n = objects.length;
  // The order is the identity: a read-only view of a shared 0, 1, 2, ... array (nothing allocated for it).
  const order = identity.subarray(0, n), pred = new Int32Array(n);
  let j = 0;
  for (let k = 0; k < n; k++) {
    while (j < k && ends[j] <= starts[k]) j++;
    pred[k] = j;
  }
  return { objects, starts, ends, index: { order, pred } };
}

/** The search's fast model of one mask: its tracer candidates (exact projection, raster footprint test), no boxes. */
export interface ProxyMask {
  set: MaskCandidateSet;
  y: Float64Array;
  /** Largest number of alignment boxes the mask can hold (alignmentCapacity: the allocation's rule); 0 for a liberal set. */
  alignmentMax: number;
  /** Boxes the mask's profile needs (alignment.minCount), when it is not the plan's first profile's. */
  alignmentNeeded?: number;
}

/**
 * The search's fast model of masks for an environment: `proxy(pointing)` gives a mask's tracer candidates (exact
 * gnomonic projection by dot products of cached unit vectors, the wavelength rule exactly, the footprint by a
 * conservative column raster; no alignment boxes) and how many alignment boxes it can hold (the allocation's rule). With `liberal`
 * the footprint test is only the bounds box: every truly eligible tracer is then in the set (for upper bounds).
 * At high density the tracers of the search's cells are thinned (solver/proxyCells.ts), never those of a liberal set;
 * `thinning: false` keeps every tracer (for comparisons).
 */
export function proxyModel(env: SearchEnv, options: { thinning?: boolean } = {}): (p: MaskPointing, liberal?: boolean) => ProxyMask {
  const { ctx } = env;
  const profile = ctx.profile;
  const b = polygonBounds(profile.footprint);
  const L = profile.slits.minLengthArcsec, gap = profile.slits.gapArcsec;
  const slitRaster = footprintRaster(profile.footprint, profile.slits.widthArcsec / 2, L / 2);
  const gc = tangentCentre(ctx.galaxy.raDeg, ctx.galaxy.decDeg);
  // The galaxy's and a mask's tangent planes differ by far less than this margin near the galaxy: the scales differ by
  // a fraction of order d^2 (d: distance between the two tangent points, radians), about 0.2" at 600" from a mask
  // centre 1 degree away, so 30" holds for masks up to about 10 degrees from the galaxy; a cell is visited when its centre,
  // in the mask frame, lies within the footprint bounds grown by the cell's half-diagonal and this margin, and a
  // tracer is projected exactly only when its own offset passes the same bounds grown by the margin alone.
  const cell = PROXY_CELL_ARCSEC, margin = 30, grow = cell * Math.SQRT1_2 + margin;
  const loX = b.minX - margin, hiX = b.maxX + margin, loY = b.minY - margin, hiY = b.maxY + margin;
  // Cells whose centre can fall inside the grown bounds of one mask (the per-trial visit, any orientation).
  const shape = { slitPitchArcsec: L + gap, cellsPerTrial: cellsInRectangle(b.maxX - b.minX + 2 * grow, b.maxY - b.minY + 2 * grow, cell) };
  const input = {
    tracers: ctx.tracerIndices, xiArcsec: env.xi, etaArcsec: env.eta, unit: ctx.unit,
    value: candidateValues(ctx, ctx.tracerIndices) ?? tracerWeightsOf(ctx),
  };
  // The search's cells (thinned at high density) and, for the liberal superset of the proven bounds, every tracer.
  const cellPair = proxyCellPair(input, shape, options.thinning === false ? null : PROXY_TRIAL_BUDGET), searchCells = cellPair.search;
  let allGather: ReturnType<typeof gatherer> | null = null;
  const searchGather = gatherer(searchCells);
  // The order of a search set's interval index: a view of 0, 1, 2, ... as long as the largest search set.
  const identity = new Int32Array(searchCells.objects.length);
  for (let k = 0; k < identity.length; k++) identity[k] = k;

  /** Candidates of one index on a mask: object indices and mask y, in y order, no allocation per target. */
  function gatherer(cells: ProxyCells) {
    const size = cells.objects.length;
    const bufObj = new Int32Array(size), bufY = new Float64Array(size), keys = new Float64Array(size);
    const sortWork: SortWork = { out: new Int32Array(size), start: new Int32Array(size + 1), fill: new Int32Array(size) };
    const { nCells, cellOnPlane, cellXiArcsec, cellEtaArcsec, cellStart, objects: pObj, ux: pX, uy: pY, uz: pZ, xiArcsec: pXi, etaArcsec: pEta } = cells;
    return (p: MaskPointing, liberal: boolean): { objects: Int32Array; y: Float64Array; starts: Float64Array; ends: Float64Array } => {
      const basis = maskBasis(p);
      const at = { xArcsec: 0, yArcsec: 0 };
      const pc = skyToTangentArcsec(gc, p.raDeg, p.decDeg);
      // The mask's +y direction as seen in the galaxy's tangent plane (North turns between the two tangent points).
      const up = maskPointToSkyDeg(p, 0, 60), pu = skyToTangentArcsec(gc, up.raDeg, up.decDeg);
      const upA = pc && pu ? PMath.atan2(pu.xiArcsec - pc.xiArcsec, pu.etaArcsec - pc.etaArcsec) : p.paDeg * RAD_PER_DEG;
      const gsp = PMath.sin(upA), gcp = PMath.cos(upA);
      const pcXi = pc ? pc.xiArcsec : 0, pcEta = pc ? pc.etaArcsec : 0;
      let n = 0;
      for (let c = 0; c < nCells; c++) {
        const culled = pc !== null && cellOnPlane[c] === 1;
        if (culled) {
          const dxi = cellXiArcsec[c] - pcXi, deta = cellEtaArcsec[c] - pcEta;
          const mx = dxi * gcp - deta * gsp, my = dxi * gsp + deta * gcp;
          if (mx < b.minX - grow || mx > b.maxX + grow || my < b.minY - grow || my > b.maxY + grow) continue;
        }
        for (let q = cellStart[c], qEnd = cellStart[c + 1]; q < qEnd; q++) {
          if (culled) {
            const dxi = pXi[q] - pcXi, deta = pEta[q] - pcEta;
            const mx = dxi * gcp - deta * gsp, my = dxi * gsp + deta * gcp;
            if (mx < loX || mx > hiX || my < loY || my > hiY) continue;
          }
          const px = pX[q], py = pY[q], pz = pZ[q];
          const cosC = maskCosC(basis, px, py, pz);
          if (cosC < 0.9) continue; // farther than ~25 degrees: never on a mask
          unitToMaskArcsec(basis, px, py, pz, cosC, at);
          const x = at.xArcsec, y = at.yArcsec;
          if (x < b.minX || x > b.maxX || y < b.minY || y > b.maxY) continue;
          if (!wavelengthOk(ctx.rules, x) || (!liberal && !rasterFits(slitRaster, x, y))) continue;
          bufObj[n] = pObj[q]; bufY[n] = y; n++;
        }
      }
      // Order by y quantised to 1e-4 arcsec (ordering only), ties by position: a bucket sort, O(n) for spread-out y.
      for (let k = 0; k < n; k++) keys[k] = Math.floor((bufY[k] + 1e4) * 1e4);
      const byY = orderByKeyInto(keys, n, sortWork);
      const objects = new Int32Array(n), y = new Float64Array(n), starts = new Float64Array(n), ends = new Float64Array(n);
      for (let k = 0; k < n; k++) {
        const j = byY[k];
        objects[k] = bufObj[j]; y[k] = bufY[j];
        starts[k] = y[k] - L / 2; ends[k] = y[k] + L / 2 + gap;
      }
      return { objects, y, starts, ends };
    };
  }

  return (p: MaskPointing, liberal = false): ProxyMask => {
    // The liberal superset feeds a proven bound: every tracer, never the thinned cells.
    const gather = !liberal || searchCells.perCellCap === null ? searchGather : (allGather ??= gatherer(cellPair.all()));
    const { objects, y, starts, ends } = gather(p, liberal);
    // The allocation's own alignment rule (shared stars allowed; boxes clear of each other along y).
    const alignmentMax = liberal ? 0 : alignmentCapacity(ctx, p).compatibleMax;
    // The liberal set's interval index is built exactly (sorted by end), not from the packed keys.
    return { set: liberal ? maskCandidateSet(objects, starts, ends) : equalLengthCandidateSet(objects, starts, ends, identity), y, alignmentMax };
  };
}

/** The weight of every tracer, in the order of ctx.tracerIndices. */
function tracerWeightsOf(ctx: AllocationContext): Float64Array {
  const out = new Float64Array(ctx.tracerIndices.length);
  for (let k = 0; k < out.length; k++) out[k] = ctx.weights[ctx.tracerIndices[k]];
  return out;
}

/** Reusable buffers of orderByKeyInto for up to out.length keys (start: length + 1). */
interface SortWork { out: Int32Array; start: Int32Array; fill: Int32Array }

/**
 * Positions 0..n-1 of `keys` ordered by (key, position) ascending, the order of a stable sort: a counting sort into
 * n equal-width buckets over [min, max] key (monotone in the key), then insertion sort inside each bucket.
 */
export function orderByKey(keys: Float64Array): Int32Array {
  const n = keys.length;
  return orderByKeyInto(keys, n, { out: new Int32Array(n), start: new Int32Array(n + 1), fill: new Int32Array(n) }).slice(0, n);
}

/** orderByKey of the first n keys, in `work`'s buffers (no allocation): the result is work.out's first n entries. */
function orderByKeyInto(keys: Float64Array, n: number, work: SortWork): Int32Array {
  const { out, start, fill } = work;
  if (n === 0) return out;
  let lo = Infinity, hi = -Infinity;
  for (let k = 0; k < n; k++) { if (keys[k] < lo) lo = keys[k]; if (keys[k] > hi) hi = keys[k]; }
  const scale = hi > lo ? (n - 1) / (hi - lo) : 0;
  const bucketOf = (k: number) => Math.min(n - 1, Math.floor((keys[k] - lo) * scale));
  start.fill(0, 0, n + 1);
  for (let k = 0; k < n; k++) start[bucketOf(k) + 1]++;
  for (let b = 0; b < n; b++) start[b + 1] += start[b];
  fill.set(start.subarray(0, n));
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
  const shortOf = (p: ProxyMask) => Math.max(0, (p.alignmentNeeded ?? minAlign) - p.alignmentMax);
  const problemOf = (ps: readonly ProxyMask[]): JointProblem => ({ weights: ctx.weights, masks: ps.map((p) => p.set) });
  // Keep the mask over the galaxy's field: its centre within tracerReachRe (semi-major) + half the footprint's diagonal.
  const maxCentreArcsec = (env.objective.tracerReachRe * g.reArcsec) / Math.sqrt(g.axisRatio) + halfDiag;
  let evaluations = 0, accepted = 0;

  const toPointing = (m: number, pp: PlanePointing): MaskPointing => {
    const sky = tangentToSkyDeg(gc, pp.xi, pp.eta);
    return { id: start[m].id, raDeg: sky.raDeg, decDeg: sky.decDeg, paDeg: wrap360Deg(pp.paDeg), locked: start[m].locked, ...(start[m].instrument !== undefined ? { instrument: start[m].instrument } : {}) };
  };
  const init = (ps: readonly MaskPointing[]): SearchState => {
    const plane = ps.map((p) => {
      const t = skyToTangentArcsec(gc, p.raDeg, p.decDeg)!;
      return { xi: t.xiArcsec, eta: t.etaArcsec, paDeg: p.paDeg };
    });
    const pointings = ps.map((p) => ({ ...p }));
    const proxies = pointings.map((p) => proxyMask(p));
    const chosen = improveByBestResponse(problemOf(proxies), allocateGreedyMaskByMask(problemOf(proxies)).chosen, 3);
    const tallies = proxies.map((p, m) => proxyTally(env, pointings[m], p, chosen[m]));
    evaluations++;
    const v = objectiveValue(env.objective, mergeTallies(env.objective, tallies));
    return { plane, pointings, proxies, chosen, tallies, value: v.total, short: proxies.reduce((a, p) => a + shortOf(p), 0), deficit: crossDeficit(floor, v, env.objective.tracerReachRe) };
  };
  // The floor: the naive cross on the proxy model, when it is a valid layout. The search keeps to layouts at least as
  // good on tracer weight and capped tracer reach (the final comparison with the fully allocated cross settles it).
  let floor: CrossFloor | null = null;
  const copy = (st: SearchState): SearchState => ({ ...st, plane: st.plane.slice(), pointings: st.pointings.slice(), proxies: st.proxies.slice(), chosen: st.chosen.slice(), tallies: st.tallies.slice() });
  /** Evaluate moving mask m to pp: the moved mask re-solved exactly with the others fixed (null when off the field). */
  const trial = (st: SearchState, m: number, pp: PlanePointing): MoveTrial | null => {
    if (PMath.hypot(pp.xi, pp.eta) > maxCentreArcsec) return null;
    evaluations++;
    const pointing = toPointing(m, pp);
    const prox = proxyMask(pointing);
    const next = st.proxies.slice();
    next[m] = prox;
    const short = st.short - shortOf(st.proxies[m]) + shortOf(prox);
    if (short > st.short) return { m, pp, pointing, prox, chosen: st.chosen, tally: st.tallies[m], value: -Infinity, short, deficit: Infinity };
    const chosen = resolveOneMask(problemOf(next), st.chosen.map((c, i) => (i === m ? [] : c)), m);
    const tally = proxyTally(env, pointing, prox, chosen[m]);
    const tallies = st.tallies.slice();
    tallies[m] = tally;
    const v = objectiveValue(env.objective, mergeTallies(env.objective, tallies));
    return { m, pp, pointing, prox, chosen, tally, value: v.total, short, deficit: crossDeficit(floor, v, env.objective.tracerReachRe) };
  };
  /** Alignment first (fewer boxes missing always wins), then the shortfall against the valid cross, then the objective. */
  const better = (t: { short: number; value: number; deficit: number }, st: { short: number; value: number; deficit: number }) =>
    t.short < st.short || (t.short === st.short && (t.deficit < st.deficit - 1e-12 || (t.deficit <= st.deficit + 1e-12 && t.value > st.value * (1 + 1e-9) + 1e-9)));
  /** Ranking of the start layouts: alignment first, then the objective. */
  const betterStart = (t: { short: number; value: number }, st: { short: number; value: number }) => t.short < st.short || (t.short === st.short && t.value > st.value * (1 + 1e-9) + 1e-9);
  const commit = (st: SearchState, t: MoveTrial) => {
    st.plane[t.m] = t.pp; st.pointings[t.m] = t.pointing; st.proxies[t.m] = t.prox; st.chosen = t.chosen; st.tallies[t.m] = t.tally;
    st.value = t.value; st.short = t.short; st.deficit = t.deficit;
    accepted++;
  };
  const tryMove = (st: SearchState, m: number, pp: PlanePointing): boolean => {
    const t = trial(st, m, pp);
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
  const crossState = init(start);
  if (crossState.short === 0) {
    const v = objectiveValue(env.objective, mergeTallies(env.objective, crossState.tallies));
    floor = { yieldWeight: v.yieldWeight, cappedReachRe: Math.min(v.tracerReachRe, env.objective.tracerReachRe) };
  }
  const ranked = starts.map((l) => ({ name: l.name, st: l.pointings === start ? crossState : init(l.pointings) })).sort((x, y) => (betterStart(x.st, y.st) ? -1 : betterStart(y.st, x.st) ? 1 : 0));
  let best: { name: string; st: SearchState } | null = null;
  for (const { name, st } of ranked.slice(0, Math.max(1, budget.starts))) {
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
  const startShort = start.reduce((a, p) => a + shortOf(proxyMask(p)), 0);
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

/** Tally of one proxy mask with a selection: its tracers, and its starlight slits estimated on the free space. */
function proxyTally(planEnv: SearchEnv, pointing: MaskPointing, p: ProxyMask, chosenK: readonly number[]): Tally {
  const env = envFor(planEnv, pointing);
  const t = emptyTally(env.objective);
  const { ctx } = env;
  for (const k of chosenK) {
    const o = p.set.objects[k];
    addTracer(t, p.set.values ? p.set.values[k] : ctx.weights[o], env.radiusRe[o], targetAzimuthDeg(env, o));
  }
  if (env.refractionLoss) t.refractionLossWeight = t.yieldWeight * env.refractionLoss(pointing);
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
  const { starlight } = chooseSlots(om, ctx.rules, slots, { ...env.starlight, skyPerMask: 0 }, new Set(), 1, 25, ctx.profile.slits.gapArcsec);
  for (const c of starlight) addStarlight(t, c.rRe, c.azimuthDeg);
  return t;
}
