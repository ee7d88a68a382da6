import { describe, expect, it } from 'vitest';
import { targetWeights, weighPlanTargets, solvePlan } from '../../src/core/pipeline/pipeline';
import { coverageSummaryLines, excludedTargetsCsv } from '../../src/core/pipeline/summary';
import { scenario } from '../search/helpers';

describe('weighting inside the pipeline', () => {
  it('without a weighting section every tracer weighs its priority or 1; with one, the formula', () => {
    const plain = scenario({ seed: 2, candidates: 300 }, (p) => { delete p.weighting; });
    const w = targetWeights(plain.plan, plain.catalog.targets, []);
    plain.catalog.targets.forEach((t, i) => expect(w[i]).toBe(1));
    const ruled = scenario({ seed: 2, candidates: 300 });
    const w2 = targetWeights(ruled.plan, ruled.catalog.targets, []);
    expect(new Set(Array.from(w2).filter((v) => v > 0 && v !== 1)).size).toBeGreaterThan(10);
    // Excluded rows weigh 0 and are listed, kept ones weigh > 0: every row is accounted for.
    const r = weighPlanTargets(ruled.plan, ruled.catalog.targets);
    const excluded = new Set(r.excluded.map((e) => e.id));
    ruled.catalog.targets.forEach((t, i) => expect(w2[i] === 0).toBe(excluded.has(t.id)));
  });

  it('each row gets the weight of its own kept entry, whether the kept list comes in catalog order or not', () => {
    const ruled = scenario({ seed: 5, candidates: 400 });
    const r = weighPlanTargets(ruled.plan, ruled.catalog.targets);
    const inOrder = targetWeights(ruled.plan, ruled.catalog.targets, [], r);
    const shuffled = targetWeights(ruled.plan, ruled.catalog.targets, [], { ...r, targets: r.targets.slice().reverse() });
    expect(Array.from(shuffled)).toEqual(Array.from(inOrder));
    const byId = new Map(r.targets.map((t) => [t.id, t]));
    ruled.catalog.targets.forEach((t, i) => {
      const k = byId.get(t.id);
      expect(inOrder[i]).toBe(k ? (t.role === 'alignment' ? 1 : k.weight) : 0);
    });
  });

  it('overrides: weight replaces, force out zeroes, force in adds the total of all others', () => {
    const x = scenario({ seed: 2, candidates: 200 }, (p) => { delete p.weighting; });
    const [a, b, c] = x.catalog.targets.filter((t) => t.role === 'tracer');
    x.plan.targetOverrides = { [a.id]: { weight: 7 }, [b.id]: { force: 'out' }, [c.id]: { force: 'in' }, nosuch: { weight: 2 } };
    const warnings: string[] = [];
    const w = targetWeights(x.plan, x.catalog.targets, warnings);
    const idx = (id: string) => x.catalog.targets.findIndex((t) => t.id === id);
    expect(w[idx(a.id)]).toBe(7);
    expect(w[idx(b.id)]).toBe(0);
    const others = Array.from(w).reduce((s, v) => s + v, 0) - w[idx(c.id)];
    expect(w[idx(c.id)]).toBeCloseTo(1 + (others + 1), 9);
    expect(warnings.some((m) => m.includes('"nosuch"'))).toBe(true);
  });

  it('the plain-text summary names the rules, the exclusions, the search and the coverage per role', () => {
    const x = scenario({ seed: 8, candidates: 800 }, (p) => { p.weighting.exclusions = [{ label: 'blob', xiArcsec: 0, etaArcsec: 0, radiusArcsec: 30 }]; });
    const sol = solvePlan(x);
    const text = coverageSummaryLines(sol).join('\n');
    expect(text).toContain('exclusion region "blob"');
    expect(text).toMatch(/\d+ by exclusion:blob/);
    expect(text).toMatch(/pointing search: objective [\d.]+ against (at most )?[\d.]+ for the naive starting layout/);
    expect(text).toMatch(/tracer: \d+ slits, reach [\d.]+ Re \(goal 10 Re/);
    expect(text).toContain('per 45-deg sector from the major axis');
    const csv = excludedTargetsCsv(sol.weighting).trim().split('\n');
    expect(csv.length - 1).toBe(sol.weighting.excluded.length);
    expect(csv.filter((l) => l.includes('exclusion:blob')).length).toBeGreaterThan(0);
  });
});

describe('exclusion regions in a solved plan', () => {
  it('no excluded target, tracer or alignment star, appears on any mask', () => {
    // Regions over the galaxy centre (where the masks of any layout overlap) and around three alignment stars.
    const probe = scenario({ seed: 12, candidates: 900 });
    const stars = probe.catalog.targets.filter((t) => t.role === 'alignment').slice(0, 3);
    const x = scenario({ seed: 12, candidates: 900 }, (p) => {
      p.weighting.exclusions = [{ label: 'core', xiArcsec: 0, etaArcsec: 0, radiusArcsec: 200 }, ...stars.map((t) => ({ label: 'core', ra: t.raDeg, dec: t.decDeg, radiusArcsec: 30 }))];
      p.search = { levels: 1, passes: 1 };
    });
    const sol = solvePlan(x);
    const excluded = new Set(sol.weighting.excluded.map((e) => e.id));
    expect([...sol.weighting.excluded].some((e) => e.role === 'alignment' && e.rule === 'exclusion:core')).toBe(true);
    const used = sol.masks.flatMap((m) => m.slits.map((s) => s.objectId));
    expect(used.filter((id) => excluded.has(id))).toEqual([]);
  });
});
