/**
 * The pointing search's fast model of one mask (docs/search.md): for a pointing, the tracer candidates that fall on
 * the mask (exact gnomonic projection from cached unit vectors, the wavelength rule, a conservative raster of the
 * footprint; no alignment boxes), sorted along the slit direction y into the interval index of
 * solver/intervalScheduling, and how many alignment boxes the mask can hold. Only the targets of the cells near the
 * mask are visited (solver/proxyCells.ts); at high density the cells are thinned.
 */
import { polygonBounds } from '../geometry/polygon';
import type { MaskPointing } from '../geometry/maskSolution';
import { skyToTangentArcsec, tangentCentre, type TangentCentre } from '../sky/tangentPlane';
import { RAD_PER_DEG } from '../sky/angles';
import { PMath } from '../numeric/portableMath';
import { wavelengthOk, type EligibilityRules } from '../profile/eligibility';
import { alignmentCapacity } from './allocateMasks';
import { maskCandidateSet, type MaskCandidateSet } from './jointAllocation';
import { footprintRaster, rasterFits, type FootprintRaster } from './footprintRaster';
import { maskBasis, maskCosC, maskPointToSkyDeg, unitToMaskArcsec, type MaskBasis } from './maskTargets';
import { candidateValues } from './maskContext';
import { cellsInRectangle, PROXY_CELL_ARCSEC, PROXY_TRIAL_BUDGET, proxyCellPair, type ProxyCells } from './proxyCells';
import { tracerWeightsOf, type SearchEnv } from './searchEnv';

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
  const L = profile.slits.minLengthArcsec, gap = profile.slits.gapArcsec, halfL = L / 2;
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

  // What every gather of this model shares (bounds, grown bounds, rules, raster): one object, fixed for the model.
  const limits: GatherLimits = {
    minX: b.minX, maxX: b.maxX, minY: b.minY, maxY: b.maxY, loX, hiX, loY, hiY,
    cellLoX: b.minX - grow, cellHiX: b.maxX + grow, cellLoY: b.minY - grow, cellHiY: b.maxY + grow,
    rules: ctx.rules, slitRaster,
  };

  /** Candidates of one index on a mask: object indices and mask y, in y order, no allocation per target. */
  function gatherer(cells: ProxyCells) {
    const size = cells.objects.length;
    const bufObj = new Int32Array(size), bufY = new Float64Array(size), keys = new Float64Array(size);
    const sortWork: SortWork = { out: new Int32Array(size), start: new Int32Array(size + 1), fill: new Int32Array(size) };
    return (f: TrialFrame): { objects: Int32Array; y: Float64Array; starts: Float64Array; ends: Float64Array } => {
      const n = gatherOnMask(cells, f, limits, bufObj, bufY);
      // Order by y quantised to 1e-4 arcsec (ordering only), ties by position: a bucket sort, O(n) for spread-out y.
      for (let k = 0; k < n; k++) keys[k] = Math.floor((bufY[k] + 1e4) * 1e4);
      const byY = orderByKeyInto(keys, n, sortWork);
      const objects = new Int32Array(n), y = new Float64Array(n), starts = new Float64Array(n), ends = new Float64Array(n);
      for (let k = 0; k < n; k++) {
        const j = byY[k];
        objects[k] = bufObj[j]; y[k] = bufY[j];
        starts[k] = y[k] - halfL; ends[k] = y[k] + halfL + gap;
      }
      return { objects, y, starts, ends };
    };
  }

  return (p: MaskPointing, liberal = false): ProxyMask => {
    // The liberal superset feeds a proven bound: every tracer, never the thinned cells.
    const gather = !liberal || searchCells.perCellCap === null ? searchGather : (allGather ??= gatherer(cellPair.all()));
    const { objects, y, starts, ends } = gather(trialFrame(gc, p.raDeg, p.decDeg, p.paDeg, liberal));
    // The allocation's own alignment rule (shared stars allowed; boxes clear of each other along y).
    const alignmentMax = liberal ? 0 : alignmentCapacity(ctx, p).compatibleMax;
    // The liberal set's interval index is built exactly (sorted by end), not from the packed keys.
    return { set: liberal ? maskCandidateSet(objects, starts, ends) : equalLengthCandidateSet(objects, starts, ends, identity), y, alignmentMax };
  };
}

