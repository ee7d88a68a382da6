import { describe, expect, it } from 'vitest';
import { rememberLast } from '../../src/core/numeric/rememberLast';
import { offsetAtLoss, slitTransmission } from '../../src/core/observe/slitLoss';

describe('rememberLast', () => {
  it('calls f again only when the numbers change; NaN is never remembered; a throw is not remembered', () => {
    let calls = 0;
    const f = rememberLast((a: number, b: number) => { calls++; if (a < 0) throw new RangeError('negative'); return a + b; });
    expect([f(1, 2), f(1, 2), f(1, 3), f(1, 3), f(1, 2)]).toEqual([3, 3, 4, 4, 3]);
    expect(calls).toBe(3);
    f(NaN, 1); f(NaN, 1);
    expect(calls).toBe(5);
    expect(() => f(-1, 0)).toThrow(RangeError);
    expect(() => f(-1, 0)).toThrow(RangeError);
    expect(calls).toBe(7);
  });

  it('keeps a remembered function answering as the plain one when asked alternately', () => {
    // offsetAtLoss remembers its last question: alternating widths must still give each width its own offset.
    const a = offsetAtLoss(1, 0.8, 0.1), b = offsetAtLoss(1.5, 0.8, 0.1);
    expect(offsetAtLoss(1, 0.8, 0.1)).toBe(a);
    expect(offsetAtLoss(1.5, 0.8, 0.1)).toBe(b);
    expect(a).not.toBe(b);
    // At the offset found, the loss relative to a centred image is the limit asked for.
    expect(1 - slitTransmission(a, 1, 0.8) / slitTransmission(0, 1, 0.8)).toBeCloseTo(0.1, 9);
  });
});
