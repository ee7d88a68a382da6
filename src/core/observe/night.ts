/**
 * Observability of one target, night by night, from a site. A night is named by the local evening's date:
 * it runs from local mean noon of that date to the next local mean noon (local mean time from the site's
 * longitude, no time zones). Times are JD (UT) inside and ISO 8601 UTC text in the rows; null where an event
 * does not happen that night (polar day or night).
 */
import { separationDeg } from '../sky/separation';
import { DEG_PER_RAD, RAD_PER_DEG, wrap360Deg } from '../sky/angles';
import { altitudeDeg, transitAltitudeDeg } from './horizon';
import { hardieAirmass, secZAirmass, altitudeForAirmassDeg } from './airmass';
import { findCrossings, type Crossing } from './crossings';
import { nightTrack, ASTRONOMICAL_TWILIGHT_DEG, SUNSET_ALTITUDE_DEG } from './twilight';
import { meanPlaceOfDateDeg } from './precession';
import { moonTrack, moonEquatorialOfDate, moonIlluminatedFraction, topocentricEquatorial, type SiteGeodetic } from './moon';
import { sunEquatorialOfDate, type EquatorialOfDate } from './sun';
import { isoUtcFromJd, jdeFromJdUt, jdFromUnixMs, nutationAt, SIDEREAL_DEG_PER_DAY } from './time';
import { PMath } from '../numeric/portableMath';

export interface NightOptions {
  /** Dark hours count only while the Hardie airmass is below this (default 2). */
  maxAirmass?: number;
  /** Sampling step in minutes for finding Sun and target crossings (default 5). */
  stepMinutes?: number;
  /** Also return the sampled altitude/airmass curve of the night. */
  includeCurve?: boolean;
  /** Exact geocentric Moon places by JD (UT), shared by consecutive nights of a table. */
  moonCache?: Map<number, EquatorialOfDate>;
}

export interface CurvePoint {
  utc: string;
  sunAltitudeDeg: number;
  targetAltitudeDeg: number;
  moonAltitudeDeg: number;
  /** Hardie airmass, null near or below the horizon. */
  airmass: number | null;
  /** Plane-parallel sec z, null near or below the horizon. */
  airmassSecZ: number | null;
}

/** One night's row. Keys up to moonSeparationDeg are the interface contract's; the rest are additions. */
export interface NightRow {
  /** The local evening's date, YYYY-MM-DD. */
  date: string;
  sunsetUtc: string | null;
  astroDuskUtc: string | null;
  astroDawnUtc: string | null;
  sunriseUtc: string | null;
  /** Upper transit (meridian passage) nearest the middle of the night; it happens even when the target is below the horizon. */
  transitUtc: string | null;
  /** Dark time (Sun below -18 deg) with the target's Hardie airmass below the limit, hours. */
  darkHours: number;
  /** Smallest Hardie airmass in dark time, null when the target is not above the horizon in dark time. */
  minAirmass: number | null;
  /** Moon's illuminated fraction 0..1 at the middle of the night. */
  moonIllumination: number;
  /** Angle between the Moon (topocentric) and the target at the middle of the night, degrees. */
  moonSeparationDeg: number;
  /** Moon's topocentric geometric altitude at the middle of the night, degrees. */
  moonAltitudeDeg: number;
  /** The part of darkHours with the Moon's centre below the geometric horizon, hours. */
  darkHoursMoonDown: number;
  /** Target's altitude at that transit, degrees. */
  transitAltitudeDeg: number;
  /** Total dark time, hours, whatever the target does. */
  darkTotalHours: number;
  /** Plane-parallel sec z at the same moment as minAirmass. */
  minAirmassSecZ: number | null;
  /** Middle of the night: between dusk and dawn, else sunset and sunrise, else the Sun's lowest point. */
  middleUtc: string;
  /** True when darkHours > 0. */
  observable: boolean;
  curve?: CurvePoint[];
}

export interface SkyTarget {
  /** ICRS (J2000) position, degrees. */
  raDeg: number;
  decDeg: number;
}

