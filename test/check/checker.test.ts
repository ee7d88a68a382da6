/** The independent checker finds each kind of violation, one tampering at a time, in an otherwise valid output. */
import { describe, expect, it } from 'vitest';
import { checkOutput, type CheckInput } from '../../src/core/check/checkOutput';
import { parseProfile } from '../../src/core/profile/load';
import type { Slit } from '../../src/core/geometry/maskSolution';
import { maskToSkyArcsec } from '../../src/core/sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';

// Footprint with a notch from the top: x in [0, 20], y from 60 up to the top edge at 100.
const profile = parseProfile({
  id: 'check-notch', label: 'checker test profile',
  telescope: { apertureM: 8 },
  site: { latDeg: -30, lonDeg: -70, elevationM: 2400, pressureHPa: 760, temperatureC: 8, relativeHumidity: 0.3 },
  footprint: [[-100, -100], [100, -100], [100, 100], [20, 100], [20, 60], [0, 60], [0, 100], [-100, 100]],
  slits: { minLengthArcsec: 4, gapArcsec: 1, widthArcsec: 1, maxTiltDeg: 20 },
  alignment: { boxSizeArcsec: 3, minCount: 2, magRange: [15, 19] },
  // p = 1000 + 10 x + (L - 8600); line 8500 at vsys 0: p = 900 + 10 x; gap [1400, 1500], margin 10.
  detector: { pixels: 2000, dispersionAPerPixel: 1, centralWavelengthA: 8600, xArcsecPerPixel: 0.1, gapsPixels: [[1400, 1500]], edgeMarginPixels: 10 },
});
const mask = { maskId: 'k1', instrument: 'check-notch', raDeg: 359.99, decDeg: -40, paDeg: 120 };

function row(slitId: string, objectId: string, role: Slit['role'], x: number, y: number, below: number, above: number, width: number, tiltDeg = 0): Slit {
  const s = maskToSkyArcsec(x, y, mask.paDeg);
  const p = tangentToSkyDeg(tangentCentre(mask.raDeg, mask.decDeg), s.xiArcsec, s.etaArcsec);
  return { maskId: 'k1', slitId, objectId, role, raDeg: p.raDeg, decDeg: p.decDeg, xArcsec: x, yArcsec: y, lenBelowArcsec: below, lenAboveArcsec: above, widthArcsec: width, tiltDeg, priority: 1, mag: 20 };
}

function valid(): Slit[] {
  return [
    row('A1', 'star1', 'alignment', -50, -80, 1.5, 1.5, 3),
    row('A2', 'star2', 'alignment', 50, 80, 1.5, 1.5, 3),
    row('S1', 'gc1', 'tracer', -20, 0, 2, 6, 1),
    row('S2', 'gc2', 'tracer', 30, 9, 2, 2, 1), // y-span [7, 11]: 1 arcsec above S1's [-2, 6]... 7 - 6 = 1 = gap
    row('S3', 'gc3', 'tracer', -60, 40, 3, 2, 1, 15),
  ];
}

const input = (slits: Slit[], masks = [mask]): CheckInput => ({ masks, slits, profileFor: (id) => (id === profile.id ? profile : null), linesRestA: [8500], vsysKms: 0 });
const rules = (slits: Slit[], masks = [mask]) => checkOutput(input(slits, masks)).map((v) => v.rule);

