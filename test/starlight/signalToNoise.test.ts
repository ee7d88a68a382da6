import { describe, expect, it } from 'vitest';
import {
  abPhotonFluxPerSCm2A, ccdSignalToNoise, collectingAreaCm2, electronsPerAFromMag, exposureForSignalToNoiseS,
  limitingSurfaceBrightness, pixelsPerA, signalToNoisePerA, skyElectronsPerPixel, type SpectroSetup,
} from '../../src/core/spectro/signalToNoise';

// Worked examples computed by hand from the CCD equation of Howell, Handbook of CCD Astronomy (2nd ed., 2006):
//   S/N = N* / sqrt(N* + n_pix (N_S + N_D + N_R^2)).
describe('CCD equation (Howell 2006), worked by hand', () => {
  it('gives 69.505 for N* = 10000, n_pix = 20, N_S = 500, N_D = 10, N_R = 5', () => {
    // variance = 10000 + 20 * (500 + 10 + 5^2) = 10000 + 20 * 535 = 20700; sqrt(20700) = 143.875; 10000 / 143.875 = 69.505
    expect(ccdSignalToNoise({ sourceE: 10000, nPix: 20, skyEPerPixel: 500, darkEPerPixel: 10, readNoiseE: 5 })).toBeCloseTo(69.505, 3);
  });

  it('is read-noise limited and source limited in the right limits', () => {
    // Source only: S/N = sqrt(N*) = sqrt(2500) = 50.
    expect(ccdSignalToNoise({ sourceE: 2500, nPix: 0, skyEPerPixel: 0, darkEPerPixel: 0, readNoiseE: 0 })).toBeCloseTo(50, 10);
    // Tiny source, 4 pixels of 10 e read noise: S/N = 1 / sqrt(1 + 4 * 100) = 0.04988
    expect(ccdSignalToNoise({ sourceE: 1, nPix: 4, skyEPerPixel: 0, darkEPerPixel: 0, readNoiseE: 10 })).toBeCloseTo(1 / Math.sqrt(401), 12);
  });
});

describe('AB photon flux, counts and S/N per Angstrom (hand-worked example)', () => {
  // AB definition (Oke & Gunn 1983): f_nu = 3631 Jy * 10^(-0.4 m) = 3.631e-20 erg/s/cm^2/Hz at m = 0.
  // Photons per unit wavelength: f_nu / (h lambda). At 8500 A (8.5e-5 cm), h = 6.62607015e-27 erg s:
  //   h lambda = 5.632160e-31; for m = 20: 3.631e-28 / 5.632160e-31 = 644.69 photons/s/cm^2/cm = 6.4469e-6 per A.
  const setup: SpectroSetup = { apertureM: 10, throughput: 0.2, dispersionAPerPixel: 0.5, yArcsecPerPixel: 0.2, readNoiseE: 3, darkEPerPixelPerS: 0.001, wavelengthA: 8500 };

  it('photon flux of m_AB = 20 at 8500 A is 6.4469e-6 photons/s/cm^2/A', () => {
    expect(abPhotonFluxPerSCm2A(20, 8500)).toBeCloseTo(6.4469e-6, 9);
    // Second route: ratio of 2.5 mag is a factor 10 exactly.
    expect(abPhotonFluxPerSCm2A(17.5, 8500) / abPhotonFluxPerSCm2A(20, 8500)).toBeCloseTo(10, 10);
  });

  it('a 10 m aperture collects pi * 500^2 = 785398.16 cm^2', () => {
    expect(collectingAreaCm2(10)).toBeCloseTo(785398.16, 2);
  });

  it('S/N per A of an m = 20 point source in 1 h is 42.33', () => {
    // N* = 6.4469e-6 * 785398.16 * 0.2 * 3600 = 3645.64 e per A
    const nStar = electronsPerAFromMag(20, setup, 3600);
    expect(nStar).toBeCloseTo(3645.64, 1);
    // Sky of 20 mag/arcsec^2 per pixel: 3645.64 e/A/arcsec^2 * (1" x 0.2") * 0.5 A = 364.564 e
    expect(skyElectronsPerPixel(20, 1, setup, 3600)).toBeCloseTo(364.564, 2);
    // 1" extraction: (1 / 0.2) * (1 / 0.5) = 10 pixels per A
    expect(pixelsPerA(1, setup)).toBeCloseTo(10, 12);
    // variance = 3645.64 + 10 * (364.564 + 0.001 * 3600 + 3^2) = 3645.64 + 3771.64 = 7417.28; sqrt = 86.124; S/N = 42.330
    const sn = signalToNoisePerA({ sourceEPerAPerS: nStar / 3600, extractionArcsec: 1, slitWidthArcsec: 1, skyMagPerArcsec2: 20 }, setup, 3600);
    expect(sn).toBeCloseTo(42.330, 2);
  });

  it('time to reach a S/N inverts the S/N of a time', () => {
    const obs = { sourceEPerAPerS: electronsPerAFromMag(21.5, setup, 1), extractionArcsec: 1.2, slitWidthArcsec: 1, skyMagPerArcsec2: 19.6 };
    for (const t of [60, 1800, 7200, 36000]) {
      const sn = signalToNoisePerA(obs, setup, t);
      expect(exposureForSignalToNoiseS(obs, setup, sn) / t).toBeCloseTo(1, 9);
    }
    expect(exposureForSignalToNoiseS({ ...obs, sourceEPerAPerS: 0 }, setup, 5)).toBe(Infinity);
  });

  it('the limiting surface brightness gives exactly the target S/N', () => {
    const mu = limitingSurfaceBrightness(8, 20, 1, 19.6, setup, 7200);
    const perS = electronsPerAFromMag(mu, setup, 1) * 20;
    const sn = signalToNoisePerA({ sourceEPerAPerS: perS, extractionArcsec: 20, slitWidthArcsec: 1, skyMagPerArcsec2: 19.6 }, setup, 7200);
    expect(sn).toBeCloseTo(8, 9);
    // Longer slits reach fainter light (sky-limited S/N grows like sqrt(length)).
    expect(limitingSurfaceBrightness(8, 40, 1, 19.6, setup, 7200)).toBeGreaterThan(mu);
  });
});
