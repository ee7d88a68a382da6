/**
 * The indexed gap-rule test of the starlight trade (spanOverlaps in solver/starlight.ts) against the direct test of
 * every span: the same indices in the same order for random windows over random spans, disjoint (rows of a mask)
 * and overlapping (a long row across short ones), including windows that touch a span's reach exactly.
 */
import { describe, expect, it } from 'vitest';
import { spanOverlaps, type Span } from '../../src/core/solver/starlight';
import { makeRng } from '../../src/core/numeric/random';

const MARGIN = 1e-6;

/** The direct test: every span not clear of [lo, hi] by the gap (and the stage's rounding margin). */
function direct(spans: readonly Span[], gap: number, lo: number, hi: number): number[] {
  const out: number[] = [];
  spans.forEach((s, i) => {
    if (s.hi + gap + MARGIN <= lo || s.lo - gap - MARGIN >= hi) return;
    out.push(i);
  });
  return out;
}

describe('spanOverlaps', () => {
  it('lists the same spans, in the same order, as testing every span', () => {
    const rng = makeRng(7);
    let compared = 0, nonEmpty = 0;
    for (let c = 0; c < 60; c++) {
      const n = 1 + rng.int(80);
      const gap = [0, 0.5, 1.2][c % 3];
      const spans: Span[] = [];
      let y = -300;
      for (let i = 0; i < n; i++) {
        if (c % 2) {
          // Disjoint rows in y order, shuffled below (the stage's list is not sorted by y).
          y += gap + rng.uniform(0.1, 8);
          const len = rng.uniform(1, 12);
          spans.push({ lo: y, hi: y + len });
          y += len;
        } else {
          const lo = rng.uniform(-300, 300);
          spans.push({ lo, hi: lo + (rng.next() < 0.1 ? rng.uniform(50, 200) : rng.uniform(0.5, 10)) });
        }
      }
      for (let i = spans.length - 1; i > 0; i--) { const j = rng.int(i + 1); [spans[i], spans[j]] = [spans[j], spans[i]]; }
      const near = spanOverlaps(spans, gap);
      for (let k = 0; k < 200; k++) {
        const lo = rng.uniform(-320, 320), hi = lo + rng.uniform(1, 40);
        const want = direct(spans, gap, lo, hi);
        expect(near(lo, hi)).toEqual(want);
        compared++;
        if (want.length) nonEmpty++;
      }
      // Windows ending or starting exactly at a span's reach: the edge belongs to neither side (the direct test's <=, >=).
      for (const s of spans.slice(0, 5)) {
        const a = s.lo - gap - MARGIN, b = s.hi + gap + MARGIN;
        expect(near(a - 10, a)).toEqual(direct(spans, gap, a - 10, a));
        expect(near(b, b + 10)).toEqual(direct(spans, gap, b, b + 10));
      }
    }
    expect(compared).toBe(60 * 200);
    expect(nonEmpty).toBeGreaterThan(1000);
  });

  it('an empty mask has nothing near any window', () => {
    expect(spanOverlaps([], 1)(-10, 10)).toEqual([]);
  });
});
