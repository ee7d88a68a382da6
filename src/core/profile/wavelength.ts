/**
 * The contract's wavelength rule. A slit at mask x (arcsec, along the dispersion) puts wavelength L (Angstrom, air)
 * at detector pixel p = pixels/2 + x/xArcsecPerPixel + (L - centralWavelengthA)/dispersionAPerPixel.
 * A science slit is usable when every required line's observed window (contract revision 2)
 * [L_rest (1 + (v_sys - dv)/c) - w, L_rest (1 + (v_sys + dv)/c) + w] lands at edgeMargin <= p <= pixels - edgeMargin
 * and at least edgeMargin pixels away from every gap (dv = goals.velocityHalfRangeKms, w = goals.lineHalfWindowA).
 */
import type { InstrumentProfile } from './schema';

/** Speed of light in km/s (SI definition). */
export const SPEED_OF_LIGHT_KMS = 299792.458;

export type DetectorModel = InstrumentProfile['detector'];

/** Observed (redshifted) wavelength in Angstrom: L_obs = L_rest (1 + v/c), v in km/s (positive = receding). */
export function observedWavelengthA(restWavelengthA: number, vsysKms: number): number {
  return restWavelengthA * (1 + vsysKms / SPEED_OF_LIGHT_KMS);
}

/** The velocity range and line half-window of the wavelength rule (plan goals; both 0 gives the bare rule at v_sys). */
export interface LineWindowSettings {
  /** Half-range of line-of-sight velocities about v_sys that must stay measurable, km/s. */
  velocityHalfRangeKms: number;
  /** Half-width in Angstrom added on each side of the redshifted line (the line and its near continuum). */
  lineHalfWindowA: number;
}

/** Contract defaults: +-500 km/s about v_sys (halo tracers move several hundred km/s) and +-10 A around each line. */
export const DEFAULT_LINE_WINDOW: LineWindowSettings = { velocityHalfRangeKms: 500, lineHalfWindowA: 10 };

/** The plan's goals.velocityHalfRangeKms and goals.lineHalfWindowA, each defaulting to the contract's value. */
export function lineWindowSettings(goals: { velocityHalfRangeKms?: number; lineHalfWindowA?: number }): LineWindowSettings {
  return {
    velocityHalfRangeKms: goals.velocityHalfRangeKms ?? DEFAULT_LINE_WINDOW.velocityHalfRangeKms,
    lineHalfWindowA: goals.lineHalfWindowA ?? DEFAULT_LINE_WINDOW.lineHalfWindowA,
  };
}

/** An observed wavelength window, Angstrom (air), loA <= hiA; restA is the line it belongs to. */
export interface LineWindowA {
  restA: number;
  loA: number;
  hiA: number;
}

/** Observed window of each rest line (Angstrom) over v_sys +- dv (km/s), widened by the half-window (Angstrom). */
export function observedLineWindowsA(linesRestA: readonly number[], vsysKms: number, w: LineWindowSettings): LineWindowA[] {
  return linesRestA.map((restA) => ({
    restA,
    loA: observedWavelengthA(restA, vsysKms - w.velocityHalfRangeKms) - w.lineHalfWindowA,
    hiA: observedWavelengthA(restA, vsysKms + w.velocityHalfRangeKms) + w.lineHalfWindowA,
  }));
}

/** Detector pixel (along dispersion, 0 at the first pixel edge) of wavelength L for a slit at mask x (arcsec). */
export function detectorPixel(detector: DetectorModel, xArcsec: number, wavelengthA: number): number {
  return detector.pixels / 2 + xArcsec / detector.xArcsecPerPixel + (wavelengthA - detector.centralWavelengthA) / detector.dispersionAPerPixel;
}

