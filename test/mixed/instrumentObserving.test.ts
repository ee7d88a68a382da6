/**
 * Exposure settings per spectrograph (plan key instruments[].observing over the plan's observing; plan/instruments.ts
 * instrumentSections): each mask's exposure estimates, hour-angle window, tracer values and starlight exposure follow
 * its own spectrograph's settings.
 */
import { describe, expect, it } from 'vitest';
import { parsePlan } from '../../src/core/plan/validate';
import { InputError } from '../../src/core/result';
import { instrumentSections } from '../../src/core/plan/instruments';
import { tracerExposureModel, type InstrumentContext } from '../../src/core/solver/instrumentContexts';
import { tracerExposure } from '../../src/core/solver/exposure';
import { formatRefractionSummary } from '../../src/core/pipeline/refractionReport';
import type { InstrumentsObservingReport } from '../../src/core/pipeline/instrumentsReport';
import { solvePlan } from '../../src/core/pipeline/pipeline';
import { mixedScenario } from '../../src/core/scenario/mixedScenario';
import { scenarioCatalog } from '../../src/core/scenario/generator';
import { shippedProfile } from './mixedCase';

const narrow = shippedProfile('ridge10-narrow'), wide = shippedProfile('broad65-wide');
const profiles = { 'ridge10-narrow': narrow, 'broad65-wide': wide };

const base = {
  format: 'haloweave.plan/1', catalog: 'c.csv',
  galaxy: { id: 'g', ra: 150, dec: -20, reArcsec: 40, axisRatio: 0.8, paDeg: 30, distanceMpc: 15, vsysKms: 1200, sersicN: 4, muE: 21 },
  goals: { masks: 2, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498, 8542.1, 8662.1] },
  observing: { exposureTimeS: 3600, targetSnPerA: 20, seeingFwhmArcsec: 0.8 },
  starlight: { exposureS: 10800 },
};

