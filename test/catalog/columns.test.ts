import { describe, expect, it } from 'vitest';
import { readCatalog } from '../../src/core/catalog/read';
import { resolveColumns, normaliseColumnName } from '../../src/core/catalog/columns';
import { detectFormat } from '../../src/core/catalog/detect';
import { InputError } from '../../src/core/result';

describe('column mapping', () => {
  it('finds common aliases, case-insensitively and ignoring punctuation', () => {
    const r = readCatalog('Source_ID;RAJ2000;DEJ2000;i_mag;g-i;Weight;kind;field\nx1;10.5;-20.25;21.5;0.9;2;alignment;A\n', 'c.csv');
    expect(r.mapping).toEqual({ id: 'Source_ID', ra: 'RAJ2000', dec: 'DEJ2000', mag: 'i_mag', color: 'g-i', priority: 'Weight', role: 'kind' });
    expect(r.targets[0]).toMatchObject({ id: 'x1', raDeg: 10.5, decDeg: -20.25, mag: 21.5, color: 0.9, priority: 2, role: 'alignment', extra: { field: 'A' } });
    expect(normaliseColumnName('RA_ICRS')).toBe('raicrs');
  });

  it('prefers the contract name over an alias and keeps the other as an extra column', () => {
    const r = readCatalog('id,RAJ2000,ra,dec,mag\na,1,2,3,4\n', 'c.csv');
    expect(r.mapping.ra).toBe('ra');
    expect(r.targets[0].raDeg).toBe(2);
    expect(r.targets[0].extra).toEqual({ RAJ2000: '1' });
  });

  it('follows an explicit mapping (plan key catalogColumns) and RA in hours from the mapping', () => {
    const r = readCatalog('name,alpha_h,delta_d,bright\np,12.5,-30,20\n', 'c.csv', { id: 'name', ra: 'alpha_h', dec: 'delta_d', mag: 'bright', raUnit: 'hour' });
    expect(r.targets[0]).toMatchObject({ id: 'p', raDeg: 187.5, decDeg: -30, mag: 20 });
  });

  it('says which required column is missing and which columns there are', () => {
    try {
      readCatalog('id,ra,declination_x,mag\na,1,2,3\n', 'c.csv');
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as Error).message).toMatch(/^c\.csv: no column for "dec" \(looked for dec, dej2000.*\); the columns are: id, ra, declination_x, mag \(rename the column to "dec" or set catalogColumns\.dec/);
    }
    expect(() => readCatalog('id,ra,dec,mag\na,1,2,3\n', 'c.csv', { mag: 'imag' })).toThrow('c.csv: catalogColumns.mag: names the column "imag", which the catalog does not have (use one of: id, ra, dec, mag)');
  });

  it('rejects a unit that is not an angle for RA/Dec', () => {
    expect(() => resolveColumns([{ name: 'id' }, { name: 'ra', unit: 'm' }, { name: 'dec' }, { name: 'mag' }], {}, 'x')).toThrow(/column ra: has the unit "m", which is not an angle/);
  });
});

describe('positions in degrees, hours, radians and sexagesimal text', () => {
  const read = (ra: string, dec: string, units?: { ra?: string; dec?: string }) => {
    const cols = [{ name: 'id' }, { name: 'ra', unit: units?.ra }, { name: 'dec', unit: units?.dec }, { name: 'mag' }];
    const table = {
      format: 'csv' as const,
      columns: cols,
      structuralRejects: [],
      forEachRow: (v: (c: (string | number | null)[], l: number) => void) => v(['a', ra, dec, '20'], 2),
    };
    return import('../../src/core/catalog/validate').then((m) => m.validateTable(table, 't'));
  };

  it('converts every form to ICRS degrees', async () => {
    // 12h30m00s = 187.5 deg exactly; -05 06 07.8 = -(5 + 6/60 + 7.8/3600) deg.
    expect((await read('12:30:00', '-05 06 07.8')).targets[0]).toMatchObject({ raDeg: 187.5, decDeg: -(5 + 6 / 60 + 7.8 / 3600) });
    expect((await read('12h30m00s', '-00:30:00')).targets[0]).toMatchObject({ raDeg: 187.5, decDeg: -0.5 });
    expect((await read('12.5', '-30', { ra: 'h' })).targets[0].raDeg).toBe(187.5);
    expect((await read('12.5', '-30', { ra: 'hourangle' })).targets[0].raDeg).toBe(187.5);
    expect((await read(String(Math.PI), String(-Math.PI / 4), { ra: 'rad', dec: 'rad' })).targets[0]).toMatchObject({ raDeg: 180, decDeg: -45 });
    expect((await read('3600', '-7200', { ra: 'arcsec', dec: 'arcsec' })).targets[0]).toMatchObject({ raDeg: 1, decDeg: -2 });
    expect((await read('187d30m00s', '+10d00m00s')).targets[0]).toMatchObject({ raDeg: 187.5, decDeg: 10 });
  });

  it('rejects positions out of range with the reason', async () => {
    expect((await read('24.5', '0', { ra: 'h' })).rejects[0]).toEqual({ line: 2, column: 'ra', reason: 'RA 24.5 h is outside [0, 24) h' });
    expect((await read('-1', '0')).rejects[0].reason).toMatch(/outside \[0, 360\)/);
    expect((await read('10', '-90.0001')).rejects[0]).toEqual({ line: 2, column: 'dec', reason: 'Dec -90.0001 is outside [-90, 90] deg' });
    expect((await read('12:75:00', '0')).rejects[0].column).toBe('ra');
  });
});

