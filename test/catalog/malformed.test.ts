import { describe, expect, it } from 'vitest';
import { readCatalog } from '../../src/core/catalog/read';
import { rejectedRowCount } from '../../src/core/catalog/validate';

/**
 * A catalog with every kind of bad row the issue lists, in one file: BOM, Windows line ends, a trailing comma
 * on the header and on some rows, blank lines, missing fields, text in numeric columns, Dec of 95, duplicate ids,
 * plus a quoted id holding a comma and a line end (it spans lines 14-15).
 */
const lines = [
  'id,ra,dec,mag,color,', // 1 header with a trailing comma
  'gc1,187.50,-5.10,21.0,0.9,', // 2 ok (trailing comma)
  '', // 3 blank line
  'gc2,187.51,-5.11,21.1,1.0', // 4 ok (no trailing comma)
  'gc3,187.52,-5.12', // 5 missing fields (mag, color)
  'gc4,abc,-5.13,21.3,1.1,', // 6 text in RA
  'gc5,187.54,-5.14,bright,1.1,', // 7 text in mag
  'gc6,187.55,95,21.5,1.2,', // 8 Dec of 95
  'gc1,187.56,-5.16,21.6,1.3,', // 9 duplicate of line 2
  '', // 10 blank line
  'gc7,12:30:13.2,-05:09:36,21.7,1.4,', // 11 ok, sexagesimal
  'gc8,187.58,-5.18,21.8,1.5,extra,', // 12 too many fields
  ',187.59,-5.19,21.9,1.6,', // 13 missing id
  '"gc,9', // 14 quoted id with a comma and a line end ...
  'b",187.60,-5.20,22.0,n/a,', // 15 ... ends here; color n/a = missing, row ok
  'gc10,187.61,,22.1,1.7,', // 16 missing Dec
];
const text = '\ufeff' + lines.join('\r\n') + '\r\n';

describe('a malformed catalog', () => {
  const r = readCatalog(text, 'bad.csv');

  it('uses exactly the good rows, with their file lines', () => {
    expect(r.format).toBe('csv');
    expect(r.targets.map((t) => [t.id, t.line])).toEqual([
      ['gc1', 2],
      ['gc2', 4],
      ['gc7', 11],
      ['gc,9\r\nb', 14],
    ]);
    expect(r.targets[0]).toEqual({ id: 'gc1', raDeg: 187.5, decDeg: -5.1, mag: 21, color: 0.9, priority: null, role: 'tracer', line: 2, extra: {} });
    // 12:30:13.2 h = 187.555 deg; -05:09:36 = -5.16 deg
    expect(r.targets[2].raDeg).toBeCloseTo(187.555, 10);
    expect(r.targets[2].decDeg).toBeCloseTo(-5.16, 10);
    expect(r.targets[3].color).toBeNull();
  });

  it('reports exactly the bad rows with line, column and reason', () => {
    expect(r.rejects.map((x) => [x.line, x.column])).toEqual([
      [3, '(row)'],
      [5, 'mag'],
      [6, 'ra'],
      [7, 'mag'],
      [8, 'dec'],
      [9, 'id'],
      [10, '(row)'],
      [12, '(row)'],
      [13, 'id'],
      [16, 'dec'],
    ]);
    const reason = (line: number) => r.rejects.find((x) => x.line === line)!.reason;
    expect(reason(3)).toBe('blank line');
    expect(reason(5)).toMatch(/^wrong field count: missing field, the row has 3 fields, the header \(line 1\) has 5/);
    expect(reason(6)).toBe('"abc" is not a number');
    expect(reason(7)).toBe('"bright" is not a number');
    expect(reason(8)).toBe('Dec 95 is outside [-90, 90] deg');
    expect(reason(9)).toBe('duplicate id "gc1", first used on line 2');
    expect(reason(12)).toMatch(/^wrong field count: the row has 7 fields/);
    expect(reason(13)).toBe('missing value');
    expect(reason(16)).toBe('missing value');
  });

  it('counts rows read, used and rejected consistently (blank lines count as rows read and are reported)', () => {
    expect(r.rowsRead).toBe(14); // lines 2..16 minus line 15, which belongs to the row of line 14
    expect(r.targets.length).toBe(4);
    expect(rejectedRowCount(r)).toBe(10);
    expect(new Set(r.rejects.map((x) => x.line)).size).toBe(10);
  });

  it('gives the same result with LF line ends and without the BOM (lines unchanged)', () => {
    const r2 = readCatalog(lines.join('\n') + '\n', 'bad.csv');
    expect(r2.rejects.map((x) => [x.line, x.column])).toEqual(r.rejects.map((x) => [x.line, x.column]));
    expect(r2.targets.map((t) => t.line)).toEqual([2, 4, 11, 14]);
  });

  it('reports every problem of a row, not only the first', () => {
    const r3 = readCatalog('id,ra,dec,mag\nx,400,-95,faint\n', 'c.csv');
    expect(r3.rejects).toEqual([
      { line: 2, column: 'ra', reason: 'RA 400 deg is outside [0, 360)' },
      { line: 2, column: 'dec', reason: 'Dec -95 is outside [-90, 90] deg' },
      { line: 2, column: 'mag', reason: '"faint" is not a number' },
    ]);
    expect(r3.rowsRead).toBe(1);
  });
});

describe('an empty catalog', () => {
  it('is an error that says so; a header without rows reads zero rows', () => {
    expect(() => readCatalog('', 'e.csv')).toThrow('e.csv: the catalog is empty (no header row with column names)');
    expect(() => readCatalog('\ufeff# only a comment\n\n', 'e.csv')).toThrow(/the catalog is empty/);
    const r = readCatalog('id,ra,dec,mag\n', 'h.csv');
    expect([r.rowsRead, r.targets.length, r.rejects.length]).toEqual([0, 0, 0]);
  });
});
