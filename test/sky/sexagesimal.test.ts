import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { formatDecDms, formatRaHms, parseDecDeg, parseRaDeg } from '../../src/core/sky/sexagesimal';
import type { Result } from '../../src/core/result';

/** The value of a Result, or a test failure that shows the error text. */
function value(r: Result<number>): number {
  if (!r.ok) throw new Error(`expected a value, got the error: ${r.error}`);
  return r.value;
}

function errorOf(r: Result<number>): string {
  if (r.ok) throw new Error(`expected an error, got the value ${r.value}`);
  return r.error;
}

// 12h34m56.7s = (12 + 34/60 + 56.7/3600) * 15 deg, by hand: 188.73625 deg.
const RA_12_34_56_7 = (12 + 34 / 60 + 56.7 / 3600) * 15;
// 5d06m07.8s = 5 + 6/60 + 7.8/3600 deg.
const DEC_5_06_07_8 = 5 + 6 / 60 + 7.8 / 3600;

describe('parseRaDeg: every form of the contract', () => {
  it.each([
    ['12:34:56.7'],
    ['12 34 56.7'],
    ['12h34m56.7s'],
    ['12h 34m 56.7s'],
    ['12 h 34 m 56.7 s'],
    ['12H34M56.7S'],
    ['12h34m56.7'],
    ['  12:34:56.7  '],
    ['+12:34:56.7'],
  ])('%s is hours, minutes, seconds', (text) => {
    expect(value(parseRaDeg(text))).toBeCloseTo(RA_12_34_56_7, 12);
  });

  it('two fields and single-letter forms', () => {
    expect(value(parseRaDeg('12:30'))).toBeCloseTo(187.5, 12);
    expect(value(parseRaDeg('12h30m'))).toBeCloseTo(187.5, 12);
    expect(value(parseRaDeg('12h'))).toBeCloseTo(180, 12);
    expect(value(parseRaDeg('12.5h'))).toBeCloseTo(187.5, 12);
    expect(value(parseRaDeg('12 30.5'))).toBeCloseTo((12 + 30.5 / 60) * 15, 12);
  });

  it('degree letters and the degree sign mean degrees, not hours', () => {
    expect(value(parseRaDeg('187d30m00s'))).toBeCloseTo(187.5, 12);
    expect(value(parseRaDeg('187°30\'00"'))).toBeCloseTo(187.5, 12);
    expect(value(parseRaDeg('187°30′00″'))).toBeCloseTo(187.5, 12);
    expect(value(parseRaDeg('187d'))).toBe(187);
  });

  it('decimal text and numbers are degrees', () => {
    expect(value(parseRaDeg('187.5'))).toBe(187.5);
    expect(value(parseRaDeg(' 187.5 '))).toBe(187.5);
    expect(value(parseRaDeg('1.875e2'))).toBe(187.5);
    expect(value(parseRaDeg(187.5))).toBe(187.5);
    expect(value(parseRaDeg(0))).toBe(0);
    expect(value(parseRaDeg(359.999999))).toBe(359.999999);
    expect(value(parseRaDeg('00:00:00'))).toBe(0);
  });

  it('errors say what was wrong', () => {
    expect(errorOf(parseRaDeg('24:00:00'))).toMatch(/beyond 24h/);
    expect(errorOf(parseRaDeg('25 00 00'))).toMatch(/25\.0000 h, beyond 24h/);
    expect(errorOf(parseRaDeg('12:60:00'))).toMatch(/minutes field is 60; minutes must be below 60/);
    expect(errorOf(parseRaDeg('12:30:60'))).toMatch(/seconds field is 60; seconds must be below 60/);
    expect(errorOf(parseRaDeg('12:30:75.5'))).toMatch(/seconds field is 75\.5/);
    expect(errorOf(parseRaDeg('12:3a:00'))).toMatch(/field 2 \("3a"\) is not a number/);
    expect(errorOf(parseRaDeg('12:34:56.7.8'))).toMatch(/field 3 \("56\.7\.8"\) is not a number/);
    expect(errorOf(parseRaDeg('twelve'))).toMatch(/field 1 \("twelve"\) is not a number/);
    expect(errorOf(parseRaDeg('12.5:30'))).toMatch(/field 1 \("12\.5"\) has decimals; only the last field may have decimals/);
    expect(errorOf(parseRaDeg('1:2:3:4'))).toMatch(/expected 1 to 3 fields/);
    expect(errorOf(parseRaDeg(''))).toMatch(/empty text/);
    expect(errorOf(parseRaDeg('-01:00:00'))).toMatch(/negative; RA runs from 0h to 24h/);
    expect(errorOf(parseRaDeg(-1))).toMatch(/outside \[0, 360\)/);
    expect(errorOf(parseRaDeg(400))).toMatch(/outside \[0, 360\)/);
    expect(errorOf(parseRaDeg(Number.NaN))).toMatch(/not a finite number/);
  });

  // Defects found by this suite and fixed in sexagesimal.ts: an empty field was silently collapsed
  // ("12::34" read as 12h34m) and unit letters were not checked for order ("12h34s" read as 12h34m).
  it('rejects an empty field instead of collapsing it', () => {
    expect(errorOf(parseRaDeg('12::34'))).toMatch(/field 2 is empty/);
    expect(errorOf(parseRaDeg('12:34:'))).toMatch(/field 3 is empty/);
    expect(errorOf(parseRaDeg(':12'))).toMatch(/field 1 is empty/);
  });

  it('rejects unit letters out of order instead of reading seconds as minutes', () => {
    expect(errorOf(parseRaDeg('12h34s'))).toMatch(/"s" marks the seconds but follows field 2 \("34"\)/);
    expect(errorOf(parseRaDeg('30m'))).toMatch(/"m" marks the minutes but follows field 1/);
    expect(errorOf(parseRaDeg('12m30h'))).toMatch(/"m" marks the minutes but follows field 1/);
  });
});

