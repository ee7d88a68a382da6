import { describe, expect, it } from 'vitest';
import * as Astronomy from 'astronomy-engine';
import { altitudeDeg, azimuthDeg, hourAngleAtAltitudeDeg, hourAngleDeg, transitAltitudeDeg } from '../../src/core/observe/horizon';
import { greenwichApparentSiderealDeg, jdFromUnixMs, localSiderealDeg } from '../../src/core/observe/time';
import { parseDecDeg, parseRaDeg } from '../../src/core/sky/sexagesimal';

describe('altitude and azimuth', () => {
  // Meeus, Astronomical Algorithms 2nd ed., ex. 13.b (values from memory): Venus on 1987 April 10, 19:21:00 UT
  // from +38d55'17", 77d03'56" W, apparent RA 23h09m16.641s, Dec -6d43'11.61": altitude 15.1249 deg and
  // azimuth 68.0337 deg counted westward from South, i.e. 248.0337 deg from North through East here.
  const ms = Date.UTC(1987, 3, 10, 19, 21, 0);
  const lat = 38 + 55 / 60 + 17 / 3600;
  const lonEast = -(77 + 3 / 60 + 56 / 3600);
  const ra = (parseRaDeg('23:09:16.641') as { ok: true; value: number }).value;
  const dec = (parseDecDeg('-06:43:11.61') as { ok: true; value: number }).value;

  it('Meeus example 13.b', () => {
    const lst = localSiderealDeg(greenwichApparentSiderealDeg(jdFromUnixMs(ms)), lonEast);
    const h = hourAngleDeg(lst, ra);
    // Meeus's H = 64.352133 deg as remembered; with his own theta0 = 8h34m56.853s the closed form gives 64.351993,
    // so H, altitude and azimuth are held to 1 arcsec (0.00028 deg), not to Meeus's last printed digit.
    expect(Math.abs(h - 64.352133) * 3600).toBeLessThan(1);
    expect(Math.abs(altitudeDeg(h, dec, lat) - 15.1249) * 3600).toBeLessThan(1);
    expect(Math.abs(azimuthDeg(h, dec, lat) - (68.0337 + 180)) * 3600).toBeLessThan(1);
  });

  it('Meeus example 13.b through astronomy-engine Horizon (independent route), within 1 arcsec', () => {
    const obs = new Astronomy.Observer(lat, lonEast, 0);
    const hor = Astronomy.Horizon(new Date(ms), obs, ra / 15, dec);
    expect(Math.abs(hor.altitude - 15.1249) * 3600).toBeLessThan(1);
    expect(Math.abs(hor.azimuth - 248.0337) * 3600).toBeLessThan(1);
  });

  it('transit altitude is 90 - |lat - dec| and the altitude-crossing hour angle inverts altitudeDeg', () => {
    expect(transitAltitudeDeg(10, 28)).toBe(72);
    expect(altitudeDeg(0, 10, 28)).toBeCloseTo(72, 12);
    const h = hourAngleAtAltitudeDeg(30, 10, 28);
    expect(altitudeDeg(h, 10, 28)).toBeCloseTo(30, 10);
    expect(hourAngleAtAltitudeDeg(80, 10, 28)).toBe(0); // never that high
    expect(hourAngleAtAltitudeDeg(-10, 80, 60)).toBe(180); // circumpolar
  });
});