const HOURS_PER_DAY = 24;
/** Sampling step of the Moon's altitude, days (30 minutes). */
const MOON_STEP_DAYS = 30 / 1440;
/** Crossing times are refined to 0.1 s. */
const TOL_DAYS = 0.1 / 86400;

/** JD (UT) of 00:00 UTC on a YYYY-MM-DD date (the text must already be valid). */
export function jdOfDateText(date: string): number {
  const [y, m, d] = date.split('-').map(Number);
  return jdFromUnixMs(Date.UTC(y, m - 1, d));
}

/** The row for the night starting on the local evening of `date` (YYYY-MM-DD). */
export function nightRow(date: string, target: SkyTarget, site: SiteGeodetic, options: NightOptions = {}): NightRow {
  const maxAirmass = options.maxAirmass ?? 2;
  const stepDays = (options.stepMinutes ?? 5) / (HOURS_PER_DAY * 60);
  const jd0 = jdOfDateText(date) + 0.5 - site.lonDeg / 360;
  const span = 1;
  const nut = nutationAt(jdeFromJdUt(jd0 + span / 2));
  const track = nightTrack(jd0, span, site.latDeg, site.lonDeg, nut);
  const place = meanPlaceOfDateDeg(target.raDeg, target.decDeg, jd0 + 0.5);
  const altLimitDeg = altitudeForAirmassDeg(maxAirmass);
  const sinLat = PMath.sin(site.latDeg * RAD_PER_DEG), cosLat = PMath.cos(site.latDeg * RAD_PER_DEG);
  const sinDec = PMath.sin(place.decDeg * RAD_PER_DEG), cosDec = PMath.cos(place.decDeg * RAD_PER_DEG);
  const targetAlt = (jd: number) => {
    const x = sinLat * sinDec + cosLat * cosDec * PMath.cos((track.localSiderealDeg(jd) - place.raDeg) * RAD_PER_DEG);
    return PMath.asin(x > 1 ? 1 : x < -1 ? -1 : x) * DEG_PER_RAD;
  };

  const n = Math.ceil(span / stepDays) + 1;
  const jds = new Float64Array(n);
  const sunAlt = new Float64Array(n);
  const tgtAlt = new Float64Array(n);
  const cache = options.moonCache;
  const geoAt = (jd: number) => {
    const key = Math.round(jd * 1e6);
    const hit = cache?.get(key);
    if (hit) return hit;
    const g = moonEquatorialOfDate(jdeFromJdUt(jd), nut);
    cache?.set(key, g);
    return g;
  };
  const moon = moonTrack(jd0, span, site, track.localSiderealDeg, geoAt);
  const moonAltitude = moon.altitudeDeg;
  for (let i = 0; i < n; i++) {
    const jd = Math.min(jd0 + i * stepDays, jd0 + span);
    jds[i] = jd;
    sunAlt[i] = track.sunAltitudeDeg(jd);
    tgtAlt[i] = targetAlt(jd);
  }
  // The Moon moves smoothly enough to be sampled every 30 minutes for its horizon crossings (refined exactly below).
  const moonEvery = Math.max(1, Math.round(MOON_STEP_DAYS / stepDays));
  const moonJds: number[] = [];
  for (let i = 0; i < n; i += moonEvery) moonJds.push(jds[i]);
  if (moonJds[moonJds.length - 1] !== jds[n - 1]) moonJds.push(jds[n - 1]);
  const moonAltSamples = moonJds.map(moonAltitude);
  const sunAltitude = track.sunAltitudeDeg;
  const setRise = pickSetRise(findCrossings(sunAltitude, jds, sunAlt, TOL_DAYS, SUNSET_ALTITUDE_DEG));
  const darkCross = findCrossings(sunAltitude, jds, sunAlt, TOL_DAYS, ASTRONOMICAL_TWILIGHT_DEG);
  const duskDawn = pickSetRise(darkCross);
  const limitCross = findCrossings(targetAlt, jds, tgtAlt, TOL_DAYS, altLimitDeg);
  const moonCross = findCrossings(moonAltitude, moonJds, moonAltSamples, TOL_DAYS, 0);

  // Dark intervals and dark time below the airmass limit: the conditions are constant between events.
  const events = [jd0, ...[darkCross, limitCross, moonCross].flatMap((cs) => cs.map((c) => c.jd)), jd0 + span].sort((a, b) => a - b);
  const dark = darkTime(events, {
    isDark: (jd) => track.sunAltitudeDeg(jd) < ASTRONOMICAL_TWILIGHT_DEG,
    isUp: (jd) => targetAlt(jd) > altLimitDeg,
    isMoonDown: (jd) => moonAltitude(jd) < 0,
  });
  const darkGood = dark.goodDays;

  // Upper transits in the window; the target's altitude peaks there, so its maximum over a dark interval is
  // at a transit inside it or at one of its ends.
  const firstTransit = jd0 + wrap360Deg(place.raDeg - track.localSiderealDeg(jd0)) / SIDEREAL_DEG_PER_DAY;
  const transits: number[] = [];
  for (let t = firstTransit; t <= jd0 + span; t += 360 / SIDEREAL_DEG_PER_DAY) transits.push(t);
  const bestAlt = highestAltitudeDeg(dark.intervals, transits, targetAlt);
  const minAirmass = bestAlt > 0 ? hardieAirmass(90 - bestAlt) : null;
  const minAirmassSecZ = bestAlt > 0 ? secZAirmass(90 - bestAlt) : null;

  const middle = middleOfNight(duskDawn, setRise, jds, sunAlt);
  const transit = transits.length ? transits.reduce((p, t) => (Math.abs(t - middle) < Math.abs(p - middle) ? t : p)) : null;

  // Moon at the middle of the night (from the track: ~10 arcsec).
  const jde = jdeFromJdUt(middle);
  const moonGeo = moon.geocentric(middle);
  const sun = sunEquatorialOfDate(jde);
  const lstMid = track.localSiderealDeg(middle);
  const moonTopo = topocentricEquatorial(moonGeo, site, lstMid);

  const iso = (jd: number | null) => (jd === null ? null : isoUtcFromJd(jd));
  const row: NightRow = {
    date,
    sunsetUtc: iso(setRise.set),
    astroDuskUtc: iso(duskDawn.set),
    astroDawnUtc: iso(duskDawn.rise),
    sunriseUtc: iso(setRise.rise),
    transitUtc: iso(transit),
    darkHours: darkGood * HOURS_PER_DAY,
    minAirmass,
    moonIllumination: moonIlluminatedFraction(moonGeo, sun),
    moonSeparationDeg: separationDeg(moonTopo.raDeg, moonTopo.decDeg, place.raDeg, place.decDeg),
    moonAltitudeDeg: altitudeDeg(lstMid - moonTopo.raDeg, moonTopo.decDeg, site.latDeg),
    transitAltitudeDeg: transit === null ? transitAltitudeDeg(place.decDeg, site.latDeg) : targetAlt(transit),
    darkTotalHours: dark.totalDays * HOURS_PER_DAY,
    darkHoursMoonDown: dark.goodMoonDownDays * HOURS_PER_DAY,
    minAirmassSecZ,
    middleUtc: isoUtcFromJd(middle),
    observable: darkGood > 0,
  };
  if (options.includeCurve) {
    row.curve = Array.from(jds, (jd, i) => ({
      utc: isoUtcFromJd(jd),
      sunAltitudeDeg: sunAlt[i],
      targetAltitudeDeg: tgtAlt[i],
      moonAltitudeDeg: moonAltitude(jd),
      airmass: hardieAirmass(90 - tgtAlt[i]),
      airmassSecZ: secZAirmass(90 - tgtAlt[i]),
    }));
  }
  return row;
}

