import { describe, expect, it } from 'vitest';
import * as Astronomy from 'astronomy-engine';
import { nightRow, nightTable, datesBetween, jdOfDateText } from '../../src/core/observe/night';
import { nightTrack, sunAltitudeDeg } from '../../src/core/observe/twilight';
import { altitudeDeg } from '../../src/core/observe/horizon';
import { hardieAirmass, altitudeForAirmassDeg } from '../../src/core/observe/airmass';
import { meanPlaceOfDateDeg } from '../../src/core/observe/precession';
import { greenwichApparentSiderealDeg, jdeFromJdUt, nutationAt } from '../../src/core/observe/time';
import { moonTrack, moonEquatorialOfDate, topocentricEquatorial } from '../../src/core/observe/moon';
import { observabilityVerdict } from '../../src/core/observe/observability';
import { parseDateText } from '../../src/core/sky/calendarText';

// Invented sites: both hemispheres, high and low elevation, one at high latitude.
const SITES = [
  { latDeg: 28.1, lonDeg: -112.7, elevationM: 3100 },
  { latDeg: -31.4, lonDeg: 21.5, elevationM: 1800 },
  { latDeg: 64.2, lonDeg: -17.3, elevationM: 50 },
  { latDeg: -24.6, lonDeg: -70.4, elevationM: 2600 },
  { latDeg: 47.9, lonDeg: 140.2, elevationM: 400 },
];
const DATES = ['2026-01-15', '2026-03-21', '2026-06-15', '2026-09-03', '2026-12-01', '2027-04-28'];
const TARGET = { raDeg: 100, decDeg: -20 };
const ms = (iso: string | null) => (iso === null ? null : Date.parse(iso));
const localNoon = (date: string, lonDeg: number) => new Date(Date.parse(`${date}T12:00:00Z`) - (lonDeg / 15) * 3600e3);

describe('Sun events against astronomy-engine (independent route), within 1 minute', () => {
  it('sunset, sunrise, end and start of astronomical twilight at five sites and six dates', () => {
    let worstS = 0, compared = 0;
    for (const site of SITES) {
      for (const date of DATES) {
        const r = nightRow(date, TARGET, site);
        const start = localNoon(date, site.lonDeg);
        const obs = new Astronomy.Observer(site.latDeg, site.lonDeg, site.elevationM);
        // astronomy-engine thins its horizon refraction with the observer's height; Haloweave uses the common-practice
        // -0.833 deg at every elevation, so sunrise/sunset are compared with an observer at height 0 (same definition).
        const obs0 = new Astronomy.Observer(site.latDeg, site.lonDeg, 0);
        const pairs: [string | null, Astronomy.AstroTime | null][] = [
          [r.sunsetUtc, Astronomy.SearchRiseSet(Astronomy.Body.Sun, obs0, -1, start, 1)],
          [r.sunriseUtc, Astronomy.SearchRiseSet(Astronomy.Body.Sun, obs0, +1, start, 1)],
          [r.astroDuskUtc, Astronomy.SearchAltitude(Astronomy.Body.Sun, obs, -1, start, 1, -18)],
          [r.astroDawnUtc, Astronomy.SearchAltitude(Astronomy.Body.Sun, obs, +1, start, 1, -18)],
        ];
        for (const [ours, theirs] of pairs) {
          // Both must agree on whether the event happens that night (high-latitude summer has no -18 deg twilight).
          expect(ours === null).toBe(theirs === null);
          if (ours !== null && theirs !== null) {
            worstS = Math.max(worstS, Math.abs(ms(ours)! - theirs.date.getTime()) / 1000);
            compared++;
          }
        }
      }
    }
    expect(compared).toBeGreaterThan(100);
    expect(worstS).toBeLessThan(60);
  });

  it('the night track (interpolated Sun, linear sidereal time) matches the direct Sun altitude within 1 arcsec', () => {
    for (const site of SITES) {
      const jd0 = jdOfDateText('2026-08-10') + 0.5 - site.lonDeg / 360;
      const track = nightTrack(jd0, 1, site.latDeg, site.lonDeg);
      for (let i = 0; i <= 96; i++) {
        const jd = jd0 + i / 96;
        expect(Math.abs(track.sunAltitudeDeg(jd) - sunAltitudeDeg(jd, site.latDeg, site.lonDeg)) * 3600).toBeLessThan(1);
      }
    }
  });
});

