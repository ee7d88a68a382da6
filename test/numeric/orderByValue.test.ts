import { describe, expect, it } from 'vitest';
import { lowerBound, orderByValue } from '../../src/core/numeric/orderByValue';
import { makeRng } from '../../src/core/numeric/random';

describe('orderByValue', () => {
  it('gives the order of a sort by (value, position), with ties, signed zeros and infinities', () => {
    const rng = makeRng('order-by-value');
    for (let c = 0; c < 300; c++) {
      const n = rng.int(40);
      const values = Array.from({ length: n }, () => {
        const r = rng.int(12);
        return r === 0 ? -0 : r === 1 ? 0 : r === 2 ? Infinity : r === 3 ? -Infinity : rng.int(15) * 0.25 - 1.5;
      });
      const expected = Array.from({ length: n }, (_, i) => i).sort((a, b) => values[a] - values[b] || a - b);
      expect(Array.from(orderByValue(values)!)).toEqual(expected);
    }
  });

  it('refuses values with a NaN (no such order) and orders an empty array', () => {
    expect(orderByValue([1, NaN, 0])).toBeNull();
    expect(Array.from(orderByValue([])!)).toEqual([]);
  });

  it('lowerBound finds the first position at or above a value', () => {
    const a = Float64Array.from([-1, 0, 0, 2.5, 7]);
    expect([-2, -1, -0.5, 0, 1, 2.5, 7, 8].map((v) => lowerBound(a, v))).toEqual([0, 0, 1, 1, 3, 3, 4, 5]);
  });
});
