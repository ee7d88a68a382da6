/**
 * Exposure and telescope time of a solved plan for the forecast: the S/N of every tracer and starlight slit in the
 * planned exposure with each mask's own spectrograph (solver/exposure.ts), the tracers' S/N target and where it comes
 * from, hours per mask and per observing site, and how each spectrograph records a cluster's lines. Times seconds in
 * the exposure reports, hours here; wavelengths Angstrom.
 */
import type { GalaxyModel, PlanFile } from '../plan/schema';
import type { InstrumentProfile } from '../profile/schema';
import type { MaskSolution } from '../geometry/maskSolution';
import { exposureModelOf, maskExposureReport, type MaskExposureReport } from '../solver/exposure';
import { OBSERVING_DEFAULTS, resolveObservingSettings } from '../observe/observingSettings';
import type { ObservingSection } from '../plan/observingSection';
import { starlightSettings } from '../solver/starlight';
import type { StarlightRules } from '../plan/starlightSection';
import { instrumentSections } from '../plan/instruments';
import { resolveForecastSettings } from './settings';
import { instrumentalSigmaA, lineSigmaA, type LineSampling } from './velocityError';
import { maskHours, type MaskHours, type SiteNights } from './hours';

/** Where the tracers' target S/N per Angstrom comes from: the plan's goals, its observing section, or the default. */
export type TargetSnSource = 'goals.tracerSnPerA' | 'observing.targetSnPerA' | 'default';

/** The tracers' target S/N per Angstrom of a plan: goals.tracerSnPerA, else observing.targetSnPerA, else the observing default. */
export function tracerTargetSn(plan: PlanFile): { snPerA: number; source: TargetSnSource } {
  const goal = plan.goals.tracerSnPerA;
  if (goal !== undefined) return { snPerA: goal, source: 'goals.tracerSnPerA' };
  const observing = (plan.observing as ObservingSection | undefined)?.targetSnPerA;
  if (observing !== undefined) return { snPerA: observing, source: 'observing.targetSnPerA' };
  return { snPerA: OBSERVING_DEFAULTS.targetSnPerA, source: 'default' };
}

/**
 * Exposure estimates (S/N per Angstrom of every tracer and starlight slit in the planned exposure, and times to the
 * tracers' target S/N) with the plan's settings and one profile, as the observing report computes them. In a plan of
 * several spectrographs the profile's own `instruments[].observing` keys apply over the plan's (plan/instruments.ts);
 * `profilesByRef` maps the plan's profile references to profiles when they are file paths rather than ids.
 */
export function planExposures(planIn: PlanFile, profile: InstrumentProfile, galaxy: GalaxyModel, masks: readonly MaskSolution[], profilesByRef: Readonly<Record<string, InstrumentProfile>> = {}): { exposures: MaskExposureReport[]; exposureTimeS: number; targetSnPerA: number } {
  const plan: PlanFile = { ...planIn, ...instrumentSections(planIn, profile.id, profilesByRef) };
  const starlight = starlightSettings(plan.starlight as StarlightRules | undefined, profile, plan);
  const settings = resolveObservingSettings(plan.observing as ObservingSection | undefined, profile, { exposureTimeS: starlight.exposureS });
  const model = exposureModelOf(starlight, { ...settings, targetSnPerA: tracerTargetSn(plan).snPerA });
  return { exposures: masks.map((m) => maskExposureReport(m, galaxy, model)), exposureTimeS: settings.exposureTimeS, targetSnPerA: model.targetSnPerA };
}

/** Masks grouped by their spectrograph (profileOf a mask id), in the order the masks come. */
export function masksByProfile(masks: readonly MaskSolution[], profileOf: (maskId: string) => InstrumentProfile): { profile: InstrumentProfile; masks: MaskSolution[] }[] {
  const groups: { profile: InstrumentProfile; masks: MaskSolution[] }[] = [];
  for (const m of masks) {
    const p = profileOf(m.mask.id);
    const g = groups.find((x) => x.profile === p);
    if (g) g.masks.push(m);
    else groups.push({ profile: p, masks: [m] });
  }
  return groups;
}

/** planExposures of a plan whose masks may use several spectrographs: each mask with its own profile's exposure model. */
export function mixedPlanExposures(plan: PlanFile, galaxy: GalaxyModel, masks: readonly MaskSolution[], profileOf: (maskId: string) => InstrumentProfile, profilesByRef: Readonly<Record<string, InstrumentProfile>> = {}): { exposures: MaskExposureReport[]; exposureTimeS: number; targetSnPerA: number } {
  const parts = masksByProfile(masks, profileOf).map((g) => planExposures(plan, g.profile, galaxy, g.masks, profilesByRef));
  const byId = new Map(parts.flatMap((p) => p.exposures).map((e) => [e.maskId, e]));
  return {
    exposures: masks.map((m) => byId.get(m.mask.id)!),
    exposureTimeS: parts[0]?.exposureTimeS ?? 0,
    targetSnPerA: parts[0]?.targetSnPerA ?? tracerTargetSn(plan).snPerA,
  };
}

/** Hours of every mask (time for the completeness fraction of its tracers to reach the target S/N, plus overhead). */
export function planMaskHours(plan: PlanFile, profile: InstrumentProfile, galaxy: GalaxyModel, masks: readonly MaskSolution[], known?: { exposures: MaskExposureReport[] }): MaskHours[] {
  const s = resolveForecastSettings(plan.forecast, galaxy, plan.goals.linesA);
  const { exposures } = known ?? planExposures(plan, profile, galaxy, masks);
  return masks.map((m) => {
    const ex = exposures.find((e) => e.maskId === m.mask.id);
    const times = (ex?.slits ?? []).filter((x) => x.role === 'tracer').map((x) => x.timeForTargetSnS);
    return maskHours(m.mask.id, times, s.completeness, ex?.exposureTimeS ?? 0, s.overheadHoursPerMask);
  });
}

/** Hours per observing site (profiles with the same latitude and longitude share one), in the order the masks come. */
export function siteHours(masks: readonly MaskSolution[], hours: readonly MaskHours[], profileOf: (maskId: string) => InstrumentProfile): Omit<SiteNights, 'nights'>[] {
  const out: Omit<SiteNights, 'nights'>[] = [];
  masks.forEach((m, i) => {
    const p = profileOf(m.mask.id);
    let site = out.find((x) => x.latDeg === p.site.latDeg && x.lonDeg === p.site.lonDeg);
    if (!site) out.push((site = { profileIds: [], latDeg: p.site.latDeg, lonDeg: p.site.lonDeg, hours: 0 }));
    if (!site.profileIds.includes(p.id)) site.profileIds.push(p.id);
    site.hours += hours[i].hours;
  });
  return out;
}

/** How a profile records the lines of a cluster: instrumental sigma of its slits and the lines' own width, and its dispersion. */
export function tracerLineSampling(profile: InstrumentProfile, intrinsicLineSigmaA: number, meanLineA: number): LineSampling {
  const instrumentalA = instrumentalSigmaA(profile.slits.widthArcsec, profile.detector.xArcsecPerPixel, profile.detector.dispersionAPerPixel);
  // Cluster lines are broadened by the instrument and the lines' own width only (internal dispersions of a few km/s).
  return { sigmaLineA: lineSigmaA(instrumentalA, intrinsicLineSigmaA, 0, meanLineA), dispersionAPerPixel: profile.detector.dispersionAPerPixel };
}
