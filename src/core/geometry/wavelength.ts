/**
 * The contract's wavelength rule. A slit at mask x (arcsec, along the dispersion) puts wavelength L (Angstrom, air)
 * at detector pixel p = pixels/2 + x/xArcsecPerPixel + (L - centralWavelengthA)/dispersionAPerPixel.
 * A science slit is usable when every required line lands at edgeMargin <= p <= pixels - edgeMargin and at least
 * edgeMargin pixels away from every gap.
 */
import type { InstrumentProfile } from '../profile/schema';

/** Speed of light in km/s (SI definition). */
export const SPEED_OF_LIGHT_KMS = 299792.458;

export type DetectorModel = InstrumentProfile['detector'];

/** Observed (redshifted) wavelength in Angstrom: L_obs = L_rest (1 + v/c), v in km/s (positive = receding). */
export function observedWavelengthA(restWavelengthA: number, vsysKms: number): number {
  return restWavelengthA * (1 + vsysKms / SPEED_OF_LIGHT_KMS);
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

/** Usable pixel ranges [p0, p1] (0 at the first pixel edge): [m, pixels - m] minus the open bands (p0 - m, p1 + m) around each gap. */
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
 * The mask-x intervals (arcsec, closed, ascending) where every observed line is usable: the intersection over
 * lines of the usable pixel ranges shifted into x. Used to test many targets at once and by the pointing search.
 */
export function usableXIntervalsArcsec(detector: DetectorModel, observedLinesA: readonly number[]): [number, number][] {
  const pix = usablePixelRanges(detector);
  let xs: [number, number][] | null = null;
  for (const l of observedLinesA) {
    // p = offset + x / s  =>  x = (p - offset) * s
    const offset = detector.pixels / 2 + (l - detector.centralWavelengthA) / detector.dispersionAPerPixel;
    const s = detector.xArcsecPerPixel;
    const lineXs = pix.map(([a, b]) => [(a - offset) * s, (b - offset) * s] as [number, number]);
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
