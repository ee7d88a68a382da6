/**
 * Figures the panels show, derived from the latest solution and the document (pure functions).
 * Reach is the largest circularised R/Re of any slit of a role, as coverage.json reports it.
 */
import type { CoverageReport } from '../core/coverage/coverage';
import type { Target } from '../core/catalog/types';
import type { PlanFile } from '../core/plan/schema';
import { targetWeights } from '../core/plan/pipeline';
import type { MaskSolution, Slit, SlitRole } from '../core/solver/types';
import { ROLES } from './view/palette';

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
