import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { orderByKey } from '../../src/core/solver/proxyModel';

describe('orderByKey (the proxy masks\' y order)', () => {
  it('gives the order of a stable sort by key, ties by position (random keys, many ties, one bucket)', () => {
    fc.assert(
      fc.property(fc.array(fc.oneof(fc.integer({ min: 0, max: 5 }), fc.integer({ min: 0, max: 1e9 })), { maxLength: 300 }), (list) => {
        const keys = Float64Array.from(list);
        const expected = list.map((_, i) => i).sort((a, b) => keys[a] - keys[b] || a - b);
        expect(Array.from(orderByKey(keys))).toEqual(expected);
      }),
      { numRuns: 400 },
    );
    expect(Array.from(orderByKey(new Float64Array([7, 7, 7])))).toEqual([0, 1, 2]);
    expect(orderByKey(new Float64Array(0)).length).toBe(0);
  });
});
