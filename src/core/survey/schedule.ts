/**
 * The survey schedule: every mask into the semester's nights (survey/darkNights.ts, survey/visibility.ts), exact by
 * the integer program (survey/ilp.ts, HiGHS) when the number of candidate blocks is at most
 * settings.exactMaxVariables, else by the stated heuristic (survey/heuristic.ts); always with a bound and the gap.
 * Pure: the caller passes the loaded HiGHS module (or null for the heuristic alone). Times JD (UT) inside,
 * ISO 8601 UTC text in the result.
 */
import type { HighsLike } from '../solver/jointIlp';
import { hardieAirmass } from '../observe/airmass';
import { altitudeDeg } from '../observe/horizon';
import { greenwichApparentSiderealDeg, isoUtcFromJd } from '../observe/time';
import { meanPlaceOfDateDeg } from '../observe/precession';
import { wrap12Hours } from '../sky/angles';
import { siteNights, type SiteNights } from './darkNights';
import { galaxyNightFlags, maskOptions, type GalaxyNightFlags, type StretchSummary, type VisibilityRules } from './visibility';
import { scheduleConflict, scheduleWeight, slotsFor, type CandidateBlock, type MaskRequest, type SurveyTelescope } from './blocks';
import { scheduleLpBound, solveScheduleExact } from './ilp';
import { scheduleGreedy, scheduleUpperBound } from './heuristic';
import type { SurveySettings } from './schema';

/** One scheduled block. */
export interface ScheduledBlock {
  galaxyId: string;
  maskId: string;
  telescopeKey: string;
  /** Local evening date of the night. */
  night: string;
  startJd: number;
  endJd: number;
  startUtc: string;
  endUtc: string;
  hours: number;
  /** Hardie airmass of the galaxy centre at the block's start, middle and end. */
  airmass: [number, number, number];
  /** Hour angle of the galaxy centre at the block's start and end, hours (West positive). */
  hourAngleH: [number, number];
  moonIllumination: number;
}

/** What happened to one mask. */
export interface MaskOutcome {
  galaxyId: string;
  maskId: string;
  priority: number;
  hoursNeeded: number;
  block: ScheduledBlock | null;
  /** Nights on which the whole exposure fits (before competition with other masks). */
  possibleNights: number;
  /** Why the mask is left out (null when scheduled). */
  reason: string | null;
  stretch: StretchSummary;
}

/** One night of a telescope, for the calendar. */
export interface TelescopeNight {
  night: string;
  darkStartUtc: string | null;
  darkEndUtc: string | null;
  darkStartJd: number | null;
  darkEndJd: number | null;
  moonIllumination: number | null;
}

export interface SurveySchedule {
  blocks: ScheduledBlock[];
  masks: MaskOutcome[];
  telescopes: (SurveyTelescope & { nights: TelescopeNight[] })[];
  solver: {
    /** 'exact' (HiGHS integer program) or 'heuristic' (survey/heuristic.ts). */
    method: 'exact' | 'heuristic';
    /** Why this method: the size against the exact limit, or the absence of the solver. */
    why: string;
    candidateBlocks: number;
    objective: number;
    /** Upper bound on the optimum, and the relative gap (bound - objective) / bound (0 when the bound is 0). */
    bound: number;
    gap: number;
    /** HiGHS status of the exact solve, or null. */
    exactStatus: string | null;
  };
}

/** Survey-wide rules and grid: SurveySettings' schedule keys. */
export type ScheduleSettings = Pick<SurveySettings, 'from' | 'to' | 'maxAirmass' | 'maxMoonIllumination' | 'minMoonSeparationDeg' | 'slotMinutes' | 'exactMaxVariables' | 'exactTimeLimitS'>;

const fmtH = (h: number) => `${h.toFixed(2)} h`;

