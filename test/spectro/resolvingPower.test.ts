// Resolving power of a slit: R = lambda / delta-lambda with delta-lambda the slit's projected width in Angstrom
// (the definition used in every spectrograph manual; common practice), worked by hand below.
import { describe, expect, it } from 'vitest';
import { slitResolution } from '../../src/core/spectro/resolution';

const detector = { pixels: 4096, dispersionAPerPixel: 0.4, centralWavelengthA: 8500, xArcsecPerPixel: 0.16, gapsPixels: [], edgeMarginPixels: 10 };

describe('slit resolving power', () => {
  it('a 0.8 arcsec slit at 0.16 arcsec/px and 0.4 A/px: 5 px, 2.0 A, R = 4250 at 8500 A (by hand)', () => {
    const r = slitResolution(detector, 0.8, 8500);
    // By hand: 0.8 / 0.16 = 5 px; 5 * 0.4 = 2.0 A; 8500 / 2.0 = 4250.
    expect(r.fwhmPixels).toBeCloseTo(5, 12);
    expect(r.fwhmA).toBeCloseTo(2.0, 12);
    expect(r.resolvingPower).toBeCloseTo(4250, 9);
  });

  it('scales inversely with the slit width and linearly with the wavelength', () => {
    // A slit twice as wide halves R; the same slit at 8000 A gives 8000/8500 of R (from the definition, by hand).
    expect(slitResolution(detector, 1.6, 8500).resolvingPower).toBeCloseTo(2125, 9);
    expect(slitResolution(detector, 0.8, 8000).resolvingPower).toBeCloseTo(4000, 9);
  });

  it('an undersampled slit image (under two pixels) is limited by the two-pixel Nyquist element', () => {
    // 0.2 arcsec = 1.25 px < 2 px: delta-lambda = 2 * 0.4 = 0.8 A, R = 8500 / 0.8 = 10625 (by hand).
    const r = slitResolution(detector, 0.2, 8500);
    expect(r.fwhmPixels).toBe(2);
    expect(r.resolvingPower).toBeCloseTo(10625, 9);
  });
});
