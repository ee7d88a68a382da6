import { describe, expect, it } from 'vitest';
import { altitudeForAirmassDeg, hardieAirmass, secZAirmass, zenithForHardieAirmassDeg } from '../../src/core/observe/airmass';

describe('airmass', () => {
  it('Hardie (1962) at z = 60 deg is 1.9945 (sec z = 2: 2 - 0.0018167 - 0.002875 - 0.0008083, closed form)', () => {
    expect(hardieAirmass(60)).toBeCloseTo(1.9945, 4);
    expect(secZAirmass(60)).toBeCloseTo(2, 12);
  });

  it('is 1 at the zenith, a little below sec z elsewhere, and null near/below the horizon', () => {
    expect(hardieAirmass(0)).toBe(1);
    for (const z of [10, 30, 45, 70, 80, 85]) expect(hardieAirmass(z)!).toBeLessThan(secZAirmass(z)!);
    expect(hardieAirmass(88)).toBeNull();
    expect(hardieAirmass(95)).toBeNull();
  });

  it('increases monotonically with z up to the reporting limit', () => {
    let prev = 0;
    for (let z = 0; z < 87; z += 0.5) {
      const x = hardieAirmass(z)!;
      expect(x).toBeGreaterThan(prev);
      prev = x;
    }
  });

  it('inverts: the zenith distance for an airmass gives that airmass back', () => {
    for (const x of [1, 1.2, 1.5, 2, 3, 5]) expect(hardieAirmass(zenithForHardieAirmassDeg(x))!).toBeCloseTo(x, 9);
    expect(altitudeForAirmassDeg(1.9945)).toBeCloseTo(30, 3);
    expect(() => zenithForHardieAirmassDeg(0.5)).toThrow(/at least 1/);
  });
});
