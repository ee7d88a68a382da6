/**
 * Where the observed line windows of a galaxy land on the detector, as mask-x intervals (interface contract,
 * "Wavelength rule"): a line L_rest seen over velocities v_sys +- dv and padded by w Angstrom covers
 * [L_rest (1 + (v_sys - dv)/c) - w, L_rest (1 + (v_sys + dv)/c) + w]; a slit at mask x (arcsec, along the dispersion)
 * is usable when the whole window of every line lies in one usable pixel range (inside the edge margins and at least
 * edgeMarginPixels from every gap).
 */
import { DEFAULT_LINE_WINDOW, observedLineWindowsA, usableXIntervalsForWindowsArcsec, type DetectorModel } from './wavelength';

/** The line settings of a check: systemic velocity, half-range about it (km/s) and half-window (Angstrom). */
export interface LineSettings {
  vsysKms: number;
  linesA: readonly number[];
  /** Default 500 km/s (interface contract, goals.velocityHalfRangeKms). */
  velocityHalfRangeKms: number;
  /** Default 10 Angstrom (interface contract, goals.lineHalfWindowA). */
  lineHalfWindowA: number;
}

export const LINE_WINDOW_DEFAULTS = DEFAULT_LINE_WINDOW;

/** Observed window [blue, red] in Angstrom (air) of each rest line for the settings (profile/wavelength.ts). */
export function observedWindowsA(s: LineSettings): [number, number][] {
  return observedLineWindowsA(s.linesA, s.vsysKms, s).map((w) => [w.loA, w.hiA]);
}

/** Mask-x intervals (arcsec, ascending) where one observed window [blueA, redA] lies wholly in one usable pixel range. */
export function windowXIntervalsArcsec(detector: DetectorModel, windowA: readonly [number, number]): [number, number][] {
  return usableXIntervalsForWindowsArcsec(detector, [{ restA: windowA[0], loA: windowA[0], hiA: windowA[1] }]);
}

/** Mask-x intervals (arcsec, ascending) where every line window is usable: the same rule as the solver's. */
export function linesXIntervalsArcsec(detector: DetectorModel, s: LineSettings): [number, number][] {
  return usableXIntervalsForWindowsArcsec(detector, observedLineWindowsA(s.linesA, s.vsysKms, s));
}