describe('Moon in the night rows against astronomy-engine', () => {
  it('Moon altitude at the middle of the night within 1 arcmin and illumination within 0.002', () => {
    for (const site of SITES) {
      for (const date of DATES) {
        const r = nightRow(date, TARGET, site);
        const t = new Date(r.middleUtc);
        const obs = new Astronomy.Observer(site.latDeg, site.lonDeg, site.elevationM);
        const eq = Astronomy.Equator(Astronomy.Body.Moon, t, obs, true, true);
        const alt = Astronomy.Horizon(t, obs, eq.ra, eq.dec).altitude;
        // middleUtc is rounded to the second; the Moon's altitude changes by at most ~0.25 arcmin in that time.
        expect(Math.abs(r.moonAltitudeDeg - alt) * 60).toBeLessThan(1);
        expect(Math.abs(r.moonIllumination - Astronomy.Illumination(Astronomy.Body.Moon, t).phase_fraction)).toBeLessThan(0.002);
        // Separation from astronomy-engine's topocentric Moon to the target's place of date (precessed here).
        const place = meanPlaceOfDateDeg(TARGET.raDeg, TARGET.decDeg, jdOfDateText(date));
        const sep = Astronomy.AngleBetween(
          Astronomy.VectorFromSphere(new Astronomy.Spherical(eq.dec, eq.ra * 15, 1), t),
          Astronomy.VectorFromSphere(new Astronomy.Spherical(place.decDeg, place.raDeg, 1), t),
        );
        expect(Math.abs(r.moonSeparationDeg - sep) * 60).toBeLessThan(2);
      }
    }
  });
});

describe('the Moon over the night', () => {
  it('the interpolated Moon altitude (used only for Moon-up time) matches the direct topocentric one within 30 arcsec over whole nights', () => {
    for (const site of SITES) {
      for (const date of ['2026-02-03', '2026-07-19']) {
        const jd0 = jdOfDateText(date) + 0.5 - site.lonDeg / 360;
        const nut = nutationAt(jdeFromJdUt(jd0 + 0.5));
        const track = nightTrack(jd0, 1, site.latDeg, site.lonDeg, nut);
        const alt = moonTrack(jd0, 1, site, track.localSiderealDeg, (jd) => moonEquatorialOfDate(jdeFromJdUt(jd))).altitudeDeg;
        for (let i = 0; i <= 48; i++) {
          const jd = jd0 + i / 48;
          const lst = greenwichApparentSiderealDeg(jd) + site.lonDeg;
          const topo = topocentricEquatorial(moonEquatorialOfDate(jdeFromJdUt(jd)), site, lst);
          expect(Math.abs(alt(jd) - altitudeDeg(lst - topo.raDeg, topo.decDeg, site.latDeg)) * 3600).toBeLessThan(30);
        }
      }
    }
  });

  it('dark hours with the Moon down match a brute-force scan with the direct Moon, and never exceed darkHours', () => {
    const site = SITES[1];
    const target = { raDeg: 60, decDeg: -30 };
    for (const date of ['2026-10-20', '2026-10-26', '2026-11-02']) {
      const r = nightRow(date, target, site);
      expect(r.darkHoursMoonDown).toBeLessThanOrEqual(r.darkHours + 1e-12);
      const jd0 = jdOfDateText(date) + 0.5 - site.lonDeg / 360;
      const place = meanPlaceOfDateDeg(target.raDeg, target.decDeg, jd0 + 0.5);
      const limitAlt = altitudeForAirmassDeg(2);
      let good = 0;
      const n = 2880;
      for (let i = 0; i < n; i++) {
        const jd = jd0 + (i + 0.5) / n;
        if (sunAltitudeDeg(jd, site.latDeg, site.lonDeg) >= -18) continue;
        const lst = greenwichApparentSiderealDeg(jd) + site.lonDeg;
        if (altitudeDeg(lst - place.raDeg, place.decDeg, site.latDeg) <= limitAlt) continue;
        const topo = topocentricEquatorial(moonEquatorialOfDate(jdeFromJdUt(jd)), site, lst);
        if (altitudeDeg(lst - topo.raDeg, topo.decDeg, site.latDeg) < 0) good++;
      }
      expect(Math.abs(r.darkHoursMoonDown - (good * 24) / n)).toBeLessThan(0.03);
    }
  });
});

