import { describe, expect, it } from 'vitest';
import * as Astronomy from 'astronomy-engine';
import { moonEquatorialOfDate, moonIlluminatedFraction, topocentricEquatorial } from '../../src/core/observe/moon';
import { sunEquatorialOfDate } from '../../src/core/observe/sun';
import { altitudeDeg } from '../../src/core/observe/horizon';
import { greenwichApparentSiderealDeg, jdeFromJdUt, jdFromUnixMs, localSiderealDeg } from '../../src/core/observe/time';

describe('Moon', () => {
  // Meeus, Astronomical Algorithms 2nd ed., ex. 47.a (from memory): 1992 April 12, 0h TD = JDE 2448724.5:
  // apparent RA 134.688470 deg, Dec +13.768368 deg, distance 368409.7 km.
  it('Meeus example 47.a: apparent place and distance', () => {
    const m = moonEquatorialOfDate(2448724.5);
    expect(m.raDeg).toBeCloseTo(134.68847, 5);
    expect(m.decDeg).toBeCloseTo(13.768368, 5);
    expect(m.distanceKm).toBeCloseTo(368409.7, 0);
  });

  it('Meeus example 47.a confirmed by astronomy-engine (geocentric, of date) within 20 arcsec', () => {
    // astronomy-engine uses a fuller lunar theory; Meeus's truncated series is good to ~10 arcsec.
    const jde = 2448724.5;
    const ttMs = (jde - 2440587.5) * 86400000;
    const t = Astronomy.MakeTime(new Date(ttMs));
    const ut = t.AddDays(-(t.tt - t.ut)); // the same instant, expressed in UT
    const geo = Astronomy.GeoVector(Astronomy.Body.Moon, ut, true);
    const eq = Astronomy.EquatorFromVector(Astronomy.RotateVector(Astronomy.Rotation_EQJ_EQD(ut), geo));
    expect(Math.abs(eq.ra * 15 - 134.68847) * 3600).toBeLessThan(20);
    expect(Math.abs(eq.dec - 13.768368) * 3600).toBeLessThan(20);
  });

  it('Meeus example 48.a: illuminated fraction 0.6786 at the same instant, and astronomy-engine agrees within 0.001', () => {
    const jde = 2448724.5;
    const k = moonIlluminatedFraction(moonEquatorialOfDate(jde), sunEquatorialOfDate(jde));
    expect(k).toBeCloseTo(0.6786, 4);
    const ttMs = (jde - 2440587.5) * 86400000;
    const t = Astronomy.MakeTime(new Date(ttMs));
    const ill = Astronomy.Illumination(Astronomy.Body.Moon, t.AddDays(-(t.tt - t.ut)));
    expect(Math.abs(ill.phase_fraction - k)).toBeLessThan(0.001);
  });

  it('topocentric altitude agrees with astronomy-engine within 1 arcmin at sites in both hemispheres', () => {
    // Invented sites; astronomy-engine's Equator(ofdate, topocentric) + Horizon without refraction is the second route.
    const sites = [
      { latDeg: 28.1, lonDeg: -112.7, elevationM: 3100 },
      { latDeg: -31.4, lonDeg: 21.5, elevationM: 1800 },
      { latDeg: 64.2, lonDeg: -17.3, elevationM: 50 },
    ];
    let worst = 0;
    for (const site of sites) {
      for (let k = 0; k < 24; k++) {
        const ms = Date.UTC(2026, k % 12, 1 + k, (k * 5) % 24, 17);
        const jd = jdFromUnixMs(ms);
        const lst = localSiderealDeg(greenwichApparentSiderealDeg(jd), site.lonDeg);
        const topo = topocentricEquatorial(moonEquatorialOfDate(jdeFromJdUt(jd)), site, lst);
        const ours = altitudeDeg(lst - topo.raDeg, topo.decDeg, site.latDeg);
        const obs = new Astronomy.Observer(site.latDeg, site.lonDeg, site.elevationM);
        const eq = Astronomy.Equator(Astronomy.Body.Moon, new Date(ms), obs, true, true);
        const theirs = Astronomy.Horizon(new Date(ms), obs, eq.ra, eq.dec).altitude;
        worst = Math.max(worst, Math.abs(ours - theirs) * 60);
      }
    }
    expect(worst).toBeLessThan(1);
  });
});
