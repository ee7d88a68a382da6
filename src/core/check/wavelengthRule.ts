/**
 * The checker's own wavelength rule (contract revision 2), written from the contract alone: for a science slit at
 * mask x (arcsec, its centre), every required line's observed window
 * [L_rest (1 + (v_sys - dv)/c) - w, L_rest (1 + (v_sys + dv)/c) + w] (Angstrom, air) must land on detector pixels
 * p = pixels/2 + x/xArcsecPerPixel + (L - centralWavelengthA)/dispersionAPerPixel with
 * edgeMarginPixels <= p <= pixels - edgeMarginPixels and at least edgeMarginPixels from every gap.
 */
import type { InstrumentProfile } from '../profile/schema';

const C_KMS = 299792.458; // speed of light, SI definition
/** Tolerance in detector pixels (far below a pixel, far above rounding of a 4-decimal x). */
export const WAVELENGTH_TOL_PIXELS = 1e-3;

/** The rule's parameters from a solved plan: rest lines (A), v_sys (km/s), dv (km/s, default 500), w (A, default 10). */
export interface WavelengthRuleInput {
  linesRestA: readonly number[];
  vsysKms: number;
  velocityHalfRangeKms?: number;
  lineHalfWindowA?: number;
}

/** Each reason a science slit at mask x (arcsec) breaks the wavelength rule on this detector (empty when it obeys it). */
export function wavelengthRuleProblems(detector: InstrumentProfile['detector'], xArcsec: number, rule: WavelengthRuleInput): string[] {
  const dv = rule.velocityHalfRangeKms ?? 500, w = rule.lineHalfWindowA ?? 10;
  const m = detector.edgeMarginPixels, tol = WAVELENGTH_TOL_PIXELS;
  const px = (l: number) => detector.pixels / 2 + xArcsec / detector.xArcsecPerPixel + (l - detector.centralWavelengthA) / detector.dispersionAPerPixel;
  const out: string[] = [];
  for (const rest of rule.linesRestA) {
    const lo = rest * (1 + (rule.vsysKms - dv) / C_KMS) - w, hi = rest * (1 + (rule.vsysKms + dv) / C_KMS) + w;
    const p0 = px(lo), p1 = px(hi);
    const what = `line ${rest} A, observed ${lo.toFixed(2)}-${hi.toFixed(2)} A (v_sys +- ${dv} km/s, +- ${w} A), falls on pixels ${p0.toFixed(1)}-${p1.toFixed(1)}`;
    if (p0 < m - tol || p1 > detector.pixels - m + tol) out.push(`${what}, outside [${m}, ${detector.pixels - m}]`);
    for (const [g0, g1] of detector.gapsPixels) {
      // The window [p0, p1] must end at or before g0 - m, or start at or after g1 + m.
      if (p1 > g0 - m + tol && p0 < g1 + m - tol) out.push(`${what}, within ${m} pixels of the gap [${g0}, ${g1}]`);
    }
  }
  return out;
}
