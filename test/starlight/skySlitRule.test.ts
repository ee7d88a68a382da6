/** Sky slits where the galaxy is faint compared with the faintest starlight slit. */
import { describe, expect, it } from 'vitest';
import { faintestStarlightMu, skySlitMuThreshold } from '../../src/core/solver/skySlitRule';
import { sersicBn } from '../../src/core/sky/sersic';

const galaxy = { id: 'g', raDeg: 0, decDeg: 0, reArcsec: 40, axisRatio: 0.8, paDeg: 35, distanceMpc: 12, vsysKms: 1180, sersicN: 4, muE: 21.2 };

describe('sky-slit rule', () => {
  it('reference: the Sérsic light at the starlight limit, with b_4 = 7.669 (Graham & Driver 2005, PASA 22, 118)', () => {
    // mu(3.5 Re) = 21.2 + 2.5 * 7.669 / ln 10 * (3.5^(1/4) - 1) = 21.2 + 8.3268 * 0.36778 = 24.262 (by hand)
    const mu = faintestStarlightMu(galaxy, sersicBn(4), { maxRe: 3.5 })!;
    expect(mu).toBeCloseTo(21.2 + ((2.5 * 7.669) / Math.LN10) * (3.5 ** 0.25 - 1), 2);
    expect(mu).toBeCloseTo(24.262, 2);
    const t = skySlitMuThreshold(galaxy, sersicBn(4), { maxRe: 3.5, skyContrastMag: 3, skyMagPerArcsec2: 19.6, catalogToAbMag: 0.45 });
    expect(t).toBeCloseTo(mu + 3, 12);
    // 3 mag fainter: galaxy light in the sky slit under 10^(-1.2) = 6.3 % of the faintest starlight slit's.
    expect(10 ** (-0.4 * 3)).toBeCloseTo(0.0631, 4);
  });
  it('the old reference (the sky) is far brighter: the new rule keeps sky slits out where the galaxy still matters', () => {
    const t = skySlitMuThreshold(galaxy, sersicBn(4), { maxRe: 3.5, skyContrastMag: 3, skyMagPerArcsec2: 19.6, catalogToAbMag: 0.45 });
    expect(t).toBeGreaterThan(19.6 - 0.45 + 3 + 4);
  });
  it('without starlight slits the sky, in the catalog system, is the reference', () => {
    expect(faintestStarlightMu(galaxy, sersicBn(4), { maxRe: 0 })).toBeNull();
    expect(skySlitMuThreshold(galaxy, sersicBn(4), { maxRe: 0, skyContrastMag: 3, skyMagPerArcsec2: 19.6, catalogToAbMag: 0.45 })).toBeCloseTo(19.6 - 0.45 + 3, 12);
  });
});
