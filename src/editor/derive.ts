/**
 * Figures the panels show, derived from the latest solution and the document (pure functions).
 * Reach is the largest circularised R/Re of any slit of a role, as coverage.json reports it.
 */
import type { CoverageReport } from '../core/coverage/coverage';
import type { Target } from '../core/catalog/types';
import type { PlanFile } from '../core/plan/schema';
import { targetWeights, weighPlanTargets } from '../core/pipeline/pipeline';
import type { MaskSolution, Slit, SlitRole } from '../core/geometry/maskSolution';
import { ROLES } from './view/palette';
import { galaxyModel } from '../core/plan/validate';
import { galaxyRadiusAndAzimuth } from '../core/sky/galaxyRadius';
import { separationDeg } from '../core/sky/separation';

export type RoleCounts = Record<SlitRole, number>;

/** Number of slits (or boxes) of each role over all masks. */
export function slitCountsByRole(masks: readonly MaskSolution[]): RoleCounts {
  const c: RoleCounts = { tracer: 0, starlight: 0, sky: 0, alignment: 0 };
  for (const m of masks) for (const s of m.slits) c[s.role]++;
  return c;
}

/** Largest R/Re reached per role, from the coverage report (0 where a role has no slit). */
export function reachByRole(coverage: unknown): RoleCounts {
  const r: RoleCounts = { tracer: 0, starlight: 0, sky: 0, alignment: 0 };
  const roles = (coverage as CoverageReport | null)?.roles;
  if (roles) for (const role of ROLES) r[role] = roles[role]?.maxReachRe ?? 0;
  return r;
}

/** Slits of each mask, by mask id. */
export function slitsByMask(masks: readonly MaskSolution[]): Map<string, Slit[]> {
  return new Map(masks.map((m) => [m.mask.id, m.slits]));
}

/** Where each allocated object went: object id to its slit. */
export function slitOfObject(masks: readonly MaskSolution[]): Map<string, Slit> {
  const map = new Map<string, Slit>();
  for (const m of masks) for (const s of m.slits) if (s.role === 'tracer' || s.role === 'alignment') map.set(s.objectId, s);
  return map;
}

/** The weight of every target as the pipeline computes it for this plan (priority or 1, overrides win). */
export function weightsFor(plan: PlanFile, targets: readonly Target[]): Float64Array {
  return targetWeights(plan, targets, []);
}

/**
 * The weight of every target before a `force: "in"` lifts it above all others: what the user set or the rules give
 * (as targetWeights in pipeline/pipeline.ts computes before forcing; alignment stars 1, excluded targets 0).
 */
export function baseWeightsFor(plan: PlanFile, targets: readonly Target[]): Float64Array {
  const kept = new Map(weighPlanTargets(plan, targets).targets.map((t) => [t.id, t]));
  return Float64Array.from(targets, (t) => {
    const k = kept.get(t.id);
    return k ? (t.role === 'alignment' ? 1 : k.weight) : 0;
  });
}

/** A number for display with `digits` decimals, or an en dash when it is not finite (never "Infinity" or "NaN"). */
export function shownNumber(v: number, digits: number): string {
  return Number.isFinite(v) ? v.toFixed(digits) : '–';
}

/** A weight for display: three significant figures below 1000 (0 as 0.00), whole numbers above (never exponent notation). */
export function shownWeight(w: number): string {
  if (!Number.isFinite(w)) return '–';
  if (Math.abs(w) >= 1000) return String(Math.round(w));
  if (w === 0) return '0.00';
  const digits = Math.max(0, Math.min(6, 2 - Math.floor(Math.log10(Math.abs(w)))));
  return w.toFixed(digits);
}

/**
 * A warning when the catalog does not cover the galaxy: no usable object within the tracer goal radius (circularised,
 * in Re) of the galaxy centre. Says how far the nearest object is (degrees, and Re when that is finite), so a catalog
 * of another field, or a galaxy centre typed wrong, shows at once. Null when the catalog covers the galaxy.
 */
export function catalogCoverageNote(plan: PlanFile, targets: readonly Target[]): string | null {
  if (!targets.length) return null;
  let galaxy;
  try { galaxy = galaxyModel(plan); } catch { return null; }
  const goal = plan.goals.tracerReachRe;
  let inside = 0, nearestDeg = Infinity, nearestRe = Infinity;
  for (const t of targets) {
    const r = galaxyRadiusAndAzimuth(galaxy, t.raDeg, t.decDeg).rRe;
    if (r <= goal) inside++;
    const d = separationDeg(galaxy.raDeg, galaxy.decDeg, t.raDeg, t.decDeg);
    if (d < nearestDeg) { nearestDeg = d; nearestRe = r; }
  }
  if (inside > 0) return null;
  const far = Number.isFinite(nearestRe) ? ` (${nearestRe.toFixed(0)} Re)` : '';
  return `the catalog does not cover the galaxy ${plan.galaxy.id}: none of its ${targets.length} objects lies within the tracer goal of ${goal} Re, `
    + `the nearest is ${nearestDeg.toFixed(2)}° from the galaxy centre${far}; every mask would stay empty. `
    + 'Check that the catalog is of this field and that its RA/Dec columns, and the galaxy centre in the plan, are in degrees or sexagesimal as intended.';
}
