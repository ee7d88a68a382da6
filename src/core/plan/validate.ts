/** Validation of a plan object; reports every problem by its key path (pure, no file access). */
import { planSchema, type GalaxyModel, type PlanFile } from './schema';
import { InputError, type Problem } from '../result';
import { mergeProblems, zodIssuesToProblems } from '../profile/load';
import { PLAN_RANGES } from './numberRanges';
import { numberRangeProblems } from '../profile/numberRanges';
import { parseDecDeg, parseRaDeg } from '../sky/sexagesimal';
import { instrumentKeyProblems } from './instruments';

/** Validate parsed plan JSON; throws InputError with one problem per wrong or missing key. */
export function parsePlan(json: unknown, source = 'plan'): PlanFile {
  // Ranges first: a number no real observation has is named with its range, before any other rule reads it.
  const ranges = numberRangeProblems(json, PLAN_RANGES, source);
  const r = planSchema.safeParse(json);
  if (!r.success || ranges.length) throw new InputError(mergeProblems(ranges, r.success ? [] : zodIssuesToProblems(source, r.error.issues)));
  const plan = r.data;
  const problems: Problem[] = instrumentKeyProblems(plan, source);
  const ids = new Set<string>();
  for (const [i, m] of (plan.masks ?? []).entries()) {
    if (ids.has(m.id)) problems.push({ where: `${source}: masks.${i}.id`, what: `mask id "${m.id}" is used twice` });
    ids.add(m.id);
    const placed = [m.raDeg, m.decDeg].filter((v) => v !== undefined).length;
    if (placed === 1) problems.push({ where: `${source}: masks.${i}`, what: 'give both raDeg and decDeg, or neither' });
    if (m.locked && (m.raDeg === undefined || m.paDeg === undefined)) {
      problems.push({ where: `${source}: masks.${i}`, what: 'a locked mask needs raDeg, decDeg and paDeg' });
    }
  }
  if ((plan.masks?.length ?? 0) > plan.goals.masks) {
    problems.push({ where: `${source}: masks`, what: `${plan.masks!.length} masks listed but goals.masks is ${plan.goals.masks}`, fix: 'raise goals.masks or remove masks' });
  }
  if (problems.length) throw new InputError(problems);
  return plan;
}

/** Parse plan text (JSON) with the file named in any error. */
export function parsePlanText(text: string, source = 'plan'): PlanFile {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new InputError([{ where: source, what: `not valid JSON: ${(e as Error).message}` }]);
  }
  return parsePlan(json, source);
}

/** The plan's galaxy with RA/Dec as decimal degrees (the plan must already be validated). */
export function galaxyModel(plan: PlanFile): GalaxyModel {
  const g = plan.galaxy;
  const ra = parseRaDeg(g.ra);
  const dec = parseDecDeg(g.dec);
  if (!ra.ok || !dec.ok) throw new InputError([{ where: 'galaxy', what: 'ra/dec could not be read' }]);
  return {
    id: g.id, raDeg: ra.value, decDeg: dec.value, reArcsec: g.reArcsec, axisRatio: g.axisRatio,
    paDeg: g.paDeg, distanceMpc: g.distanceMpc, vsysKms: g.vsysKms, sersicN: g.sersicN, muE: g.muE,
  };
}