/** Why a mask with no block is left out, from its longest stretches at each level of the rules. */
function reasonFor(r: MaskRequest, s: StretchSummary, possibleNights: number, settings: ScheduleSettings, needH: number): string {
  const airmass = `airmass ${settings.maxAirmass}`;
  if (s.darkUpH === 0) return `never below ${airmass} in astronomical darkness between ${settings.from} and ${settings.to}`;
  if (s.darkUpH < needH) return `at most ${fmtH(s.darkUpH)} a night below ${airmass} in darkness, shorter than the ${fmtH(needH)} it needs`;
  if (r.hourAngleWindowH === null) return 'no hour angle keeps its tracer slits within the refraction loss limit (solved.plan.json, observingReport), so it cannot be observed';
  const w = `[${r.hourAngleWindowH[0].toFixed(2)}, ${r.hourAngleWindowH[1].toFixed(2)}] h`;
  if (s.windowH === 0) return `below ${airmass} in darkness only outside its hour-angle window ${w}`;
  if (s.windowH < needH) return `its hour-angle window ${w} leaves at most ${fmtH(s.windowH)} a night in darkness below ${airmass}, shorter than the ${fmtH(needH)} it needs`;
  if (s.moonH < needH) return `the Moon rules (illumination <= ${settings.maxMoonIllumination}, separation >= ${settings.minMoonSeparationDeg} deg while up) leave at most ${fmtH(s.moonH)} a night, shorter than the ${fmtH(needH)} it needs`;
  return `possible on ${possibleNights} night${possibleNights === 1 ? '' : 's'}, but that time went to other masks (the schedule maximises the total priority of scheduled masks)`;
}

/** Hardie airmass (Infinity below the horizon) and hour angle (hours in [-12, 12), West positive) of a fixed ICRS target at a JD (UT). */
export function airmassAndHourAngleAt(raDeg: number, decDeg: number, jdUt: number, site: { latDeg: number; lonDeg: number }): { airmass: number; hourAngleH: number } {
  const place = meanPlaceOfDateDeg(raDeg, decDeg, jdUt);
  const haDeg = greenwichApparentSiderealDeg(jdUt) + site.lonDeg - place.raDeg;
  const alt = altitudeDeg(haDeg, place.decDeg, site.latDeg);
  return { airmass: hardieAirmass(90 - alt) ?? Infinity, hourAngleH: wrap12Hours(haDeg / 15) };
}

