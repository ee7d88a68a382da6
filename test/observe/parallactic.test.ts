import { describe, expect, it } from 'vitest';
import { parallacticAngle } from 'astronomia/parallactic';
import { parallacticAngleDeg } from '../../src/core/observe/parallactic';
import { positionAngleDeg } from '../../src/core/sky/separation';
import { wrap180Deg } from '../../src/core/sky/angles';

/** Independent spherical-triangle route: the position angle (East of North) of the zenith seen from the object. */
function zenithPaDeg(haDeg: number, decDeg: number, latDeg: number): number {
  // The zenith has RA = LST and Dec = latitude; put LST = 0 so the object's RA is -H.
  return wrap180Deg(positionAngleDeg(-haDeg, decDeg, 0, latDeg));
}

describe('parallactic angle', () => {
  it('is 0 or 180 deg at transit: 0 when the object culminates South of the zenith (dec < lat), 180 North of it', () => {
    // At transit the zenith lies due North (dec < lat) or due South (dec > lat) of the object: closed form.
    for (const lat of [-70, -30, 0, 28, 64]) {
      for (const dec of [-80, -45, -10, 15, 50, 85]) {
        if (dec === lat) continue;
        const q = parallacticAngleDeg(0, dec, lat);
        expect(Math.abs(q)).toBeCloseTo(dec < lat ? 0 : 180, 10);
      }
    }
  });

  it('is positive West of the meridian and negative East of it', () => {
    expect(parallacticAngleDeg(30, 5, 28)).toBeGreaterThan(0);
    expect(parallacticAngleDeg(-30, 5, 28)).toBeLessThan(0);
  });

  it('equals Meeus (14.1) as implemented by astronomia and the spherical-triangle position angle of the zenith', () => {
    let seed = 7;
    const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
    for (let i = 0; i < 2000; i++) {
      const ha = -180 + 360 * rnd(), dec = -85 + 170 * rnd(), lat = -80 + 160 * rnd();
      const q = parallacticAngleDeg(ha, dec, lat);
      const meeus = (parallacticAngle(lat * Math.PI / 180, dec * Math.PI / 180, ha * Math.PI / 180) * 180) / Math.PI;
      expect(Math.abs(wrap180Deg(q - meeus))).toBeLessThan(1e-8);
      expect(Math.abs(wrap180Deg(q - zenithPaDeg(ha, dec, lat)))).toBeLessThan(1e-7);
    }
  });
});
