/** Date text for observability ranges and the plain-language verdict when a target cannot be observed. */
import { fail, ok, type Result } from '../result';
import { altitudeForAirmassDeg } from './airmass';
import { transitAltitudeDeg } from './horizon';
import type { NightRow, SkyTarget } from './night';
import type { SiteGeodetic } from './moon';

/** Parse a calendar date YYYY-MM-DD (Gregorian, years 1900-2199); the error says what is wrong. */
export function parseDateText(text: string): Result<string> {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text.trim());
  if (!m) return fail(`"${text}" is not a date of the form YYYY-MM-DD`);
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  if (y < 1900 || y > 2199) return fail(`year ${y} is outside 1900-2199, where the Sun and Moon theories are used here`);
  if (mo < 1 || mo > 12) return fail(`"${text}" has month ${mo}; months run 01-12`);
  const days = new Date(Date.UTC(y, mo, 0)).getUTCDate();
  if (d < 1 || d > days) return fail(`"${text}" has day ${d}; ${m[1]}-${m[2]} has ${days} days`);
  return ok(`${m[1]}-${m[2]}-${m[3]}`);
}

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
