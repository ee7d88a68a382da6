/**
 * Integrated starlight co-added per bin (solver/starlightCoadd.ts, solver/starlightBins.ts): the CCD equation of
 * Howell (Handbook of CCD Astronomy, 2nd ed. 2006, sec. 4.4) with the sky-estimate term, summed over spectra, and the
 * systematic sky-subtraction floor; the Sérsic light of Graham & Driver 2005 (PASA 22, 118) turned into electrons per
 * slit pixel by hand; and, over generated galaxies (src/core/scenario/suite.ts), every bin reported as reaching the
 * target re-summed here from slits.csv-like rows by formulas written in this file.
 */
import { describe, expect, it } from 'vitest';
import { coaddedSignalToNoise, floorCapSnPerA, spectrumPart, starlightBins } from '../../src/core/solver/starlightBins';
import type { ExposureModel } from '../../src/core/solver/exposure';
import { sersicBn, sersicMuMagPerArcsec2 } from '../../src/core/sky/sersic';
import { coaddStarlightBins, planStarlightModels } from '../../src/core/solver/starlightCoadd';
import { solvePlan } from '../../src/core/pipeline/pipeline';
import { parsePlan } from '../../src/core/plan/validate';
import { suiteScenario } from '../../src/core/scenario/suite';
import { scenarioCatalog } from '../../src/core/scenario/generator';
import { loadProfile, PROFILE_IDS, scenario, violations } from '../search/helpers';
import type { MaskSolution, Slit } from '../../src/core/geometry/maskSolution';
import type { GalaxyModel } from '../../src/core/plan/schema';
import type { AllocationContext } from '../../src/core/solver/allocateMasks';

// An invented 10 m telescope and spectrograph (numbers typical of the class).
const model: ExposureModel = {
  setup: { apertureM: 10, throughput: 0.2, dispersionAPerPixel: 0.33, yArcsecPerPixel: 0.12, readNoiseE: 2.6, darkEPerPixelPerS: 0.0008, wavelengthA: 8600 },
  skyMagPerArcsec2: 19.6, seeingFwhmArcsec: 0.8, exposureTimeS: 3600, targetSnPerA: 5,
};

describe('co-adding spectra (Howell 2006 CCD equation, sky-limited; derived)', () => {
  // A 20" slit at mu = 24.13 AB (3 Re below) against a 19.6 sky: sky electrons per pixel (206) far above the galaxy's (3.2).
  const part = spectrumPart(24.1318, 20, 1, 40, model)!;
  it('N equal slits give sqrt(N) times the S/N of one when the floor is off (common practice; variances add)', () => {
    const one = coaddedSignalToNoise([part], 0).sn;
    for (const n of [2, 4, 9, 25]) expect(coaddedSignalToNoise(Array(n).fill(part), 0).sn / one).toBeCloseTo(Math.sqrt(n), 10);
  });
  it('the floor f caps the co-added S/N at (galaxy / sky) / f however many slits are added (derived)', () => {
    // 10^(-0.4 (24.1318 - 19.6)) / 0.01 = 1.5391 (the galaxy and the sky fill the same pixels).
    const cap = Math.pow(10, -0.4 * (24.1318 - 19.6)) / 0.01;
    expect(cap).toBeCloseTo(1.5391, 3);
    const sums = [1, 10, 100, 10000].map((n) => coaddedSignalToNoise(Array(n).fill(part), 0.01).sn);
    for (let i = 1; i < sums.length; i++) expect(sums[i]).toBeGreaterThan(sums[i - 1]);
    expect(sums[3]).toBeLessThan(cap);
    expect(sums[3]).toBeGreaterThan(0.99 * cap);
  });
});

