/** Resolving power, instrumental dispersion, night-sky OH flags and usable x ranges of the spectral report. */
import { describe, expect, it } from 'vitest';
import { slitResolution } from '../../src/core/spectro/resolution';
import { OH_LINES_A, skyLineHits } from '../../src/core/spectro/nightSkyLines';
import { spectralReport, spectralSummaryLines } from '../../src/core/spectro/spectralReport';
import { parseProfile } from '../../src/core/profile/load';

const c = 299792.458; // km/s, SI definition

describe('instrument resolution from slit width and dispersion (common practice: resolution element = slit image x dispersion)', () => {
  it('a 1" slit at 0.16"/px and 0.4 A/px: 6.25 px = 2.5 A FWHM; R = 8542.1/2.5 = 3416.8; sigma = c / (R 2 sqrt(2 ln 2)) = 37.26 km/s', () => {
    const r = slitResolution({ dispersionAPerPixel: 0.4, xArcsecPerPixel: 0.16 }, 1, 8542.1);
    expect(r.fwhmPixels).toBeCloseTo(6.25, 12);
    expect(r.fwhmA).toBeCloseTo(2.5, 12);
    expect(r.resolvingPower).toBeCloseTo(3416.84, 2);
    // Gaussian FWHM = 2.35482 sigma (exact: 2 sqrt(2 ln 2)); 299792.458 / 3416.84 / 2.35482 = 37.260 km/s (by hand)
    expect(r.sigmaKms).toBeCloseTo(37.26, 2);
  });
  it('a slit narrower than 2 pixels is limited by sampling (Nyquist): 2 px', () => {
    const r = slitResolution({ dispersionAPerPixel: 0.4, xArcsecPerPixel: 0.5 }, 0.5, 8500);
    expect(r.fwhmPixels).toBe(2);
    expect(r.fwhmA).toBeCloseTo(0.8, 12);
  });
});

describe('night-sky OH lines on the redshifted lines (Osterbrock et al. 1996, PASP 108, 277; 1997, PASP 109, 614)', () => {
  it('carries the published wavelengths near the calcium triplet, and 8520-8760 A is clean', () => {
    expect(OH_LINES_A).toContain(8505.054);
    expect(OH_LINES_A).toContain(8776.294);
    expect(OH_LINES_A.filter((l) => l > 8520 && l < 8760)).toEqual([]);
  });
  it('8498.0 A lands on the 8505.054 A OH line at v = c (8505.054/8498 - 1) = 248.85 km/s, within +- one FWHM', () => {
    const hits = skyLineHits([8498.0], 250, 500, 2.5).filter((h) => h.skyLineA === 8505.054);
    expect(hits).toHaveLength(1);
    const centre = c * (8505.054 / 8498 - 1);
    expect(centre).toBeCloseTo(248.85, 2); // 7.054 / 8498 = 8.3008e-4, times c
    // +- 2.5 A is +- 2.5/8498 c = +- 88.2 km/s
    expect(hits[0].fromKms).toBeCloseTo(centre - (2.5 / 8498) * c, 6);
    expect(hits[0].toKms).toBeCloseTo(centre + (2.5 / 8498) * c, 6);
    // Far from it the line is clean: at v_sys = 1200 +- 500 km/s 8542.1 A moves over 8562-8591 A.
    expect(skyLineHits([8542.1], 1200, 500, 2.5)).toEqual([]);
    // The flagged stretch is clipped to the velocity range.
    const clipped = skyLineHits([8498.0], 0, 200, 2.5).find((h) => h.skyLineA === 8505.054)!;
    expect(clipped.toKms).toBe(200);
  });
});

describe('spectral report of a plan', () => {
  const profile = parseProfile({
    id: 'spec-test', label: 'spectral report test profile', telescope: { apertureM: 8 },
    site: { latDeg: -30, lonDeg: -70, elevationM: 2400, pressureHPa: 760, temperatureC: 8, relativeHumidity: 0.3 },
    footprint: [[-100, -50], [100, -50], [100, 50], [-100, 50]],
    slits: { minLengthArcsec: 4, gapArcsec: 1, widthArcsec: 1, maxTiltDeg: 20 },
    alignment: { boxSizeArcsec: 3, minCount: 2, magRange: [15, 19] },
    // p = 1000 + 10 x + (L - 8600): no gap, margin 10.
    detector: { pixels: 2000, dispersionAPerPixel: 1, centralWavelengthA: 8600, xArcsecPerPixel: 0.1, gapsPixels: [], edgeMarginPixels: 10 },
  });
  const plan = { galaxy: { vsysKms: 0 } as never, goals: { masks: 1, tracerReachRe: 10, starlightReachRe: 0, linesA: [8500] } };
  it('usable x: the window 8475.82-8524.18 A must stay in pixels [10, 1990] (computed by hand from the contract)', () => {
    // 875.82 + 10x >= 10 -> x >= -86.582; 924.18 + 10x <= 1990 -> x >= ... <= 106.58 (beyond the footprint's 100).
    const r = spectralReport(plan, profile, ['a', 'b']);
    expect(r.masks).toHaveLength(2);
    const [[lo, hi]] = r.masks[0].intervalsArcsec;
    expect(lo).toBeCloseTo(-86.582, 2);
    expect(hi).toBe(100);
    expect(r.masks[0].usableFraction).toBeCloseTo((100 + 86.582) / 200, 3);
    expect(r.lines[0].resolution.fwhmA).toBeCloseTo(10, 12); // 1" / 0.1"/px = 10 px of 1 A
    expect(r.photometry.assumed).toBe(true);
    const text = spectralSummaryLines(r).join('\n');
    expect(text).toMatch(/masks a, b: science slits usable at x = -86\.6 to 100\.0 arcsec/);
    expect(text).toMatch(/not declared; catalog magnitudes and muE taken as AB/);
  });
});
