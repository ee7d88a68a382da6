/**
 * Masks of several spectrographs in one allocation (plan key `instruments`, plan/instruments.ts): one
 * AllocationContext per profile (eligibility, footprint, alignment range and the exposure model of its telescope),
 * reached from the plan's context by each mask's `instrument` (a profile id). The targets, their weights and unit
 * vectors are shared, so an object index means the same object on every mask and "at most once" still holds.
 *
 * What a tracer slit is worth on a mask: in a plan of one spectrograph, its weight. In a mixed plan, its weight
 * times the chance of a usable velocity with that mask's telescope, p = s^2 / (1 + s^2), s = (S/N per A reached in
 * the planned exposure) / (target S/N per A), from the CCD-equation exposure model (solver/exposure.ts): a
 * faint tracer is worth more on the larger aperture, a bright one about the same anywhere (docs/allocation.md).
 */
import type { Target } from '../catalog/types';
import type { GalaxyModel, PlanFile } from '../plan/schema';
import type { InstrumentProfile } from '../profile/schema';
import { allocationContext, withTargetObjects, type AllocationContext } from './allocateMasks';
import { targetColumnsOf, type TargetColumns } from '../catalog/targetColumns';
import { lineWindowSettings } from '../profile/wavelength';
import { starlightSettings } from './starlight';
import { type StarlightRules } from '../plan/starlightSection';
import { resolveObservingSettings } from '../observe/observingSettings';
import { type ObservingSection } from '../plan/observingSection';
import { exposureModelOf, tracerExposure, type ExposureModel } from './exposure';
import { instrumentSections } from '../plan/instruments';

/** The tracer exposure model of a profile under the plan's starlight and observing settings (same as the observing report's). */
export function tracerExposureModel(plan: Pick<PlanFile, 'goals' | 'galaxy' | 'starlight' | 'observing'>, profile: InstrumentProfile): ExposureModel {
  const starlight = starlightSettings(plan.starlight as StarlightRules | undefined, profile, plan);
  const settings = resolveObservingSettings(plan.observing as ObservingSection | undefined, profile, { exposureTimeS: starlight.exposureS });
  return exposureModelOf(starlight, settings);
}

/** Chance (0..1) of a usable velocity from S/N per A: s^2 / (1 + s^2) with s = snPerA / targetSnPerA (0.5 at the target). */
export function velocityChance(snPerA: number, targetSnPerA: number): number {
  const s = snPerA / targetSnPerA;
  return s > 0 ? (s * s) / (1 + s * s) : 0;
}

/** velocityChance of a point source of magnitude `mag` (AB) through the profile's slit width, cached per 0.001 mag. */
export function velocityChanceOfMag(profile: InstrumentProfile, model: ExposureModel): (mag: number) => number {
  const cache = new Map<number, number>();
  const slit = { slitId: '', objectId: '', widthArcsec: profile.slits.widthArcsec };
  return (mag: number) => {
    const key = Math.round(mag * 1000);
    let v = cache.get(key);
    if (v === undefined) {
      v = Number.isFinite(mag) ? velocityChance(tracerExposure(slit, key / 1000, model).snPerA, model.targetSnPerA) : 0;
      cache.set(key, v);
    }
    return v;
  };
}

/** A context of one profile within a mixed plan: besides the usual context, each target's value factor on it. */
export interface InstrumentContext extends AllocationContext {
  /** The plan's observing and starlight sections for this profile's masks (plan/instruments.ts instrumentSections). */
  sections: Pick<PlanFile, 'observing' | 'starlight'>;
  /** Value of a tracer on this profile's masks per unit weight (0..1), by magnitude. */
  valueFactorOfMag: (mag: number) => number;
  /** valueFactorOfMag of every target (index as targets). */
  valueFactor: Float64Array;
}


/**
 * The allocation context of a plan with several profiles (first profile first): the first profile's context with
 * `byInstrument` (profile id -> its context) set; each context carries its value factors, from its own observing
 * settings (`instruments[].observing` over the plan's; `profilesByRef` maps the plan's references to their profiles).
 * One profile: the plain context.
 */
export function instrumentsAllocationContext(plan: PlanFile, profiles: readonly InstrumentProfile[], galaxy: GalaxyModel, targets: readonly Target[] | TargetColumns, weights: Float64Array, profilesByRef: Readonly<Record<string, InstrumentProfile>> = {}): AllocationContext {
  const table = targetColumnsOf(targets);
  if (profiles.length <= 1) return allocationContext(profiles[0], galaxy, plan.goals.linesA, table, weights, lineWindowSettings(plan.goals));
  const byInstrument = new Map<string, AllocationContext>();
  let shared: Pick<AllocationContext, 'raDeg' | 'decDeg' | 'unit'> | null = null;
  for (const profile of profiles) {
    const base = allocationContext(profile, galaxy, plan.goals.linesA, table, weights, lineWindowSettings(plan.goals));
    shared ??= base;
    const sections = instrumentSections(plan, profile.id, profilesByRef);
    const valueFactorOfMag = velocityChanceOfMag(profile, tracerExposureModel({ ...plan, ...sections }, profile));
    const valueFactor = new Float64Array(table.length);
    for (let i = 0; i < table.length; i++) valueFactor[i] = table.isAlignment(i) ? 0 : valueFactorOfMag(table.mag[i]);
    const ctx: InstrumentContext = withTargetObjects({
      ...base, raDeg: shared.raDeg, decDeg: shared.decDeg, unit: shared.unit, byInstrument, valueFactorOfMag, sections, valueFactor,
    });
    byInstrument.set(profile.id, ctx);
  }
  return byInstrument.get(profiles[0].id)!;
}

/** The profiles of a context, each once (the plan's first profile first). */
export function contextProfiles(ctx: AllocationContext): InstrumentProfile[] {
  return ctx.byInstrument ? [...ctx.byInstrument.values()].map((c) => c.profile) : [ctx.profile];
}
