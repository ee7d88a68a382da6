/**
 * The one objective the pointing search maximises (docs/search.md):
 *
 *   J = Y + W * [ aBin * sum_b min(n_b, kBin) / kBin            (tracer radial bins of 1 Re, b < tracerReachRe)
 *               + aSector * sum_s min(n_s, kSector) / kSector   (8 sectors of 45 degrees from the major axis)
 *               + aStarlightBin * (starlight bins of 1 Re, b < starlightReachRe, holding at least one slit)
 *               + aStarlightSector * (starlight sectors of 45 degrees holding at least one slit inside the goal)
 *               + aStarlightReach * min(Rsl / starlightReachRe, 1) ]
 *     - aRefraction * sum_m Y_m * f_m                           (f_m: light mask m loses to refraction, refractionTerm.ts)
 *
 * Y is the summed weight of the allocated tracers; W is the mean weight of the usable tracer candidates, so each
 * coverage term is counted in "typical tracers"; n_b, n_s are tracer slits per radial bin / sector; Rsl is the
 * largest R/Re of a starlight slit. R is the circularised radius, azimuth phi = atan2(v, u) in [0, 360).
 * The terms are additive over masks except the starlight reach (a maximum), so a search can keep one
 * accumulator per mask and re-evaluate only the mask it moves.
 */
import type { SearchRules } from '../plan/searchSection';

export const OBJECTIVE_DEFAULTS = { aBin: 5, kBin: 5, aSector: 4, kSector: 10, aStarlightBin: 10, aStarlightReach: 10, aStarlightSector: 4, aRefraction: 1 } as const;
export type ObjectiveWeights = { -readonly [K in keyof typeof OBJECTIVE_DEFAULTS]: number };

export const SECTORS = 8;

/** Everything that fixes the objective for a plan: goals, coefficients and the weight unit W. */
export interface ObjectiveContext {
  tracerReachRe: number;
  starlightReachRe: number;
  weights: ObjectiveWeights;
  /** Mean weight of the usable tracer candidates (the unit of the coverage terms). */
  unitWeight: number;
}

/** Build the context; unitWeight is the mean of the positive weights given (1 when there are none). */
export function objectiveContext(goals: { tracerReachRe: number; starlightReachRe: number }, rules: SearchRules | undefined, candidateWeights: ArrayLike<number>): ObjectiveContext {
  let s = 0, n = 0;
  for (let i = 0; i < candidateWeights.length; i++) if (candidateWeights[i] > 0) { s += candidateWeights[i]; n++; }
  return {
    tracerReachRe: goals.tracerReachRe,
    starlightReachRe: goals.starlightReachRe,
    weights: { ...OBJECTIVE_DEFAULTS, ...stripUndefined(rules?.objective ?? {}) },
    unitWeight: n ? s / n : 1,
  };
}

function stripUndefined(o: Record<string, unknown>): Partial<ObjectiveWeights> {
  const out: Record<string, number> = {};
  for (const [k, v] of Object.entries(o)) if (typeof v === 'number') out[k] = v;
  return out as Partial<ObjectiveWeights>;
}

/** Additive tallies of one mask (or of several, merged): tracer weight, per-bin and per-sector counts, starlight. */
export interface Tally {
  yieldWeight: number;
  tracerBins: Float64Array;
  tracerSectors: Float64Array;
  starlightBins: Float64Array;
  /** Starlight slits per 45-degree sector, counted inside the starlight goal radius (plus its placement margin of 1 Re). */
  starlightSectors: Float64Array;
  starlightReachRe: number;
  /** Largest R/Re of an allocated tracer (0 without one). */
  tracerReachRe: number;
  /** Tracer weight lost to refraction across the slits: each mask's tracer weight times its loss fraction (solver/refractionTerm.ts). */
  refractionLossWeight: number;
}

/** An empty tally for the context's goals. */
export function emptyTally(ctx: ObjectiveContext): Tally {
  return {
    yieldWeight: 0,
    tracerBins: new Float64Array(Math.max(0, Math.ceil(ctx.tracerReachRe - 1e-12))),
    tracerSectors: new Float64Array(SECTORS),
    starlightBins: new Float64Array(Math.max(0, Math.ceil(ctx.starlightReachRe - 1e-12))),
    starlightSectors: new Float64Array(SECTORS),
    starlightReachRe: 0,
    tracerReachRe: 0,
    refractionLossWeight: 0,
  };
}

/** Sector index (0..7) of an azimuth in degrees from the major axis (any range). */
export const sectorOf = (azimuthDeg: number) => Math.min(SECTORS - 1, Math.floor(((((azimuthDeg % 360) + 360) % 360)) / 45));

