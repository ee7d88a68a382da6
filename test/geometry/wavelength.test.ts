import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { detectorPixel, linesUsableAtX, observedWavelengthA, pixelUsable, SPEED_OF_LIGHT_KMS, usableXIntervalsArcsec } from '../../src/core/geometry/wavelength';

const detector = { pixels: 4096, dispersionAPerPixel: 0.4, centralWavelengthA: 8500, xArcsecPerPixel: 0.16, gapsPixels: [[2040, 2100]] as [number, number][], edgeMarginPixels: 15 };

describe('wavelength rule (contract: p = pixels/2 + x/xArcsecPerPixel + (L - centralWavelengthA)/dispersionAPerPixel)', () => {
  it('redshifts by (1 + v/c) with c = 299792.458 km/s (SI definition)', () => {
    expect(SPEED_OF_LIGHT_KMS).toBe(299792.458);
    // 1500 km/s: 8542.1 * (1 + 1500/299792.458) = 8584.840... (computed by hand: 8542.1 * 0.0050035 = 42.740)
    expect(observedWavelengthA(8542.1, 1500)).toBeCloseTo(8542.1 + (8542.1 * 1500) / 299792.458, 10);
    expect(observedWavelengthA(8542.1, 1500)).toBeCloseTo(8584.840, 2);
    expect(observedWavelengthA(8000, 0)).toBe(8000);
  });

  it('puts the central wavelength of a slit at x = 0 on the middle pixel, and moves 1 pixel per xArcsecPerPixel', () => {
    expect(detectorPixel(detector, 0, 8500)).toBe(2048);
    expect(detectorPixel(detector, 0.16, 8500)).toBeCloseTo(2049, 12);
    expect(detectorPixel(detector, 0, 8500.4)).toBeCloseTo(2049, 9);
  });

  it('honours the edge margins and keeps lines at least the margin away from the gap', () => {
    expect(pixelUsable(detector, 15)).toBe(true);
    expect(pixelUsable(detector, 14.9)).toBe(false);
    expect(pixelUsable(detector, 4081)).toBe(true);
    expect(pixelUsable(detector, 4081.1)).toBe(false);
    expect(pixelUsable(detector, 2025)).toBe(true); // 2040 - 15
    expect(pixelUsable(detector, 2025.1)).toBe(false);
    expect(pixelUsable(detector, 2070)).toBe(false);
    expect(pixelUsable(detector, 2115)).toBe(true); // 2100 + 15
  });

  it('the usable x intervals agree with the rule applied line by line at random x (property)', () => {
    const lines = [8498.0, 8542.1, 8662.1].map((l) => observedWavelengthA(l, 1200));
    const iv = usableXIntervalsArcsec(detector, lines);
    expect(iv.length).toBeGreaterThan(0);
    fc.assert(fc.property(fc.double({ min: -400, max: 400, noNaN: true }), (x) => {
      const inIv = iv.some(([a, b]) => x >= a && x <= b);
      return inIv === linesUsableAtX(detector, x, lines);
    }), { numRuns: 5000 });
  });
});