describe('independent checker', () => {
  it('passes a valid output (gap exactly met, a tilted slit)', () => {
    expect(checkOutput(input(valid()))).toEqual([]);
  });

  it('finds a slit bridging the notch although all four corners are inside', () => {
    const s = valid();
    s[3] = row('S2', 'gc2', 'tracer', 10, 70, 2, 2, 30); // x from -5 to 25 across the notch [0, 20] at y 68..72
    expect(rules(s)).toContain('footprint');
  });

  it('finds a slit whose lengthening or tilt takes a corner outside', () => {
    const s = valid();
    s[2] = row('S1', 'gc1', 'tracer', -20, 0, 2, 101, 1);
    expect(rules(s)).toContain('footprint');
    const t = valid();
    // Upright at x = -99.2 the slit (width 1) stays inside; tilted 15 deg its lower corner leans out to x = -100.46.
    t[4] = row('S3', 'gc3', 'sky', -99.2, 40, 3, 2, 1, 0);
    expect(rules(t)).toEqual([]);
    t[4] = row('S3', 'gc3', 'sky', -99.2, 40, 3, 2, 1, 15);
    expect(rules(t)).toEqual(['footprint']);
  });

  it('finds the gap rule broken by 0.01 arcsec, tilt included', () => {
    const s = valid();
    s[3] = row('S2', 'gc2', 'tracer', 30, 8.99, 2, 2, 1);
    expect(rules(s)).toEqual(['gap']);
    const t = valid();
    // S3 at y 40 tilted 15 deg spans y up to 40 + 2 cos15 + 0.5 sin15 = 42.06; a slit starting at 42.5 is too close.
    t.push(row('S4', 'gc4', 'tracer', 30, 44.5, 2, 2, 1));
    expect(rules(t)).toEqual(['gap']);
  });

  it('finds a half-length below minLength/2, a wrong box, a tilt over the limit', () => {
    const s = valid();
    s[2] = { ...s[2], lenBelowArcsec: 1.9 };
    expect(rules(s)).toEqual(['minimal length']);
    const b = valid();
    b[0] = { ...b[0], widthArcsec: 2 };
    expect(rules(b)).toEqual(['alignment box']);
    const t = valid();
    t[4] = row('S3', 'gc3', 'tracer', -60, 40, 3, 2, 1, 25);
    expect(rules(t)).toContain('tilt');
  });

  it('finds a line in the gap band or off the detector (wavelength rule)', () => {
    const s = valid();
    s[3] = row('S2', 'gc2', 'tracer', 50, 9, 2, 2, 1); // p = 900 + 500 = 1400: in the gap
    expect(rules(s)).toEqual(['wavelength']);
    const m = valid();
    m[3] = row('S2', 'gc2', 'tracer', 49.2, 9, 2, 2, 1); // p = 1392 < 1400 - 10
    expect(rules(m)).toEqual(['wavelength']);
    const e = valid();
    e[3] = row('S2', 'gc2', 'tracer', -89.5, 9, 2, 2, 1); // p = 5 < margin 10
    expect(rules(e)).toEqual(['wavelength']);
    // Sky slits need no lines.
    const k = valid();
    k[3] = { ...row('S2', '', 'sky', 50, 9, 2, 2, 1) };
    expect(rules(k)).toEqual([]);
  });

  it('finds an object used twice (also across masks), a wrong sky position, too few boxes, an unknown mask', () => {
    const s = valid();
    s[3] = { ...s[3], objectId: 'gc1' };
    expect(rules(s)).toEqual(['object once']);
    const p = valid();
    p[2] = { ...p[2], decDeg: p[2].decDeg + 0.01 / 3600 };
    expect(rules(p)).toEqual(['sky position']);
    const a = valid().slice(1);
    expect(rules(a)).toEqual(['alignment count']);
    const u = valid();
    u.push({ ...u[2], maskId: 'nope', slitId: 'X' });
    expect(rules(u)).toEqual(['mask']);
    const two = [mask, { ...mask, maskId: 'k2', raDeg: 0.5 }];
    const other = valid().map((r) => ({ ...r, maskId: 'k2' }));
    expect(rules([...valid(), ...other], two)).toContain('object once');
  });

  it('accepts an alignment star on several masks (contract revision 2), once per mask and never as a science row', () => {
    // A second mask at the same pointing, so every row's sky position is right on both.
    const two = [mask, { ...mask, maskId: 'k2' }];
    const onK2 = (r: Slit) => ({ ...r, maskId: 'k2' });
    const boxes = valid().filter((r) => r.role === 'alignment');
    expect(rules([...valid(), ...boxes.map(onK2)], two)).toEqual([]);
    // The same tracer on both masks is still one object used twice.
    expect(rules([...valid(), ...boxes.map(onK2), onK2(valid()[2])], two)).toEqual(['object once']);
    // A star boxed twice on one mask, or used as a tracer elsewhere, is not allowed.
    expect(rules([...valid(), row('A9', 'star1', 'alignment', -50, -40, 1.5, 1.5, 3)])).toEqual(['object once']);
    expect(rules([...valid(), ...boxes.map(onK2), onK2({ ...valid()[2], objectId: 'star1' })], two)).toEqual(['object once']);
  });

  it('finds an unknown instrument profile', () => {
    expect(rules(valid(), [{ ...mask, instrument: 'missing' }])).toEqual(['instrument']);
  });
});