describe('observing settings per spectrograph', () => {
  it('an instrument\'s observing keys go over the plan\'s for its masks only; its exposure time is also their starlight exposure', () => {
    const plan = parsePlan({ ...base, instruments: [{ profile: 'ridge10-narrow', masks: 1, observing: { exposureTimeS: 14400, seeingFwhmArcsec: 0.6 } }, { profile: 'broad65-wide', masks: 1 }] });
    expect(instrumentSections(plan, 'ridge10-narrow')).toStrictEqual({
      observing: { exposureTimeS: 14400, targetSnPerA: 20, seeingFwhmArcsec: 0.6 }, starlight: { exposureS: 14400 },
    });
    expect(instrumentSections(plan, 'broad65-wide')).toStrictEqual({ observing: base.observing, starlight: base.starlight });
    // A profile named by path is found by the id of the profile loaded from it.
    const byPath = parsePlan({ ...base, instruments: [{ profile: 'profiles/n.json', masks: 1, observing: { targetSnPerA: 10 } }, { profile: 'broad65-wide', masks: 1 }] });
    expect(instrumentSections(byPath, 'ridge10-narrow', { 'profiles/n.json': narrow }).observing?.targetSnPerA).toBe(10);
  });

  it('four times the exposure doubles the S/N of a bright, source-limited tracer (CCD equation, Howell 2006 sect. 4.4)', () => {
    // Source-noise dominated: S/N = N*/sqrt(N*) = sqrt(N*), N* proportional to t, so S/N scales as sqrt(t). Common
    // practice; the closed form, not the code's own numbers, gives the expected ratio of 2.
    const plan = parsePlan({ ...base, instruments: [{ profile: 'ridge10-narrow', masks: 1, observing: { exposureTimeS: 14400 } }, { profile: 'broad65-wide', masks: 1 }] });
    const own = tracerExposureModel({ ...plan, ...instrumentSections(plan, 'ridge10-narrow') }, narrow);
    const planWide = tracerExposureModel(plan, narrow);
    const sn = (m: typeof own) => tracerExposure({ slitId: '', objectId: '', widthArcsec: 1 }, 8, m).snPerA;
    expect(sn(own) / sn(planWide)).toBeCloseTo(2, 2);
  });

  it('a bad value names the instrument entry and the key', () => {
    let err: unknown;
    try { parsePlan({ ...base, instruments: [{ profile: 'ridge10-narrow', masks: 1, observing: { exposureTimeS: -5 } }, { profile: 'broad65-wide', masks: 1 }] }); } catch (e) { err = e; }
    expect(err).toBeInstanceOf(InputError);
    const p = (err as InputError).problems.map((x) => `${x.where} ${x.what}`).join('\n');
    expect(p).toMatch(/instruments.*observing.*exposureTimeS/);
    expect(p).toMatch(/greater than 0/);
  });

  it('a solved mixed plan: each mask\'s exposure estimates, windows and tracer values follow its spectrograph', () => {
    const s = mixedScenario({ seed: 23, candidates: 1500 }, [{ profile: narrow, masks: 1 }, { profile: wide, masks: 1 }]);
    const solve = (instruments: unknown) => {
      const plan = parsePlan({ ...s.plan, search: { seed: 3, levels: 1, passes: 1 }, observing: { exposureTimeS: 3600, targetSnPerA: 20 }, instruments });
      return solvePlan({ plan, profile: narrow, catalog: scenarioCatalog(s), profiles });
    };
    const sol = solve([{ profile: 'ridge10-narrow', masks: 1 }, { profile: 'broad65-wide', masks: 1, observing: { exposureTimeS: 14400, targetSnPerA: 10, maxAirmass: 1.5 } }]);
    const report = sol.observingReport as InstrumentsObservingReport;
    const instrumentOf = new Map(sol.masks.map((m) => [m.mask.id, m.mask.instrument]));
    for (const e of report.exposures!) {
      const isWide = instrumentOf.get(e.maskId) === 'broad65-wide';
      expect(e.exposureTimeS, e.maskId).toBe(isWide ? 14400 : 3600);
      expect(e.targetSnPerA, e.maskId).toBe(isWide ? 10 : 20);
    }
    expect(report.instruments!.map((p) => [p.instrument, p.settings.exposureTimeS, p.settings.maxAirmass])).toStrictEqual([['ridge10-narrow', 3600, 2], ['broad65-wide', 14400, 1.5]]);
    // The summary gives each mask its own exposure and target, and each window is held against its own exposure.
    const lines = formatRefractionSummary(report).join('\n');
    expect(lines).toContain('4.00 h, S/N per A');
    expect(lines).toContain('1.00 h, S/N per A');
    const wideId = [...instrumentOf].find(([, v]) => v === 'broad65-wide')![0];
    expect(lines).toMatch(new RegExp(`${wideId}: designed for .*4\\.00 h exposure`));
    // The wide field's own airmass limit is named beside its masks (the heading gives the narrow field's 2).
    expect(lines).toMatch(new RegExp(`broad65-wide \\(masks ${wideId}\\): seeing 0\\.8" FWHM, guide \\d+ A, airmass <= 1\\.5`));

    // A longer exposure on the wide field makes its tracers worth more there: the same plan without it gives the
    // wide-field context lower values for faint tracers.
    const plain = solve([{ profile: 'ridge10-narrow', masks: 1 }, { profile: 'broad65-wide', masks: 1 }]);
    const wideMask = (x: typeof sol) => x.masks.find((m) => m.mask.instrument === 'broad65-wide')!;
    expect(sol.plan.instruments![1].observing).toStrictEqual({ exposureTimeS: 14400, targetSnPerA: 10, maxAirmass: 1.5 });
    const eLong = report.exposures!.find((e) => e.maskId === wideMask(sol).mask.id)!;
    const ePlain = (plain.observingReport as InstrumentsObservingReport).exposures!.find((e) => e.maskId === wideMask(plain).mask.id)!;
    expect(eLong.tracersReachingTarget / Math.max(1, eLong.slits.filter((x) => x.role === 'tracer').length))
      .toBeGreaterThan(ePlain.tracersReachingTarget / Math.max(1, ePlain.slits.filter((x) => x.role === 'tracer').length));
  });

  it('the wide field\'s context values a faint tracer more with its own longer exposure', async () => {
    const { instrumentsAllocationContext } = await import('../../src/core/solver/instrumentContexts');
    const s = mixedScenario({ seed: 5, candidates: 300 }, [{ profile: narrow, masks: 1 }, { profile: wide, masks: 1 }]);
    const catalog = scenarioCatalog(s);
    const ctxOf = (instruments: unknown) => {
      const plan = parsePlan({ ...s.plan, observing: { exposureTimeS: 3600 }, instruments });
      const g = { id: 'g', raDeg: 161.8125, decDeg: -21.405, reArcsec: 75, axisRatio: 0.8, paDeg: 35, distanceMpc: 12, vsysKms: 1180, sersicN: 4, muE: 21.2 };
      return instrumentsAllocationContext(plan, [narrow, wide], g as never, catalog.targets, new Float64Array(catalog.targets.length).fill(1), profiles);
    };
    const long = ctxOf([{ profile: 'ridge10-narrow', masks: 1 }, { profile: 'broad65-wide', masks: 1, observing: { exposureTimeS: 14400 } }]);
    const plain = ctxOf([{ profile: 'ridge10-narrow', masks: 1 }, { profile: 'broad65-wide', masks: 1 }]);
    const f = (c: typeof long, id: string) => (c.byInstrument!.get(id) as InstrumentContext).valueFactorOfMag(22.5);
    expect(f(long, 'broad65-wide')).toBeGreaterThan(f(plain, 'broad65-wide'));
    expect(f(long, 'ridge10-narrow')).toBe(f(plain, 'ridge10-narrow'));
  });
});