describe('roles and priorities', () => {
  it('rejects an unknown role and a non-positive priority, accepts empty ones', () => {
    const r = readCatalog('id,ra,dec,mag,priority,role\na,1,2,20,,\nb,1,2,20,0,tracer\nc,1,2,20,1,star\nd,1,2,20,2,ALIGNMENT\ne,1,2,20,-1,constructor\n', 'c.csv');
    expect(r.targets.map((t) => [t.id, t.priority, t.role])).toEqual([
      ['a', null, 'tracer'],
      ['d', 2, 'alignment'],
    ]);
    expect(r.rejects).toEqual([
      { line: 3, column: 'priority', reason: 'non-positive priority 0; a priority is a positive weight (leave it empty for the default)' },
      { line: 4, column: 'role', reason: 'unknown role "star"; use tracer or alignment (empty means tracer)' },
      { line: 6, column: 'priority', reason: 'non-positive priority -1; a priority is a positive weight (leave it empty for the default)' },
      { line: 6, column: 'role', reason: 'unknown role "constructor"; use tracer or alignment (empty means tracer)' },
    ]);
  });

  it('does not let a rejected row claim an id: a later good row with that id is used', () => {
    const r = readCatalog('id,ra,dec,mag\na,1,95,20\na,1,2,20\na,1,3,20\n', 'c.csv');
    expect(r.targets.map((t) => t.line)).toEqual([3]);
    expect(r.rejects.map((x) => [x.line, x.reason])).toEqual([
      [2, 'Dec 95 is outside [-90, 90] deg'],
      [4, 'duplicate id "a", first used on line 3'],
    ]);
  });
});

describe('format detection from content', () => {
  it('tells CSV, TSV, ECSV, VOTable and FITS apart without a file name', () => {
    expect(detectFormat('id,ra,dec,mag\n')).toBe('csv');
    expect(detectFormat('id\tra\tdec\tmag\n')).toBe('tsv');
    expect(detectFormat('# a comment, with commas\nid\tra\tdec\tmag\n')).toBe('tsv');
    expect(detectFormat('\ufeff# %ECSV 1.0\n# ---\n')).toBe('ecsv');
    expect(detectFormat('<?xml version="1.0"?>\n<!-- x -->\n<VOTABLE version="1.4">')).toBe('votable');
    expect(detectFormat('<html><VOTABLE>')).toBe('csv');
    const fits = new TextEncoder().encode('SIMPLE  =                    T'.padEnd(2880, ' '));
    expect(detectFormat(fits)).toBe('fits');
  });

  it('reads a TSV catalog with quoted fields', () => {
    const r = readCatalog('id\tra\tdec\tmag\n"a\tb"\t1\t2\t20\n', 'c.tsv');
    expect(r.format).toBe('tsv');
    expect(r.targets[0].id).toBe('a\tb');
  });
});

describe('numbers in text cells', () => {
  it('reads plain decimals only; blanks and nan-like words are missing values', async () => {
    const { cellNumber } = await import('../../src/core/catalog/validate');
    const read = (t: string) => {
      const why = { reason: 'unset' as string | null };
      const v = cellNumber(t, why);
      return Number.isNaN(v) ? (why.reason === null ? 'missing' : 'bad') : v;
    };
    expect(['12', '-5.5', '1e5', '.5', '5.', ' 1', '1 ', '+3', '00', '0.0'].map(read)).toEqual([12, -5.5, 1e5, 0.5, 5, 1, 1, 3, 0, 0]);
    expect(Object.is(read('-0'), -0)).toBe(true);
    expect(['', '  ', 'nan', 'NaN', 'null', 'N/A', '--'].map(read)).toEqual(Array(7).fill('missing'));
    expect(['0x10', '0B1', '0o7', 'Infinity', '-Infinity', '1_0', '1,5', '+0x10', '-', '.', 'e5', 'abc'].map(read)).toEqual(Array(12).fill('bad'));
  });
});
