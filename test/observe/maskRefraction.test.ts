import { describe, expect, it } from 'vitest';
import { erf, relativeSlitLoss, slitTransmission, FWHM_PER_SIGMA } from '../../src/core/observe/slitLoss';
import { maskRefractionContext, maskRefractionReport, maskRowAt, slitsAtHourAngle, type RefractionSettings } from '../../src/core/observe/maskRefraction';
import { edlenRefractivity } from '../../src/core/observe/refractiveIndex';
import { parallacticAngleDeg } from '../../src/core/observe/parallactic';
import { altitudeDeg } from '../../src/core/observe/horizon';
import { maskToSkyArcsec } from '../../src/core/sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import { ARCSEC_PER_RAD, RAD_PER_DEG } from '../../src/core/sky/angles';
import type { MaskPointing, Slit, SlitRole } from '../../src/core/geometry/maskSolution';

const AIR = { pressureHPa: 690, temperatureC: 2, relativeHumidity: 0.2 };
const LAT = 28.1;
const SETTINGS: RefractionSettings = {
  seeingFwhmArcsec: 0.8, maxLossFraction: 0.1, guideWavelengthA: 6500, scienceRangeA: [7800, 9000],
  hourAngleRangeH: [-5, 5], hourAngleStepH: 0.25, maxAirmass: 2.5,
};

function slitAt(mask: MaskPointing, id: string, xArcsec: number, yArcsec: number, role: SlitRole = 'tracer'): Slit {
  const s = maskToSkyArcsec(xArcsec, yArcsec, mask.paDeg);
  const p = tangentToSkyDeg(tangentCentre(mask.raDeg, mask.decDeg), s.xiArcsec, s.etaArcsec);
  return { maskId: mask.id, slitId: id, objectId: id, role, raDeg: p.raDeg, decDeg: p.decDeg, xArcsec, yArcsec, lenBelowArcsec: 3, lenAboveArcsec: 3, widthArcsec: 1, tiltDeg: 0, priority: 1, mag: role === 'tracer' ? 21 : null };
}

/** Plane-parallel refraction (arcsec) at the target's zenith distance: closed form for the checks. */
function closedFormR(haDeg: number, decDeg: number, wavelengthA: number): number {
  const z = 90 - altitudeDeg(haDeg, decDeg, LAT);
  return ARCSEC_PER_RAD * edlenRefractivity(wavelengthA, AIR) * Math.tan(z * RAD_PER_DEG);
}

describe('slit transmission for Gaussian seeing', () => {
  it('a centred image through a slit one FWHM wide passes erf(sqrt(ln 2)) = 0.7610 (closed form), confirmed by Simpson integration', () => {
    expect(slitTransmission(0, 1, 1)).toBeCloseTo(erf(Math.sqrt(Math.LN2)), 12);
    expect(slitTransmission(0, 1, 1)).toBeCloseTo(0.761, 3);
    // Numerical integral of the normalised Gaussian over the slit, offset 0.3", width 0.9", FWHM 0.7".
    const sigma = 0.7 / FWHM_PER_SIGMA, n = 2000, a = -0.45 - 0.3, b = 0.45 - 0.3;
    let sum = 0;
    for (let i = 0; i <= n; i++) {
      const x = a + ((b - a) * i) / n;
      const w = i === 0 || i === n ? 1 : i % 2 ? 4 : 2;
      sum += w * Math.exp(-(x * x) / (2 * sigma * sigma));
    }
    const simpson = (sum * (b - a)) / (3 * n) / (sigma * Math.sqrt(2 * Math.PI));
    expect(slitTransmission(0.3, 0.9, 0.7)).toBeCloseTo(simpson, 8);
  });

  it('erf matches known values (Abramowitz & Stegun table: erf 0.5 = 0.5204999, erf 1 = 0.8427008, erf 2 = 0.9953223)', () => {
    expect(erf(0.5)).toBeCloseTo(0.5204999, 7);
    expect(erf(1)).toBeCloseTo(0.8427008, 7);
    expect(erf(-2)).toBeCloseTo(-0.9953223, 7);
  });

  it('the relative loss is 0 when centred, symmetric, and grows with the offset', () => {
    expect(relativeSlitLoss(0, 1, 0.8)).toBe(0);
    expect(relativeSlitLoss(0.2, 1, 0.8)).toBeCloseTo(relativeSlitLoss(-0.2, 1, 0.8), 14);
    expect(relativeSlitLoss(0.4, 1, 0.8)).toBeGreaterThan(relativeSlitLoss(0.2, 1, 0.8));
  });
});

