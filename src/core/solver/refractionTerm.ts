/**
 * The pointing search's refraction term (objective.ts, `search.objective.aRefraction`): the fraction of a mask's
 * tracer light lost to differential refraction across its slits at the mask's PA,
 *   f = c / (c + w),
 * with c the mean across-slit spread of the science range over the exposure (observe/paRefractionCost.ts,
 * |R(blue) - R(red)| |sin(q - PA)|, arcsec) and w the slit width (arcsec): f is about c / w for a small spread and
 * one half when the spread equals the slit width. The exposure window is centred on the mask's design hour angle
 * (the mask's `designHourAngleH`, else `observing.designHourAngleH`, else transit) and lasts the plan's exposure
 * time; the science range, site air and exposure are the observing report's (observe/observingSettings.ts). A mask
 * whose centre sets within the window gets 0 (no PA helps; the observing report says there is no window).
 */
import type { PlanFile } from '../plan/schema';
import type { InstrumentProfile } from '../profile/schema';
import type { MaskPointing } from '../geometry/maskSolution';
import { paRefractionCostArcsec } from '../observe/paRefractionCost';
import { lineWindowsRangeA, resolveObservingSettings } from '../observe/observingSettings';
import { type ObservingSection } from '../plan/observingSection';
import { lineWindowSettings, observedLineWindowsA } from '../profile/wavelength';
import { starlightSettings } from './starlight';
import { type StarlightRules } from '../plan/starlightSection';

/** Loss fraction f in [0, 1) of a mask pointing (PA degrees East of North, Dec degrees); 0 when the term is off. */
export type RefractionLoss = (p: MaskPointing) => number;

/** The refraction loss of masks of `profile` for a plan (null when aRefraction is 0: the term then costs nothing). */
export function refractionLossModel(plan: PlanFile, profile: InstrumentProfile, aRefraction: number): RefractionLoss | null {
  if (!(aRefraction > 0)) return null;
  const starlight = starlightSettings(plan.starlight as StarlightRules | undefined, profile, plan);
  const settings = resolveObservingSettings(plan.observing as ObservingSection | undefined, profile, {
    exposureTimeS: starlight.exposureS,
    scienceRangeA: lineWindowsRangeA(observedLineWindowsA(plan.goals.linesA, plan.galaxy.vsysKms, lineWindowSettings(plan.goals))),
  });
  const designOf = new Map((plan.masks ?? []).filter((m) => m.designHourAngleH !== undefined).map((m) => [m.id, m.designHourAngleH as number]));
  const halfH = settings.exposureTimeS / 7200;
  const air = { pressureHPa: profile.site.pressureHPa, temperatureC: profile.site.temperatureC, relativeHumidity: profile.site.relativeHumidity };
  const widthArcsec = profile.slits.widthArcsec;
  return (p) => {
    const d = designOf.get(p.id) ?? (settings.designHourAngleChosen ? 0 : settings.designHourAngleH);
    const c = paRefractionCostArcsec(p.paDeg, { decDeg: p.decDeg, latDeg: profile.site.latDeg, air, scienceRangeA: settings.scienceRangeA, windowH: [d - halfH, d + halfH] });
    return Number.isFinite(c) ? c / (c + widthArcsec) : 0;
  };
}
