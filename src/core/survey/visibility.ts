/**
 * Where each mask may be observed: on each night's slot grid (survey/darkNights.ts), the boundaries at which the
 * galaxy is below the airmass limit, inside the mask's hour-angle window and clear of the Moon, and from them the
 * block starts at which the mask's whole exposure fits. A slot counts when its two boundaries pass: the altitude of
 * a fixed target over a stretch of hour angle inside (-12 h, 12 h) is highest inside or at an end and lowest at an
 * end, and the hour angle grows monotonically, so both ends passing means the whole slot passes.
 * Hour angles are of the galaxy centre (the mask centres lie within a few arcminutes), hours, positive West.
 */
import { altitudeForAirmassDeg } from '../observe/airmass';
import { meanPlaceOfDateDeg } from '../observe/precession';
import { separationDeg } from '../sky/separation';
import { DEG_PER_RAD, RAD_PER_DEG, wrap12Hours } from '../sky/angles';
import { PMath } from '../numeric/portableMath';
import type { DarkNight, SiteNights } from './darkNights';

/** Margin added to the airmass limit's altitude, degrees (1 arcmin): the ephemerides agree to well under this. */
export const ALTITUDE_MARGIN_DEG = 1 / 60;

const altitudeLimits = new Map<number, number>();

/** Altitude (degrees) of the Hardie airmass limit plus the margin; solved once per limit. */
export function altitudeLimitDeg(maxAirmass: number): number {
  let v = altitudeLimits.get(maxAirmass);
  if (v === undefined) altitudeLimits.set(maxAirmass, (v = altitudeForAirmassDeg(maxAirmass) + ALTITUDE_MARGIN_DEG));
  return v;
}

/** The conditions of a schedule that apply to every mask. */
export interface VisibilityRules {
  maxAirmass: number;
  /** Moon rules apply while the Moon's centre is above the horizon. */
  maxMoonIllumination: number;
  minMoonSeparationDeg: number;
}

/** Per-boundary flags of one galaxy on one night: 1 when the condition holds. */
export interface GalaxyNightFlags {
  /** Galaxy above the altitude of the airmass limit (plus the margin). */
  up: Uint8Array;
  /** Moon down, or up but within the illumination and separation rules. */
  moonOk: Uint8Array;
  /** Hour angle of the galaxy centre, hours in [-12, 12). */
  hourAngleH: Float64Array;
  /** Geometric altitude of the galaxy centre, degrees. */
  altitudeDeg: Float64Array;
}

/** Flags of a galaxy (ICRS RA/Dec, degrees) on one dark night. */
export function galaxyNightFlags(raDeg: number, decDeg: number, w: DarkNight, latDeg: number, rules: VisibilityRules): GalaxyNightFlags {
  const place = meanPlaceOfDateDeg(raDeg, decDeg, (w.startJd + w.endJd) / 2);
  const altLimit = altitudeLimitDeg(rules.maxAirmass);
  const sinLat = PMath.sin(latDeg * RAD_PER_DEG), cosLat = PMath.cos(latDeg * RAD_PER_DEG);
  const sinDec = PMath.sin(place.decDeg * RAD_PER_DEG), cosDec = PMath.cos(place.decDeg * RAD_PER_DEG);
  const n = w.boundariesJd.length;
  const up = new Uint8Array(n), moonOk = new Uint8Array(n), hourAngleH = new Float64Array(n), alt = new Float64Array(n);
  const moonBright = w.moonIllumination > rules.maxMoonIllumination;
  for (let k = 0; k < n; k++) {
    const haDeg = w.localSiderealDeg[k] - place.raDeg;
    hourAngleH[k] = wrap12Hours(haDeg / 15);
    const x = sinLat * sinDec + cosLat * cosDec * PMath.cos(haDeg * RAD_PER_DEG);
    alt[k] = PMath.asin(x > 1 ? 1 : x < -1 ? -1 : x) * DEG_PER_RAD;
    up[k] = alt[k] >= altLimit ? 1 : 0;
    if (w.moonAltitudeDeg[k] < 0) moonOk[k] = 1;
    else moonOk[k] = !moonBright && separationDeg(w.moonRaDeg[k], w.moonDecDeg[k], place.raDeg, place.decDeg) >= rules.minMoonSeparationDeg ? 1 : 0;
  }
  return { up, moonOk, hourAngleH, altitudeDeg: alt };
}

/** Feasible block starts of one mask on one night: boundary indices k such that slots k .. k + slots - 1 all pass. */
export interface NightOptions {
  nightIndex: number;
  starts: number[];
}

/** Longest stretch (hours) found at each level of the rules, for the reason a mask is left out. */
export interface StretchSummary {
  /** Dark and below the airmass limit. */
  darkUpH: number;
  /** ... and inside the hour-angle window. */
  windowH: number;
  /** ... and clear of the Moon. */
  moonH: number;
  /** Night of the longest stretch at the last level, or null. */
  bestNight: string | null;
}

/** Length (in slots) of the longest run of consecutive passing slots, a slot passing when both its ends pass. */
function longestRun(pass: (k: number) => boolean, n: number): number {
  let best = 0, run = 0;
  for (let k = 0; k + 1 < n; k++) {
    run = pass(k) && pass(k + 1) ? run + 1 : 0;
    if (run > best) best = run;
  }
  return best;
}

/**
 * Block starts of a mask needing `slots` slots on each night, and the longest stretches at each level of the rules.
 * `windowH` is the mask's hour-angle window [start, end] in hours (null: no hour angle is allowed).
 */
export function maskOptions(flagsByNight: (GalaxyNightFlags | null)[], nights: SiteNights, windowH: [number, number] | null, slots: number): { options: NightOptions[]; stretch: StretchSummary } {
  const slotH = nights.slotDays * 24;
  const options: NightOptions[] = [];
  const stretch: StretchSummary = { darkUpH: 0, windowH: 0, moonH: 0, bestNight: null };
  nights.nights.forEach((entry, i) => {
    const f = flagsByNight[i];
    if (!entry.window || !f) return;
    const n = entry.window.boundariesJd.length;
    const inWindow = (k: number) => windowH !== null && f.hourAngleH[k] >= windowH[0] && f.hourAngleH[k] <= windowH[1];
    const level1 = (k: number) => f.up[k] === 1;
    const level2 = (k: number) => level1(k) && inWindow(k);
    const level3 = (k: number) => level2(k) && f.moonOk[k] === 1;
    stretch.darkUpH = Math.max(stretch.darkUpH, longestRun(level1, n) * slotH);
    stretch.windowH = Math.max(stretch.windowH, longestRun(level2, n) * slotH);
    const run3 = longestRun(level3, n) * slotH;
    if (run3 > stretch.moonH) {
      stretch.moonH = run3;
      stretch.bestNight = entry.night;
    }
    // Starts: a running count of consecutive passing slots ending at each boundary.
    const starts: number[] = [];
    let run = 0;
    for (let k = 1; k < n; k++) {
      run = level3(k - 1) && level3(k) ? run + 1 : 0;
      if (run >= slots) starts.push(k - slots);
    }
    if (starts.length) options.push({ nightIndex: i, starts });
  });
  return { options, stretch };
}
