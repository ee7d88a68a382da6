/**
 * The Moon from the plan's observing date (observe/moonAtDate.ts, astronomia's lunar theory, Meeus ch. 40, 47, 48)
 * against astronomy-engine (npm, a general-purpose ephemeris written independently): phase angle and illuminated
 * fraction, topocentric separation from the galaxy and altitude, at invented sites and dates over two years.
 * Tolerances: 1 arcmin in angles and 0.01 in illuminated fraction.
 */
import { describe, expect, it } from 'vitest';
import * as Astronomy from 'astronomy-engine';
import { designMomentJd, designTimeJd, middleNight, moonAtTime } from '../../src/core/observe/moonAtDate';
import { unixMsFromJd } from '../../src/core/observe/time';
import { planMoon, planSkyMagPerArcsec2 } from '../../src/core/observe/planSky';
import { starlightSettings } from '../../src/core/solver/starlight';
import { parsePlan } from '../../src/core/plan/validate';
import { loadProfile, scenario } from '../search/helpers';
import { solvePlan } from '../../src/core/pipeline/pipeline';
import { planStarlightModels } from '../../src/core/solver/starlightCoadd';
import { starlightBins } from '../../src/core/solver/starlightBins';
import type { AllocationContext } from '../../src/core/solver/allocateMasks';
import { InputError } from '../../src/core/result';

const sites = [
  { latDeg: 19.8, lonDeg: -155.5, elevationM: 4100 },
  { latDeg: -29.3, lonDeg: -70.7, elevationM: 2400 },
  { latDeg: 37.1, lonDeg: 2.5, elevationM: 2100 },
];
const targets = [
  { raDeg: 161.8125, decDeg: -21.405 },
  { raDeg: 0.4, decDeg: 12.2 },
  { raDeg: 250.3, decDeg: 36.5 },
];

/** The same quantities by astronomy-engine: phase angle, fraction, topocentric separation (of date) and geometric altitude. */
function byAstronomyEngine(jdUt: number, target: { raDeg: number; decDeg: number }, site: { latDeg: number; lonDeg: number; elevationM: number }) {
  const date = new Date(unixMsFromJd(jdUt));
  const time = Astronomy.MakeTime(date);
  const obs = new Astronomy.Observer(site.latDeg, site.lonDeg, site.elevationM);
  const ill = Astronomy.Illumination(Astronomy.Body.Moon, time);
  const moon = Astronomy.Equator(Astronomy.Body.Moon, time, obs, true, true);
  const j2000 = Astronomy.VectorFromSphere(new Astronomy.Spherical(target.decDeg, target.raDeg, 1), time);
  const ofDate = Astronomy.RotateVector(Astronomy.Rotation_EQJ_EQD(time), j2000);
  const targetEq = Astronomy.EquatorFromVector(ofDate);
  return {
    phaseAngleDeg: ill.phase_angle,
    fraction: ill.phase_fraction,
    separationDeg: Astronomy.AngleBetween(moon.vec, ofDate),
    altitudeDeg: Astronomy.Horizon(time, obs, moon.ra, moon.dec).altitude,
    targetHourAngleDeg: ((Astronomy.SiderealTime(time) * 15 + site.lonDeg - targetEq.ra * 15) % 360 + 540) % 360 - 180,
  };
}