describe('dark hours, transit and minimum airmass', () => {
  const site = SITES[0];
  const target = { raDeg: 30, decDeg: 10 };

  it('dark hours below the airmass limit and the minimum airmass match a brute-force scan at 20-second steps', () => {
    for (const date of ['2026-10-01', '2026-12-20', '2027-02-14']) {
      for (const maxAirmass of [1.3, 2, 3]) {
        const r = nightRow(date, target, site, { maxAirmass });
        const jd0 = jdOfDateText(date) + 0.5 - site.lonDeg / 360;
        const place = meanPlaceOfDateDeg(target.raDeg, target.decDeg, jd0 + 0.5);
        const limitAlt = altitudeForAirmassDeg(maxAirmass);
        let dark = 0, good = 0, bestAlt = -90;
        const n = 4320;
        for (let i = 0; i < n; i++) {
          const jd = jd0 + (i + 0.5) / n;
          if (sunAltitudeDeg(jd, site.latDeg, site.lonDeg) >= -18) continue;
          dark++;
          const alt = altitudeDeg(greenwichApparentSiderealDeg(jd) + site.lonDeg - place.raDeg, place.decDeg, site.latDeg);
          bestAlt = Math.max(bestAlt, alt);
          if (alt > limitAlt) good++;
        }
        expect(Math.abs(r.darkTotalHours - (dark * 24) / n)).toBeLessThan(0.02);
        expect(Math.abs(r.darkHours - (good * 24) / n)).toBeLessThan(0.02);
        // The scan only samples dark moments, so it can only find an equal or larger airmass; the exact minimum may sit
        // at dusk or dawn, where a setting target's airmass changes by ~1e-3 in the scan's 20 s.
        const scanned = hardieAirmass(90 - bestAlt)!;
        expect(r.minAirmass!).toBeLessThanOrEqual(scanned + 1e-7);
        expect(scanned - r.minAirmass!).toBeLessThan(2e-3);
      }
    }
  });

  it('transit is when the hour angle is zero, nearest the middle of the night', () => {
    const r = nightRow('2026-10-01', target, site);
    const jd = Date.parse(r.transitUtc!) / 86400000 + 2440587.5;
    const place = meanPlaceOfDateDeg(target.raDeg, target.decDeg, jd);
    const ha = greenwichApparentSiderealDeg(jd) + site.lonDeg - place.raDeg;
    expect(Math.abs((((ha % 360) + 540) % 360) - 180) * 240).toBeLessThan(1.5); // seconds of time (rounded to 1 s)
    expect(Math.abs(Date.parse(r.transitUtc!) - Date.parse(r.middleUtc)) / 3600e3).toBeLessThan(12.1);
    expect(r.transitAltitudeDeg).toBeCloseTo(72, 1);
  });

  it('a lower airmass limit never gives more dark hours', () => {
    const rows = [1.2, 1.5, 2, 3].map((x) => nightRow('2026-11-11', target, site, { maxAirmass: x }).darkHours);
    for (let i = 1; i < rows.length; i++) expect(rows[i]).toBeGreaterThanOrEqual(rows[i - 1]);
    expect(rows[0]).toBeLessThan(rows[3]);
  });
});

