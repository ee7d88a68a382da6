/**
 * The plan's refraction and hour-angle report: one MaskRefractionReport per solved mask, from the masks with
 * their slits, the profile's site (latitude, pressure, temperature, humidity) and the observing settings.
 * Pure; the planning pipeline adds it to the solution as `observingReport`.
 */
import type { MaskSolution } from '../geometry/maskSolution';
import type { GalaxyModel, PlanFile } from '../plan/schema';
import type { InstrumentProfile } from '../profile/schema';
import { maskRefractionReport, type MaskRefractionReport } from '../observe/maskRefraction';
import { chooseDesignHourAngle, designHourAngleCandidatesH, exposureFit } from '../observe/designHourAngle';
import { lineWindowsRangeA } from '../observe/observingSettings';
import { lineWindowSettings, observedLineWindowsA } from '../profile/wavelength';
import { planSkyMagPerArcsec2 } from '../observe/planSky';
import { DEFAULT_SKY_SYSTEMATIC_FRACTION, starlightBinLines, starlightBins, type StarlightBin } from '../solver/starlightBins';
import { designHourAnglesH, resolveObservingSettings, type ObservingSettings } from '../observe/observingSettings';
import type { ObservingSection } from '../plan/observingSection';
import { exposureModelOf, maskExposureReport, type MaskExposureReport } from '../solver/exposure';
import { starlightSettings } from '../solver/starlight';
import { type StarlightRules } from '../plan/starlightSection';
import type { StarlightBinsResult } from '../coverage/goals';

export interface RefractionReportInput {
  galaxy: GalaxyModel;
  masks: MaskSolution[];
  site: InstrumentProfile['site'];
  settings: ObservingSettings;
  /** Per-mask design hour angles (hours); masks not listed get the one with the longest window (settings.designHourAngleChosen) or settings.designHourAngleH. */
  designHourAnglesH?: Record<string, number>;
}

export interface ObservingReport {
  galaxyId: string;
  settings: ObservingSettings;
  masks: MaskRefractionReport[];
  /** Per-mask exposure estimates (present when built by observingReportForPlan). */
  exposures?: MaskExposureReport[];
  /** Co-added integrated-starlight bins (solver/starlightBins.ts), with the target and the sky floor used. */
  starlightBins?: { bins: StarlightBin[]; targetSnPerA: number; skySystematicFraction: number };
}

/** Refraction rows and recommended hour-angle window of every mask (hour angles of each mask centre, hours). */
export function refractionReport(input: RefractionReportInput): ObservingReport {
  const air = {
    pressureHPa: input.site.pressureHPa,
    temperatureC: input.site.temperatureC,
    relativeHumidity: input.site.relativeHumidity,
  };
  return {
    galaxyId: input.galaxy.id,
    settings: input.settings,
    masks: input.masks.map((m) => {
      const base = { mask: m.mask, slits: m.slits, latDeg: input.site.latDeg, air, settings: input.settings };
      const given = input.designHourAnglesH?.[m.mask.id];
      const s = input.settings;
      const chosen = given === undefined && s.designHourAngleChosen;
      const r = chosen
        ? chooseDesignHourAngle(base, designHourAngleCandidatesH(s.hourAngleRangeH, s.hourAngleStepH), s.exposureTimeS)
        : maskRefractionReport({ ...base, designHourAngleH: given ?? s.designHourAngleH });
      return { ...r, designHourAngleChosen: chosen, exposureFitsWindow: exposureFit(r.hourAngleWindowH, s.exposureTimeS).fits };
    }),
  };
}

/**
 * The whole observing report of a solved plan: settings resolved from the plan's `observing` section (exposure
 * time and target S/N falling back to its `starlight` section), each mask's design hour angle from the plan,
 * refraction rows and window per mask, and exposure estimates per slit. `measured`: the co-added starlight bins of
 * these masks as pipeline.ts measureStarlightBins made them for this plan and profile (the same model, target and
 * floor: solver/starlightBins.ts starlightBinModel), reused instead of measured again.
 */
