/** Test helpers: catalogs built directly as reader results, targets placed by mask-frame offsets, output round trips. */
import type { CatalogReadResult, Target } from '../../src/core/catalog/types';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import { maskToSkyArcsec } from '../../src/core/sky/frames';
import type { PlanSolution } from '../../src/core/pipeline/pipeline';
import { masksToCsv, parseMasksCsv, parseSlitsCsv, slitsToCsv } from '../../src/core/export/slitsCsv';
import { checkOutput, type Violation } from '../../src/core/check/checkOutput';
import type { InstrumentProfile } from '../../src/core/profile/schema';

/** A target at mask-frame (x, y) arcsec of a mask centred at (ra0, dec0) with position angle paDeg. */
export function targetAt(id: string, mask: { raDeg: number; decDeg: number; paDeg: number }, xArcsec: number, yArcsec: number, extra: Partial<Target> = {}): Target {
  const s = maskToSkyArcsec(xArcsec, yArcsec, mask.paDeg);
  const p = tangentToSkyDeg(tangentCentre(mask.raDeg, mask.decDeg), s.xiArcsec, s.etaArcsec);
  return { id, raDeg: p.raDeg, decDeg: p.decDeg, mag: 21, color: null, priority: null, role: 'tracer', line: 0, extra: {}, ...extra };
}

/** A catalog read result holding the given targets (lines numbered from 2, as after a header). */
export function catalogOf(targets: Target[], source = 'test.csv'): CatalogReadResult {
  return {
    format: 'csv', source, targets: targets.map((t, i) => ({ ...t, line: i + 2 })), rejects: [], rowsRead: targets.length,
    columns: ['id', 'ra', 'dec', 'mag', 'priority', 'role'].map((name) => ({ name })), mapping: { id: 'id', ra: 'ra', dec: 'dec', mag: 'mag' },
  };
}

/** Write a solution's masks.csv and slits.csv as the CLI does, read them back, and run the independent checker. */
export function checkSolution(solution: PlanSolution, profile: InstrumentProfile): Violation[] {
  const masksText = masksToCsv(solution.masks.map((m) => ({ maskId: m.mask.id, instrument: profile.id, raDeg: m.mask.raDeg, decDeg: m.mask.decDeg, paDeg: m.mask.paDeg })));
  const slitsText = slitsToCsv(solution.masks.flatMap((m) => m.slits));
  return checkOutput({
    masks: parseMasksCsv(masksText, 'masks.csv'),
    slits: parseSlitsCsv(slitsText, 'slits.csv'),
    profileFor: (id) => (id === profile.id ? profile : null),
    linesRestA: solution.plan.goals.linesA,
    vsysKms: solution.plan.galaxy.vsysKms,
  });
}
