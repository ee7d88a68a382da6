import { describe, expect, it } from 'vitest';
import { pointSourceApertureFraction, tracerExposure, starlightExposure, maskExposureReport, type ExposureModel } from '../../src/core/solver/exposure';
import { erf } from '../../src/core/observe/slitLoss';
import { signalToNoisePerA } from '../../src/core/spectro/signalToNoise';

const model: ExposureModel = {
  setup: { apertureM: 10, throughput: 0.2, dispersionAPerPixel: 0.33, yArcsecPerPixel: 0.12, readNoiseE: 2.6, darkEPerPixelPerS: 0.0008, wavelengthA: 8600 },
  skyMagPerArcsec2: 19.6, seeingFwhmArcsec: 0.8, exposureTimeS: 3600, targetSnPerA: 10,
};
const slit = { slitId: 's1', objectId: 'o1', widthArcsec: 1, lenBelowArcsec: 4, lenAboveArcsec: 4 };

describe('exposure estimates (CCD equation, Howell 2006)', () => {
  it('point-source aperture fraction: slit width term times erf over the extraction length (closed form)', () => {
    // Width = FWHM gives erf(sqrt(ln 2)); an extraction of 2 FWHM gives erf(2 sqrt(ln 2)) along the slit.
    const f = pointSourceApertureFraction(0.8, 1.6, 0.8);
    expect(f).toBeCloseTo(erf(Math.sqrt(Math.LN2)) * erf(2 * Math.sqrt(Math.LN2)), 12);
  });

  it('a tracer: S/N in the planned time, and the time for the target S/N gives that S/N back', () => {
    const e = tracerExposure(slit, 21, model);
    expect(e.snPerA).toBeGreaterThan(0);
    const back = tracerExposure(slit, 21, { ...model, exposureTimeS: e.timeForTargetSnS! });
    expect(back.snPerA).toBeCloseTo(model.targetSnPerA, 6);
    // Brighter gives more S/N and a shorter time; S/N grows with time (about as sqrt(t) when sky-limited).
    const bright = tracerExposure(slit, 20, model);
    expect(bright.snPerA).toBeGreaterThan(e.snPerA);
    expect(bright.timeForTargetSnS!).toBeLessThan(e.timeForTargetSnS!);
    const longer = tracerExposure(slit, 21, { ...model, exposureTimeS: 4 * 3600 });
    expect(longer.snPerA / e.snPerA).toBeGreaterThan(1.9);
    expect(longer.snPerA / e.snPerA).toBeLessThan(2.05);
  });

  it('equals the CCD equation worked by hand for the tracer\'s own terms', () => {
    // N* from the AB flux density: 3631 Jy 10^(-0.4 m) / (h lambda) photons per s per cm2 per A (Oke & Gunn 1983).
    const e = tracerExposure(slit, 21, model);
    const photons = (3631e-23 * 10 ** (-0.4 * 21)) / (6.62607015e-27 * 8600e-8) * 1e-8;
    const area = Math.PI * 500 * 500;
    const frac = pointSourceApertureFraction(1, 1.6, 0.8);
    const nStar = photons * area * 0.2 * 3600 * frac;
    const nPix = (1.6 / 0.12) / 0.33;
    const sky = (3631e-23 * 10 ** (-0.4 * 19.6)) / (6.62607015e-27 * 8600e-8) * 1e-8 * area * 0.2 * 3600 * (1 * 0.12) * 0.33;
    const byHand = nStar / Math.sqrt(nStar + nPix * (sky + 0.0008 * 3600 + 2.6 * 2.6));
    expect(e.snPerA).toBeCloseTo(byHand, 8);
  });

  it('a starlight slit uses the whole slit as extraction and matches the shared S/N function', () => {
    const e = starlightExposure(slit, 22, model);
    expect(e.snPerA).toBeGreaterThan(0);
    expect(e.muMagPerArcsec2).toBe(22);
    const fainter = starlightExposure(slit, 23, model);
    expect(fainter.snPerA).toBeLessThan(e.snPerA);
    expect(signalToNoisePerA({ sourceEPerAPerS: 0, extractionArcsec: 8, slitWidthArcsec: 1, skyMagPerArcsec2: 19.6 }, model.setup, 3600)).toBe(0);
  });

  it('per mask: tracers and starlight get estimates, sky and alignment rows none', () => {
    const galaxy = { id: 'g', raDeg: 30, decDeg: 10, reArcsec: 45, axisRatio: 0.8, paDeg: 30, distanceMpc: 18, vsysKms: 1250, sersicN: 4, muE: 21.5 };
    const mask = { id: 'm1', raDeg: 30, decDeg: 10, paDeg: 0, locked: true };
    const row = (id: string, role: 'tracer' | 'starlight' | 'sky' | 'alignment', mag: number | null, y: number) => ({ maskId: 'm1', slitId: id, objectId: id, role, raDeg: 30, decDeg: 10 + y / 3600, xArcsec: 0, yArcsec: y, lenBelowArcsec: 3, lenAboveArcsec: 3, widthArcsec: 1, tiltDeg: 0, priority: 1, mag });
    const r = maskExposureReport({ mask, slits: [row('t1', 'tracer', 21, -100), row('t2', 'tracer', 22.5, 100), row('l1', 'starlight', null, 60), row('k1', 'sky', null, 300), row('a1', 'alignment', 17, 400)] }, galaxy, model);
    expect(r.slits.map((s) => s.slitId)).toEqual(['t1', 't2', 'l1']);
    expect(r.medianTracerSnPerA).toBeCloseTo((r.slits[0].snPerA + r.slits[1].snPerA) / 2, 12);
    expect(r.tracersReachingTarget).toBe(r.slits.filter((s) => s.role === 'tracer' && s.snPerA >= 10).length);
    expect(r.slits[2].muMagPerArcsec2!).toBeGreaterThan(21.5); // 60" from the centre, beyond Re: fainter than muE
  });
});