export function observingReportForPlan(plan: PlanFile, profile: InstrumentProfile, galaxy: GalaxyModel, masks: MaskSolution[], measured?: StarlightBinsResult): ObservingReport {
  const starlight = starlightSettings(plan.starlight as StarlightRules | undefined, profile, plan);
  const settings = resolveObservingSettings(plan.observing as ObservingSection | undefined, profile, {
    exposureTimeS: starlight.exposureS,
    scienceRangeA: lineWindowsRangeA(observedLineWindowsA(plan.goals.linesA, galaxy.vsysKms, lineWindowSettings(plan.goals))),
  });
  const report = refractionReport({ galaxy, masks, site: profile.site, settings, designHourAnglesH: designHourAnglesH(plan, settings) });
  const model = exposureModelOf(starlight, settings);
  const skySystematicFraction = (plan.observing as ObservingSection | undefined)?.skySystematicFraction ?? DEFAULT_SKY_SYSTEMATIC_FRACTION;
  const bins = plan.goals.starlightReachRe > 0
    ? { bins: measured?.bins ?? starlightBins(masks, galaxy, model, { reachRe: plan.goals.starlightReachRe, targetSnPerA: starlight.targetSnPerA, skySystematicFraction }), targetSnPerA: starlight.targetSnPerA, skySystematicFraction }
    : undefined;
  return { ...report, exposures: masks.map((m) => maskExposureReport(m, galaxy, model)), starlightBins: bins };
}

/**
 * The sky (AB mag/arcsec^2) the exposure estimates use: the dark sky brightened by the plan's Moon (observe/planSky.ts:
 * observing.moon as given, else computed for observing.date / dateRange; Krisciunas & Schaefer 1991).
 */
export function skyWithMoon(plan: PlanFile, profile: InstrumentProfile, galaxy: GalaxyModel, darkSkyAbMagPerArcsec2: number): number {
  return planSkyMagPerArcsec2(darkSkyAbMagPerArcsec2, plan.observing as ObservingSection | undefined, plan.photometry, profile.site, galaxy);
}

const r4 = (v: number) => Math.round(v * 1e4) / 1e4;

/** The report with numbers rounded for files: arcsec and hours to 1e-4, loss fractions to 1e-4, S/N to 0.01. */
export function compactObservingReport(report: ObservingReport): ObservingReport {
  return {
    ...report,
    masks: report.masks.map((m) => ({
      ...m,
      rows: m.rows.map((r) => ({
        ...r,
        altitudeDeg: r4(r.altitudeDeg), airmass: r.airmass === null ? null : r4(r.airmass), parallacticAngleDeg: r4(r.parallacticAngleDeg),
        maxDispersionAcrossArcsec: r.maxDispersionAcrossArcsec === null ? null : r4(r.maxDispersionAcrossArcsec),
        maxFieldShiftAcrossArcsec: r.maxFieldShiftAcrossArcsec === null ? null : r4(r.maxFieldShiftAcrossArcsec),
        maxLossFraction: r.maxLossFraction === null ? null : r4(r.maxLossFraction),
      })),
    })),
    exposures: report.exposures?.map((e) => ({
      ...e,
      medianTracerSnPerA: e.medianTracerSnPerA === null ? null : Math.round(e.medianTracerSnPerA * 100) / 100,
      slits: e.slits.map((s) => ({
        ...s,
        snPerA: Math.round(s.snPerA * 100) / 100,
        timeForTargetSnS: s.timeForTargetSnS === null ? null : Math.round(s.timeForTargetSnS),
        apertureFraction: s.apertureFraction === null ? null : r4(s.apertureFraction),
        muMagPerArcsec2: s.muMagPerArcsec2 === null ? null : Math.round(s.muMagPerArcsec2 * 1000) / 1000,
      })),
    })),
    starlightBins: report.starlightBins && {
      ...report.starlightBins,
      bins: report.starlightBins.bins.map((b) => ({ ...b, reachRe: r4(b.reachRe), snPerA: Math.round(b.snPerA * 100) / 100, snPerAWithoutFloor: Math.round(b.snPerAWithoutFloor * 100) / 100, floorCapSnPerA: b.floorCapSnPerA === null ? null : Math.round(b.floorCapSnPerA * 100) / 100 })),
    },
  };
}

/**
 * The solved plan with the observing report: key `observingReport` (compact) and, on every mask, its
 * `designHourAngleH` and `hourAngleWindowH` ([start, end] hours, or null).
 */
export function withObservingReport(plan: PlanFile, report: ObservingReport): PlanFile {
  const byId = new Map(report.masks.map((m) => [m.maskId, m]));
  const masks = (plan.masks ?? []).map((m) => {
    const r = byId.get(m.id);
    return r ? { ...m, designHourAngleH: r.designHourAngleH, hourAngleWindowH: r.hourAngleWindowH } : m;
  });
  return { ...plan, masks, observingReport: compactObservingReport(report) };
}

