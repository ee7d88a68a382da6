import { describe, expect, it } from 'vitest';
import { weightedIntervalScheduling, buildIntervalIndex, solveIntervalIndex } from '../../src/core/solver/intervalScheduling';
import { makeRng } from '../../src/core/numeric/random';

/** Brute force over every subset: the best total weight of pairwise compatible half-open intervals. */
function bruteForce(starts: number[], ends: number[], w: number[]): number {
  const n = starts.length;
  let best = 0;
  for (let mask = 0; mask < 1 << n; mask++) {
    let total = 0, ok = true;
    for (let i = 0; i < n && ok; i++) {
      if (!(mask & (1 << i))) continue;
      total += w[i];
      for (let j = i + 1; j < n; j++) {
        if (!(mask & (1 << j))) continue;
        if (!(ends[i] <= starts[j] || ends[j] <= starts[i])) { ok = false; break; }
      }
    }
    if (ok && total > best) best = total;
  }
  return best;
}

describe('weighted interval scheduling', () => {
  it('equals brute force on 3000 small random cases (slit-like equal lengths and mixed lengths, ties included)', () => {
    const rng = makeRng('wis-brute');
    for (let c = 0; c < 3000; c++) {
      const n = 1 + rng.int(11);
      const equal = c % 2 === 0;
      const starts: number[] = [], ends: number[] = [], w: number[] = [];
      for (let i = 0; i < n; i++) {
        // Coarse grid positions so that touching intervals (end == start) happen often.
        const y = rng.int(40) * 0.5;
        const len = equal ? 5.5 : 0.5 + rng.int(12) * 0.5;
        starts.push(y); ends.push(y + len);
        w.push(rng.int(4) === 0 ? rng.int(5) : Math.round(rng.uniform(0.1, 5) * 100) / 100);
      }
      const r = weightedIntervalScheduling(starts, ends, w);
      expect(r.total).toBeCloseTo(bruteForce(starts, ends, w), 9);
      // The chosen set is feasible and adds up to the total.
      let sum = 0;
      for (const i of r.chosen) sum += w[i];
      expect(sum).toBeCloseTo(r.total, 9);
      for (let a = 0; a < r.chosen.length; a++) for (let b = a + 1; b < r.chosen.length; b++) {
        const i = r.chosen[a], j = r.chosen[b];
        expect(ends[i] <= starts[j] || ends[j] <= starts[i]).toBe(true);
      }
      expect(r.chosen.every((i) => w[i] > 0)).toBe(true);
    }
  });

  it('reuses one index for many weight vectors (as the joint allocation does)', () => {
    const rng = makeRng('wis-reuse');
    const n = 10;
    const starts = Array.from({ length: n }, () => rng.uniform(0, 30));
    const ends = starts.map((s) => s + 6);
    const index = buildIntervalIndex(starts, ends);
    for (let k = 0; k < 200; k++) {
      const w = Array.from({ length: n }, () => rng.uniform(-1, 3));
      expect(solveIntervalIndex(index, w).total).toBeCloseTo(bruteForce(starts, ends, w.map((x) => Math.max(0, x))), 9);
    }
  });

  it('orders by (end, index) and counts the ends at or before each start, with ties, signed zeros, infinities and mixed lengths', () => {
    const rng = makeRng('wis-index-order');
    for (let c = 0; c < 300; c++) {
      const n = rng.int(30);
      const starts: number[] = [], ends: number[] = [];
      for (let i = 0; i < n; i++) {
        const s = c % 5 === 0 && rng.int(4) === 0 ? -0 : rng.int(20) * 0.5 - 3;
        starts.push(s);
        ends.push(c % 7 === 0 && rng.int(9) === 0 ? Infinity : s + (c % 2 ? 3 : 0.5 + rng.int(8) * 0.5));
      }
      if (c % 5 === 0 && n > 0) ends[rng.int(n)] = 0;
      const { order, pred } = buildIntervalIndex(starts, ends);
      const expected = Array.from({ length: n }, (_, i) => i).sort((a, b) => ends[a] - ends[b] || a - b);
      expect(Array.from(order)).toEqual(expected);
      for (let k = 0; k < n; k++) {
        let count = 0;
        for (let j = 0; j < k; j++) if (ends[order[j]] <= starts[order[k]]) count++;
        expect(pred[k]).toBe(count);
      }
    }
  });

  it('takes the heavier of two overlapping slits and both of two that just touch', () => {
    expect(weightedIntervalScheduling([0, 3], [5, 8], [1, 2]).chosen).toEqual([1]);
    expect(weightedIntervalScheduling([0, 5], [5, 10], [1, 2]).chosen).toEqual([0, 1]);
    expect(weightedIntervalScheduling([], [], []).total).toBe(0);
  });
});

describe('optimum without each interval', () => {
  it('equals re-solving with that interval removed, on 1500 small random cases', async () => {
    const { optimumWithoutEach } = await import('../../src/core/solver/intervalScheduling');
    const rng = makeRng('wis-without');
    for (let c = 0; c < 1500; c++) {
      const n = 1 + rng.int(12);
      const starts: number[] = [], ends: number[] = [], w: number[] = [];
      for (let i = 0; i < n; i++) {
        const y = rng.int(40) * 0.5;
        starts.push(y); ends.push(y + (c % 2 ? 5.5 : 0.5 + rng.int(12) * 0.5));
        w.push(rng.int(5) === 0 ? 0 : Math.round(rng.uniform(0.1, 5) * 100) / 100);
      }
      const index = buildIntervalIndex(starts, ends);
      const got = optimumWithoutEach(index, starts, ends, w);
      // Asking for a subset gives the same figures for the subset (NaN elsewhere).
      const only = Array.from({ length: n }, (_, i) => i).filter((i) => (i + c) % 3 === 0);
      const some = optimumWithoutEach(index, starts, ends, w, only);
      for (let i = 0; i < n; i++) {
        const wi = w.slice();
        wi[i] = 0;
        expect(got[i]).toBeCloseTo(bruteForce(starts, ends, wi), 9);
        if (only.includes(i)) expect(some[i]).toBe(got[i]);
        else expect(some[i]).toBeNaN();
      }
    }
  });
});
