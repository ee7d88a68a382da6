/**
 * Telescope time: hours per mask to bring a fraction of its tracer slits to the target S/N, and the nights of a
 * semester that cover the total from each night's observable dark hours (observe/night.ts `darkHours`: Sun below
 * -18 deg and the galaxy below the airmass limit). A mask's exposure may be split over nights (sub-exposures are
 * co-added), so nights are taken best first until their hours cover the total.
 */

export interface MaskHours {
  maskId: string;
  /** Exposure (hours) for `completeness` of the tracer slits to reach the target S/N; null when no tracer can. */
  exposureHours: number | null;
  /** Tracer slits on the mask. */
  tracerSlits: number;
  /** exposureHours (or the planned exposure when null) plus the overhead, hours. */
  hours: number;
}

/**
 * Hours of one mask: the `completeness` quantile of its tracer slits' times to the target S/N (seconds, null when
 * unreachable), plus overheadHours; without tracers, or when the quantile is unreachable, the planned exposure.
 */
export function maskHours(maskId: string, timesS: readonly (number | null)[], completeness: number, plannedS: number, overheadHours: number): MaskHours {
  const times = timesS.map((t) => (t === null ? Infinity : t)).sort((a, b) => a - b);
  let exposureHours: number | null = null;
  if (times.length) {
    const k = Math.max(0, Math.ceil(completeness * times.length) - 1);
    exposureHours = Number.isFinite(times[k]) ? times[k] / 3600 : null;
  }
  return { maskId, exposureHours, tracerSlits: times.length, hours: (exposureHours ?? plannedS / 3600) + overheadHours };
}

export interface NightsEstimate {
  /** Nights needed (best first), null when the semester's observable hours fall short. */
  nightsNeeded: number | null;
  /** Nights of the semester with any observable dark time, and their summed hours. */
  nightsUsable: number;
  hoursAvailable: number;
  from: string;
  to: string;
}

/** Nights (best first by observable dark hours) whose hours cover totalHours. */
export function nightsNeeded(totalHours: number, nights: readonly { date: string; darkHours: number }[], from: string, to: string): NightsEstimate {
  const hours = nights.map((n) => n.darkHours).filter((h) => h > 0).sort((a, b) => b - a);
  const available = hours.reduce((s, h) => s + h, 0);
  let sum = 0, count = 0;
  for (const h of hours) {
    if (sum >= totalHours) break;
    sum += h;
    count++;
  }
  return { nightsNeeded: sum >= totalHours ? count : null, nightsUsable: hours.length, hoursAvailable: available, from, to };
}

/** The nights of one site: its spectrographs' masks, their hours, and the nights estimate from the site's own nights. */
export interface SiteNights {
  /** Profile ids of the spectrographs at the site (same latitude and longitude). */
  profileIds: string[];
  latDeg: number;
  lonDeg: number;
  hours: number;
  nights: NightsEstimate;
}

/**
 * Nights of a plan whose masks are observed at several sites: each site's masks' hours against that site's nights
 * (spectrographs at one site share its telescope time: their hours add); the sites observe in parallel, so the plan
 * needs the largest of their nights (null when any site falls short).
 */
export function nightsOfSites(sites: readonly Omit<SiteNights, 'nights'>[], nightsOf: (profileId: string) => { rows: readonly { date: string; darkHours: number }[]; from: string; to: string }): { sites: SiteNights[]; overall: NightsEstimate } {
  const out = sites.map((s) => {
    const n = nightsOf(s.profileIds[0]);
    return { ...s, nights: nightsNeeded(s.hours, n.rows, n.from, n.to) };
  });
  const short = out.find((s) => s.nights.nightsNeeded === null);
  const longest = short ?? out.reduce((a, b) => (b.nights.nightsNeeded! > a.nights.nightsNeeded! ? b : a));
  return { sites: out, overall: longest.nights };
}