/**
 * The plan without what a solve wrote into it (the inverse of withObservingReport): no `observingReport` and no mask
 * `hourAngleWindowH`. A mask's `designHourAngleH` stays: a plan may set it by hand. Used when a solved plan is opened
 * for editing, so a stale report is not carried along (or saved) once masks move.
 */
export function withoutSolveOutputs(plan: PlanFile): PlanFile {
  const { observingReport: _report, ...rest } = plan as PlanFile & { observingReport?: unknown };
  if (!plan.masks) return rest;
  return { ...rest, masks: plan.masks.map(({ hourAngleWindowH: _window, ...m }) => m) };
}

const fmtH = (h: number) => `${h >= 0 ? '+' : ''}${h.toFixed(2)} h`;

/** Plain-text lines for the plan report: each mask's design hour angle and recommended window. */
export function formatRefractionSummary(report: ObservingReport): string[] {
  const s = report.settings;
  const lines = [
    `Differential refraction (seeing ${s.seeingFwhmArcsec}" FWHM, slits cut at ${(s.designWavelengthA ?? s.guideWavelengthA).toFixed(0)} A, guide ${s.guideWavelengthA.toFixed(0)} A, ` +
      `science ${s.scienceRangeA[0].toFixed(0)}-${s.scienceRangeA[1].toFixed(0)} A, tracer slits losing < ${(s.maxLossFraction * 100).toFixed(0)} %, airmass <= ${s.maxAirmass}):`,
  ];
  // A report over several spectrographs carries each one's settings (pipeline/instrumentsReport.ts): each mask's own exposure,
  // and each spectrograph's seeing, guider and airmass limit when they differ from the heading's.
  const parts = (report as { instruments?: { instrument: string; maskIds: string[]; settings: ObservingSettings }[] }).instruments;
  const exposureOf = (maskId: string) => parts?.find((p) => p.maskIds.includes(maskId))?.settings.exposureTimeS ?? s.exposureTimeS;
  for (const p of parts ?? []) {
    const o = p.settings;
    if (o.seeingFwhmArcsec !== s.seeingFwhmArcsec || o.guideWavelengthA !== s.guideWavelengthA || o.maxAirmass !== s.maxAirmass) {
      lines.push(`  ${p.instrument} (masks ${p.maskIds.join(', ')}): seeing ${o.seeingFwhmArcsec}" FWHM, guide ${o.guideWavelengthA.toFixed(0)} A, airmass <= ${o.maxAirmass}`);
    }
  }
  for (const m of report.masks) {
    const w = m.hourAngleWindowH;
    const where = (w === null ? 'no hour-angle window' : `hour-angle window ${fmtH(w[0])} to ${fmtH(w[1])}`) + (m.windowNote ? ` (${m.windowNote})` : '');
    const fit = exposureFit(w, exposureOf(m.maskId)).text;
    lines.push(`  ${m.maskId}: designed for HA ${fmtH(m.designHourAngleH)}${m.designHourAngleChosen ? ' (chosen for the longest window)' : ''}; ${where}; ${fit}; ${m.windowSlitCount} tracer slits`);
  }
  if (report.exposures?.length) {
    const e0 = report.exposures[0];
    // One exposure time and target for all masks in the heading; each mask's own when its spectrograph has others.
    const same = report.exposures.every((e) => e.exposureTimeS === e0.exposureTimeS && e.targetSnPerA === e0.targetSnPerA && e.wavelengthA === e0.wavelengthA);
    const setup = (e: typeof e0) => `${(e.exposureTimeS / 3600).toFixed(2)} h, S/N per A at ${e.wavelengthA.toFixed(0)} A, target ${e.targetSnPerA}`;
    lines.push(same ? `Exposure estimate (${setup(e0)}):` : 'Exposure estimate (each mask with its own spectrograph\'s exposure time and target):');
    for (const e of report.exposures) {
      const n = e.slits.filter((s) => s.role === 'tracer').length;
      const med = e.medianTracerSnPerA === null ? 'no tracer slits' : `median tracer S/N ${e.medianTracerSnPerA.toFixed(1)}`;
      lines.push(`  ${e.maskId}: ${same ? '' : `${setup(e)}; `}${med}; ${e.tracersReachingTarget} of ${n} tracers reach the target`);
    }
  }
  if (report.starlightBins) lines.push(...starlightBinLines(report.starlightBins.bins, report.starlightBins.targetSnPerA, report.starlightBins.skySystematicFraction));
  return lines;
}
