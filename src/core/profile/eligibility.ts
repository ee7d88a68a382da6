/**
 * Eligibility of a target on a mask (mask frame, arcsec): its minimal slit (centred on the target, minLengthArcsec
 * long, widthArcsec wide, tilt 0) lies inside the footprint, and for a science slit every required line's observed
 * window (v_sys +- velocityHalfRangeKms, widened by lineHalfWindowA) obeys the wavelength rule. Alignment boxes need only fit in the footprint.
 */
import type { InstrumentProfile } from './schema';
import { polygonBounds, stripFreeYRange, type Corner } from '../geometry/polygon';
import { DEFAULT_LINE_WINDOW, observedLineWindowsA, observedWavelengthA, usableXIntervalsForWindowsArcsec, type LineWindowA, type LineWindowSettings } from './wavelength';

/** Half a unit of the 4th decimal in which slits.csv writes x (arcsec), with room to spare. */
const X_ROUNDING_GUARD_ARCSEC = 1e-4;

/** Everything needed to test many targets against one profile and one set of lines. */
export interface EligibilityRules {
  footprint: readonly Corner[];
  bounds: { minX: number; maxX: number; minY: number; maxY: number };
  minLengthArcsec: number;
  widthArcsec: number;
  boxSizeArcsec: number;
  /** Observed (redshifted at v_sys) required lines, Angstrom. */
  observedLinesA: number[];
  /** Observed window of each line over the velocity range, widened by the line half-window (Angstrom). */
  lineWindowsA: LineWindowA[];
  /** Mask-x intervals (arcsec) where every line window is usable. */
  usableXArcsec: [number, number][];
}

/** Precompute the rules for a profile, rest-frame lines (Angstrom), systemic velocity (km/s) and line windows (plan goals). */
export function eligibilityRules(profile: InstrumentProfile, linesRestA: readonly number[], vsysKms: number, window: LineWindowSettings = DEFAULT_LINE_WINDOW): EligibilityRules {
  const observedLinesA = linesRestA.map((l) => observedWavelengthA(l, vsysKms));
  const lineWindowsA = observedLineWindowsA(linesRestA, vsysKms, window);
  return {
    footprint: profile.footprint,
    bounds: polygonBounds(profile.footprint),
    minLengthArcsec: profile.slits.minLengthArcsec,
    widthArcsec: profile.slits.widthArcsec,
    boxSizeArcsec: profile.alignment.boxSizeArcsec,
    observedLinesA,
    lineWindowsA,
    // Shrunk by the rounding of written x (4 decimals) so a slit on an interval's end still passes an outside check.
    usableXArcsec: usableXIntervalsForWindowsArcsec(profile.detector, lineWindowsA)
      .map(([a, b]) => [a + X_ROUNDING_GUARD_ARCSEC, b - X_ROUNDING_GUARD_ARCSEC] as [number, number]).filter(([a, b]) => a <= b),
  };
}

/** True when the rectangle of half-width halfW and half-length halfL centred on (x, y) lies in the footprint. */
export function centredRectFits(rules: EligibilityRules, xArcsec: number, yArcsec: number, halfWArcsec: number, halfLArcsec: number): boolean {
  const b = rules.bounds;
  if (!(xArcsec - halfWArcsec >= b.minX && xArcsec + halfWArcsec <= b.maxX && yArcsec - halfLArcsec >= b.minY && yArcsec + halfLArcsec <= b.maxY)) return false;
  const r = stripFreeYRange(xArcsec - halfWArcsec, xArcsec + halfWArcsec, yArcsec, rules.footprint);
  return r !== null && r.lo <= yArcsec - halfLArcsec && r.hi >= yArcsec + halfLArcsec;
}

/** True when every required line of a slit at mask x (arcsec) is usable (wavelength rule). */
export function wavelengthOk(rules: EligibilityRules, xArcsec: number): boolean {
  const usable = rules.usableXArcsec;
  for (let i = 0; i < usable.length; i++) if (xArcsec >= usable[i][0] && xArcsec <= usable[i][1]) return true;
  return false;
}

/** True when a science target at (x, y) arcsec can have its minimal slit on this mask. */
export function scienceSlitEligible(rules: EligibilityRules, xArcsec: number, yArcsec: number): boolean {
  return Number.isFinite(xArcsec) && wavelengthOk(rules, xArcsec) && centredRectFits(rules, xArcsec, yArcsec, rules.widthArcsec / 2, rules.minLengthArcsec / 2);
}

/** True when an alignment box centred on (x, y) arcsec fits in the footprint. */
export function alignmentBoxFits(rules: EligibilityRules, xArcsec: number, yArcsec: number): boolean {
  const h = rules.boxSizeArcsec / 2;
  return Number.isFinite(xArcsec) && centredRectFits(rules, xArcsec, yArcsec, h, h);
}