describe('parseDecDeg: every form of the contract', () => {
  it.each([
    ['-05:06:07.8'],
    ['-05 06 07.8'],
    ['-05d06m07.8s'],
    ['-05D06M07.8S'],
    ['-05°06\'07.8"'],
    ["-05°06'07.8''"],
    ['-05°06′07.8″'],
    ['\u221205 06 07.8'], // Unicode minus sign
    ['- 05 06 07.8'],
  ])('%s is minus 5 deg 6 arcmin 7.8 arcsec', (text) => {
    expect(value(parseDecDeg(text))).toBeCloseTo(-DEC_5_06_07_8, 12);
  });

  it('positive and unsigned forms', () => {
    expect(value(parseDecDeg('+05:06:07.8'))).toBeCloseTo(DEC_5_06_07_8, 12);
    expect(value(parseDecDeg('05:06:07.8'))).toBeCloseTo(DEC_5_06_07_8, 12);
    expect(value(parseDecDeg('45d'))).toBe(45);
    expect(value(parseDecDeg('1°'))).toBe(1);
  });

  it('keeps the sign of a zero leading field', () => {
    expect(value(parseDecDeg('-00 30'))).toBeCloseTo(-0.5, 15);
    expect(value(parseDecDeg('-00:30'))).toBeCloseTo(-0.5, 15);
    expect(value(parseDecDeg('-00:00:30'))).toBeCloseTo(-30 / 3600, 15);
    expect(value(parseDecDeg('-00d00m30s'))).toBeCloseTo(-30 / 3600, 15);
    expect(value(parseDecDeg('-0 0 0.5'))).toBeCloseTo(-0.5 / 3600, 15);
    expect(value(parseDecDeg('+00 30'))).toBeCloseTo(0.5, 15);
  });

  it('decimal text and numbers are degrees; the poles are allowed', () => {
    expect(value(parseDecDeg('-12.5'))).toBe(-12.5);
    expect(value(parseDecDeg(-12.5))).toBe(-12.5);
    expect(value(parseDecDeg('90:00:00'))).toBe(90);
    expect(value(parseDecDeg('-90'))).toBe(-90);
    expect(value(parseDecDeg(90))).toBe(90);
  });

  it('errors say what was wrong', () => {
    expect(errorOf(parseDecDeg('90:00:01'))).toMatch(/"90:00:01" is outside \[-90, 90\] deg/);
    expect(errorOf(parseDecDeg('-91'))).toMatch(/outside \[-90, 90\]/);
    expect(errorOf(parseDecDeg(90.0001))).toMatch(/outside \[-90, 90\]/);
    expect(errorOf(parseDecDeg('12:60'))).toMatch(/minutes field is 60; minutes must be below 60/);
    expect(errorOf(parseDecDeg('12d60m'))).toMatch(/minutes field is 60/);
    expect(errorOf(parseDecDeg('12:30:60'))).toMatch(/seconds field is 60/);
    expect(errorOf(parseDecDeg('12h30m'))).toMatch(/uses hour letters; write it in degrees/);
    expect(errorOf(parseDecDeg('12:x:00'))).toMatch(/field 2 \("x"\) is not a number/);
    expect(errorOf(parseDecDeg(Number.POSITIVE_INFINITY))).toMatch(/not a finite number/);
    expect(errorOf(parseDecDeg('   '))).toMatch(/empty text/);
  });
});

