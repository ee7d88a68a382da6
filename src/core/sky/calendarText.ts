/**
 * Calendar dates and instants as users type them in plans and on the command line (UTC, Gregorian). Pure text
 * parsing with no astronomy, so the plan file's schema can check them as well as the observing code.
 */
import { fail, ok, type Result } from '../result';

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

/** ISO 8601 instant with a time (e.g. 2027-03-15T04:30Z or 2027-03-15T04:30:00Z, UTC) to Unix milliseconds; null if not one. */
export function isoInstantUnixMs(text: string): number | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}(?:\.\d+)?))?Z$/.exec(text.trim());
  if (!m) return null;
  const [y, mo, d, h, mi, sec] = [Number(m[1]), Number(m[2]), Number(m[3]), Number(m[4]), Number(m[5]), Number(m[6] ?? 0)];
  if (mo < 1 || mo > 12 || d < 1 || d > new Date(Date.UTC(y, mo, 0)).getUTCDate() || h > 23 || mi > 59 || sec >= 60) return null;
  return Date.UTC(y, mo - 1, d, h, mi, 0) + sec * 1000;
}