describe('worked example: a Sérsic n = 4 galaxy at 2 and 3 Re (Graham & Driver 2005)', () => {
  // mu(R) = mu_e + 2.5 b_n / ln 10 [(R/Re)^(1/n) - 1], b_4 = 7.669 (Graham & Driver 2005): 2.5 x 7.669 / 2.302585 = 8.32651.
  //   R = 2 Re: 2^(1/4) = 1.189207, mu = 21.5 + 8.32651 x 0.189207 = 23.0754 mag/arcsec^2 (AB here).
  //   R = 3 Re: 3^(1/4) = 1.316074, mu = 21.5 + 8.32651 x 0.316074 = 24.1318.
  // Photons of AB = 0 at 8600 A: 3631e-23 / (6.62607015e-27 x 8.6e-5 cm) x 1e-8 = 637.19 s^-1 cm^-2 A^-1 (Oke & Gunn 1983).
  // Area of a 10 m aperture pi x 500^2 = 785398 cm^2; throughput 0.2; 3600 s; one pixel = 1" x 0.12" x 0.33 A:
  //   galaxy at 2 Re: 637.19 x 10^(-0.4 x 23.0754) x 785398 x 0.2 x 3600 x 0.12 x 0.33 = 8.399 e- per pixel;
  //   sky 19.6: 206.25 e- per pixel; at 3 Re: 3.174 e- per pixel.
  // A 20" slit, 1 A: n_pix = (20 / 0.12) / 0.33 = 505.05, N* = 8.399 x 505.05 = 4241.8 e- (2 Re), 1603.3 e- (3 Re);
  // sky from 40" of sky slit: 1 + n_pix/n_B = 1.5; read noise 2.6 e-, dark 0.0008 x 3600 = 2.88 e- per pixel:
  //   S/N(2 Re) = 4241.8 / sqrt(4241.8 + 505.05 x 1.5 x (206.25 + 2.88 + 6.76)) = 10.355;   S/N(3 Re) = 3.945.
  // With a floor of 1 % of the sky: + (0.01 x 505.05 x 206.25)^2 in the variance: 3.790 (2 Re) and 1.434 (3 Re).
  const galaxy: GalaxyModel = { id: 'worked', raDeg: 0, decDeg: 0, reArcsec: 40, axisRatio: 1, paDeg: 0, distanceMpc: 10, vsysKms: 1000, sersicN: 4, muE: 21.5 };
  const bn = sersicBn(4);
  it('b_4 = 7.669 and the surface brightness at 2 and 3 Re', () => {
    expect(bn).toBeCloseTo(7.669, 3);
    expect(sersicMuMagPerArcsec2(80, 40, 4, 21.5, bn)).toBeCloseTo(23.0754, 3);
    expect(sersicMuMagPerArcsec2(120, 40, 4, 21.5, bn)).toBeCloseTo(24.1318, 3);
  });
  it('electrons per slit pixel and S/N per A of a 20" slit, with and without the floor', () => {
    const at2 = spectrumPart(23.0754, 20, 1, 40, model)!, at3 = spectrumPart(24.1318, 20, 1, 40, model)!;
    const nPix = 20 / 0.12 / 0.33;
    expect(at2.signalE / nPix).toBeCloseTo(8.399, 2);
    expect(at3.signalE / nPix).toBeCloseTo(3.174, 2);
    expect(at2.skyE / nPix).toBeCloseTo(206.25, 1);
    expect(at2.signalE).toBeCloseTo(4241.8, 0);
    expect(coaddedSignalToNoise([at2], 0).sn).toBeCloseTo(10.355, 2);
    expect(coaddedSignalToNoise([at3], 0).sn).toBeCloseTo(3.945, 2);
    expect(coaddedSignalToNoise([at2], 0.01).sn).toBeCloseTo(3.790, 2);
    expect(coaddedSignalToNoise([at3], 0.01).sn).toBeCloseTo(1.434, 2);
    // The bin from 2 Re can never reach S/N 5 with a 1 % floor: its brightest point allows 4.07 (8.399 / 206.25 / 0.01).
    expect(floorCapSnPerA(2, galaxy, model, 0.01, bn)).toBeCloseTo(4.072, 2);
    expect(floorCapSnPerA(0, galaxy, model, 0.01, bn)).toBe(Infinity);
  });
});