describe('the Moon at the design time, against astronomy-engine', () => {
  it('phase angle, illuminated fraction, separation and altitude agree within 1 arcmin / 0.01', () => {
    let worstAngleArcmin = 0, worstFraction = 0, n = 0;
    for (let k = 0; k < 27; k++) {
      const site = sites[k % 3], target = targets[Math.floor(k / 3) % 3];
      const date = new Date(Date.UTC(2027, (k * 5) % 24, 1 + ((k * 11) % 28))).toISOString().slice(0, 10);
      const jd = designTimeJd(date, target, site.lonDeg, ((k % 5) - 2) * 1.5);
      const ours = moonAtTime(jd, target, site);
      const ref = byAstronomyEngine(jd, target, site);
      worstAngleArcmin = Math.max(worstAngleArcmin, ...[
        ours.phaseAngleDeg - ref.phaseAngleDeg, ours.separationDeg - ref.separationDeg, ours.altitudeDeg - ref.altitudeDeg,
      ].map((d) => Math.abs(d) * 60));
      worstFraction = Math.max(worstFraction, Math.abs(ours.illuminatedFraction - ref.fraction));
      n++;
    }
    console.log(`moon at ${n} design times: worst angle difference ${worstAngleArcmin.toFixed(3)} arcmin, worst fraction ${worstFraction.toFixed(5)}`);
    expect(worstAngleArcmin).toBeLessThan(1);
    expect(worstFraction).toBeLessThan(0.01);
  });

  it('the design time puts the galaxy at the design hour angle (astronomy-engine sidereal time), nearest local midnight', () => {
    for (const [i, site] of sites.entries()) {
      const target = targets[i];
      for (const haH of [0, -2, 3]) {
        const jd = designTimeJd('2027-04-10', target, site.lonDeg, haH);
        expect(Math.abs(byAstronomyEngine(jd, target, site).targetHourAngleDeg - haH * 15)).toBeLessThan(0.02);
        // Local mean midnight of the night of 2027-04-10 is JD 2461505.5 + 1 - lon/360 (2461505.5 = 2027-04-10 0h UT,
        // 9961 days after JD 2451544.5 = 2000-01-01 0h); within 12 h of it.
        expect(Math.abs(jd - (2461505.5 + 1 - site.lonDeg / 360))).toBeLessThanOrEqual(0.5);
      }
    }
  });

  it('a night range stands for its middle night; an ISO instant is used as given', () => {
    expect(middleNight('2027-02-01', '2027-02-05')).toBe('2027-02-03');
    expect(middleNight('2027-02-01', '2027-02-04')).toBe('2027-02-02');
    const site = sites[0], target = targets[0];
    expect(designMomentJd({ dateRange: ['2027-02-01', '2027-02-05'] }, target, site)).toBe(designTimeJd('2027-02-03', target, site.lonDeg));
    // 2027-03-15T04:30Z = JD 2461479.6875 (JD 2461479.5 is 2027-03-15 0h UT: 2451544.5 + 9935 days).
    expect(designMomentJd({ date: '2027-03-15T04:30Z' }, target, site)).toBeCloseTo(2461479.6875, 9);
  });
});

