/**
 * The search's evaluation environment: every target's position in the galaxy's tangent plane (xi East, eta North,
 * arcsec), its circularised radius R/Re and (lazily) its azimuth from the major axis, with the objective, starlight and
 * refraction settings of the plan. Built once per plan; shared by the pointing search, its proxy model, the pipeline
 * report and the benchmarks.
 */
import type { PlanFile } from '../plan/schema';
import type { StarlightRules } from '../plan/starlightSection';
import type { SearchRules } from '../plan/searchSection';
import { galaxyTurn } from '../sky/frames';
import { wrap360Deg } from '../sky/angles';
import { skyToTangentArcsec, tangentCentre } from '../sky/tangentPlane';
import { sersicBn } from '../sky/sersic';
import { tangentAzimuthDeg, tangentRadiusRe } from '../sky/galaxyRadius';
import type { AllocationContext } from './allocateMasks';
import { starlightSettings, type StarlightSettings, type StarlightTrade } from './starlight';
import { objectiveContext, type ObjectiveContext } from './objective';
import { refractionLossModel, type RefractionLoss } from './refractionTerm';
import { positionsFor, type GalaxyPositions } from './weighting';

/** Objective evaluation shared by the search, the pipeline report and the benchmark. */
export interface SearchEnv {
  ctx: AllocationContext;
  objective: ObjectiveContext;
  starlight: StarlightSettings;
  plan: PlanFile;
  /** R/Re of every target (index as ctx.targets). */
  radiusRe: Float64Array;
  /** Azimuth (degrees, [0, 360)) of every target, NaN until first needed: read it through targetAzimuthDeg. */
  azimuthDeg: Float64Array;
  /** Galaxy tangent-plane position of every target (arcsec). */
  xi: Float64Array;
  eta: Float64Array;
  bn: number;
  /** Fraction of a mask's tracer light lost to refraction across its slits (solver/refractionTerm.ts); null when search.objective.aRefraction is 0. */
  refractionLoss: RefractionLoss | null;
}

/**
 * Build the evaluation environment (cached target positions) for a plan and an allocation context; `positions`, the
 * weighting's own projection of the same targets about the same galaxy (solver/weighting.ts), is reused instead of
 * projecting every target again (the same bits: one projection and one R/Re formula).
 */
export function searchEnv(plan: PlanFile, ctx: AllocationContext, positions?: GalaxyPositions | null): SearchEnv {
  const g = ctx.galaxy, n = ctx.table.length;
  const reuse = positionsFor(positions, ctx.table, g);
  const { xi, eta, radiusRe } = reuse ? { xi: reuse.xiArcsec, eta: reuse.etaArcsec, radiusRe: reuse.radiusRe } : projectTargets(ctx);
  // targetAzimuthDeg's value (wrapped to [0, 360)) from the weighting's azimuth, else NaN until first asked.
  const azimuthDeg = reuse ? Float64Array.from(reuse.azimuthDeg, wrap360Deg) : new Float64Array(n).fill(NaN);
  const tracerWeights = tracerWeightsOf(ctx);
  const objective = objectiveContext(plan.goals, plan.search as SearchRules | undefined, tracerWeights);
  return {
    ctx, plan, radiusRe, azimuthDeg, xi, eta, bn: sersicBn(g.sersicN), objective,
    refractionLoss: refractionLossModel(plan, ctx.profile, objective.weights.aRefraction),
    starlight: starlightSettings(plan.starlight as StarlightRules | undefined, ctx.profile, plan),
  };
}

/** Every target's galaxy tangent-plane offset (arcsec; NaN without a gnomonic image) and circularised R/Re (Infinity then). */
function projectTargets(ctx: AllocationContext): { xi: Float64Array; eta: Float64Array; radiusRe: Float64Array } {
  const g = ctx.galaxy, n = ctx.table.length;
  const radiusRe = new Float64Array(n), xi = new Float64Array(n), eta = new Float64Array(n);
  const c = tangentCentre(g.raDeg, g.decDeg), turn = galaxyTurn(g.paDeg);
  for (let i = 0; i < n; i++) {
    const t = skyToTangentArcsec(c, ctx.raDeg[i], ctx.decDeg[i]);
    xi[i] = t ? t.xiArcsec : NaN;
    eta[i] = t ? t.etaArcsec : NaN;
    // galaxyRadiusAndAzimuth's R/Re from the projection just made (the same bits, one projection instead of two).
    radiusRe[i] = t ? tangentRadiusRe(g, t.xiArcsec, t.etaArcsec, turn) : Infinity;
  }
  return { xi, eta, radiusRe };
}

/** Azimuth of target i about the galaxy (degrees from the major axis, as galaxyRadiusAndAzimuth), computed once when first asked. */
export function targetAzimuthDeg(env: SearchEnv, i: number): number {
  const a = env.azimuthDeg[i];
  if (a === a) return a;
  return (env.azimuthDeg[i] = Number.isNaN(env.xi[i]) ? 0 : tangentAzimuthDeg(env.xi[i], env.eta[i], galaxyTurn(env.ctx.galaxy.paDeg)));
}

/** The weight of every tracer, in the order of ctx.tracerIndices. */
export function tracerWeightsOf(ctx: AllocationContext): Float64Array {
  const out = new Float64Array(ctx.tracerIndices.length);
  for (let k = 0; k < out.length; k++) out[k] = ctx.weights[ctx.tracerIndices[k]];
  return out;
}

/** The objective's price of a starlight slit in tracer weight (for the starlight stage's trades). */
export function starlightTrade(o: ObjectiveContext): StarlightTrade {
  return { unitWeight: o.unitWeight, aStarlightBin: o.weights.aStarlightBin, aStarlightReach: o.weights.aStarlightReach, aStarlightSector: o.weights.aStarlightSector };
}
