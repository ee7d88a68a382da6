import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { alignmentSpreadScore, chooseAlignmentBoxes, convexHullAreaArcsec2, type AlignmentCandidate } from '../../src/core/solver/alignment';
import { lengthenSlits } from '../../src/core/solver/lengthen';
import { rectInPolygon, type Corner } from '../../src/core/geometry/polygon';
import { makeRng } from '../../src/core/numeric/random';

const cand = (object: number, x: number, y: number): AlignmentCandidate => ({ object, xArcsec: x, yArcsec: y });

describe('alignment boxes', () => {
  it('hull area of a right triangle with legs 3 and 4 is 6 (closed form)', () => {
    expect(convexHullAreaArcsec2([[0, 0], [3, 0], [0, 4], [1, 1]])).toBe(6);
  });

  it('picks the set spread in both x and y, not a clump or a line', () => {
    const cs = [cand(0, -100, -100), cand(1, 100, -90), cand(2, 0, 100), cand(3, 1, 2), cand(4, 3, 5), cand(5, 5, 8), cand(6, 0, -60), cand(7, 0, 60)];
    const r = chooseAlignmentBoxes(cs, 3, 4);
    expect(r.ok).toBe(true);
    expect(r.chosen.map((c) => c.object).sort()).toEqual([0, 1, 2]);
  });

  it('reaches the best spread of all triples on small random sets (brute force), keeping boxes apart in y', () => {
    const rng = makeRng('align');
    for (let c = 0; c < 300; c++) {
      const n = 3 + rng.int(6);
      const cs = Array.from({ length: n }, (_, i) => cand(i, rng.uniform(-100, 100), rng.uniform(-100, 100)));
      const sep = 6;
      let best = -1;
      for (let a = 0; a < n; a++) for (let b = a + 1; b < n; b++) for (let d = b + 1; d < n; d++) {
        const set = [cs[a], cs[b], cs[d]];
        if (set.some((p, i) => set.some((q, j) => i < j && Math.abs(p.yArcsec - q.yArcsec) < sep))) continue;
        best = Math.max(best, alignmentSpreadScore(set));
      }
      const r = chooseAlignmentBoxes(cs, 3, sep);
      if (best < 0) { expect(r.ok).toBe(false); continue; }
      expect(r.ok).toBe(true);
      for (let i = 0; i < r.chosen.length; i++) for (let j = i + 1; j < r.chosen.length; j++) expect(Math.abs(r.chosen[i].yArcsec - r.chosen[j].yArcsec)).toBeGreaterThanOrEqual(sep);
      // Swap search is a local optimum; on sets this small it should be within 10 % of the best triple.
      expect(alignmentSpreadScore(r.chosen)).toBeGreaterThanOrEqual(0.9 * best);
    }
  });

  it('says how many were found against how many are needed', () => {
    const r = chooseAlignmentBoxes([cand(0, 0, 0), cand(1, 10, 1), cand(2, 20, 50)], 3, 5);
    expect(r).toMatchObject({ ok: false, available: 3, compatibleMax: 2 });
  });
});

describe('slit lengthening', () => {
  const fp: Corner[] = [[-60, -100], [60, -100], [60, 70], [10, 70], [10, 100], [-60, 100]]; // notch top right
  it('keeps the gap, the footprint and the minimal halves on random masks (property)', () => {
    fc.assert(fc.property(fc.integer({ min: 1, max: 1e9 }), (seed) => {
      const rng = makeRng(seed);
      const L = 4, g = 1, w = 1;
      // Random minimal slits obeying the gap rule, plus fixed boxes.
      const rows: { xArcsec: number; yArcsec: number; lenBelowArcsec: number; lenAboveArcsec: number; widthArcsec: number; fixed: boolean }[] = [];
      let top = -100 - g + rng.uniform(0, 5); // top of the previous row (y), so that every new row keeps the gap
      for (;;) {
        const box = rng.next() < 0.15;
        const half = box ? 1.5 : L / 2;
        const y = top + g + half + rng.uniform(0, 12);
        if (y + half > 100) break;
        const x = rng.uniform(-55, box ? 5 : 55);
        if (rectInPolygon(x - (box ? 1.5 : w / 2), x + (box ? 1.5 : w / 2), y - half, y + half, fp)) {
          rows.push({ xArcsec: x, yArcsec: y, lenBelowArcsec: half, lenAboveArcsec: half, widthArcsec: box ? 3 : w, fixed: box });
          top = y + half;
        }
      }
      const cap = rng.next() < 0.5 ? undefined : rng.uniform(L, 30);
      const out = lengthenSlits(rows, { footprint: fp, gapArcsec: g, maxLengthArcsec: cap });
      const sorted = [...out].sort((a, b) => a.yArcsec - b.yArcsec);
      for (let i = 0; i < sorted.length; i++) {
        const r = sorted[i];
        const orig = rows[out.indexOf(r)];
        if (r.fixed) expect([r.lenBelowArcsec, r.lenAboveArcsec]).toEqual([orig.lenBelowArcsec, orig.lenAboveArcsec]);
        expect(r.lenBelowArcsec).toBeGreaterThanOrEqual(orig.lenBelowArcsec);
        expect(r.lenAboveArcsec).toBeGreaterThanOrEqual(orig.lenAboveArcsec);
        if (cap !== undefined && !r.fixed) expect(Math.max(r.lenBelowArcsec, r.lenAboveArcsec)).toBeLessThanOrEqual(Math.max(cap / 2, L / 2) + 1e-9);
        expect(rectInPolygon(r.xArcsec - r.widthArcsec / 2, r.xArcsec + r.widthArcsec / 2, r.yArcsec - r.lenBelowArcsec, r.yArcsec + r.lenAboveArcsec, fp)).toBe(true);
        if (i > 0) {
          const p = sorted[i - 1];
          expect(r.yArcsec - r.lenBelowArcsec - (p.yArcsec + p.lenAboveArcsec)).toBeGreaterThanOrEqual(g);
        }
      }
    }), { numRuns: 300 });
  });

  it('gives the whole free space to one side when the other cannot grow (asymmetric)', () => {
    // A box at y = 0 (fixed) and a slit at y = 10: the 10 - 1.5 - 2 - 1 = 5.5 arcsec clear all go to the slit below it.
    const out = lengthenSlits([
      { xArcsec: 0, yArcsec: 0, lenBelowArcsec: 1.5, lenAboveArcsec: 1.5, widthArcsec: 3, fixed: true },
      { xArcsec: 0, yArcsec: 10, lenBelowArcsec: 2, lenAboveArcsec: 2, widthArcsec: 1, fixed: false },
    ], { footprint: [[-50, -50], [50, -50], [50, 50], [-50, 50]], gapArcsec: 1 });
    expect(out[1].lenBelowArcsec).toBeCloseTo(7.5, 5);
    expect(out[1].lenAboveArcsec).toBeCloseTo(40, 5); // up to the top edge at 50
    expect(out[0].lenBelowArcsec).toBe(1.5);
  });
});
