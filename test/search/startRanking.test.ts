import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { galaxyModel } from '../../src/core/plan/validate';
import { targetWeights } from '../../src/core/pipeline/pipeline';
import { allocationContext } from '../../src/core/solver/allocateMasks';
import { leadingStarts, rankStarts, startLayouts } from '../../src/core/solver/pointingSearch';
import { instrumentsProxyModel } from '../../src/core/solver/instrumentSearch';
import { proxyModel } from '../../src/core/solver/proxyModel';
import { searchEnv } from '../../src/core/solver/searchEnv';
import { PROFILE_IDS, scenario } from './helpers';

/** Items for leadingStarts: a start value and short, an exact value reached by finishing, a ceiling at or above it. */
type Item = { st: { short: number; value: number }; ceiling: number; exact: number; finished: boolean; i: number };
const item = (short: number, exact: number, lift: number, head: number): Item => ({ st: { short, value: exact - lift }, ceiling: exact + head, exact, finished: false, i: 0 });
const finishItem = (it: Item) => { it.finished = true; it.st.value = it.exact; };
const betterStart = (t: Item['st'], s: Item['st']) => t.short < s.short || (t.short === s.short && t.value > s.value * (1 + 1e-9) + 1e-9);
/** The ranking the search made before pruning: every item finished, a stable sort of them all, the first `count`. */
const fullRanking = (items: Item[], count: number) => {
  for (const it of items) finishItem(it);
  return items.slice().sort((x, y) => (betterStart(x.st, y.st) ? -1 : betterStart(y.st, x.st) ? 1 : 0)).slice(0, count);
};
const fresh = (items: Item[]) => items.map((it, i) => ({ ...it, st: { ...it.st }, finished: false, i }));

describe('the ranking of the start layouts', () => {
  it('finishing only the items a ceiling cannot rule out gives the full ranking (random items, ties and near-ties)', () => {
    let pruned = 0;
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 0, max: 2 }), fc.constantFrom(0, 1000, 1000 * (1 + 4e-10), 2500, -300, 4000), fc.double({ min: -500, max: 500, noNaN: true }), fc.double({ min: 0, max: 400, noNaN: true }), fc.double({ min: 0, max: 300, noNaN: true }), fc.boolean()), { minLength: 1, maxLength: 9 }),
        fc.integer({ min: 1, max: 9 }),
        (specs, count) => {
          const items = specs.map(([short, level, jitter, lift, head, exactTie]) => item(short, exactTie ? level : level + jitter, lift, head));
          const got = leadingStarts(fresh(items), count, finishItem);
          const want = fullRanking(fresh(items), count);
          expect(got.map((it) => it.i)).toEqual(want.map((it) => it.i));
          // Every returned item holds its exact value.
          for (const it of got) expect(it.finished).toBe(true);
          const a = fresh(items);
          leadingStarts(a, count, finishItem);
          pruned += a.filter((it) => !it.finished).length;
        },
      ),
      { numRuns: 400, seed: 7 },
    );
    // The ceilings did spare work (else the test would not test the pruning).
    expect(pruned).toBeGreaterThan(100);
  });

  it('finishes every item when two finished values are within the tolerance without being equal', () => {
    const items = [item(0, 1000, 50, 10), item(0, 1000 * (1 + 4e-10), 50, 10), item(0, 100, 0, 5)];
    const a = fresh(items);
    leadingStarts(a, 1, finishItem);
    expect(a.every((it) => it.finished)).toBe(true);
    const b = [item(0, 1000, 50, 10), item(0, 1000, 50, 10), item(0, 100, 0, 5)];
    leadingStarts(b, 1, finishItem);
    expect(b[2].finished).toBe(false);
  });

  it('is the same with the starlight estimates of ruled-out layouts skipped as with all of them made (generated plans)', () => {
    for (const [seed, profileId, candidates] of [[3, PROFILE_IDS[0], 900], [8, PROFILE_IDS[1], 500], [21, PROFILE_IDS[2], 700], [5, PROFILE_IDS[0], 300]] as const) {
      const x = scenario({ seed, candidates, profileId });
      const galaxy = galaxyModel(x.plan);
      const ctx = allocationContext(x.profile, galaxy, x.plan.goals.linesA, x.catalog.targets, targetWeights(x.plan, x.catalog.targets, []));
      const env = searchEnv(x.plan, ctx);
      const proxy = instrumentsProxyModel(env, proxyModel);
      const starts = startLayouts(x.plan, galaxy, x.profile);
      for (const count of [1, 2, 3, 8]) {
        const fast = rankStarts(env, proxy, starts[0].pointings, starts, count);
        const all = rankStarts(env, proxy, starts[0].pointings, starts, count, false);
        expect(fast.ranked.map((r) => r.name)).toEqual(all.ranked.map((r) => r.name));
        expect(fast.ranked.map((r) => r.st)).toEqual(all.ranked.map((r) => r.st));
        expect([fast.floor, fast.crossShort, fast.evaluations]).toEqual([all.floor, all.crossShort, all.evaluations]);
        expect(fast.ranked.length).toBe(Math.min(count, starts.length));
      }
    }
  });
});
