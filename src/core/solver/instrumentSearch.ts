/**
 * The pointing search and the starlight stage over masks of several spectrographs (plan key `instruments`): each
 * mask is evaluated in the search environment of its own profile (footprint, slit and alignment rules, detector,
 * starlight settings and the value of each tracer on its telescope; solver/instrumentContexts.ts). With one profile
 * every function here is the single-profile path unchanged.
 */
import type { PlanFile } from '../plan/schema';
import { polygonBounds } from '../geometry/polygon';
import { PMath } from '../numeric/portableMath';
import { candidateValues, contextFor, withContextSections } from './maskContext';
import { placeStarlightAndSky, placeStarlightOnMask, starlightSettings, starlightStage, starlightTaken, type StarlightResult, type StarlightStage, type StarlightTrade } from './starlight';
import { type StarlightRules } from '../plan/starlightSection';
import type { AllocationContext } from './allocateMasks';
import type { SearchEnv } from './searchEnv';
import type { ProxyMask } from './proxyModel';
import { refractionLossModel } from './refractionTerm';
import type { MaskPointing, MaskSolution } from '../geometry/maskSolution';

const subEnvs = new WeakMap<SearchEnv, Map<string, SearchEnv>>();

/** The search environment of a mask's own profile (same cached target positions, its context and starlight settings). */
export function envFor(env: SearchEnv, mask: Pick<MaskPointing, 'instrument'>): SearchEnv {
  if (!env.ctx.byInstrument || mask.instrument === undefined) return env;
  let byId = subEnvs.get(env);
  if (!byId) subEnvs.set(env, (byId = new Map()));
  let sub = byId.get(mask.instrument);
  if (!sub) {
    const ctx = contextFor(env.ctx, mask);
    // The plan's first profile shares the plan's environment unless it has observing keys of its own
    // (instruments[].observing): those change its starlight exposure and sky, and its refraction over the exposure.
    const plan = withContextSections(ctx, env.plan);
    sub = ctx === env.ctx && plan === env.plan ? env : {
      ...env, ctx, starlight: starlightSettings(plan.starlight as StarlightRules | undefined, ctx.profile, plan),
      refractionLoss: refractionLossModel(plan, ctx.profile, env.objective.weights.aRefraction),
    };
    byId.set(mask.instrument, sub);
  }
  return sub;
}

/**
 * The search's fast mask model for masks of any of the plan's profiles: `single(env)` (pointingSearch.proxyModel) per
 * profile, its candidates carrying their values on that telescope and its alignment need (alignment.minCount).
 */
export function instrumentsProxyModel(env: SearchEnv, single: (env: SearchEnv) => (p: MaskPointing, liberal?: boolean) => ProxyMask): (p: MaskPointing, liberal?: boolean) => ProxyMask {
  if (!env.ctx.byInstrument) return single(env);
  const models = new Map<SearchEnv, (p: MaskPointing, liberal?: boolean) => ProxyMask>();
  return (p, liberal) => {
    const sub = envFor(env, p);
    let model = models.get(sub);
    if (!model) models.set(sub, (model = single(sub)));
    const r = model(p, liberal);
    return { ...r, set: { ...r.set, values: candidateValues(sub.ctx, r.set.objects) }, alignmentNeeded: sub.ctx.profile.alignment.minCount };
  };
}

/** Half the long side and half the diagonal (arcsec) of the largest footprint among the plan's profiles: the search's step scale. */
export function footprintScaleArcsec(ctx: AllocationContext): { halfLong: number; halfDiag: number } {
  let halfLong = 0, halfDiag = 0;
  for (const c of ctx.byInstrument?.values() ?? [ctx]) {
    const b = polygonBounds(c.profile.footprint);
    halfLong = Math.max(halfLong, Math.max(b.maxY - b.minY, b.maxX - b.minX) / 2);
    halfDiag = Math.max(halfDiag, PMath.hypot(Math.max(-b.minX, b.maxX), Math.max(-b.minY, b.maxY)));
  }
  return { halfLong, halfDiag };
}

/**
 * Starlight and sky slits on every mask, each by its own profile's rules. One profile: placeStarlightAndSky. Several:
 * masks in order, each with the coverage of the masks before it counted as taken (placeStarlightOnMask), so the
 * starlight slits spread over the galaxy as in the single-profile stage.
 */
export function placeStarlightForMasks(ctx: AllocationContext, plan: Pick<PlanFile, 'goals' | 'galaxy' | 'starlight'>, masks: readonly MaskSolution[], trade?: StarlightTrade): StarlightResult {
  if (!ctx.byInstrument) return placeStarlightAndSky(masks, ctx.galaxy, ctx.profile, plan, trade);
  const stages = new Map<string, StarlightStage>();
  const stageOf = (ms: MaskSolution) => {
    const c = contextFor(ctx, ms.mask);
    let st = stages.get(c.profile.id);
    if (!st) stages.set(c.profile.id, (st = starlightStage(ctx.galaxy, c.profile, withContextSections(c, plan), trade)));
    return st;
  };
  const done: MaskSolution[] = [];
  const warnings: string[] = [];
  for (const ms of masks) {
    const st = stageOf(ms);
    const r = placeStarlightOnMask(st, ms, starlightTaken(st, done));
    done.push(r.mask);
    warnings.push(...r.warnings);
  }
  return { masks: done, warnings };
}
