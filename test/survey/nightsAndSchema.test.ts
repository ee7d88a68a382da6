import { describe, expect, it } from 'vitest';
import * as Astronomy from 'astronomy-engine';
import { siteNights, DARK_MARGIN_MINUTES } from '../../src/core/survey/darkNights';
import { parseSurvey } from '../../src/core/survey/schema';
import { InputError } from '../../src/core/result';
import { unixMsFromJd } from '../../src/core/observe/time';

describe('dark windows against astronomy-engine', () => {
  // Astronomical twilight: the Sun's centre 18 deg below the horizon (common practice). astronomy-engine's
  // SearchAltitude is an independent route; the windows must lie inside its dark time, by about the margin.
  for (const site of [{ latDeg: 28.1, lonDeg: -112.7, elevationM: 3100 }, { latDeg: -31.3, lonDeg: 149.1, elevationM: 1150 }, { latDeg: 52.2, lonDeg: 6.6, elevationM: 20 }]) {
    it(`lat ${site.latDeg}: every night's window within darkness, ends within ${DARK_MARGIN_MINUTES} min + 1 min of twilight`, () => {
      const nights = siteNights(site, '2027-05-01', '2027-07-10', 10);
      const obs = new Astronomy.Observer(site.latDeg, site.lonDeg, site.elevationM);
      let compared = 0;
      for (const n of nights.nights) {
        const noon = new Date(Date.parse(`${n.night}T12:00:00Z`) - (site.lonDeg / 360) * 86_400_000);
        const dusk = Astronomy.SearchAltitude(Astronomy.Body.Sun, obs, -1, Astronomy.MakeTime(noon), 1, -18);
        const dawn = dusk ? Astronomy.SearchAltitude(Astronomy.Body.Sun, obs, +1, dusk.AddDays(1 / 1440), 1, -18) : null;
        if (!n.window) {
          // At 52.2 deg North near midsummer the Sun never reaches -18 deg: its lowest altitude is
          // -(90 - 52.2 - 23.44) = -14.4 deg at the solstice (closed form).
          expect(site.latDeg).toBeGreaterThan(45);
          continue;
        }
        expect(dusk && dawn).toBeTruthy();
        const startMin = (unixMsFromJd(n.window.startJd) - dusk!.date.getTime()) / 60000;
        const endMin = (dawn!.date.getTime() - unixMsFromJd(n.window.endJd)) / 60000;
        expect(startMin).toBeGreaterThan(0);
        expect(endMin).toBeGreaterThan(0);
        expect(Math.abs(startMin - DARK_MARGIN_MINUTES)).toBeLessThan(1);
        expect(Math.abs(endMin - DARK_MARGIN_MINUTES)).toBeLessThan(1);
        // Moon illumination at the middle of the window against astronomy-engine's phase fraction.
        const mid = new Date(unixMsFromJd((n.window.startJd + n.window.endJd) / 2));
        expect(Math.abs(n.window.moonIllumination - Astronomy.Illumination(Astronomy.Body.Moon, Astronomy.MakeTime(mid)).phase_fraction)).toBeLessThan(0.01);
        compared++;
      }
      expect(compared).toBeGreaterThan(site.latDeg > 45 ? 0 : 60);
    });
  }
});

describe('survey file', () => {
  it('fills the documented defaults and reads priorities', () => {
    const r = parseSurvey({ format: 'haloweave.survey/1', plans: ['a.plan.json', { plan: 'b.plan.json', priority: 3 }], from: '2027-02-01', to: '2027-07-31' });
    expect(r.plans).toEqual([{ plan: 'a.plan.json', priority: 1 }, { plan: 'b.plan.json', priority: 3 }]);
    expect(r.settings).toMatchObject({ maxAirmass: 2, hoursPerMask: null, hoursFrom: 'plan', overheadHoursPerMask: 0, maxMoonIllumination: 1, minMoonSeparationDeg: 30, slotMinutes: 10 });
  });

  it('reports every problem with its key', () => {
    try {
      parseSurvey({ format: 'haloweave.survey/1', plans: ['a.plan.json', 'a.plan.json'], from: '2027-03-01', to: '2027-02-01', moon: { maxIllumination: 2 } }, 's.json');
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).problems.map((p) => p.where)).toEqual(['s.json: moon.maxIllumination']);
    }
    try {
      parseSurvey({ format: 'haloweave.survey/1', plans: ['a.plan.json', 'a.plan.json'], from: '2027-03-01', to: '2027-02-01' }, 's.json');
      expect.unreachable();
    } catch (e) {
      const text = (e as InputError).message;
      expect(text).toMatch(/s\.json: to: the last night 2027-02-01 is before the first night 2027-03-01/);
      expect(text).toMatch(/s\.json: plans\.1: the plan file "a\.plan\.json" is listed twice/);
    }
  });
});
