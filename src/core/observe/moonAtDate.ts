/**
 * The Moon at the design time of an observing night, for the sky model (observe/moonSky.ts, Krisciunas & Schaefer
 * 1991): its phase angle (0 = full, 180 = new; geocentric Moon and Sun, Meeus ch. 48), its topocentric separation from
 * the galaxy and altitude (Meeus ch. 40 and 47, observe/moon.ts), and the galaxy's own altitude at that moment.
 * The design time is the moment of the night (local evening date; local mean noon to noon, observe/night.ts) when the
 * galaxy's hour angle equals the design hour angle (default 0: transit), taken nearest local midnight. Degrees, JD (UT).
 */
import { phaseAngleEquatorial } from 'astronomia/moonillum';
import { Coord, illuminated } from 'astronomia/base';
import { DEG_PER_RAD, RAD_PER_DEG, wrap180Deg } from '../sky/angles';
import { separationDeg } from '../sky/separation';
import { isoInstantUnixMs } from '../sky/calendarText';
import { moonEquatorialOfDate, topocentricEquatorial, type SiteGeodetic } from './moon';
import { sunEquatorialOfDate } from './sun';
import { altitudeDeg } from './horizon';
import { meanPlaceOfDateDeg } from './precession';
import { datesBetween, jdOfDateText } from './night';
import { greenwichApparentSiderealDeg, isoUtcFromJd, jdeFromJdUt, jdFromUnixMs, localSiderealDeg, SIDEREAL_DEG_PER_DAY } from './time';

/** The Moon and the galaxy at one moment. */
export interface MoonAtTime {
  utc: string;
  /** Lunar phase angle, degrees (0 full, 180 new). */
  phaseAngleDeg: number;
  /** Illuminated fraction of the disk, 0..1 (Meeus 48.1). */
  illuminatedFraction: number;
  /** Topocentric Moon - galaxy separation and Moon altitude (geometric), degrees. */
  separationDeg: number;
  altitudeDeg: number;
  /** The galaxy's geometric altitude at that moment, degrees. */
  galaxyAltitudeDeg: number;
}

/** Moon geometry seen from `site` at `jdUt` for a target at J2000 (raDeg, decDeg). */
export function moonAtTime(jdUt: number, target: { raDeg: number; decDeg: number }, site: SiteGeodetic): MoonAtTime {
  const jde = jdeFromJdUt(jdUt);
  const moonGeo = moonEquatorialOfDate(jde);
  const sun = sunEquatorialOfDate(jde);
  const iRad = phaseAngleEquatorial(
    new Coord(moonGeo.raDeg * RAD_PER_DEG, moonGeo.decDeg * RAD_PER_DEG, moonGeo.distanceKm),
    new Coord(sun.raDeg * RAD_PER_DEG, sun.decDeg * RAD_PER_DEG, sun.distanceKm),
  );
  const lst = localSiderealDeg(greenwichApparentSiderealDeg(jdUt), site.lonDeg);
  const topo = topocentricEquatorial(moonGeo, site, lst);
  const place = meanPlaceOfDateDeg(target.raDeg, target.decDeg, jdUt);
  return {
    utc: isoUtcFromJd(jdUt),
    phaseAngleDeg: iRad * DEG_PER_RAD,
    illuminatedFraction: illuminated(iRad),
    separationDeg: separationDeg(topo.raDeg, topo.decDeg, place.raDeg, place.decDeg),
    altitudeDeg: altitudeDeg(lst - topo.raDeg, topo.decDeg, site.latDeg),
    galaxyAltitudeDeg: altitudeDeg(lst - place.raDeg, place.decDeg, site.latDeg),
  };
}

/**
 * JD (UT) on the night of local evening `date` (YYYY-MM-DD) when the target's hour angle is `hourAngleH` (hours,
 * positive West), the one nearest local mean midnight.
 */
export function designTimeJd(date: string, target: { raDeg: number; decDeg: number }, lonEastDeg: number, hourAngleH = 0): number {
  const midnight = jdOfDateText(date) + 1 - lonEastDeg / 360;
  const place = meanPlaceOfDateDeg(target.raDeg, target.decDeg, midnight);
  const haNowDeg = localSiderealDeg(greenwichApparentSiderealDeg(midnight), lonEastDeg) - place.raDeg;
  return midnight + wrap180Deg(hourAngleH * 15 - haNowDeg) / SIDEREAL_DEG_PER_DAY;
}

/** The night a range of nights stands for: the middle one (earlier of the two middle nights for an even count). */
export function middleNight(from: string, to: string): string {
  const nights = datesBetween(from, to);
  return nights[Math.floor((nights.length - 1) / 2)] ?? from;
}

/** ISO 8601 instant with a time (e.g. 2027-03-15T04:30Z or 2027-03-15T04:30:00Z, UTC) to JD (UT); null if not one. */
export function jdOfIsoInstant(text: string): number | null {
  const ms = isoInstantUnixMs(text);
  return ms === null ? null : jdFromUnixMs(ms);
}

/** What the plan says about when it is observed (observing.date / observing.dateRange). */
export interface ObservingWhen {
  date?: string;
  dateRange?: [string, string];
  designHourAngleH?: number;
}

/**
 * The design moment of a plan's observation: an ISO instant in `date` as given; a date (or the middle night of
 * `dateRange`) at the design hour angle; null when the plan gives no date.
 */
export function designMomentJd(when: ObservingWhen, target: { raDeg: number; decDeg: number }, site: SiteGeodetic): number | null {
  if (when.date !== undefined) {
    const instant = jdOfIsoInstant(when.date);
    if (instant !== null) return instant;
    return designTimeJd(when.date.trim(), target, site.lonDeg, when.designHourAngleH ?? 0);
  }
  if (when.dateRange) return designTimeJd(middleNight(when.dateRange[0], when.dateRange[1]), target, site.lonDeg, when.designHourAngleH ?? 0);
  return null;
}
