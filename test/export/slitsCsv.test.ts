import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { masksToCsv, parseMasksCsv, parseSlitsCsv, slitsToCsv, SLIT_COLUMNS, type MaskRow } from '../../src/core/export/slitsCsv';
import { catalogReportCsv } from '../../src/core/export/catalogReport';
import { InputError } from '../../src/core/result';
import type { Slit } from '../../src/core/geometry/maskSolution';
import { awkwardText, finite, slitArb } from './arbitraries';

const exampleSlit: Slit = {
  maskId: 'm1',
  slitId: 's1',
  objectId: 'gc-001',
  role: 'tracer',
  raDeg: 187.5000001,
  decDeg: -5.25,
  xArcsec: 12.3,
  yArcsec: -40.0625,
  lenBelowArcsec: 3,
  lenAboveArcsec: 4.5,
  widthArcsec: 1,
  tiltDeg: 0,
  priority: 2.5,
  mag: 21.37,
};

describe('slits.csv', () => {
  it('writes exactly the contract columns in order', () => {
    const text = slitsToCsv([exampleSlit]);
    const [header, row] = text.split('\n');
    expect(header).toBe(
      'mask_id,slit_id,object_id,role,ra_deg,dec_deg,x_arcsec,y_arcsec,len_below_arcsec,len_above_arcsec,width_arcsec,tilt_deg,priority,mag',
    );
    expect(SLIT_COLUMNS.join(',')).toBe(header);
    expect(row).toBe('m1,s1,gc-001,tracer,187.5000001,-5.25,12.3,-40.0625,3,4.5,1,0,2.5,21.37');
  });

  it('neutralises formula starts in text cells but not in numbers', () => {
    const text = slitsToCsv([{ ...exampleSlit, objectId: '=SUM(A1)', slitId: '+1', maskId: '@m', yArcsec: -3 }]);
    const row = text.split('\n')[1];
    expect(row.startsWith("'@m,'+1,'=SUM(A1),tracer,")).toBe(true);
    expect(row).toContain(',-3,');
  });

  it('round-trips any slit list exactly (ids with commas, quotes, line ends, non-ASCII, formula starts, apostrophes)', () => {
    fc.assert(
      fc.property(fc.array(slitArb, { maxLength: 12 }), (slits) => {
        const back = parseSlitsCsv(slitsToCsv(slits), 'slits.csv');
        expect(back).toEqual(slits);
        // -0 and full double precision survive too
        back.forEach((b, i) => expect(Object.is(b.decDeg, slits[i].decDeg)).toBe(true));
      }),
      { numRuns: 300 },
    );
  });

  it('names the file, line and column of a bad cell', () => {
    const good = slitsToCsv([exampleSlit, { ...exampleSlit, slitId: 's2' }]);
    const bad = good.replace('s2,gc-001,tracer,187.5000001', 's2,gc-001,bogus,18x7');
    try {
      parseSlitsCsv(bad, 'out/slits.csv');
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      const lines = (e as Error).message.split('\n');
      expect(lines).toContain('out/slits.csv:3, column ra_deg: "18x7" is not a number (write a decimal number such as 12.5)');
      expect(lines.some((l) => l.startsWith('out/slits.csv:3, column role: unknown role "bogus"'))).toBe(true);
      expect(lines).toHaveLength(2);
    }
  });

  it('counts lines through quoted line ends when it reports an error', () => {
    const text = slitsToCsv([{ ...exampleSlit, objectId: 'a\nb\nc' }, { ...exampleSlit, slitId: 's2', mag: null }]).replace(/,4\.5,1,0,2\.5,\n$/, ',4.5,1,0,,\n');
    expect(() => parseSlitsCsv(text, 'slits.csv')).toThrow('slits.csv:5, column priority: missing value');
  });

  it('rejects a header without a contract column and a row with the wrong field count', () => {
    expect(() => parseSlitsCsv('mask_id,slit_id\nm1,s1\n', 'slits.csv')).toThrow(/slits\.csv:1: the header lacks the columns object_id, role/);
    const t = slitsToCsv([exampleSlit]) + 'm1,s9\n';
    expect(() => parseSlitsCsv(t, 'slits.csv')).toThrow('slits.csv:3: the row has 2 fields, the header has 14');
  });
});

describe('masks.csv', () => {
  const mask: MaskRow = { maskId: 'm1', instrument: 'ridge10-narrow', raDeg: 359.99999999, decDeg: -89.5, paDeg: 123.456789012345 };
  it('writes the contract columns and reads them back exactly', () => {
    const text = masksToCsv([mask]);
    expect(text).toBe('mask_id,instrument,ra_deg,dec_deg,pa_deg\nm1,ridge10-narrow,359.99999999,-89.5,123.456789012345\n');
    expect(parseMasksCsv(text, 'masks.csv')).toEqual([mask]);
  });
  it('round-trips awkward ids', () => {
    fc.assert(
      fc.property(fc.array(fc.record({ maskId: awkwardText(1), instrument: awkwardText(1), raDeg: finite, decDeg: finite, paDeg: finite })), (masks) => {
        expect(parseMasksCsv(masksToCsv(masks), 'masks.csv')).toEqual(masks);
      }),
    );
  });
  it('reports a missing number with line and column', () => {
    expect(() => parseMasksCsv('mask_id,instrument,ra_deg,dec_deg,pa_deg\nm1,p,10,,0\n', 'masks.csv')).toThrow('masks.csv:2, column dec_deg: missing value');
  });
});

describe('catalog-report.csv', () => {
  it('has the columns line,column,reason, sorted by line, with awkward reasons quoted', () => {
    const text = catalogReportCsv([
      { line: 9, column: 'dec', reason: 'Dec 95 is outside [-90, 90] deg' },
      { line: 3, column: 'ra', reason: '"abc" is not a number' },
      { line: 3, column: 'mag', reason: 'missing value' },
    ]);
    expect(text).toBe('line,column,reason\n3,ra,"""abc"" is not a number"\n3,mag,missing value\n9,dec,"Dec 95 is outside [-90, 90] deg"\n');
  });
});
