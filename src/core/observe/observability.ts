/** The plain-language verdict when a target cannot be observed. */
import { altitudeForAirmassDeg } from './airmass';
import { transitAltitudeDeg } from './horizon';
import type { NightRow, SkyTarget } from './night';
import type { SiteGeodetic } from './moon';

/**
 * Null when the target has dark time below the airmass limit on some night; otherwise a sentence starting
 * "not observable" saying why: it never rises, never gets above the airmass limit, or is never up in dark time.
 */
export function observabilityVerdict(rows: NightRow[], target: SkyTarget, site: SiteGeodetic, maxAirmass: number): string | null {
  if (rows.some((r) => r.observable)) return null;
  const top = transitAltitudeDeg(target.decDeg, site.latDeg);
  const where = `at latitude ${site.latDeg.toFixed(2)} deg`;
  if (top <= 0) return `not observable: the target (Dec ${target.decDeg.toFixed(2)} deg) never rises ${where} (highest altitude ${top.toFixed(1)} deg)`;
  const need = altitudeForAirmassDeg(maxAirmass);
  if (top <= need) return `not observable: the target never gets above airmass ${maxAirmass} ${where} (highest altitude ${top.toFixed(1)} deg, airmass ${maxAirmass} needs ${need.toFixed(1)} deg)`;
  if (rows.every((r) => r.darkTotalHours === 0)) return `not observable: no astronomical darkness ${where} on these dates (the Sun stays above -18 deg)`;
  return `not observable: the target is not above airmass ${maxAirmass} in dark time on any of these nights`;
}
