/** Howell's CCD equation with the sky-estimate term, galaxy light under tracers, and the photometric declaration. */
import { describe, expect, it } from 'vitest';
import { ccdSignalToNoise, exposureForSignalToNoiseS, signalToNoisePerA, skyEstimateFactor } from '../../src/core/spectro/signalToNoise';
import { tracerExposure, maskExposureReport, type ExposureModel } from '../../src/core/solver/exposure';
import { AB_MINUS_VEGA_MAG, resolvePhotometry, photometrySchema } from '../../src/core/plan/photometry';
import { planSchema } from '../../src/core/plan/schema';

describe('CCD equation with the sky estimate (Howell, Handbook of CCD Astronomy, 2nd ed. 2006, sec. 4.4; Howell 1989, PASP 101, 616)', () => {
  // S/N = N* / sqrt(N* + n_pix (1 + n_pix/n_B)(N_S + N_D + N_R^2)). Check values computed from the published formula
  // (references: N* = 24000, n_pix = 200, N_S = 620, N_D = 1.833, N_R = 5): 61.28 for n_B -> infinity, 56.69 for n_B = 1000.
  const t = { sourceE: 24000, nPix: 200, skyEPerPixel: 620, darkEPerPixel: 1.833, readNoiseE: 5 };
  it('reproduces the worked values', () => {
    expect(ccdSignalToNoise(t)).toBeCloseTo(61.28, 2);
    expect(ccdSignalToNoise({ ...t, skyPixels: 1e12 })).toBeCloseTo(61.28, 2);
    expect(ccdSignalToNoise({ ...t, skyPixels: 1000 })).toBeCloseTo(56.69, 2);
  });
  it('no sky pixels: no sky estimate, S/N 0; the factor is 1 + n_pix/n_B', () => {
    expect(ccdSignalToNoise({ ...t, skyPixels: 0 })).toBe(0);
    expect(skyEstimateFactor(200, 1000)).toBeCloseTo(1.2, 15);
    expect(skyEstimateFactor(200, undefined)).toBe(1);
  });
  it('galaxy light under the source is a background like the sky: 620 sky + 380 galaxy = 1000 sky', () => {
    expect(ccdSignalToNoise({ ...t, skyEPerPixel: 620, galaxyEPerPixel: 380 })).toBeCloseTo(ccdSignalToNoise({ ...t, skyEPerPixel: 1000 }), 12);
  });
  it('the time for a target S/N inverts the S/N with both new terms', () => {
    const setup = { apertureM: 8, throughput: 0.15, dispersionAPerPixel: 0.4, yArcsecPerPixel: 0.2, readNoiseE: 3, darkEPerPixelPerS: 0.001, wavelengthA: 8600 };
    const o = { sourceEPerAPerS: 5, extractionArcsec: 1.6, slitWidthArcsec: 1, skyMagPerArcsec2: 19.6, skyLengthArcsec: 3, galaxyMagPerArcsec2: 21 };
    const tS = exposureForSignalToNoiseS(o, setup, 10);
    expect(signalToNoisePerA(o, setup, tS)).toBeCloseTo(10, 8);
    expect(signalToNoisePerA(o, setup, tS)).toBeLessThan(signalToNoisePerA({ ...o, skyLengthArcsec: undefined, galaxyMagPerArcsec2: undefined }, setup, tS));
  });
});

describe('tracer exposures: sky from the slit itself, galaxy light, photometry', () => {
  const model: ExposureModel = {
    setup: { apertureM: 10, throughput: 0.2, dispersionAPerPixel: 0.33, yArcsecPerPixel: 0.12, readNoiseE: 2.6, darkEPerPixelPerS: 0.0008, wavelengthA: 8600 },
    skyMagPerArcsec2: 19.6, seeingFwhmArcsec: 0.8, exposureTimeS: 3600, targetSnPerA: 10,
  };
  const slit = { slitId: 's1', objectId: 'o1', widthArcsec: 1 };
  it('a short slit (little sky) lowers the S/N by the factor of the published equation', () => {
    // Extraction 1.6" and 1.6" of sky: n_pix/n_B = 1, noise variance of the background doubles.
    const ideal = tracerExposure(slit, 22.5, model);
    const short = tracerExposure(slit, 22.5, model, { skyLengthArcsec: 1.6 });
    expect(short.snPerA).toBeLessThan(ideal.snPerA);
    expect(short.snPerA / ideal.snPerA).toBeGreaterThan(1 / Math.SQRT2 - 1e-9); // at most the background doubles
  });
  it('a Vega I magnitude is 0.45 mag fainter in AB (Blanton & Roweis 2007, AJ 133, 734, Table 1): 10^(0.4*0.45) = 1.51x fewer photons', () => {
    expect(AB_MINUS_VEGA_MAG.I).toBe(0.45);
    const p = resolvePhotometry({ band: 'I', system: 'Vega' });
    expect(p.catalogToAbMag).toBe(0.45);
    expect(p.source).toMatch(/Blanton & Roweis 2007/);
    const vega = tracerExposure(slit, 21, { ...model, catalogToAbMag: p.catalogToAbMag });
    const ab = tracerExposure(slit, 21.45, model);
    expect(vega.snPerA).toBeCloseTo(ab.snPerA, 10);
    expect(10 ** (0.4 * 0.45)).toBeCloseTo(1.514, 3);
  });
  it('galaxy light near the centre lowers a tracer\'s S/N; far out it does not matter', () => {
    const galaxy = { id: 'g', raDeg: 30, decDeg: 10, reArcsec: 45, axisRatio: 0.8, paDeg: 30, distanceMpc: 18, vsysKms: 1250, sersicN: 4, muE: 21.5 };
    const mask = { id: 'm1', raDeg: 30, decDeg: 10, paDeg: 0, locked: true };
    const row = (id: string, y: number) => ({ maskId: 'm1', slitId: id, objectId: id, role: 'tracer' as const, raDeg: 30, decDeg: 10, xArcsec: 0, yArcsec: y, lenBelowArcsec: 3, lenAboveArcsec: 3, widthArcsec: 1, tiltDeg: 0, priority: 1, mag: 22 });
    const r = maskExposureReport({ mask, slits: [row('in', 15), row('out', 400)] }, galaxy, model);
    const bare = tracerExposure({ slitId: 'x', objectId: 'x', widthArcsec: 1 }, 22, model, { skyLengthArcsec: 6 - 1.6 });
    expect(r.slits[0].snPerA).toBeLessThan(0.8 * bare.snPerA);
    expect(r.slits[1].snPerA / bare.snPerA).toBeGreaterThan(0.99);
  });
  it('the plan accepts a declaration and refuses a Vega band without an offset, saying how to fix it', () => {
    expect(photometrySchema.safeParse({ band: 'I', system: 'Vega' }).success).toBe(true);
    const bad = photometrySchema.safeParse({ band: 'Y', system: 'Vega' });
    expect(bad.success).toBe(false);
    expect(JSON.stringify(bad.error?.issues)).toMatch(/give abMinusVegaMag/);
    expect(resolvePhotometry({ band: 'Y', system: 'Vega', abMinusVegaMag: 0.6 }).catalogToAbMag).toBe(0.6);
    expect(resolvePhotometry(undefined)).toMatchObject({ system: 'AB', catalogToAbMag: 0, assumed: true });
    expect(planSchema.shape.photometry).toBeDefined();
  });
});