/** Add one allocated tracer (weight, R/Re, azimuth in degrees). */
export function addTracer(t: Tally, weight: number, rRe: number, azimuthDeg: number): void {
  t.yieldWeight += weight;
  if (rRe < t.tracerBins.length) t.tracerBins[Math.floor(rRe)]++;
  t.tracerSectors[sectorOf(azimuthDeg)]++;
  if (rRe > t.tracerReachRe) t.tracerReachRe = rRe;
}

/** Add one starlight slit at R/Re and azimuth (degrees from the major axis). */
export function addStarlight(t: Tally, rRe: number, azimuthDeg: number): void {
  if (rRe < t.starlightBins.length) t.starlightBins[Math.floor(rRe)]++;
  if (rRe < t.starlightBins.length + 1) t.starlightSectors[sectorOf(azimuthDeg)]++;
  if (rRe > t.starlightReachRe) t.starlightReachRe = rRe;
}

/** Sum of tallies (counts added, starlight reach the largest). */
export function mergeTallies(ctx: ObjectiveContext, tallies: readonly Tally[]): Tally {
  const out = emptyTally(ctx);
  for (const t of tallies) {
    out.yieldWeight += t.yieldWeight;
    t.tracerBins.forEach((v, i) => (out.tracerBins[i] += v));
    t.tracerSectors.forEach((v, i) => (out.tracerSectors[i] += v));
    t.starlightBins.forEach((v, i) => (out.starlightBins[i] += v));
    t.starlightSectors.forEach((v, i) => (out.starlightSectors[i] += v));
    out.starlightReachRe = Math.max(out.starlightReachRe, t.starlightReachRe);
    out.tracerReachRe = Math.max(out.tracerReachRe, t.tracerReachRe);
    out.refractionLossWeight += t.refractionLossWeight;
  }
  return out;
}

/**
 * A copy of tally t with up to maxSlits starlight slits of R/Re <= maxRe added where they count most: each in an empty
 * starlight bin (up to maxRe) and an empty sector, the reach raised to maxRe. J of it bounds J of t with any maxSlits
 * such slits added (the starlight terms count held bins and sectors and cap the reach; coefficients >= 0).
 */
export function starlightCeiling(t: Tally, maxRe: number, maxSlits: number): Tally {
  const bins = t.starlightBins.slice(), sectors = t.starlightSectors.slice();
  if (maxSlits <= 0) return { ...t, starlightBins: bins, starlightSectors: sectors };
  for (let b = 0, left = maxSlits; b < bins.length && b <= maxRe && left > 0; b++) if (bins[b] === 0) { bins[b] = 1; left--; }
  for (let k = 0, left = maxSlits; k < sectors.length && left > 0; k++) if (sectors[k] === 0) { sectors[k] = 1; left--; }
  return { ...t, starlightBins: bins, starlightSectors: sectors, starlightReachRe: Math.max(t.starlightReachRe, maxRe) };
}

/** The objective's terms and total for a merged tally. */
export interface ObjectiveValue {
  total: number;
  yieldWeight: number;
  binTerm: number;
  sectorTerm: number;
  starlightTerm: number;
  /** Minus aRefraction x the tracer weight lost to refraction across the slits (0 or negative). */
  refractionTerm: number;
  /** Largest R/Re of an allocated tracer (uncapped; the search compares it capped at goals.tracerReachRe). */
  tracerReachRe: number;
}

/** J of a merged tally (see the module comment). */
export function objectiveValue(ctx: ObjectiveContext, t: Tally): ObjectiveValue {
  const w = ctx.weights, W = ctx.unitWeight;
  let bins = 0;
  for (const n of t.tracerBins) bins += Math.min(n, w.kBin) / w.kBin;
  let sectors = 0;
  for (const n of t.tracerSectors) sectors += Math.min(n, w.kSector) / w.kSector;
  let slBins = 0;
  for (const n of t.starlightBins) if (n > 0) slBins++;
  let slSectors = 0;
  if (t.starlightBins.length) for (const n of t.starlightSectors) if (n > 0) slSectors++;
  const slReach = ctx.starlightReachRe > 0 ? Math.min(t.starlightReachRe / ctx.starlightReachRe, 1) : 0;
  const binTerm = W * w.aBin * bins, sectorTerm = W * w.aSector * sectors;
  const starlightTerm = W * (w.aStarlightBin * slBins + w.aStarlightSector * slSectors + w.aStarlightReach * slReach);
  const refractionTerm = w.aRefraction > 0 ? -w.aRefraction * t.refractionLossWeight : 0;
  return { total: t.yieldWeight + binTerm + sectorTerm + starlightTerm + refractionTerm, yieldWeight: t.yieldWeight, binTerm, sectorTerm, starlightTerm, refractionTerm, tracerReachRe: t.tracerReachRe };
}
