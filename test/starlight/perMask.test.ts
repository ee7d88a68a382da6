// The per-mask starlight step (placeStarlightOnMask, used by the editor while a mask is dragged) is the same
// computation as the whole-plan stage (placeStarlightAndSky): for a mask alone, and, without the tracer trade,
// for each mask of a plan given the cells the masks before it hold.
import { describe, expect, it } from 'vitest';
import { solvePlan } from '../../src/core/pipeline/pipeline';
import { evaluateSlot, galaxyOnMask, galaxyRadiusAt, placeStarlightAndSky, placeStarlightOnMask, slitMeanMu, starlightSignalToNoise, starlightStage, starlightTaken, type GalaxyOnMask, type StarlightTrade } from '../../src/core/solver/starlight';
import { centredRectFits, wavelengthOk } from '../../src/core/profile/eligibility';
import type { MaskSolution } from '../../src/core/geometry/maskSolution';
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

describe('one slot evaluated lazily', () => {
  const x = scenario({ seed: 5, candidates: 800 });
  const sol = solvePlan(x);
  const stage = starlightStage(sol.galaxy, x.profile, x.plan);

  /** Every grid position tested first, then sorted (the plain reading of evaluateSlot's rule), as the oracle. */
  function oracle(g: GalaxyOnMask, slot: { lo: number; hi: number }, samples: number, step: number) {
    const { rules, s } = stage;
    const hw = rules.widthArcsec / 2, len = slot.hi - slot.lo, yc = 0.5 * (slot.lo + slot.hi);
    const ok: { x: number; rRe: number }[] = [];
    for (let xx = rules.bounds.minX + hw; xx <= rules.bounds.maxX - hw; xx += step) {
      if (!wavelengthOk(rules, xx)) continue;
      const rRe = galaxyRadiusAt(g, xx, yc).rArcsec / sol.galaxy.reArcsec;
      if (!(s.reachRe > 0 && Math.sqrt(sol.galaxy.axisRatio) * Math.abs(yc - g.gyArcsec) <= s.maxRe * sol.galaxy.reArcsec) || rRe > s.maxRe) continue;
      const sn = starlightSignalToNoise(slitMeanMu(g, xx, slot.lo, slot.hi, samples), len, rules.widthArcsec, s);
      if (sn >= s.targetSnPerA) ok.push({ x: xx, rRe });
    }
    ok.sort((a, b) => b.rRe - a.rRe || a.x - b.x);
    const bins = new Set<number>(), out: number[] = [];
    for (const o of ok) {
      if (bins.has(Math.floor(o.rRe)) || !centredRectFits(rules, o.x, yc, hw, len / 2)) continue;
      bins.add(Math.floor(o.rRe));
      out.push(o.x);
    }
    return out;
  }

  it('chooses the same positions as testing every position first, over windows along every mask', () => {
    let chosen = 0, windows = 0;
    for (const m of sol.masks) {
      const g = galaxyOnMask(m.mask, sol.galaxy);
      for (const L of [stage.s.slitLengthArcsec, stage.s.slitLengthArcsec / 2]) {
        for (let lo = stage.rules.bounds.minY; lo + L <= stage.rules.bounds.maxY; lo += L) {
          const slot = { lo, hi: lo + L };
          const got = evaluateSlot(g, stage.rules, slot, { ...stage.s, skyPerMask: 0 }, 3, 10).options.map((o) => o.xArcsec);
          expect(got, `mask ${m.mask.id} window ${lo.toFixed(1)}+${L}`).toStrictEqual(oracle(g, slot, 3, 10));
          chosen += got.length;
          windows++;
        }
      }
    }
    // Both kinds of window occur: some hold starlight options, some are too faint for any.
    expect(chosen).toBeGreaterThan(0);
    expect(windows).toBeGreaterThan(chosen);
  });
});
