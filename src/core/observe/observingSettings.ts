/**
 * The plan's `observing` section: conditions and choices for the refraction/hour-angle report and the exposure
 * estimates. Every key is optional; resolveObservingSettings fills the documented defaults (docs/observability.md).
 * Hour angles in hours (positive West), wavelengths Angstrom (air), seeing FWHM arcsec, times seconds.
 */
import type { ObservingSection } from '../plan/observingSection';
import type { InstrumentProfile } from '../profile/schema';
import type { PlanFile } from '../plan/schema';
import type { RefractionSettings } from './maskRefraction';

/** Every observing setting with its value (defaults filled). */
export interface ObservingSettings extends RefractionSettings {
  designHourAngleH: number;
  /** True when no design hour angle was given and the report chooses one per mask (chooseDesignHourAngleH). */
  designHourAngleChosen: boolean;
  exposureTimeS: number;
  targetSnPerA: number;
}

export const OBSERVING_DEFAULTS = {
  designHourAngleH: 0,
  seeingFwhmArcsec: 0.8,
  maxLossFraction: 0.1,
  exposureTimeS: 3600,
  targetSnPerA: 20,
  hourAngleRangeH: [-4, 4] as [number, number],
  hourAngleStepH: 0.25,
  maxAirmass: 2,
};

/** Wavelength range (Angstrom) the detector records at the mask centre: central +- pixels/2 x dispersion. */
export function detectorRangeA(profile: InstrumentProfile): [number, number] {
  const half = (profile.detector.pixels / 2) * profile.detector.dispersionAPerPixel;
  return [profile.detector.centralWavelengthA - half, profile.detector.centralWavelengthA + half];
}

/** Span (Angstrom) of the required lines' observed windows: the science range by default. */
export function lineWindowsRangeA(windows: readonly { loA: number; hiA: number }[]): [number, number] | undefined {
  if (windows.length === 0) return undefined;
  return [Math.min(...windows.map((w) => w.loA)), Math.max(...windows.map((w) => w.hiA))];
}

/**
 * The plan's observing settings with defaults: science range = `fallback.scienceRangeA` (the span of the required
 * lines' windows), else the detector's range at the mask centre; design wavelength (where slits are cut) = the middle
 * of the science range; guide wavelength = the design wavelength unless set (set the guider's own effective wavelength
 * when known); exposure time and target S/N fall back to `fallback` (the starlight settings) and then to
 * OBSERVING_DEFAULTS. Without a design hour angle the report chooses one per mask.
 */
export function resolveObservingSettings(section: ObservingSection | undefined, profile: InstrumentProfile, fallback: { exposureTimeS?: number; targetSnPerA?: number; scienceRangeA?: [number, number] } = {}): ObservingSettings {
  const s = section ?? {};
  const scienceRangeA = (s.scienceRangeA as [number, number] | undefined) ?? fallback.scienceRangeA ?? detectorRangeA(profile);
  const designWavelengthA = s.designWavelengthA ?? (scienceRangeA[0] + scienceRangeA[1]) / 2;
  return {
    designHourAngleH: s.designHourAngleH ?? OBSERVING_DEFAULTS.designHourAngleH,
    designHourAngleChosen: s.designHourAngleH === undefined,
    designWavelengthA,
    seeingFwhmArcsec: s.seeingFwhmArcsec ?? OBSERVING_DEFAULTS.seeingFwhmArcsec,
    maxLossFraction: s.maxLossFraction ?? OBSERVING_DEFAULTS.maxLossFraction,
    guideWavelengthA: s.guideWavelengthA ?? designWavelengthA,
    scienceRangeA,
    exposureTimeS: s.exposureTimeS ?? fallback.exposureTimeS ?? OBSERVING_DEFAULTS.exposureTimeS,
    targetSnPerA: s.targetSnPerA ?? fallback.targetSnPerA ?? OBSERVING_DEFAULTS.targetSnPerA,
    hourAngleRangeH: (s.hourAngleRangeH as [number, number] | undefined) ?? OBSERVING_DEFAULTS.hourAngleRangeH,
    hourAngleStepH: s.hourAngleStepH ?? OBSERVING_DEFAULTS.hourAngleStepH,
    maxAirmass: s.maxAirmass ?? OBSERVING_DEFAULTS.maxAirmass,
  };
}

/** Design hour angle (hours) of each plan mask that gives one, else the observing value when the plan sets it. */
export function designHourAnglesH(plan: PlanFile, settings: ObservingSettings): Record<string, number> {
  const out: Record<string, number> = {};
  for (const m of plan.masks ?? []) {
    if (m.designHourAngleH !== undefined) out[m.id] = m.designHourAngleH;
    else if (!settings.designHourAngleChosen) out[m.id] = settings.designHourAngleH;
  }
  return out;
}