/**
 * Dark time between sorted event times (JD) at which the conditions may change: total dark time, dark time with the
 * target up (above the airmass limit), the part of that with the Moon down (days), and the dark intervals.
 */
export function darkTime(events: number[], c: { isDark(jd: number): boolean; isUp(jd: number): boolean; isMoonDown(jd: number): boolean }) {
  let totalDays = 0, goodDays = 0, goodMoonDownDays = 0;
  const intervals: [number, number][] = [];
  for (let i = 1; i < events.length; i++) {
    const a = events[i - 1], b = events[i];
    if (b <= a) continue;
    const mid = (a + b) / 2;
    if (!c.isDark(mid)) continue;
    totalDays += b - a;
    if (c.isUp(mid)) {
      goodDays += b - a;
      if (c.isMoonDown(mid)) goodMoonDownDays += b - a;
    }
    const last = intervals[intervals.length - 1];
    if (last && Math.abs(last[1] - a) < 1e-12) last[1] = b;
    else intervals.push([a, b]);
  }
  return { totalDays, goodDays, goodMoonDownDays, intervals };
}

/** Highest altitude (degrees) of a fixed target over intervals: at their ends or at an upper transit inside one; -Infinity if none. */
export function highestAltitudeDeg(intervals: [number, number][], transits: number[], altitudeAt: (jd: number) => number): number {
  let best = -Infinity;
  for (const [a, b] of intervals) {
    best = Math.max(best, altitudeAt(a), altitudeAt(b));
    for (const t of transits) if (t > a && t < b) best = Math.max(best, altitudeAt(t));
  }
  return best;
}