describe('per-mask refraction', () => {
  const mask: MaskPointing = { id: 'm1', raDeg: 150, decDeg: 5, paDeg: 30, locked: true };

  it('(a) for a slit at the mask centre equals the closed form (R(L) - R(guide)) sin(q - PA); (b) is zero there', () => {
    const ctx = maskRefractionContext({ mask, slits: [slitAt(mask, 'c', 0, 0)], designHourAngleH: 0, latDeg: LAT, air: AIR, settings: SETTINGS });
    for (const haH of [-3, -1.5, 0, 0.7, 2.5]) {
      const [s] = slitsAtHourAngle(ctx, haH);
      const q = parallacticAngleDeg(haH * 15, mask.decDeg, LAT);
      const proj = Math.sin((q - mask.paDeg) * RAD_PER_DEG);
      const rg = closedFormR(haH * 15, mask.decDeg, 6500);
      expect(s.dispersionAcrossArcsec[0]).toBeCloseTo((closedFormR(haH * 15, mask.decDeg, 7800) - rg) * proj, 4);
      expect(s.dispersionAcrossArcsec[1]).toBeCloseTo((closedFormR(haH * 15, mask.decDeg, 9000) - rg) * proj, 4);
      expect(Math.abs(s.fieldShiftAcrossArcsec)).toBeLessThan(1e-6);
      expect(Math.abs(s.fieldShiftAlongArcsec)).toBeLessThan(1e-6);
    }
  });

  it('a mask whose PA equals the parallactic angle has no across-slit dispersion at that hour angle', () => {
    const haH = 1.2;
    const q = parallacticAngleDeg(haH * 15, mask.decDeg, LAT);
    const m2 = { ...mask, paDeg: ((q % 360) + 360) % 360 };
    const ctx = maskRefractionContext({ mask: m2, slits: [slitAt(m2, 'c', 0, 0)], designHourAngleH: haH, latDeg: LAT, air: AIR, settings: SETTINGS });
    const [s] = slitsAtHourAngle(ctx, haH);
    expect(Math.abs(s.dispersionAcrossArcsec[0])).toBeLessThan(1e-6);
    expect(Math.abs(s.totalAcrossArcsec[1])).toBeLessThan(1e-6);
    expect(s.lossFraction).toBeLessThan(1e-9);
  });

  it('(b) is zero at the design hour angle and matches the linearised vector difference of the refraction elsewhere', () => {
    const slits = [slitAt(mask, 'n', 40, 400), slitAt(mask, 's', -120, -450), slitAt(mask, 'e', 140, 0)];
    const design = -1;
    const ctx = maskRefractionContext({ mask, slits, designHourAngleH: design, latDeg: LAT, air: AIR, settings: SETTINGS });
    for (const s of slitsAtHourAngle(ctx, design)) expect(Math.hypot(s.fieldShiftAcrossArcsec, s.fieldShiftAlongArcsec)).toBeLessThan(1e-6);
    // Independent route with vectors: each image is turned toward the zenith vector by its refraction (no parallactic
    // angle, no sky/ tangent-plane code), then projected on the plane tangent at the true mask centre by the closed form
    // of Calabretta & Greisen (2002): xi = T.E / T.C, eta = T.N / T.C; the guided centre's image is subtracted.
    const unit = (raDeg: number, decDeg: number) => {
      const a = raDeg * RAD_PER_DEG, d = decDeg * RAD_PER_DEG;
      return [Math.cos(d) * Math.cos(a), Math.cos(d) * Math.sin(a), Math.sin(d)];
    };
    const dot = (u: number[], v: number[]) => u[0] * v[0] + u[1] * v[1] + u[2] * v[2];
    const C = unit(mask.raDeg, mask.decDeg);
    const E = [-Math.sin(mask.raDeg * RAD_PER_DEG), Math.cos(mask.raDeg * RAD_PER_DEG), 0];
    const N = [C[1] * E[2] - C[2] * E[1], C[2] * E[0] - C[0] * E[2], C[0] * E[1] - C[1] * E[0]];
    const image = (raDeg: number, decDeg: number, haH: number) => {
      const lst = mask.raDeg + haH * 15; // LST for which the mask centre has hour angle haH
      const Z = unit(lst, LAT), T = unit(raDeg, decDeg);
      const cz = dot(T, Z);
      const zDeg = Math.acos(cz) / RAD_PER_DEG;
      const r = (ARCSEC_PER_RAD * edlenRefractivity(6500, AIR) * Math.tan(zDeg * RAD_PER_DEG)) / ARCSEC_PER_RAD;
      const perp = Z.map((z, k) => z - cz * T[k]);
      const pn = Math.hypot(...perp);
      const A = T.map((t, k) => t * Math.cos(r) + (perp[k] / pn) * Math.sin(r));
      return { xi: (dot(A, E) / dot(A, C)) * ARCSEC_PER_RAD, eta: (dot(A, N) / dot(A, C)) * ARCSEC_PER_RAD };
    };
    const relative = (slit: Slit, haH: number) => {
      const t = image(slit.raDeg, slit.decDeg, haH), c = image(mask.raDeg, mask.decDeg, haH);
      return { xi: t.xi - c.xi, eta: t.eta - c.eta };
    };
    const pa = mask.paDeg * RAD_PER_DEG;
    let checked = 0;
    for (const haH of [-4, -2.5, 0.5, 2, 3.5]) {
      const got = slitsAtHourAngle(ctx, haH);
      slits.forEach((slit, i) => {
        const a = relative(slit, haH), b = relative(slit, design);
        const dxi = a.xi - b.xi, deta = a.eta - b.eta;
        const x = dxi * Math.cos(pa) - deta * Math.sin(pa), y = dxi * Math.sin(pa) + deta * Math.cos(pa);
        expect(Math.abs(got[i].fieldShiftAcrossArcsec - x)).toBeLessThan(1e-4);
        expect(Math.abs(got[i].fieldShiftAlongArcsec - y)).toBeLessThan(1e-4);
        checked++;
      });
    }
    expect(checked).toBe(15);
    // The shifts are real: hours from the design they reach a tenth of an arcsec across a 16' field at this site.
    const far = slitsAtHourAngle(ctx, 3.5);
    expect(Math.max(...far.map((s) => Math.hypot(s.fieldShiftAcrossArcsec, s.fieldShiftAlongArcsec)))).toBeGreaterThan(0.05);
  });

  it('the window contains the design hour angle, its ends sit on the loss or airmass limit, and it narrows with the limit', () => {
    const slits = [slitAt(mask, 'a', 0, 0), slitAt(mask, 'b', 100, 300), slitAt(mask, 'c', -130, -420), slitAt(mask, 's1', 50, -100, 'sky'), slitAt(mask, 'l1', -60, 150, 'starlight')];
    const input = { mask, slits, designHourAngleH: 0.5, latDeg: LAT, air: AIR, settings: SETTINGS };
    const r = maskRefractionReport(input);
    expect(r.windowSlitCount).toBe(3); // sky and starlight slits do not count
    expect(r.windowContainsDesign).toBe(true);
    const [w0, w1] = r.hourAngleWindowH!;
    expect(w0).toBeLessThan(0.5);
    expect(w1).toBeGreaterThan(0.5);
    const ctx = maskRefractionContext(input);
    for (const end of [w0, w1]) {
      const inside = maskRowAt(ctx, end + (end < 0.5 ? 0.01 : -0.01));
      const outside = maskRowAt(ctx, end + (end < 0.5 ? -0.01 : 0.01));
      expect(inside.passes).toBe(true);
      expect(outside.passes).toBe(false);
      const onLoss = Math.abs(maskRowAt(ctx, end).maxLossFraction! - SETTINGS.maxLossFraction) < 0.01;
      const onAirmass = Math.abs(maskRowAt(ctx, end).airmass! - SETTINGS.maxAirmass) < 0.02;
      expect(onLoss || onAirmass).toBe(true);
    }
    const strict = maskRefractionReport({ ...input, settings: { ...SETTINGS, maxLossFraction: 0.03 } });
    expect(strict.hourAngleWindowH![0]).toBeGreaterThanOrEqual(w0);
    expect(strict.hourAngleWindowH![1]).toBeLessThanOrEqual(w1);
    expect(strict.hourAngleWindowH![1] - strict.hourAngleWindowH![0]).toBeLessThan(w1 - w0);
  });

  it('says why there is no window for a mask that never rises or never gets below the airmass limit', () => {
    const south = { ...mask, decDeg: -75 };
    const r = maskRefractionReport({ mask: south, slits: [slitAt(south, 'a', 0, 0)], designHourAngleH: 0, latDeg: LAT, air: AIR, settings: SETTINGS });
    expect(r.hourAngleWindowH).toBeNull();
    expect(r.windowNote).toMatch(/below the horizon at every hour angle/);
    expect(r.rows.every((row) => row.airmass === null && !row.passes)).toBe(true);
    const low = { ...mask, decDeg: -45 }; // culminates at 16.9 deg from latitude 28.1: airmass ~3.4
    const r2 = maskRefractionReport({ mask: low, slits: [slitAt(low, 'a', 0, 0)], designHourAngleH: 0, latDeg: LAT, air: AIR, settings: SETTINGS });
    expect(r2.windowNote).toMatch(/never gets below airmass 2.5/);
  });

  it('gives no window when no hour angle keeps the slits under the limit, and flags rows below the horizon', () => {
    // PA 90: the slit never lies along the vertical (|q| stays below 62 deg for this target), so (a) never vanishes.
    const m90 = { ...mask, paDeg: 90 };
    const slits = [slitAt(m90, 'a', 0, 0)];
    const r = maskRefractionReport({ mask: m90, slits, designHourAngleH: 0, latDeg: LAT, air: AIR, settings: { ...SETTINGS, maxLossFraction: 1e-6, hourAngleRangeH: [-12, 12], hourAngleStepH: 1 } });
    expect(r.hourAngleWindowH).toBeNull();
    expect(r.windowContainsDesign).toBe(false);
    expect(r.windowNote).toMatch(/no hour angle keeps every tracer slit under 0 % loss/);
    const below = r.rows.find((row) => row.hourAngleH === 12)!;
    expect(below.altitudeDeg).toBeLessThan(0);
    expect(below.airmass).toBeNull();
    expect(below.passes).toBe(false);
  });
});

