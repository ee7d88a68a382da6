/**
 * Strong night-sky OH emission lines near the calcium triplet (air wavelengths, Angstrom), and the velocities at
 * which a redshifted required line falls on one of them. Line list: Osterbrock et al. 1996, PASP 108, 277 and
 * 1997, PASP 109, 614; Hanuschik 2003, A&A 407, 1157. Between about 8520 and 8760 A the sky is comparatively clean.
 */
import { SPEED_OF_LIGHT_KMS } from '../profile/wavelength';

/** OH lines (air, Angstrom) from 8340 to 8890 A (Osterbrock et al. 1996, 1997; Hanuschik 2003). */
export const OH_LINES_A: readonly number[] = [
  8344.602, 8399.17, 8415.231, 8430.17, 8465.208, 8465.509, 8493.389, 8504.628, 8505.054,
  8776.294, 8778.333, 8790.993, 8791.186, 8825.448, 8827.096, 8885.85,
];
/** Wavelength span of OH_LINES_A (Angstrom): outside it the list says nothing. */
export const OH_LIST_RANGE_A: readonly [number, number] = [8340, 8890];

/** A stretch of line-of-sight velocity (km/s) over which a required line lies within one resolution element of a sky line. */
export interface SkyLineHit {
  restA: number;
  skyLineA: number;
  fromKms: number;
  toKms: number;
}

/**
 * Velocities in [vsys - dv, vsys + dv] (km/s) at which each rest line (Angstrom), redshifted by (1 + v/c), lands within
 * fwhmA (Angstrom, the resolution element) of a sky line: v in c [(L_sky -+ fwhm)/L_rest - 1], clipped to the range.
 */
export function skyLineHits(linesRestA: readonly number[], vsysKms: number, velocityHalfRangeKms: number, fwhmA: number, skyLinesA: readonly number[] = OH_LINES_A): SkyLineHit[] {
  const out: SkyLineHit[] = [];
  const c = SPEED_OF_LIGHT_KMS;
  for (const restA of linesRestA) {
    for (const sky of skyLinesA) {
      const from = Math.max(vsysKms - velocityHalfRangeKms, c * ((sky - fwhmA) / restA - 1));
      const to = Math.min(vsysKms + velocityHalfRangeKms, c * ((sky + fwhmA) / restA - 1));
      if (from <= to) out.push({ restA, skyLineA: sky, fromKms: from, toKms: to });
    }
  }
  return out;
}
