// The pre-flight check applies the contract's windowed wavelength rule: lines that land on the detector at v_sys but
// whose windows over the velocity range cannot all stay clear of the edges at any x leave no science slit possible.
// Worked by hand from the contract's rule p = pixels/2 + x/xArcsecPerPixel + (L - centralWavelengthA)/dispersionAPerPixel.
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parseProfileText } from '../../src/core/profile/load';
import { scienceSlitProblems } from '../../src/core/plan/scienceFeasibility';

const base = parseProfileText(readFileSync(new URL('../../instrument-profiles/quad8-square.json', import.meta.url), 'utf8'), 'quad8-square.json');
// 2000 pixels of 0.5 A (1000 A), margin 10 pixels, no gaps, centred at 8580 A: usable 1980 pixels = 990 A.
const profile = { ...base, detector: { ...base.detector, pixels: 2000, dispersionAPerPixel: 0.5, centralWavelengthA: 8580, gapsPixels: [] as [number, number][], edgeMarginPixels: 10 } };
const lines = [8498.0, 8542.1, 8662.1];

describe('pre-flight with line windows', () => {
  it('bare lines fit (8498-8662 A spans 164 A < 990 A usable): no problem at v_sys', () => {
    expect(scienceSlitProblems(profile, lines, 0, 'p')).toEqual([]);
    expect(scienceSlitProblems(profile, lines, 0, 'p', { velocityHalfRangeKms: 500, lineHalfWindowA: 10 })).toEqual([]);
  });

  it('windows of +-400 A (span 8084-9076 A, 992 A > 990 A usable) fit nowhere: one problem naming the windows', () => {
    const p = scienceSlitProblems(profile, lines, 0, 'p', { velocityHalfRangeKms: 500, lineHalfWindowA: 400 });
    expect(p).toHaveLength(1);
    expect(p[0].what).toMatch(/not with their windows \(v_sys \+- 500 km\/s, \+- 400 A\)/);
    expect(p[0].fix).toMatch(/goals\.velocityHalfRangeKms/);
    // 385 A each side (962 A span) fits again.
    expect(scienceSlitProblems(profile, lines, 0, 'p', { velocityHalfRangeKms: 500, lineHalfWindowA: 385 })).toEqual([]);
  });
});
