/**
 * The plan's spectral report: the photometric declaration, each required line's observed window over the velocity
 * range, the instrument's resolving power and instrumental dispersion at each line (slit width and dispersion), the
 * velocities at which a line falls on a night-sky OH line, and per mask the usable x range of science slits
 * (mask frame, arcsec, x along the dispersion). Pure; the pipeline adds it to the solution, the editor can call it.
 */
import type { InstrumentProfile } from '../profile/schema';
import type { PlanFile } from '../plan/schema';
import { lineWindowSettings, observedLineWindowsA, observedWavelengthA, type LineWindowSettings } from '../profile/wavelength';
import { eligibilityRules } from '../profile/eligibility';
import { resolvePhotometry, photometryLine, type Photometry } from '../plan/photometry';
import { slitResolution, type Resolution } from './resolution';
import { OH_LIST_RANGE_A, skyLineHits, type SkyLineHit } from './nightSkyLines';

export interface LineReport {
  restA: number;
  /** Observed wavelength at v_sys and the window over v_sys +- dv widened by the half-window (Angstrom). */
  observedA: number;
  windowLoA: number;
  windowHiA: number;
  resolution: Resolution;
}

export interface MaskUsableX {
  maskId: string;
  /** Mask-x intervals (arcsec) inside the footprint's x extent where every line window is usable. */
  intervalsArcsec: [number, number][];
  /** The footprint's x extent (arcsec) and the fraction of it that is usable. */
  footprintXArcsec: [number, number];
  usableFraction: number;
}

export interface SpectralReport {
  profileId: string;
  slitWidthArcsec: number;
  photometry: Photometry;
  window: LineWindowSettings;
  lines: LineReport[];
  skyLineHits: SkyLineHit[];
  /** False when a line window leaves the span of the OH line list (no flag there means: not looked up). */
  skyLinesCovered: boolean;
  masks: MaskUsableX[];
  /** A plan with several spectrographs: each one's own report (its masks only); `masks` above then lists every mask. */
  instruments?: SpectralReport[];
}

/** The spectral report of a plan on one profile, for the given mask ids (usable x is a property of the profile and lines). */
export function spectralReport(plan: Pick<PlanFile, 'goals' | 'galaxy'> & { photometry?: PlanFile['photometry'] }, profile: InstrumentProfile, maskIds: readonly string[]): SpectralReport {
  const window = lineWindowSettings(plan.goals);
  const vsysKms = plan.galaxy.vsysKms;
  const width = profile.slits.widthArcsec;
  const windows = observedLineWindowsA(plan.goals.linesA, vsysKms, window);
  const lines = windows.map((w) => {
    const observedA = observedWavelengthA(w.restA, vsysKms);
    return { restA: w.restA, observedA, windowLoA: w.loA, windowHiA: w.hiA, resolution: slitResolution(profile.detector, width, observedA) };
  });
  const fwhmA = Math.max(...lines.map((l) => l.resolution.fwhmA));
  const rules = eligibilityRules(profile, plan.goals.linesA, vsysKms, window);
  const fx: [number, number] = [rules.bounds.minX, rules.bounds.maxX];
  const intervals = rules.usableXArcsec
    .map(([a, b]) => [Math.max(a, fx[0]), Math.min(b, fx[1])] as [number, number])
    .filter(([a, b]) => a <= b);
  const usable = intervals.reduce((s, [a, b]) => s + (b - a), 0);
  return {
    profileId: profile.id,
    slitWidthArcsec: width,
    photometry: resolvePhotometry(plan.photometry),
    window,
    lines,
    skyLineHits: skyLineHits(plan.goals.linesA, vsysKms, window.velocityHalfRangeKms, fwhmA),
    skyLinesCovered: windows.every((w) => w.loA >= OH_LIST_RANGE_A[0] && w.hiA <= OH_LIST_RANGE_A[1]),
    masks: maskIds.map((maskId) => ({ maskId, intervalsArcsec: intervals, footprintXArcsec: fx, usableFraction: fx[1] > fx[0] ? usable / (fx[1] - fx[0]) : 0 })),
  };
}

/**
 * The spectral report of masks on several profiles (plan key instruments): each profile's report for its own masks,
 * the first profile's at the top with every mask's usable x (mask order as given). One group: spectralReport.
 */
export function spectralReportForGroups(plan: Parameters<typeof spectralReport>[0], groups: readonly { profile: InstrumentProfile; maskIds: string[] }[], maskOrder: readonly string[]): SpectralReport {
  if (groups.length <= 1) return spectralReport(plan, groups[0].profile, maskOrder);
  const parts = groups.map((g) => spectralReport(plan, g.profile, g.maskIds));
  const byId = new Map(parts.flatMap((p) => p.masks.map((m) => [m.maskId, m] as const)));
  return { ...parts[0], masks: maskOrder.map((id) => byId.get(id)!).filter(Boolean), instruments: parts };
}

const f1 = (v: number) => v.toFixed(1);

/** Plain-text lines for the plan summary (one block per spectrograph when the report has several). */
export function spectralSummaryLines(r: SpectralReport): string[] {
  if (r.instruments) return [photometryLine(r.photometry), ...r.instruments.flatMap((p) => spectralSummaryLines(p).slice(1))];
  const out = [photometryLine(r.photometry)];
  out.push(`spectral windows (v_sys +- ${r.window.velocityHalfRangeKms} km/s, +- ${r.window.lineHalfWindowA} A) and instrument ${r.profileId} (slit ${r.slitWidthArcsec}"):`);
  for (const l of r.lines) {
    out.push(`  ${l.restA} A: observed ${l.observedA.toFixed(2)} A, window ${l.windowLoA.toFixed(2)}-${l.windowHiA.toFixed(2)} A; R = ${l.resolution.resolvingPower.toFixed(0)}, resolution ${l.resolution.fwhmA.toFixed(2)} A FWHM, instrumental sigma ${f1(l.resolution.sigmaKms)} km/s`);
  }
  if (r.skyLineHits.length === 0) out.push(r.skyLinesCovered ? '  night-sky OH lines: none within one resolution element of a line over the velocity range' : '  night-sky OH lines: none listed in 8340-8890 A within reach (windows outside that span not looked up)');
  for (const h of r.skyLineHits) out.push(`  night-sky OH line ${h.skyLineA} A lies on the ${h.restA} A line for ${f1(h.fromKms)} to ${f1(h.toKms)} km/s`);
  // Masks with the same usable range (same profile and lines) share one line.
  const groups = new Map<string, string[]>();
  for (const m of r.masks) {
    const iv = m.intervalsArcsec.length ? m.intervalsArcsec.map(([a, b]) => `${f1(a)} to ${f1(b)}`).join(', ') : 'none';
    const text = `science slits usable at x = ${iv} arcsec (${(100 * m.usableFraction).toFixed(0)} % of the footprint's x extent ${f1(m.footprintXArcsec[0])} to ${f1(m.footprintXArcsec[1])})`;
    groups.set(text, [...(groups.get(text) ?? []), m.maskId]);
  }
  for (const [text, ids] of groups) out.push(`  mask${ids.length > 1 ? 's' : ''} ${ids.join(', ')}: ${text}`);
  return out;
}
