/**
 * The editor's live re-solve of one dragged mask in a plan with several spectrographs (src/editor/worker/liveSolve.ts):
 * with no mask moved it equals the pipeline's solve of the same locked plan; along a drag every preview passes the
 * independent checker with each mask against its own profile, the moved mask keeps its own footprint and rules, and
 * the other masks keep their slits.
 */
import { describe, expect, it } from 'vitest';
import { liveSolve, resetLiveSolve } from '../../src/editor/worker/liveSolve';
import { parsePlan } from '../../src/core/plan/validate';
import { solvePlan } from '../../src/core/pipeline/pipeline';
import { checkOutput } from '../../src/core/check/checkOutput';
import { mixedScenario } from '../../src/core/scenario/mixedScenario';
import { scenarioCatalog } from '../../src/core/scenario/generator';
import { polygonBounds } from '../../src/core/geometry/polygon';
import type { PlanFile } from '../../src/core/plan/schema';
import type { SolveResult } from '../../src/editor/worker/protocol';
import { shippedProfile } from './mixedCase';

const narrow = shippedProfile('ridge10-narrow'), wide = shippedProfile('broad65-wide');
const profiles = { 'ridge10-narrow': narrow, 'broad65-wide': wide };
const scenario = mixedScenario({ seed: 17, candidates: 1500 }, [{ profile: narrow, masks: 2 }, { profile: wide, masks: 2 }]);
const plan0 = parsePlan({ ...scenario.plan, search: { seed: 3, levels: 1, passes: 1 } });
const catalog = scenarioCatalog(scenario);
const solved = solvePlan({ plan: plan0, profile: narrow, catalog, profiles }, { skipObservingReport: true }).plan;
const locked: PlanFile = { ...solved, masks: solved.masks!.map((m) => ({ ...m, locked: true })) };
const byId = new Map(Object.values(profiles).map((p) => [p.id, p]));

function violations(r: SolveResult) {
  return checkOutput({
    masks: r.masks.map((m) => ({ maskId: m.mask.id, instrument: m.mask.instrument ?? '', raDeg: m.mask.raDeg, decDeg: m.mask.decDeg, paDeg: m.mask.paDeg })),
    slits: r.masks.flatMap((m) => m.slits),
    profileFor: (id) => byId.get(id) ?? null,
    linesRestA: plan0.goals.linesA,
    vsysKms: plan0.galaxy.vsysKms,
  });
}

/** Largest |x| (along dispersion) of any slit centre on a mask: bounded by its own footprint's half-width. */
const maxAbsX = (r: SolveResult, k: number) => Math.max(...r.masks[k].slits.map((s) => Math.abs(s.xArcsec)));

describe('live re-solve of a dragged mask in a plan with several spectrographs', () => {
  it('with no mask moved, gives the pipeline slits of the same (all locked) plan, each mask on its own instrument', () => {
    expect(new Set(locked.masks!.map((m) => m.instrument))).toStrictEqual(new Set(['ridge10-narrow', 'broad65-wide']));
    resetLiveSolve();
    const live = liveSolve(locked, narrow, catalog, {}, profiles);
    const full = solvePlan({ plan: locked, profile: narrow, catalog, profiles }, { skipObservingReport: true });
    expect(live.masks).toStrictEqual(full.masks);
    expect(live.coverage).toStrictEqual(full.coverage);
    expect(live.masks.map((m) => m.mask.instrument)).toStrictEqual(locked.masks!.map((m) => m.instrument));
    expect(live.plan.masks!.map((m) => m.instrument)).toStrictEqual(locked.masks!.map((m) => m.instrument));
  });

  it('every preview along a drag of a wide-field mask passes the checker against each mask\'s own profile', () => {
    resetLiveSolve();
    const inputs = {};
    const first = liveSolve(locked, narrow, catalog, inputs, profiles);
    const k = locked.masks!.findIndex((m) => m.instrument === 'broad65-wide');
    const m0 = locked.masks![k];
    const wideHalfX = polygonBounds(wide.footprint).maxX, narrowHalfX = polygonBounds(narrow.footprint).maxX;
    expect(wideHalfX).toBeGreaterThan(narrowHalfX);
    const yields = new Set<number>();
    for (let step = 1; step <= 8; step++) {
      const masks = locked.masks!.map((m, i) => (i === k ? { ...m, raDeg: m0.raDeg! + 0.003 * step, decDeg: m0.decDeg! - 0.002 * step, paDeg: (m0.paDeg! + 9 * step) % 360 } : m));
      const r = liveSolve({ ...locked, masks }, narrow, catalog, inputs, profiles);
      expect(violations(r), `step ${step}`).toStrictEqual([]);
      expect(r.extra.preview).toBe(true);
      expect(r.masks[k].mask.instrument).toBe('broad65-wide');
      expect(r.masks[k].mask.raDeg).toBeCloseTo(m0.raDeg! + 0.003 * step, 12);
      // The moved wide-field mask still uses its whole (wider) field: slits beyond the narrow field's half-width.
      expect(maxAbsX(r, k)).toBeGreaterThan(narrowHalfX);
      // The other masks are the very objects of the first result: only the moved mask is re-solved.
      for (let i = 0; i < r.masks.length; i++) if (i !== k) expect(r.masks[i]).toBe(first.masks[i]);
      yields.add(r.masks[k].slits.filter((s) => s.role === 'tracer').length);
    }
    expect(yields.size).toBeGreaterThan(1);
  });

  it('a mask given another instrument rebuilds the contexts: the live result then equals the pipeline again', () => {
    resetLiveSolve();
    const inputs = {};
    liveSolve(locked, narrow, catalog, inputs, profiles);
    // Swap the instruments of one narrow and one wide mask: the counts stay 2 + 2, the masks' footprints change.
    const a = locked.masks!.findIndex((m) => m.instrument === 'ridge10-narrow');
    const b = locked.masks!.findIndex((m) => m.instrument === 'broad65-wide');
    const masks = locked.masks!.map((m, i) => (i === a ? { ...m, instrument: 'broad65-wide' } : i === b ? { ...m, instrument: 'ridge10-narrow' } : m));
    const swapped = { ...locked, masks };
    const live = liveSolve(swapped, narrow, catalog, inputs, profiles);
    const full = solvePlan({ plan: swapped, profile: narrow, catalog, profiles }, { skipObservingReport: true });
    expect(live.masks).toStrictEqual(full.masks);
    expect(live.masks[a].mask.instrument).toBe('broad65-wide');
    expect(violations(live)).toStrictEqual([]);
  });
});