describe('erf routes', () => {
  it('the series and the incomplete-gamma route agree to 1e-14 on both sides of the switch at |x| = 3', async () => {
    const { regularisedLowerGamma } = await import('../../src/core/sky/sersic');
    for (let x = 0.01; x < 6; x += 0.07) expect(Math.abs(erf(x) - regularisedLowerGamma(0.5, x * x))).toBeLessThan(1e-14);
    expect(erf(0)).toBe(0);
  });
});

describe('the summary row of a mask', () => {
  it('maskRowAt gives exactly the maxima and counts of the per-slit rows of slitsAtHourAngle, and the early stop agrees on passing', () => {
    const mask: MaskPointing = { id: 'm1', raDeg: 150.2, decDeg: 12.5, paDeg: 35, locked: false };
    const slits: Slit[] = [];
    for (let i = 0; i < 24; i++) slits.push(slitAt(mask, `s${i}`, -250 + 21 * i, -120 + 11 * i, i % 7 === 3 ? 'starlight' : 'tracer'));
    const input = { mask, slits, designHourAngleH: -1.5, latDeg: LAT, air: AIR, settings: { ...SETTINGS, maxLossFraction: 0.05 } };
    const ctx = maskRefractionContext(input);
    // A context whose rows stop at the first failing slit before any full row (no images shared yet).
    const stopFirst = maskRefractionContext(input);
    let passed = 0, failed = 0;
    for (let h = -5; h <= 5; h += 0.35) {
      const early = maskRowAt(stopFirst, h, true);
      const row = maskRowAt(ctx, h);
      expect(early.passes).toBe(row.passes);
      const tracers = slitsAtHourAngle(ctx, h).filter((s) => s.role === 'tracer');
      if (row.airmass === null) continue;
      expect(row.maxLossFraction).toBe(Math.max(0, ...tracers.map((s) => s.lossFraction)));
      expect(row.maxFieldShiftAcrossArcsec).toBe(Math.max(0, ...tracers.map((s) => Math.abs(s.fieldShiftAcrossArcsec))));
      expect(row.maxDispersionAcrossArcsec).toBe(Math.max(0, ...tracers.flatMap((s) => s.dispersionAcrossArcsec.map(Math.abs))));
      expect(row.slitsOverLimit).toBe(tracers.filter((s) => s.lossFraction >= 0.05).length);
      expect(maskRowAt(ctx, h, true).passes).toBe(row.passes);
      if (row.passes) passed++; else failed++;
    }
    // The grid crosses the window's edges, so both outcomes are exercised.
    expect(passed).toBeGreaterThan(0);
    expect(failed).toBeGreaterThan(0);
  });
});
