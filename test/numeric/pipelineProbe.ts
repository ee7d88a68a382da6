/**
 * A chain of plan solves to run in two engines and compare: the demo plan solved with the pointing search, then
 * seeded edits of the result as a user makes them in the editor (masks moved and turned, weights changed, a target
 * forced in), each solved with the masks kept. Returns the slits (as slits.csv text) and coverage of every solve.
 * Used by test/browser/portableMath.test.ts in Chromium and in node; only src/core is called.
 */
import { solvePlan } from '../../src/core/pipeline/pipeline';
import { parsePlanText } from '../../src/core/plan/validate';
import { parseProfileText } from '../../src/core/profile/load';
import { readCatalog } from '../../src/core/catalog/read';
import { slitsToCsv } from '../../src/core/export/slitsCsv';
import { makeRng } from '../../src/core/numeric/random';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import type { PlanFile } from '../../src/core/plan/schema';

/** One solve: slits.csv text and coverage.json text. */
export interface ProbeSolve { label: string; slitsCsv: string; coverageJson: string }

/** The searched plan and `edits` edited variants of it, each solved. */
export function solveChain(planText: string, profileText: string, catalogText: string, catalogName: string, edits: number): ProbeSolve[] {
  const plan = parsePlanText(planText, 'plan');
  const profile = parseProfileText(profileText, 'profile');
  const catalog = readCatalog(catalogText, catalogName, plan.catalogColumns);
  const out: ProbeSolve[] = [];
  const solve = (label: string, p: PlanFile) => {
    const s = solvePlan({ plan: p, profile, catalog }, { skipObservingReport: true });
    out.push({ label, slitsCsv: slitsToCsv(s.masks.flatMap((m) => m.slits)), coverageJson: JSON.stringify(s.coverage) });
    return s;
  };
  const searched = solve('pointing search', plan).plan;
  const placed = (searched.masks ?? []).map((m) => ({ ...m, locked: true }));
  const rng = makeRng('edits');
  const ids = catalog.targets.map((t) => t.id);
  for (let k = 0; k < edits; k++) {
    const masks = placed.map((m) => {
      const c = tangentCentre(m.raDeg!, m.decDeg!);
      const moved = tangentToSkyDeg(c, rng.uniform(-90, 90), rng.uniform(-90, 90));
      return { ...m, raDeg: moved.raDeg, decDeg: moved.decDeg, paDeg: (m.paDeg! + rng.uniform(-25, 25) + 360) % 360 };
    });
    const targetOverrides: PlanFile['targetOverrides'] = {};
    for (let j = 0; j < 20; j++) targetOverrides[ids[rng.int(ids.length)]] = { weight: Math.round(rng.uniform(0.1, 5) * 1000) / 1000 };
    targetOverrides[ids[rng.int(ids.length)]] = { force: 'in' };
    solve(`edit ${k + 1}`, { ...searched, masks, targetOverrides });
  }
  return out;
}
