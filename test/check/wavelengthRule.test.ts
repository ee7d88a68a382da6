/** The checker's wavelength rule over the velocity range and line windows (contract revision 2), worked by hand. */
import { describe, expect, it } from 'vitest';
import { wavelengthRuleProblems } from '../../src/core/check/wavelengthRule';

// p = 1000 + 10 x + (L - 8600); gap [1400, 1500], margin 10: the band (1390, 1510) and the edges [10, 1990] are refused.
const detector = { pixels: 2000, dispersionAPerPixel: 1, centralWavelengthA: 8600, xArcsecPerPixel: 0.1, gapsPixels: [[1400, 1500]] as [number, number][], edgeMarginPixels: 10 };

describe('checker wavelength rule (contract revision 2, computed by hand from the contract formula)', () => {
  // 8500 A at v_sys 0 +- 500 km/s, +- 10 A: 8500 (1 -+ 500/299792.458) -+ 10 = 8475.8236 .. 8524.1764 A,
  // i.e. pixels 875.82 + 10x .. 924.18 + 10x. Bare line: pixel 900 + 10x.
  const rule = { linesRestA: [8500], vsysKms: 0 };

  it('refuses a slit whose line misses the gap band at v_sys but whose window reaches it (defaults 500 km/s, 10 A)', () => {
    // x = 48: bare pixel 1380 (outside the band), window 1355.8 .. 1404.2 (enters it at 1390).
    expect(wavelengthRuleProblems(detector, 48, { ...rule, velocityHalfRangeKms: 0, lineHalfWindowA: 0 })).toEqual([]);
    const p = wavelengthRuleProblems(detector, 48, rule);
    expect(p).toHaveLength(1);
    expect(p[0]).toMatch(/8475\.82-8524\.18 A.*within 10 pixels of the gap \[1400, 1500\]/);
  });

  it('accepts the window just clear of the band on either side and refuses it just inside', () => {
    // Window ends at 1390 when x = (1390 - 924.1764) / 10 = 46.58236; starts at 1510 when x = (1510 - 875.8236) / 10 = 63.41764.
    expect(wavelengthRuleProblems(detector, 46.58, rule)).toEqual([]);
    expect(wavelengthRuleProblems(detector, 46.59, rule)).toHaveLength(1);
    expect(wavelengthRuleProblems(detector, 63.42, rule)).toEqual([]);
    expect(wavelengthRuleProblems(detector, 63.41, rule)).toHaveLength(1);
  });

  it('uses the plan values when given: a wider velocity range refuses more', () => {
    // dv = 1500 km/s: 8500 * 1500 / c = 42.53 A; window 8447.47 .. 8552.53 A, pixels 847.5 + 10x .. 952.5 + 10x.
    expect(wavelengthRuleProblems(detector, 44, { ...rule, velocityHalfRangeKms: 1500 })).toHaveLength(1); // ends at 1392.5
    expect(wavelengthRuleProblems(detector, 43.7, { ...rule, velocityHalfRangeKms: 1500 })).toEqual([]); // ends at 1389.5
  });

  it('refuses a window over the detector edge', () => {
    // Low end at pixel 875.82 + 10x < 10 when x < -86.58.
    expect(wavelengthRuleProblems(detector, -86.5, rule)).toEqual([]);
    expect(wavelengthRuleProblems(detector, -86.7, rule)[0]).toMatch(/outside \[10, 1990\]/);
  });
});
