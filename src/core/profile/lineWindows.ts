/**
 * Where the observed line windows of a galaxy land on the detector, as mask-x intervals (interface contract,
 * "Wavelength rule"): a line L_rest seen over velocities v_sys +- dv and padded by w Angstrom covers
 * [L_rest (1 + (v_sys - dv)/c) - w, L_rest (1 + (v_sys + dv)/c) + w]; a slit at mask x (arcsec, along the dispersion)
 * is usable when the whole window of every line lies in one usable pixel range (inside the edge margins and at least
 * edgeMarginPixels from every gap).
 */
import { intersectIntervals, observedWavelengthA, usablePixelRanges, type DetectorModel } from '../geometry/wavelength';

/** The line settings of a check: systemic velocity, half-range about it (km/s) and half-window (Angstrom). */
export interface LineSettings {
  vsysKms: number;
  linesA: readonly number[];
  /** Default 500 km/s (interface contract, goals.velocityHalfRangeKms). */
  velocityHalfRangeKms: number;
  /** Default 10 Angstrom (interface contract, goals.lineHalfWindowA). */
  lineHalfWindowA: number;
}

export const LINE_WINDOW_DEFAULTS = { velocityHalfRangeKms: 500, lineHalfWindowA: 10 } as const;

/** Observed window [blue, red] in Angstrom (air) of each rest line for the settings. */
export function observedWindowsA(s: LineSettings): [number, number][] {
  return s.linesA.map((l) => [
    observedWavelengthA(l, s.vsysKms - s.velocityHalfRangeKms) - s.lineHalfWindowA,
    observedWavelengthA(l, s.vsysKms + s.velocityHalfRangeKms) + s.lineHalfWindowA,
  ]);
}

/** Mask-x offset (arcsec) of pixel p for wavelength L: the inverse of the contract's rule p(x, L). */
export function maskXForPixelArcsec(detector: DetectorModel, pixel: number, wavelengthA: number): number {
  return (pixel - detector.pixels / 2 - (wavelengthA - detector.centralWavelengthA) / detector.dispersionAPerPixel) * detector.xArcsecPerPixel;
}

/** Mask-x intervals (arcsec, ascending) where one observed window [blueA, redA] lies wholly in one usable pixel range. */
export function windowXIntervalsArcsec(detector: DetectorModel, windowA: readonly [number, number]): [number, number][] {
  const out: [number, number][] = [];
  for (const [p0, p1] of usablePixelRanges(detector)) {
    // The blue end must reach p0 or beyond and the red end stay at p1 or below.
    const lo = maskXForPixelArcsec(detector, p0, windowA[0]);
    const hi = maskXForPixelArcsec(detector, p1, windowA[1]);
    if (lo <= hi) out.push([lo, hi]);
  }
  return out;
}

/** Mask-x intervals (arcsec, ascending) where every line window is usable: the intersection over the lines. */
export function linesXIntervalsArcsec(detector: DetectorModel, s: LineSettings): [number, number][] {
  let xs: [number, number][] | null = null;
  for (const w of observedWindowsA(s)) {
    const lineXs = windowXIntervalsArcsec(detector, w);
    xs = xs === null ? lineXs : intersectIntervals(xs, lineXs);
  }
  return xs ?? [];
}
