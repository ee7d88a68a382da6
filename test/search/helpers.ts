/** Shared set-up for the search tests: a generated scenario solved by the pipeline, and the independent checker. */
import { readFileSync } from 'node:fs';
import { generateScenario, scenarioCatalog, type ScenarioOptions } from '../../src/core/scenario/generator';
import { parsePlan } from '../../src/core/plan/validate';
import { parseProfile } from '../../src/core/profile/load';
import type { InstrumentProfile } from '../../src/core/profile/schema';
import type { PlanFile } from '../../src/core/plan/schema';
import { checkOutput } from '../../src/core/check/checkOutput';
import type { PlanSolution } from '../../src/core/pipeline/pipeline';

export const PROFILE_IDS = ['ridge10-narrow', 'quad8-square', 'broad65-wide'] as const;

export function loadProfile(id: string): InstrumentProfile {
  return parseProfile(JSON.parse(readFileSync(new URL(`../../instrument-profiles/${id}.json`, import.meta.url), 'utf8')), id);
}

/** A scenario for a profile (alignment stars in its range), with plan edits applied. */
export function scenario(opts: Partial<ScenarioOptions> & { profileId?: string }, edit: (plan: Record<string, any>) => void = () => {}) {
  const profileId = opts.profileId ?? 'ridge10-narrow';
  const profile = loadProfile(profileId);
  const s = generateScenario({ seed: 1, candidates: 600, ...opts, instrument: profileId, alignmentMagRange: profile.alignment.magRange });
  edit(s.plan);
  const plan: PlanFile = parsePlan(s.plan);
  return { s, plan, profile, catalog: scenarioCatalog(s) };
}

/** Violations of the contract's rules in a solution, by the independent checker (src/core/check). */
export function violations(sol: PlanSolution, profile: InstrumentProfile): string[] {
  const v = checkOutput({
    masks: sol.masks.map((m) => ({ maskId: m.mask.id, instrument: profile.id, raDeg: m.mask.raDeg, decDeg: m.mask.decDeg, paDeg: m.mask.paDeg })),
    slits: sol.masks.flatMap((m) => m.slits),
    profileFor: (id) => (id === profile.id ? profile : null),
    linesRestA: sol.plan.goals.linesA,
    vsysKms: sol.galaxy.vsysKms,
  });
  return v.map((x) => `${x.where}: [${x.rule}] ${x.what}`);
}
