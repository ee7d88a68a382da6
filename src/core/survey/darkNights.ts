/**
 * The semester's dark windows at one site: for each night (named by its local evening date) the time between the
 * end of evening and the start of morning astronomical twilight (Sun's centre 18 deg below the horizon, common
 * practice), shrunk by a safety margin, cut into a grid of slot boundaries; with the Moon's topocentric place and
 * altitude at each boundary. Times are JD (UT). Polar nights/days: a night without dusk or dawn has no window.
 */
import { nightTrack, ASTRONOMICAL_TWILIGHT_DEG } from '../observe/twilight';
import { findCrossings } from '../observe/crossings';
import { moonEquatorialOfDate, moonIlluminatedFraction, moonTrack, topocentricEquatorial, type SiteGeodetic } from '../observe/moon';
import { sunEquatorialOfDate } from '../observe/sun';
import { altitudeDeg } from '../observe/horizon';
import { jdeFromJdUt, nutationAt } from '../observe/time';
import { datesBetween, jdOfDateText } from '../observe/night';

/** Margin kept inside astronomical darkness at each end, minutes: the ephemerides agree to well under this. */
export const DARK_MARGIN_MINUTES = 1;
const MINUTES_PER_DAY = 1440;
/** Sun altitude sampling step for the twilight crossings, days (10 minutes). */
const SUN_STEP_DAYS = 10 / MINUTES_PER_DAY;

/** One night's dark window at a site and its slot grid. */
export interface DarkNight {
  /** Local evening date, YYYY-MM-DD. */
  night: string;
  /** Index of the night in the semester (0 = the first night). */
  index: number;
  /** Start and end of the usable dark window (twilight crossings moved inwards by the margin), JD (UT). */
  startJd: number;
  endJd: number;
  /** Slot boundaries from startJd, every slot length; the last one is at or before endJd. */
  boundariesJd: Float64Array;
  /** Local sidereal time at each boundary, degrees (not wrapped). */
  localSiderealDeg: Float64Array;
  /** Moon's topocentric RA/Dec of date and geometric altitude of its centre at each boundary, degrees. */
  moonRaDeg: Float64Array;
  moonDecDeg: Float64Array;
  moonAltitudeDeg: Float64Array;
  /** Illuminated fraction of the Moon at the middle of the window (0..1). */
  moonIllumination: number;
}

/** The nights of a semester at one site: one entry per date; `window` is null when the Sun never reaches -18 deg. */
export interface SiteNights {
  site: SiteGeodetic;
  slotDays: number;
  nights: { night: string; index: number; window: DarkNight | null }[];
}

/** Dark windows of every night from `from` to `to` (inclusive, local evening dates) at `site`, slots of slotMinutes. */
export function siteNights(site: SiteGeodetic, from: string, to: string, slotMinutes: number): SiteNights {
  const slotDays = slotMinutes / MINUTES_PER_DAY;
  const marginDays = DARK_MARGIN_MINUTES / MINUTES_PER_DAY;
  const nights = datesBetween(from, to).map((night, index) => {
    // A night runs from local mean noon of its evening date to the next local mean noon (observe/night.ts).
    const jd0 = jdOfDateText(night) + 0.5 - site.lonDeg / 360;
    const nut = nutationAt(jdeFromJdUt(jd0 + 0.5));
    const track = nightTrack(jd0, 1, site.latDeg, site.lonDeg, nut);
    const n = Math.ceil(1 / SUN_STEP_DAYS) + 1;
    const jds = new Float64Array(n), alt = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      jds[i] = Math.min(jd0 + i * SUN_STEP_DAYS, jd0 + 1);
      alt[i] = track.sunAltitudeDeg(jds[i]);
    }
    const cross = findCrossings(track.sunAltitudeDeg, jds, alt, 0.1 / 86400, ASTRONOMICAL_TWILIGHT_DEG);
    const dusk = cross.find((c) => !c.rising);
    const dawn = dusk ? cross.find((c) => c.rising && c.jd > dusk.jd) : undefined;
    if (!dusk || !dawn) return { night, index, window: null };
    const startJd = dusk.jd + marginDays, endJd = dawn.jd - marginDays;
    if (endJd <= startJd) return { night, index, window: null };
    const count = Math.floor((endJd - startJd) / slotDays + 1e-9) + 1;
    const boundariesJd = Float64Array.from({ length: count }, (_, k) => startJd + k * slotDays);
    const moon = moonTrack(jd0, 1, site, track.localSiderealDeg, (jd) => moonEquatorialOfDate(jdeFromJdUt(jd), nut));
    const lst = boundariesJd.map((jd) => track.localSiderealDeg(jd));
    const moonRaDeg = new Float64Array(count), moonDecDeg = new Float64Array(count), moonAltitudeDeg = new Float64Array(count);
    for (let k = 0; k < count; k++) {
      const topo = topocentricEquatorial(moon.geocentric(boundariesJd[k]), site, lst[k]);
      moonRaDeg[k] = topo.raDeg;
      moonDecDeg[k] = topo.decDeg;
      moonAltitudeDeg[k] = altitudeDeg(lst[k] - topo.raDeg, topo.decDeg, site.latDeg);
    }
    const mid = (startJd + endJd) / 2;
    const moonIllumination = moonIlluminatedFraction(moon.geocentric(mid), sunEquatorialOfDate(jdeFromJdUt(mid)));
    const window: DarkNight = { night, index, startJd, endJd, boundariesJd, localSiderealDeg: lst, moonRaDeg, moonDecDeg, moonAltitudeDeg, moonIllumination };
    return { night, index, window };
  });
  return { site, slotDays, nights };
}

/** A key naming a site (latitude, longitude, elevation): masks at the same key share one telescope's nights. */
export function siteKey(site: SiteGeodetic): string {
  return `${site.latDeg.toFixed(4)},${site.lonDeg.toFixed(4)},${Math.round(site.elevationM)}`;
}
