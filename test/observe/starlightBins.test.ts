/** Co-added integrated starlight per radial and azimuthal bin, with a systematic sky floor. */
import { describe, expect, it } from 'vitest';
import { coaddedSignalToNoise, starlightBins, starlightBinLines } from '../../src/core/solver/starlightBins';
import type { ExposureModel } from '../../src/core/solver/exposure';

describe('co-adding spectra (Howell 2006 CCD equation summed over independent spectra)', () => {
  const one = { signalE: 1000, varianceE2: 1000 + 40000, skyE: 30000 };
  it('n equal independent spectra raise the S/N by sqrt(n) without a floor (textbook: variances add)', () => {
    const s1 = coaddedSignalToNoise([one], 0).sn;
    expect(s1).toBeCloseTo(1000 / Math.sqrt(41000), 12);
    expect(coaddedSignalToNoise(Array(16).fill(one), 0).sn / s1).toBeCloseTo(4, 12);
  });
  it('a systematic floor f caps the S/N at N_gal / (f N_sky) however many spectra are added', () => {
    const cap = 1000 / (0.01 * 30000); // 3.33
    const many = coaddedSignalToNoise(Array(10000).fill(one), 0.01);
    expect(many.sn).toBeLessThan(cap);
    expect(many.sn).toBeGreaterThan(0.98 * cap);
    expect(many.snWithoutFloor).toBeGreaterThan(40);
  });
});

describe('starlight bins of a mask', () => {
  const model: ExposureModel = {
    setup: { apertureM: 10, throughput: 0.2, dispersionAPerPixel: 0.33, yArcsecPerPixel: 0.12, readNoiseE: 2.6, darkEPerPixelPerS: 0.0008, wavelengthA: 8600 },
    skyMagPerArcsec2: 19.6, seeingFwhmArcsec: 0.8, exposureTimeS: 3600, targetSnPerA: 10,
  };
  const galaxy = { id: 'g', raDeg: 30, decDeg: 10, reArcsec: 45, axisRatio: 1, paDeg: 0, distanceMpc: 18, vsysKms: 1250, sersicN: 4, muE: 21.5 };
  const mask = { id: 'm1', raDeg: 30, decDeg: 10, paDeg: 0, locked: true };
  const row = (id: string, role: 'tracer' | 'starlight' | 'sky', x: number, y: number, len: number) => ({ maskId: 'm1', slitId: id, objectId: id, role, raDeg: 30, decDeg: 10, xArcsec: x, yArcsec: y, lenBelowArcsec: len / 2, lenAboveArcsec: len / 2, widthArcsec: 1, tiltDeg: 0, priority: 1, mag: role === 'tracer' ? 21 : null });
  it('counts starlight slits and tracer sky parts inside the goal radius into their bins; none without sky slits', () => {
    // Galaxy round (q = 1), PA 0: at mask PA 0 the major axis (u) points North = +y; y = 30" is R = 0.67 Re, azimuth 0.
    const slits = [row('l1', 'starlight', 0, 30, 12), row('t1', 'tracer', 0.5, 35, 8), row('t2', 'tracer', 0, 400, 8), row('k1', 'sky', 0, -600, 10)];
    const bins = starlightBins([{ mask, slits }], galaxy, model, { reachRe: 3, targetSnPerA: 10 });
    expect(bins).toHaveLength(1);
    expect(bins[0]).toMatchObject({ fromRe: 0, toRe: 1, sectorDeg: 0, starlightSlits: 1, tracerSkyParts: 2 });
    const alone = starlightBins([{ mask, slits: [slits[0], slits[3]] }], galaxy, model, { reachRe: 3, targetSnPerA: 10 });
    expect(bins[0].snPerAWithoutFloor).toBeGreaterThan(alone[0].snPerAWithoutFloor);
    expect(starlightBins([{ mask, slits: slits.slice(0, 3) }], galaxy, model, { reachRe: 3, targetSnPerA: 10 })).toEqual([]);
    expect(starlightBinLines(bins, 10, 0.01)[1]).toMatch(/^ {2}0-1 Re: [01] of 1 sectors reach it; 0-45 deg S\/N/);
  });
});