/** The setting crossing (first downward one) and the rising crossing after it (or the last upward one if none set). */
function pickSetRise(crossings: Crossing[]): { set: number | null; rise: number | null } {
  const setC = crossings.find((c) => !c.rising) ?? null;
  const rises = crossings.filter((c) => c.rising && (setC === null || c.jd > setC.jd));
  const riseC = setC === null ? (crossings.filter((c) => c.rising).pop() ?? null) : (rises[0] ?? null);
  return { set: setC?.jd ?? null, rise: riseC?.jd ?? null };
}

/** Middle of the night: dusk-dawn midpoint, else sunset-sunrise midpoint, else the sample where the Sun is lowest. */
function middleOfNight(duskDawn: { set: number | null; rise: number | null }, setRise: { set: number | null; rise: number | null }, jds: Float64Array, sunAlt: Float64Array): number {
  if (duskDawn.set !== null && duskDawn.rise !== null) return (duskDawn.set + duskDawn.rise) / 2;
  if (setRise.set !== null && setRise.rise !== null) return (setRise.set + setRise.rise) / 2;
  let k = 0;
  for (let i = 1; i < sunAlt.length; i++) if (sunAlt[i] < sunAlt[k]) k = i;
  return jds[k];
}

/** Every date from `from` to `to` inclusive (YYYY-MM-DD, already valid), as YYYY-MM-DD text. */
export function datesBetween(from: string, to: string): string[] {
  const out: string[] = [];
  const [y0, m0, d0] = from.split('-').map(Number);
  const end = Date.parse(`${to}T00:00:00Z`);
  for (let t = Date.UTC(y0, m0 - 1, d0); t <= end; t += 86_400_000) out.push(new Date(t).toISOString().slice(0, 10));
  return out;
}

/** Rows for every night from `from` to `to` inclusive, one at a time (a long range with curves is never held whole). */
export function* nightRows(from: string, to: string, target: SkyTarget, site: SiteGeodetic, options: NightOptions = {}): Generator<NightRow> {
  const moonCache = options.moonCache ?? new Map<number, EquatorialOfDate>();
  for (const d of datesBetween(from, to)) {
    const row = nightRow(d, target, site, { ...options, moonCache });
    // Keep only the places the next night can share (its start is this night's end).
    for (const k of [...moonCache.keys()].slice(0, -1)) moonCache.delete(k);
    yield row;
  }
}

/** Rows for every night from `from` to `to` inclusive. */
export function nightTable(from: string, to: string, target: SkyTarget, site: SiteGeodetic, options: NightOptions = {}): NightRow[] {
  return [...nightRows(from, to, target, site, options)];
}