/** What the gathers of one proxy model share: footprint bounds, bounds grown for tracers and for cell centres (arcsec), rules, raster. */
interface GatherLimits {
  minX: number; maxX: number; minY: number; maxY: number;
  loX: number; hiX: number; loY: number; hiY: number;
  cellLoX: number; cellHiX: number; cellLoY: number; cellHiY: number;
  rules: EligibilityRules;
  slitRaster: FootprintRaster;
}

/**
 * One trial's constants: the mask's basis, its centre in the galaxy's tangent plane (arcsec; onPlane false when it has
 * no image there: nothing culled), the sine and cosine of its +y direction there (East of North), and whether the set is liberal.
 */
interface TrialFrame { basis: MaskBasis; onPlane: boolean; pcXi: number; pcEta: number; gsp: number; gcp: number; liberal: boolean }

/** The trial frame of the pointing (raDeg, decDeg, paDeg) about the galaxy's tangent centre gc (mask +y as seen in the galaxy's tangent plane). */
function trialFrame(gc: TangentCentre, raDeg: number, decDeg: number, paDeg: number, liberal: boolean): TrialFrame {
  // One object shape for every pointing, whatever fields the caller's pointing has.
  const p = { raDeg, decDeg, paDeg };
  const basis = maskBasis(p);
  const pc = skyToTangentArcsec(gc, p.raDeg, p.decDeg);
  // The mask's +y direction as seen in the galaxy's tangent plane (North turns between the two tangent points).
  const up = maskPointToSkyDeg(p, 0, 60), pu = skyToTangentArcsec(gc, up.raDeg, up.decDeg);
  const upA = pc && pu ? PMath.atan2(pu.xiArcsec - pc.xiArcsec, pu.etaArcsec - pc.etaArcsec) : p.paDeg * RAD_PER_DEG;
  return { basis, onPlane: pc !== null, pcXi: pc ? pc.xiArcsec : 0, pcEta: pc ? pc.etaArcsec : 0, gsp: PMath.sin(upA), gcp: PMath.cos(upA), liberal };
}

/**
 * The tracers of `cells` on one mask, in cell order, written as object index and mask y (arcsec) into bufObj and bufY;
 * returns their count. A cell (and then a tracer) on the plane is skipped when its offset, turned into the mask's axes
 * in the galaxy's tangent plane, lies outside the grown bounds (a cell well inside them has no per-tracer test); the
 * others are projected exactly (maskCosC, unitToMaskArcsec) and kept inside the footprint bounds, by the wavelength
 * rule and (unless liberal) the raster.
 */
function gatherOnMask(cells: ProxyCells, f: TrialFrame, lim: GatherLimits, bufObj: Int32Array, bufY: Float64Array): number {
  const { nCells, cellOnPlane, cellXiArcsec, cellEtaArcsec, cellStart, objects: pObj, ux: pX, uy: pY, uz: pZ, xiArcsec: pXi, etaArcsec: pEta } = cells;
  const { basis, onPlane, pcXi, pcEta, gsp, gcp, liberal } = f;
  const { minX, maxX, minY, maxY, loX, hiX, loY, hiY, cellLoX, cellHiX, cellLoY, cellHiY, rules, slitRaster } = lim;
  const at = { xArcsec: 0, yArcsec: 0 };
  // A tracer lies within half a cell diagonal of its cell's centre (plus far more than the rounding): when the centre
  // is that far inside the tracers' grown bounds, every tracer of the cell passes their test, which is then skipped.
  const inset = cells.cellArcsec * Math.SQRT1_2 + 1e-6;
  const inLoX = loX + inset, inHiX = hiX - inset, inLoY = loY + inset, inHiY = hiY - inset;
  let n = 0;
  for (let c = 0; c < nCells; c++) {
    let culled = onPlane && cellOnPlane[c] === 1;
    if (culled) {
      const dxi = cellXiArcsec[c] - pcXi, deta = cellEtaArcsec[c] - pcEta;
      const mx = dxi * gcp - deta * gsp, my = dxi * gsp + deta * gcp;
      if (mx < cellLoX || mx > cellHiX || my < cellLoY || my > cellHiY) continue;
      culled = !(mx >= inLoX && mx <= inHiX && my >= inLoY && my <= inHiY);
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
      if (x < minX || x > maxX || y < minY || y > maxY) continue;
      if (!wavelengthOk(rules, x) || (!liberal && !rasterFits(slitRaster, x, y))) continue;
      bufObj[n] = pObj[q]; bufY[n] = y; n++;
    }
  }
  return n;
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