describe('haloweave sky with an airmass limit per spectrograph', () => {
  it('each site\'s dark hours below the airmass limit use its own instruments[].observing.maxAirmass', async () => {
    const { mkdtempSync, writeFileSync, readFileSync } = await import('node:fs');
    const { tmpdir } = await import('node:os');
    const { join } = await import('node:path');
    const { cli, ROOT } = await import('../cli/runCli');
    const dir = mkdtempSync(join(tmpdir(), 'hw-sky-airmass-'));
    const example = JSON.parse(readFileSync(join(ROOT, 'examples/mixed/two-telescopes.plan.json'), 'utf8'));
    const nights = (instruments: unknown) => {
      writeFileSync(join(dir, 'p.plan.json'), JSON.stringify({ ...example, catalog: join(ROOT, 'examples/mixed', example.catalog), instruments }));
      const r = cli(['sky', join(dir, 'p.plan.json'), '--from', '2027-03-01', '--to', '2027-03-03', '--json'], dir);
      expect(r.code, r.err).toBe(0);
      return JSON.parse(r.out) as { instrument: string; darkHours: number; minAirmass: number }[];
    };
    const plain = nights([{ profile: 'ridge10-narrow', masks: 2 }, { profile: 'broad65-wide', masks: 2 }]);
    const strict = nights([{ profile: 'ridge10-narrow', masks: 2 }, { profile: 'broad65-wide', masks: 2, observing: { maxAirmass: 1.1 } }]);
    const of = (rows: typeof plain, id: string) => rows.filter((r) => r.instrument === id);
    // The narrow field's site is unchanged; the wide field's hours shrink to the time spent below airmass 1.1.
    expect(of(strict, 'ridge10-narrow')).toStrictEqual(of(plain, 'ridge10-narrow'));
    of(strict, 'broad65-wide').forEach((r, k) => {
      const p = of(plain, 'broad65-wide')[k];
      expect(r.minAirmass).toBeLessThan(1.1); // the galaxy passes near the zenith there (dec -21.4, latitude -27.8)
      expect(r.darkHours).toBeLessThan(p.darkHours);
      expect(r.darkHours).toBeGreaterThan(0);
    });
  });
});

describe('the spectral report of a plan with several spectrographs', () => {
  it('gives each mask the usable x range of its own profile\'s footprint and detector, and one block per spectrograph', async () => {
    const { solveMixed } = await import('./mixedCase');
    const { spectralSummaryLines } = await import('../../src/core/spectro/spectralReport');
    const c = solveMixed({ seed: 29, candidates: 800 }, [{ profile: narrow, masks: 1 }, { profile: wide, masks: 1 }]);
    const r = c.solution.spectralReport!;
    expect(r.instruments!.map((p) => p.profileId)).toStrictEqual(['ridge10-narrow', 'broad65-wide']);
    const xExtent = (p: typeof narrow) => [Math.min(...p.footprint.map((q) => q[0])), Math.max(...p.footprint.map((q) => q[0]))];
    for (const m of c.solution.masks) {
      const own = m.mask.instrument === 'broad65-wide' ? wide : narrow;
      const row = r.masks.find((x) => x.maskId === m.mask.id)!;
      // The footprint's x extent read from the profile file.
      expect(row.footprintXArcsec).toStrictEqual(xExtent(own));
    }
    const text = spectralSummaryLines(r).join('\n');
    expect(text.match(/^spectral windows .* instrument (\S+) /gm)!.map((l) => l.split(' instrument ')[1].split(' ')[0])).toStrictEqual(['ridge10-narrow', 'broad65-wide']);
  });
});
