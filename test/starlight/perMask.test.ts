// The per-mask starlight step (placeStarlightOnMask, used by the editor while a mask is dragged) is the same
// computation as the whole-plan stage (placeStarlightAndSky): for a mask alone, and, without the tracer trade,
// for each mask of a plan given the cells the masks before it hold.
import { describe, expect, it } from 'vitest';
import { solvePlan } from '../../src/core/plan/pipeline';
import { placeStarlightAndSky, placeStarlightOnMask, starlightStage, starlightTaken, type StarlightTrade } from '../../src/core/solver/starlight';
import type { MaskSolution } from '../../src/core/solver/types';
import { scenario } from '../search/helpers';

describe('starlight and sky slits on one mask', () => {
  const x = scenario({ seed: 21, candidates: 1200 });
  const sol = solvePlan(x);
  // The stage's input: the masks with tracer slits and alignment boxes only (starlight and sky rows removed).
  const base: MaskSolution[] = sol.masks.map((m) => ({ ...m, slits: m.slits.filter((r) => r.role === 'tracer' || r.role === 'alignment') }));
  // A trade generous enough that starlight slits displace tracers (so that branch is exercised too).
  const generous: StarlightTrade = { unitWeight: 50, aStarlightBin: 2, aStarlightReach: 3 };

  it('alone, equals the whole-plan stage run on that mask, with and without the tracer trade', () => {
    let displaced = 0;
    for (const trade of [undefined, generous]) {
      const stage = starlightStage(sol.galaxy, x.profile, x.plan, trade);
      for (const ms of base) {
        const whole = placeStarlightAndSky([ms], sol.galaxy, x.profile, x.plan, trade);
        const one = placeStarlightOnMask(stage, ms);
        expect(one.mask).toStrictEqual(whole.masks[0]);
        expect(one.warnings).toStrictEqual(whole.warnings);
        if (trade) displaced += ms.slits.filter((r) => r.role === 'tracer').length - one.mask.slits.filter((r) => r.role === 'tracer').length;
      }
    }
    // The generous trade did give tracer slits away somewhere (else the second pass proved nothing about it).
    expect(displaced).toBeGreaterThan(0);
  });

  it('without the trade, mask i given the cells of masks 0..i-1 equals mask i of the whole-plan stage', () => {
    const whole = placeStarlightAndSky(base, sol.galaxy, x.profile, x.plan);
    const stage = starlightStage(sol.galaxy, x.profile, x.plan);
    expect(whole.masks.length).toBeGreaterThan(1);
    for (let i = 0; i < base.length; i++) {
      const one = placeStarlightOnMask(stage, base[i], starlightTaken(stage, whole.masks.slice(0, i)));
      expect(one.mask, `mask ${base[i].mask.id}`).toStrictEqual(whole.masks[i]);
    }
    // Starlight slits exist, so the cells handed on were not all empty.
    expect(whole.masks.slice(0, -1).some((m) => m.slits.some((r) => r.role === 'starlight'))).toBe(true);
  });

  it('the taken coverage is read back from the starlight rows: cells, bins and reach of the whole-plan stage', () => {
    const stage = starlightStage(sol.galaxy, x.profile, x.plan);
    const whole = placeStarlightAndSky(base, sol.galaxy, x.profile, x.plan);
    const t = starlightTaken(stage, whole.masks);
    const rows = whole.masks.flatMap((m) => m.slits.filter((r) => r.role === 'starlight'));
    expect(t.cells.size).toBeGreaterThan(0);
    expect(t.cells.size).toBeLessThanOrEqual(rows.length);
    for (const b of t.bins) expect(b).toBeLessThan(stage.s.maxRe);
    expect(t.reachRe).toBeGreaterThan(0);
    expect(t.reachRe).toBeLessThanOrEqual(stage.s.maxRe + 1e-9);
    expect(Math.max(...t.bins)).toBe(Math.floor(t.reachRe));
  });
});
