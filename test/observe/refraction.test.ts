import { describe, expect, it } from 'vitest';
import { bennett } from 'astronomia/refraction';
import { differentialRefractionArcsec, refractionArcsec, refractionAtWavelengthArcsec } from '../../src/core/observe/refraction';
import { ARCSEC_PER_RAD } from '../../src/core/sky/angles';
import { edlenRefractivity } from '../../src/core/observe/refractiveIndex';

describe('refraction', () => {
  it('is 206265" (n - 1) tan z (Filippenko 1982): zero at the zenith, (n-1) x 206265 at z = 45', () => {
    expect(refractionArcsec(0, 2.8e-4)).toBe(0);
    expect(refractionArcsec(45, 2.8e-4)).toBeCloseTo(2.8e-4 * ARCSEC_PER_RAD, 6);
  });

  it('is within 0.07 arcmin of Bennett\'s formula (Meeus ch. 16, astronomia refraction.bennett) at 1010 hPa, 10 C, z <= 70 deg', () => {
    // Bennett's formula is an independent empirical fit for 1010 mbar and 10 C in visual light (~5500 A), stated
    // by Meeus to be good to 0.07 arcmin (from memory); it runs about 2.5 % above the plane-parallel Edlén value.
    const air = { pressureHPa: 1010, temperatureC: 10, relativeHumidity: 0 };
    for (const z of [10, 20, 30, 45, 60, 70]) {
      const ours = refractionAtWavelengthArcsec(z, 5500, air);
      const apparentAltRad = ((90 - z) * Math.PI) / 180; // Bennett's argument is the apparent altitude
      const theirs = (bennett(apparentAltRad) * 180 / Math.PI) * 3600;
      expect(Math.abs(ours - theirs)).toBeLessThan(0.07 * 60);
      expect(Math.abs(ours - theirs) / theirs).toBeLessThan(0.03);
    }
  });

  it('differential refraction between 4000 and 9000 A at z = 45 deg and a 700 hPa site is about 1 arcsec (blue higher)', () => {
    const air = { pressureHPa: 700, temperatureC: 5, relativeHumidity: 0.2 };
    const d = differentialRefractionArcsec(45, 4000, 9000, air);
    expect(d).toBeGreaterThan(0.9);
    expect(d).toBeLessThan(1.3);
    expect(differentialRefractionArcsec(45, 9000, 4000, air)).toBeCloseTo(-d, 12);
    // Closed form from the index: (n4000 - n9000) 206265 tan 45.
    expect(d).toBeCloseTo((edlenRefractivity(4000, air) - edlenRefractivity(9000, air)) * ARCSEC_PER_RAD * Math.tan(Math.PI / 4), 9);
  });
});