/** Schedule every mask; highs null runs the heuristic alone. onProgress gets fractions in [0, 1] with a message. */
export function scheduleSurvey(requests: readonly MaskRequest[], settings: ScheduleSettings, highs: HighsLike | null, onProgress?: (fraction: number, message: string) => void): SurveySchedule {
  const progress = onProgress ?? (() => {});
  const rules: VisibilityRules = { maxAirmass: settings.maxAirmass, maxMoonIllumination: settings.maxMoonIllumination, minMoonSeparationDeg: settings.minMoonSeparationDeg };
  const telescopes: SurveyTelescope[] = [];
  const telescopeIndex = new Map<string, number>();
  for (const r of requests) if (!telescopeIndex.has(r.telescope.key)) telescopeIndex.set(r.telescope.key, telescopes.push(r.telescope) - 1);
  const nightsOf: SiteNights[] = telescopes.map((t, i) => {
    progress((0.3 * i) / telescopes.length, `dark windows at ${t.label}`);
    return siteNights(t.site, settings.from, settings.to, settings.slotMinutes);
  });
  // Flags per galaxy (position and telescope), shared by its masks.
  const flagCache = new Map<string, (GalaxyNightFlags | null)[]>();
  const candidates: CandidateBlock[] = [];
  const perMask = requests.map((r, m) => {
    if (m % 20 === 0) progress(0.3 + (0.3 * m) / Math.max(1, requests.length), `visibility of ${r.galaxyId}`);
    const t = telescopeIndex.get(r.telescope.key)!;
    const nights = nightsOf[t];
    const fkey = `${t}|${r.raDeg}|${r.decDeg}`;
    let flags = flagCache.get(fkey);
    if (!flags) {
      flags = nights.nights.map((e) => (e.window ? galaxyNightFlags(r.raDeg, r.decDeg, e.window, r.telescope.site.latDeg, rules) : null));
      flagCache.set(fkey, flags);
    }
    const slots = slotsFor(r.hoursNeeded, nights.slotDays * 24);
    const { options, stretch } = maskOptions(flags, nights, r.hourAngleWindowH, slots);
    for (const o of options) for (const s of o.starts) candidates.push({ mask: m, telescope: t, night: o.nightIndex, startSlot: s, slots });
    return { stretch, possibleNights: options.length };
  });

  progress(0.6, `${candidates.length} candidate blocks`);
  const greedy = scheduleGreedy(candidates, requests);
  let chosen = greedy;
  let method: 'exact' | 'heuristic' = 'heuristic';
  let exactStatus: string | null = null;
  let bound = scheduleUpperBound(candidates, requests);
  let why: string;
  if (!highs) why = 'the exact solver is not available';
  else if (candidates.length > settings.exactMaxVariables) why = `${candidates.length} candidate blocks, more than the exact solver's limit of ${settings.exactMaxVariables} (survey key exactMaxVariables)`;
  else {
    progress(0.7, `integer program of ${candidates.length} blocks (HiGHS)`);
    const exact = solveScheduleExact(highs, candidates, requests, settings.exactTimeLimitS);
    exactStatus = exact.status;
    const exactWeight = scheduleWeight(exact.chosen, candidates, requests);
    if (exact.status === 'Optimal' && scheduleConflict(exact.chosen, candidates) === null) {
      chosen = exact.chosen;
      method = 'exact';
      bound = exactWeight;
      why = `${candidates.length} candidate blocks, within the exact solver's limit of ${settings.exactMaxVariables}; proved optimal`;
    } else {
      const lp = scheduleLpBound(highs, candidates, requests, settings.exactTimeLimitS);
      if (lp !== null) bound = Math.min(bound, lp);
      if (exactWeight > scheduleWeight(greedy, candidates, requests) && scheduleConflict(exact.chosen, candidates) === null) {
        chosen = exact.chosen;
        method = 'exact';
      }
      why = `the exact solver stopped with "${exact.status}" after at most ${settings.exactTimeLimitS} s; the better of its best schedule and the heuristic's is kept`;
    }
  }
  const objective = scheduleWeight(chosen, candidates, requests);
  bound = Math.max(bound, objective);
  progress(0.95, 'writing the schedule');

  const blockOf = new Map<number, ScheduledBlock>();
  for (const i of chosen) {
    const c = candidates[i];
    const r = requests[c.mask];
    const w = nightsOf[c.telescope].nights[c.night].window!;
    const startJd = w.boundariesJd[c.startSlot];
    const endJd = startJd + r.hoursNeeded / 24;
    const [a, m, e] = [startJd, (startJd + endJd) / 2, endJd].map((jd) => airmassAndHourAngleAt(r.raDeg, r.decDeg, jd, r.telescope.site));
    blockOf.set(c.mask, {
      galaxyId: r.galaxyId, maskId: r.maskId, telescopeKey: r.telescope.key, night: w.night,
      startJd, endJd, startUtc: isoUtcFromJd(startJd), endUtc: isoUtcFromJd(endJd), hours: r.hoursNeeded,
      airmass: [a.airmass, m.airmass, e.airmass], hourAngleH: [a.hourAngleH, e.hourAngleH], moonIllumination: w.moonIllumination,
    });
  }
  const masks: MaskOutcome[] = requests.map((r, m) => {
    const block = blockOf.get(m) ?? null;
    const { stretch, possibleNights } = perMask[m];
    return {
      galaxyId: r.galaxyId, maskId: r.maskId, priority: r.priority, hoursNeeded: r.hoursNeeded, block, possibleNights, stretch,
      reason: block ? null : reasonFor(r, stretch, possibleNights, settings, slotsFor(r.hoursNeeded, settings.slotMinutes / 60) * (settings.slotMinutes / 60)),
    };
  });
  const blocks = [...blockOf.values()].sort((a, b) => a.startJd - b.startJd || a.telescopeKey.localeCompare(b.telescopeKey));
  return {
    blocks,
    masks,
    telescopes: telescopes.map((t, i) => ({
      ...t,
      nights: nightsOf[i].nights.map((e) => ({
        night: e.night,
        darkStartJd: e.window?.startJd ?? null, darkEndJd: e.window?.endJd ?? null,
        darkStartUtc: e.window ? isoUtcFromJd(e.window.startJd) : null, darkEndUtc: e.window ? isoUtcFromJd(e.window.endJd) : null,
        moonIllumination: e.window?.moonIllumination ?? null,
      })),
    })),
    solver: { method, why, candidateBlocks: candidates.length, objective, bound, gap: bound > 0 ? (bound - objective) / bound : 0, exactStatus },
  };
}