describe('the plan sky with the Moon of a date', () => {
  const profile = loadProfile('ridge10-narrow');
  const base = {
    format: 'haloweave.plan/1', instrument: 'ridge10-narrow', catalog: 'c.csv',
    galaxy: { id: 'Moon Test', ra: 161.8125, dec: -21.405, reArcsec: 40, axisRatio: 0.8, paDeg: 35, distanceMpc: 12, vsysKms: 1180, sersicN: 4, muE: 21.2 },
    goals: { masks: 4, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498, 8542.1, 8662.1] },
    photometry: { band: 'I', system: 'Vega' },
  };
  // Full and new Moons of 2027 near these nights (phase angles checked by astronomy-engine below, not assumed).
  const nights = Array.from({ length: 30 }, (_, d) => new Date(Date.UTC(2027, 2, 1 + d)).toISOString().slice(0, 10));
  const site = profile.site, galaxy = { raDeg: 161.8125, decDeg: -21.405 };
  const phase = (date: string) => moonAtTime(designTimeJd(date, galaxy, site.lonDeg), galaxy, site).phaseAngleDeg;
  const fullNight = nights.reduce((a, b) => (phase(b) < phase(a) ? b : a));
  const newNight = nights.reduce((a, b) => (phase(b) > phase(a) ? b : a));

  it('brightens the sky near full Moon with the Moon up, leaves it dark at new Moon; explicit moon values win', () => {
    const jdFull = designTimeJd(fullNight, galaxy, site.lonDeg);
    expect(byAstronomyEngine(jdFull, galaxy, site).phaseAngleDeg).toBeLessThan(30);
    const full = parsePlan({ ...base, observing: { date: fullNight } });
    const fresh = parsePlan({ ...base, observing: { date: newNight } });
    const m = planMoon(full.observing, site, galaxy)!;
    expect(m.source).toBe('date');
    expect(m.computed!.illuminatedFraction).toBeGreaterThan(0.9);
    const skyFull = planSkyMagPerArcsec2(19.6, full.observing, full.photometry, site, galaxy);
    const skyNew = planSkyMagPerArcsec2(19.6, fresh.observing, fresh.photometry, site, galaxy);
    if (m.computed!.altitudeDeg > 0) expect(skyFull).toBeLessThan(19.6 - 0.3);
    expect(skyNew).toBeGreaterThan(19.6 - 0.05);
    // The starlight placement uses the same sky (solver/starlight.ts starlightSettings).
    expect(starlightSettings(undefined, profile, full).skyMagPerArcsec2).toBe(skyFull);
    expect(starlightSettings(undefined, profile, full).darkSkyMagPerArcsec2).toBe(19.6);
    // A given Moon (here below the horizon) wins over the date.
    const given = parsePlan({ ...base, observing: { date: fullNight, moon: { phaseAngleDeg: 10, separationDeg: 60, altitudeDeg: -10 } } });
    expect(planMoon(given.observing, site, galaxy)!.source).toBe('given');
    expect(planSkyMagPerArcsec2(19.6, given.observing, given.photometry, site, galaxy)).toBe(19.6);
  });

  it('the co-added starlight bins of a solved plan are measured under that Moon', () => {
    const { plan, profile: prof, catalog } = scenario({ seed: 5, candidates: 400 }, (p) => { p.observing = { date: fullNight }; });
    const sol = solvePlan({ plan, profile: prof, catalog }, { skipObservingReport: true });
    const g = { raDeg: sol.galaxy.raDeg, decDeg: sol.galaxy.decDeg };
    const up = moonAtTime(designTimeJd(fullNight, g, prof.site.lonDeg), g, prof.site).altitudeDeg > 0;
    expect(up).toBe(true); // a full Moon at local midnight is up at this site: the comparison below is not empty
    const ctx = { profile: prof, galaxy: sol.galaxy } as AllocationContext;
    const lit = planStarlightModels(sol.plan, ctx), dark = planStarlightModels({ ...sol.plan, observing: {} }, ctx);
    expect(lit.modelOf(sol.masks[0]).skyMagPerArcsec2).toBe(starlightSettings(sol.plan.starlight, prof, sol.plan).skyMagPerArcsec2);
    const a = starlightBins(sol.masks, sol.galaxy, lit.modelOf, lit.settings), b = starlightBins(sol.masks, sol.galaxy, dark.modelOf, dark.settings);
    expect(a.length).toBe(b.length);
    expect(a.length).toBeGreaterThan(0);
    for (let i = 0; i < a.length; i++) {
      if (up) expect(a[i].snPerAWithoutFloor).toBeLessThan(b[i].snPerAWithoutFloor);
      else expect(a[i].snPerAWithoutFloor).toBe(b[i].snPerAWithoutFloor);
    }
    expect(sol.coverage.starlightBins!.bins.map((x) => x.snPerA)).toEqual(a.map((x) => Math.round(x.snPerA * 100) / 100));
  }, 60_000);

  it('refuses a date that is not one, saying the form to use', () => {
    for (const bad of ['2027-02-30', '15/03/2027', '2027-03-15T25:00Z']) {
      try {
        parsePlan({ ...base, observing: { date: bad } }, 'p.plan.json');
        expect.unreachable();
      } catch (e) {
        expect(e).toBeInstanceOf(InputError);
        expect((e as InputError).problems[0].where).toContain('observing.date');
        expect((e as InputError).problems[0].what).toMatch(/YYYY-MM-DD/);
      }
    }
    expect(() => parsePlan({ ...base, observing: { dateRange: ['2027-05-01', '2027-02-01'] } })).toThrow(InputError);
  });
});