describe('starlight slits added to bins short of the target', () => {
  it('adds slits until bins are met, keeps the masks valid, and spends none on a bin it cannot meet', () => {
    const { plan, profile, catalog } = scenario({ seed: 3, candidates: 200 }, (p) => {
      p.observing = { ...(p.observing ?? {}), skySystematicFraction: 0.002 };
      p.starlight = { ...(p.starlight ?? {}), targetSnPerA: 12 };
    });
    const sol = solvePlan({ plan, profile, catalog }, { skipObservingReport: true });
    expect(violations(sol, profile)).toEqual([]);
    // Start again from the solution without its starlight slits: the co-adding alone must meet bins.
    const bare: MaskSolution[] = sol.masks.map((m) => ({ ...m, slits: m.slits.filter((s) => s.role !== 'starlight') }));
    const ctx = { profile, galaxy: sol.galaxy } as AllocationContext;
    const models = planStarlightModels(sol.plan, ctx);
    const before = starlightBins(bare, sol.galaxy, models.modelOf, models.settings);
    const r = coaddStarlightBins(bare, models.stageOf, models.modelOf, models.settings);
    const after = starlightBins(r.masks, sol.galaxy, models.modelOf, models.settings);
    const metBefore = before.filter((b) => b.met).length, metAfter = after.filter((b) => b.met).length;
    console.log(`co-adding: ${r.added} starlight slits added, bins meeting S/N 12: ${metBefore} -> ${metAfter} of ${after.length}`);
    expect(r.added).toBeGreaterThan(0);
    expect(metAfter).toBeGreaterThan(metBefore);
    // Every bin that received a new slit now meets the target (slits tried for a bin that stays short are given back).
    const key = (b: { fromRe: number; sectorDeg: number }) => `${b.fromRe}:${b.sectorDeg}`;
    const had = new Map(before.map((b) => [key(b), b.starlightSlits]));
    for (const b of after) if (b.starlightSlits > (had.get(key(b)) ?? 0)) expect(b.met).toBe(true);
    expect(violations({ ...sol, masks: r.masks }, profile)).toEqual([]);
    // Each tracer, starlight or sky object once over all masks (alignment stars may serve several masks).
    const ids = r.masks.flatMap((m) => m.slits.filter((s) => s.role !== 'alignment').map((s) => s.objectId));
    expect(new Set(ids).size).toBe(ids.length);
  });
});

// ---- independent re-summation (formulas of this file only) ------------------------------------------------------

const RAD = Math.PI / 180;
/** Gnomonic (TAN) offsets in arcsec of (ra, dec) about (ra0, dec0), Calabretta & Greisen 2002. */
function tan(ra0: number, dec0: number, ra: number, dec: number) {
  const d = (ra - ra0) * RAD, c = Math.sin(dec0 * RAD) * Math.sin(dec * RAD) + Math.cos(dec0 * RAD) * Math.cos(dec * RAD) * Math.cos(d);
  const xi = (Math.cos(dec * RAD) * Math.sin(d)) / c, eta = (Math.cos(dec0 * RAD) * Math.sin(dec * RAD) - Math.sin(dec0 * RAD) * Math.cos(dec * RAD) * Math.cos(d)) / c;
  return { xi: (xi / RAD) * 3600, eta: (eta / RAD) * 3600 };
}

