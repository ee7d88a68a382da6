/** Load and validate instrument profiles; every wrong or missing key is reported by its path. */
import { profileSchema, type InstrumentProfile } from './schema';
import { InputError, type Problem } from '../result';
import { polygonSelfIntersects } from '../geometry/polygon';

/** Turn zod issues into problems named by their dotted key path, e.g. `slits.gapArcsec`. */
export function zodIssuesToProblems(source: string, issues: readonly { path: readonly PropertyKey[]; message: string }[]): Problem[] {
  return issues.map((i) => ({
    where: `${source}: ${i.path.length ? i.path.map(String).join('.') : '(top level)'}`,
    what: i.message,
  }));
}

/** Validate a parsed profile object; throws InputError listing every problem (source names the file). */
export function parseProfile(json: unknown, source = 'profile'): InstrumentProfile {
  const r = profileSchema.safeParse(json);
  if (!r.success) throw new InputError(zodIssuesToProblems(source, r.error.issues));
  const p = r.data;
  const problems: Problem[] = [];
  if (polygonSelfIntersects(p.footprint)) {
    problems.push({ where: `${source}: footprint`, what: 'the polygon crosses itself', fix: 'list the corners in order around the outline' });
  }
  if (problems.length) throw new InputError(problems);
  return p;
}

/** Parse profile text (JSON); a syntax error is reported with the file name. */
export function parseProfileText(text: string, source = 'profile'): InstrumentProfile {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new InputError([{ where: source, what: `not valid JSON: ${(e as Error).message}` }]);
  }
  return parseProfile(json, source);
}