describe('formatRaHms / formatDecDms', () => {
  it('formats known values', () => {
    expect(formatRaHms(RA_12_34_56_7)).toBe('12:34:56.70');
    expect(formatRaHms(0)).toBe('00:00:00.00');
    expect(formatRaHms(10, 0)).toBe('00:40:00');
    expect(formatDecDms(-DEC_5_06_07_8)).toBe('-05:06:07.8');
    expect(formatDecDms(DEC_5_06_07_8)).toBe('+05:06:07.8');
    expect(formatDecDms(-0.5)).toBe('-00:30:00.0');
    expect(formatDecDms(-30 / 3600)).toBe('-00:00:30.0');
    expect(formatDecDms(10, 0)).toBe('+10:00:00');
  });

  it('carries 59.999 s upward through minutes, hours and degrees', () => {
    // 00h00m59.999s rounds to 00:01:00.00 at two decimals, never 00:00:60.00.
    expect(formatRaHms((59.999 / 3600) * 15)).toBe('00:01:00.00');
    // 11h59m59.999s -> 12:00:00.00.
    expect(formatRaHms((11 + 59 / 60 + 59.999 / 3600) * 15)).toBe('12:00:00.00');
    // 23h59m59.999s -> wraps to 00:00:00.00 rather than 24:00:00.00.
    expect(formatRaHms((23 + 59 / 60 + 59.999 / 3600) * 15)).toBe('00:00:00.00');
    expect(formatDecDms(-(59.99 / 3600))).toBe('-00:01:00.0');
    expect(formatDecDms(-(9 + 59 / 60 + 59.97 / 3600))).toBe('-10:00:00.0');
    expect(formatDecDms(89 + 59 / 60 + 59.99 / 3600)).toBe('+90:00:00.0');
  });

  it('does not print a minus sign on a value that rounds to zero', () => {
    expect(formatDecDms(-1e-9)).toBe('+00:00:00.0');
    expect(formatDecDms(-0)).toBe('+00:00:00.0');
  });

  it('RA round trip: parse(format(ra)) is within half a unit of the last decimal (fast-check)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 360, maxExcluded: true, noNaN: true }), fc.integer({ min: 0, max: 4 }), (raDeg, decimals) => {
        const text = formatRaHms(raDeg, decimals);
        expect(text).toMatch(/^\d\d:\d\d:\d\d(\.\d+)?$/);
        const back = value(parseRaDeg(text));
        // Half a unit of the last decimal of time seconds, in degrees (1 s of time = 15 arcsec).
        const halfUnitDeg = (0.5 * 10 ** -decimals * 15) / 3600;
        const diff = Math.abs(((back - raDeg + 540) % 360) - 180);
        expect(diff).toBeLessThanOrEqual(halfUnitDeg * (1 + 1e-9) + 1e-12);
      }),
      { numRuns: 5000, seed: 20261202 },
    );
  });

  it('Dec round trip including values just below a carry (fast-check)', () => {
    const nearCarry = fc
      .tuple(fc.integer({ min: -89, max: 89 }), fc.integer({ min: 0, max: 59 }), fc.double({ min: 59.9, max: 59.99999, noNaN: true }))
      .map(([d, m, s]) => Math.sign(d || 1) * (Math.abs(d) + m / 60 + s / 3600))
      .filter((v) => Math.abs(v) <= 90);
    fc.assert(
      fc.property(fc.oneof(fc.double({ min: -90, max: 90, noNaN: true }), nearCarry), fc.integer({ min: 0, max: 4 }), (decDeg, decimals) => {
        const text = formatDecDms(decDeg, decimals);
        expect(text).toMatch(/^[+-]\d\d:\d\d:\d\d(\.\d+)?$/);
        const fields = text.slice(1).split(':').map(Number);
        expect(fields[1]).toBeLessThan(60);
        expect(fields[2]).toBeLessThan(60);
        const back = value(parseDecDeg(text));
        const halfUnitDeg = (0.5 * 10 ** -decimals) / 3600;
        expect(Math.abs(back - decDeg)).toBeLessThanOrEqual(halfUnitDeg * (1 + 1e-9) + 1e-12);
      }),
      { numRuns: 5000, seed: 20261203 },
    );
  });

  it('text forms round trip through each other: h/m/s letters, spaces and colons agree (fast-check)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 23 }), fc.integer({ min: 0, max: 59 }), fc.integer({ min: 0, max: 59999 }), (h, m, ms) => {
        const s = (ms / 1000).toFixed(3);
        const a = value(parseRaDeg(`${h}:${m}:${s}`));
        expect(value(parseRaDeg(`${h} ${m} ${s}`))).toBe(a);
        expect(value(parseRaDeg(`${h}h${m}m${s}s`))).toBe(a);
        expect(a).toBeCloseTo((h + m / 60 + ms / 1000 / 3600) * 15, 10);
      }),
      { numRuns: 2000, seed: 7 },
    );
  });
});