/** Co-added S/N per bin re-summed from the rows: Sérsic light (b_n by Ciotti & Bertin 1999), Howell's CCD equation, the floor. */
function resum(masks: readonly { paDeg: number; rows: readonly Slit[] }[], g: GalaxyModel, m: ExposureModel, reachRe: number, f: number, ab: number) {
  const n = g.sersicN, bn = 2 * n - 1 / 3 + 4 / (405 * n) + 46 / (25515 * n * n);
  const mu = (rArcsec: number) => g.muE + (2.5 / Math.LN10) * bn * (Math.pow(rArcsec / g.reArcsec, 1 / n) - 1);
  const s = m.setup, t = m.exposureTimeS;
  const photons = (3631e-23 / (6.62607015e-27 * s.wavelengthA * 1e-8)) * 1e-8 * Math.PI * Math.pow(s.apertureM * 50, 2) * (1 - (s.obstructedFraction ?? 0)) * s.throughput * t;
  const bins = new Map<string, { sig: number; v: number; sky: number }>();
  const extraction = 2 * m.seeingFwhmArcsec;
  for (const mk of masks) {
    const skyLen = mk.rows.filter((r) => r.role === 'sky').reduce((a, r) => a + r.lenBelowArcsec + r.lenAboveArcsec, 0);
    if (!(skyLen > 0)) continue;
    const along = (r: Slit, dy: number) => {
      // Offset dy along the slit (mask y) from the row's point, to the galaxy frame (contract formulas).
      const p = tan(g.raDeg, g.decDeg, r.raDeg, r.decDeg);
      const xi = p.xi + dy * Math.sin(mk.paDeg * RAD), eta = p.eta + dy * Math.cos(mk.paDeg * RAD);
      const u = xi * Math.sin(g.paDeg * RAD) + eta * Math.cos(g.paDeg * RAD), v = xi * Math.cos(g.paDeg * RAD) - eta * Math.sin(g.paDeg * RAD);
      return { R: Math.sqrt(g.axisRatio * u * u + (v * v) / g.axisRatio), phi: ((Math.atan2(v, u) / RAD) % 360 + 360) % 360 };
    };
    const part = (r: Slit, dy0: number, dy1: number, tracer: boolean) => {
      const len = dy1 - dy0;
      if (!(len > 0)) return;
      const c = along(r, 0.5 * (dy0 + dy1));
      if (tracer && c.R / g.reArcsec > reachRe) return;
      let flux = 0;
      for (let k = 0; k < 41; k++) flux += Math.pow(10, -0.4 * mu(along(r, dy0 + ((k + 0.5) / 41) * len).R));
      const muMean = -2.5 * Math.log10(flux / 41) + ab;
      const nPix = len / s.yArcsecPerPixel / s.dispersionAPerPixel, nB = skyLen / s.yArcsecPerPixel / s.dispersionAPerPixel;
      const N = photons * Math.pow(10, -0.4 * muMean) * r.widthArcsec * len;
      const skyPix = photons * Math.pow(10, -0.4 * m.skyMagPerArcsec2) * r.widthArcsec * s.yArcsecPerPixel * s.dispersionAPerPixel;
      const key = `${Math.floor(c.R / g.reArcsec)}:${45 * Math.floor(c.phi / 45)}`;
      const b = bins.get(key) ?? { sig: 0, v: 0, sky: 0 };
      b.sig += N;
      b.v += N + nPix * (1 + nPix / nB) * (skyPix + s.darkEPerPixelPerS * t + s.readNoiseE * s.readNoiseE);
      b.sky += nPix * skyPix;
      bins.set(key, b);
    };
    for (const r of mk.rows) {
      if (r.role === 'starlight') part(r, -r.lenBelowArcsec, r.lenAboveArcsec, false);
      if (r.role === 'tracer') {
        part(r, -r.lenBelowArcsec, Math.max(-r.lenBelowArcsec, -extraction / 2), true);
        part(r, Math.min(r.lenAboveArcsec, extraction / 2), r.lenAboveArcsec, true);
      }
    }
  }
  return new Map([...bins].map(([k, b]) => [k, b.sig / Math.sqrt(b.v + Math.pow(f * b.sky, 2))]));
}

describe('generated galaxies: every bin reported as met reaches the target when re-summed independently', () => {
  const profiles = PROFILE_IDS.map(loadProfile);
  // Suite cases with the smaller catalogs (1 500 to 3 000 candidates), over the three profiles.
  it.each([0, 1, 2, 5])('suite case %i', (i) => {
    const sc = suiteScenario(i, profiles);
    const profile = profiles[i % profiles.length];
    const raw = JSON.parse(JSON.stringify(sc.plan));
    raw.observing = { ...(raw.observing ?? {}), skySystematicFraction: 0.003 };
    const sol = solvePlan({ plan: parsePlan(raw), profile, catalog: scenarioCatalog(sc) }, { skipObservingReport: true });
    const file = sol.coverage.starlightBins!;
    expect(file).toBeDefined();
    const models = planStarlightModels(sol.plan, { profile, galaxy: sol.galaxy } as AllocationContext);
    const m = models.modelOf(sol.masks[0]);
    const again = resum(sol.masks.map((k) => ({ paDeg: k.mask.paDeg, rows: k.slits })), sol.galaxy, m, file.goalRe, file.skySystematicFraction, m.catalogToAbMag ?? 0);
    let worst = 0;
    for (const b of file.bins) {
      const sn = again.get(`${b.fromRe}:${b.sectorDeg}`);
      expect(sn).toBeDefined();
      worst = Math.max(worst, Math.abs(sn! / b.snPerA - 1));
      if (b.met) expect(sn!).toBeGreaterThanOrEqual(0.99 * file.targetSnPerA);
    }
    console.log(`suite case ${i}: ${file.bins.filter((b) => b.met).length} of ${file.bins.length} bins met; worst re-summed S/N difference ${(100 * worst).toFixed(2)} %`);
    expect(worst).toBeLessThan(0.03);
    const goal = sol.goals.find((x) => x.name === 'starlightBins');
    if (goal) expect(goal.achieved).toBe(file.bins.filter((b) => b.met && b.fromRe < file.goalRe).length);
  }, 120_000);
});