/** True when pixel p is inside the edge margins and at least edgeMarginPixels from every gap [p0, p1]. */
export function pixelUsable(detector: DetectorModel, p: number): boolean {
  const m = detector.edgeMarginPixels;
  if (!(p >= m && p <= detector.pixels - m)) return false;
  for (const [p0, p1] of detector.gapsPixels) if (p > p0 - m && p < p1 + m) return false;
  return true;
}

/** True when every observed line (Angstrom) of a slit at mask x (arcsec) lands on a usable pixel. */
export function linesUsableAtX(detector: DetectorModel, xArcsec: number, observedLinesA: readonly number[]): boolean {
  for (const l of observedLinesA) if (!pixelUsable(detector, detectorPixel(detector, xArcsec, l))) return false;
  return true;
}

/** True when every observed window of a slit at mask x (arcsec) lies on usable pixels, wholly inside one usable range. */
export function windowsUsableAtX(detector: DetectorModel, xArcsec: number, windows: readonly LineWindowA[]): boolean {
  const ranges = usablePixelRanges(detector);
  for (const win of windows) {
    const p0 = detectorPixel(detector, xArcsec, win.loA), p1 = detectorPixel(detector, xArcsec, win.hiA);
    if (!ranges.some(([a, b]) => p0 >= a && p1 <= b)) return false;
  }
  return true;
}

/** Usable detector pixel ranges (closed, ascending): [m, pixels - m] minus the open bands (p0 - m, p1 + m) about each gap. */
export function usablePixelRanges(detector: DetectorModel): [number, number][] {
  const m = detector.edgeMarginPixels;
  let pix: [number, number][] = [[m, detector.pixels - m]];
  for (const [p0, p1] of detector.gapsPixels) {
    const next: [number, number][] = [];
    for (const [a, b] of pix) {
      if (p0 - m > a) next.push([a, Math.min(b, p0 - m)]);
      if (p1 + m < b) next.push([Math.max(a, p1 + m), b]);
    }
    pix = next.filter(([a, b]) => a <= b);
  }
  return pix;
}

/**
 * The mask-x intervals (arcsec, closed, ascending) where every observed line (zero-width window) is usable: the
 * intersection over lines of the usable pixel ranges shifted into x.
 */
export function usableXIntervalsArcsec(detector: DetectorModel, observedLinesA: readonly number[]): [number, number][] {
  return usableXIntervalsForWindowsArcsec(detector, observedLinesA.map((l) => ({ restA: l, loA: l, hiA: l })));
}

/**
 * The mask-x intervals (arcsec, closed, ascending) where every observed window lies wholly in one usable pixel
 * range: for a range [a, b], x runs from (a - offset(lo)) s to (b - offset(hi)) s. Used to test many targets at once.
 */
export function usableXIntervalsForWindowsArcsec(detector: DetectorModel, windows: readonly LineWindowA[]): [number, number][] {
  const pix = usablePixelRanges(detector);
  const s = detector.xArcsecPerPixel;
  const offset = (l: number) => detector.pixels / 2 + (l - detector.centralWavelengthA) / detector.dispersionAPerPixel;
  let xs: [number, number][] | null = null;
  for (const win of windows) {
    // p = offset + x / s  =>  x = (p - offset) * s; the window's low end must be >= a and its high end <= b.
    const lineXs = pix.map(([a, b]) => [(a - offset(win.loA)) * s, (b - offset(win.hiA)) * s] as [number, number]).filter(([lo, hi]) => lo <= hi);
    xs = xs === null ? lineXs : intersectIntervals(xs, lineXs);
  }
  return xs ?? [];
}

/** Intersection of two sets of closed intervals, ascending. */
export function intersectIntervals(a: readonly [number, number][], b: readonly [number, number][]): [number, number][] {
  const out: [number, number][] = [];
  for (const [a0, a1] of a) for (const [b0, b1] of b) {
    const lo = Math.max(a0, b0), hi = Math.min(a1, b1);
    if (lo <= hi) out.push([lo, hi]);
  }
  return out.sort((p, q) => p[0] - q[0]);
}
