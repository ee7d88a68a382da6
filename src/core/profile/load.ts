/** Load and validate instrument profiles; every wrong or missing key is reported by its path. */
import { profileSchema, type InstrumentProfile } from './schema';
import { InputError, type Problem } from '../result';
import { polygonSelfIntersects, type Corner } from '../geometry/polygon';
import { PROFILE_RANGES, numberRangeProblems } from './numberRanges';

/** Turn zod issues into problems named by their dotted key path, e.g. `slits.gapArcsec`; a missing key says so. */
export function zodIssuesToProblems(source: string, issues: readonly { path: readonly PropertyKey[]; message: string }[]): Problem[] {
  return issues.map((i) => {
    const where = `${source}: ${i.path.length ? i.path.map(String).join('.') : '(top level)'}`;
    const missing = /^Invalid input: expected (\w+), received undefined$/.exec(i.message);
    if (missing) return { where, what: `missing (expected ${missing[1]})`, fix: 'add this key' };
    return { where, what: i.message };
  });
}

/** Least area a footprint can enclose (arcsec^2): one square arcsec, far below any slit. */
const MIN_FOOTPRINT_AREA_ARCSEC2 = 1;

/** Signed area of a polygon by the shoelace formula (arcsec^2; positive counter-clockwise in x, y). */
function polygonAreaArcsec2(p: readonly Corner[]): number {
  let a = 0;
  for (let i = 0; i < p.length; i++) a += p[i][0] * p[(i + 1) % p.length][1] - p[(i + 1) % p.length][0] * p[i][1];
  return a / 2;
}

/**
 * Schema problems and range problems together, one per place: the schema's own message where it has a specific one
 * (e.g. "must be greater than 0"); the range message for a non-finite number or where the schema's is generic.
 */
export function mergeProblems(ranges: readonly Problem[], schema: readonly Problem[]): Problem[] {
  // Where the schema only says "Too small" or "Invalid input", the range message (with the range) is clearer.
  const generic = (p: Problem) => /^(Too small|Too big|Invalid input)/.test(p.what);
  const rangeAt = new Set(ranges.map((p) => p.where));
  const nonFinite = new Set(ranges.filter((p) => / is not a finite number/.test(p.what)).map((p) => p.where));
  const kept = schema.filter((p) => !nonFinite.has(p.where) && !(generic(p) && rangeAt.has(p.where)));
  const named = new Set(kept.map((p) => p.where));
  return [...kept, ...ranges.filter((p) => !named.has(p.where))];
}

/** Validate a parsed profile object; throws InputError listing every problem at once (source names the file). */
export function parseProfile(json: unknown, source = 'profile'): InstrumentProfile {
  const r = profileSchema.safeParse(json);
  const problems: Problem[] = mergeProblems(numberRangeProblems(json, PROFILE_RANGES, source), r.success ? [] : zodIssuesToProblems(source, r.error.issues));
  // The outline check runs on whatever footprint is readable, so it is reported along with schema problems.
  const footprint = readableFootprint(r.success ? r.data : json);
  if (footprint && polygonSelfIntersects(footprint)) {
    problems.push({ where: `${source}: footprint`, what: 'the polygon crosses or touches itself', fix: 'list the corners in order around the outline' });
  } else if (footprint && Math.abs(polygonAreaArcsec2(footprint)) < MIN_FOOTPRINT_AREA_ARCSEC2) {
    problems.push({ where: `${source}: footprint`, what: `encloses ${Math.abs(polygonAreaArcsec2(footprint)).toPrecision(3)} square arcsec: its corners lie on a line or a point, so no slit fits`, fix: 'give the corners of the field outline in arcsec' });
  }
  if (problems.length || !r.success) throw new InputError(problems);
  return r.data;
}

/** The footprint as corners when it is an array of at least three [x, y] pairs of finite numbers, else null. */
function readableFootprint(json: unknown): Corner[] | null {
  if (typeof json !== 'object' || json === null) return null;
  const f = (json as { footprint?: unknown }).footprint;
  if (!Array.isArray(f) || f.length < 3) return null;
  const ok = f.every((c) => Array.isArray(c) && c.length === 2 && c.every((v) => typeof v === 'number' && Number.isFinite(v)));
  return ok ? (f as Corner[]) : null;
}

/** Parse profile text (JSON); a syntax error is reported with the file name, line and column. */
export function parseProfileText(text: string, source = 'profile'): InstrumentProfile {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    const message = (e as Error).message;
    throw new InputError([{ where: `${source}${jsonErrorLocation(text, message)}`, what: `not valid JSON: ${message}`, fix: 'correct the JSON syntax at that place' }]);
  }
  return parseProfile(json, source);
}

/** ":line:column" (1-based) of a JSON.parse error whose message names a character position, else "". */
export function jsonErrorLocation(text: string, message: string): string {
  const m = /position (\d+)/.exec(message);
  // "Unexpected end of JSON input" names no position: the problem is at the end of the text.
  const pos = m ? Math.min(Number(m[1]), text.length) : /end of JSON input/.test(message) ? text.length : null;
  if (pos === null) return '';
  const before = text.slice(0, pos);
  const line = before.split('\n').length;
  const column = pos - (before.lastIndexOf('\n') + 1) + 1;
  return `:${line}:${column}`;
}