describe('targets and sites where nothing can be observed', () => {
  it('a galaxy that never rises gives "not observable" rows and verdict, not an error', () => {
    const site = SITES[0];
    const target = { raDeg: 80, decDeg: -75 }; // culminates at 90 - |28.1 + 75| = -13.1 deg
    const rows = nightTable('2026-10-01', '2026-10-10', target, site);
    expect(rows).toHaveLength(10);
    for (const r of rows) {
      expect(r.observable).toBe(false);
      expect(r.darkHours).toBe(0);
      expect(r.minAirmass).toBeNull();
      expect(r.transitAltitudeDeg).toBeLessThan(0);
      expect(r.astroDuskUtc).not.toBeNull();
    }
    expect(observabilityVerdict(rows, target, site, 2)).toMatch(/^not observable: .*never rises/);
  });

  it('a target that rises but never reaches the airmass limit is "not observable" with that reason', () => {
    const site = SITES[0];
    const target = { raDeg: 80, decDeg: -50 }; // culminates at 11.9 deg, airmass ~4.8
    const rows = nightTable('2026-10-01', '2026-10-03', target, site);
    expect(observabilityVerdict(rows, target, site, 2)).toMatch(/never gets above airmass 2/);
    expect(rows[0].minAirmass).not.toBeNull();
  });

  it('a polar summer site has no sunset, no twilight and zero dark hours; astronomy-engine agrees there is no sunset', () => {
    const site = { latDeg: 78.2, lonDeg: 15.6, elevationM: 20 };
    const target = { raDeg: 200, decDeg: 60 }; // circumpolar there
    const rows = nightTable('2026-06-10', '2026-06-25', target, site);
    for (const r of rows) {
      expect([r.sunsetUtc, r.astroDuskUtc, r.astroDawnUtc, r.sunriseUtc]).toEqual([null, null, null, null]);
      expect(r.darkHours).toBe(0);
      expect(r.darkTotalHours).toBe(0);
      expect(r.minAirmass).toBeNull();
      expect(r.transitUtc).not.toBeNull();
    }
    const obs = new Astronomy.Observer(site.latDeg, site.lonDeg, 0);
    expect(Astronomy.SearchRiseSet(Astronomy.Body.Sun, obs, -1, localNoon('2026-06-15', site.lonDeg), 1)).toBeNull();
    expect(observabilityVerdict(rows, target, site, 2)).toMatch(/no astronomical darkness/);
  });

  it('a polar winter site has no sunset or sunrise but dark time, and a circumpolar target is observable', () => {
    const site = { latDeg: 78.2, lonDeg: 15.6, elevationM: 20 };
    const target = { raDeg: 200, decDeg: 60 };
    const r = nightRow('2026-12-21', target, site);
    expect(r.sunsetUtc).toBeNull();
    expect(r.sunriseUtc).toBeNull();
    expect(r.darkTotalHours).toBeGreaterThan(12);
    expect(r.darkHours).toBeGreaterThan(0);
    expect(r.observable).toBe(true);
  });
});

describe('dates', () => {
  it('parses YYYY-MM-DD and says what is wrong otherwise', () => {
    expect(parseDateText('2026-02-28')).toEqual({ ok: true, value: '2026-02-28' });
    expect(parseDateText('2028-02-29').ok).toBe(true);
    for (const [bad, msg] of [['2026-02-29', /28 days/], ['2026-13-01', /month 13/], ['26-1-1', /YYYY-MM-DD/], ['tomorrow', /YYYY-MM-DD/], ['1800-01-01', /outside/]] as const) {
      const r = parseDateText(bad);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.error).toMatch(msg);
    }
  });

  it('lists every date of a range, across month and year ends', () => {
    const d = datesBetween('2026-12-30', '2027-01-02');
    expect(d).toEqual(['2026-12-30', '2026-12-31', '2027-01-01', '2027-01-02']);
    expect(datesBetween('2026-10-01', '2027-04-02')).toHaveLength(184);
  });
});
