/**
 * Haloweave's VOTable and FITS writers read back by Haloweave's readers give the same table: values, units, UCDs,
 * and metadata (property tests with fast-check over awkward ids: quotes, commas, markup, line ends, tabs,
 * non-ASCII letters, emoji, very long ids).
 * Documented losses, asserted here too: empty text reads as null in both formats; FITS drops trailing blanks of a
 * text and ends a text at NUL; characters XML 1.0 cannot carry are substituted visibly in VOTable (with an INFO).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readVoTable } from '../../src/core/catalog/votable';
import { readFitsTable } from '../../src/core/catalog/fitsTable';
import { writeVoTable } from '../../src/core/export/votableWriter';
import { writeFitsTable } from '../../src/core/export/fitsWriter';
import type { OutputTable } from '../../src/core/export/outputTable';
import type { Cell } from '../../src/core/catalog/types';
import type { RawTableWithMeta } from '../../src/core/catalog/tableMeta';
import { InputError } from '../../src/core/result';
import { tableArb } from './arbitraries';

const utf8 = new TextEncoder();
function readAll(t: RawTableWithMeta): Cell[][] {
  const rows: Cell[][] = [];
  let expectLine = 1;
  t.forEachRow((cells, line) => { expect(line).toBe(expectLine++); rows.push(cells); });
  return rows;
}

/** What a text cell becomes after the documented losses of each format. */
const textAfter = (s: Cell, fits: boolean): Cell => {
  if (typeof s !== 'string') return s;
  const t = fits ? s.replace(/ +$/, '') : s;
  return t === '' ? null : t;
};
const realAfter = (x: Cell): Cell => (typeof x === 'number' && Number.isNaN(x) ? null : x);

describe('VOTable writer -> VOTable reader round trip', () => {
  it('keeps every value, unit, UCD, description and PARAM (fast-check)', () => {
    fc.assert(fc.property(tableArb, (table) => {
      const back = readVoTable(utf8.encode(writeVoTable(table)));
      expect(back.format).toBe('votable');
      expect(back.name).toBe(table.name);
      expect(back.columns).toEqual([
        { name: 'object_id', datatype: 'string', ucd: 'meta.id;meta.main', description: 'id of the target, as in the catalog' },
        { name: 'ra_deg', datatype: 'float64', unit: table.columns[1].unit, ucd: 'pos.eq.ra;meta.main' },
        { name: 'slit_index', datatype: 'int32' },
        { name: 'forced', datatype: 'bool', description: 'forced in by the user' },
      ]);
      expect(readAll(back)).toEqual(table.rows.map((r) => [textAfter(r[0], false), realAfter(r[1]), r[2], r[3]]));
      expect(back.meta.map((m) => [m.key, m.value, m.unit, m.description])).toEqual([
        ['instrument', textAfter(table.meta[0].value as string, false), undefined, 'profile id'],
        ['MASK1RA', table.meta[1].value, 'deg', 'centre of mask m1'],
        ['mask_count', table.rows.length, undefined, undefined],
      ]);
    }), { numRuns: 200 });
  });

  it('substitutes characters XML 1.0 cannot hold, visibly, and says so in an INFO', () => {
    const table: OutputTable = { name: 't', columns: [{ name: 'id', datatype: 'string' }], rows: [['a\u0001b\u0000c']], meta: [] };
    const xml = writeVoTable(table);
    expect(xml).toContain('<INFO name="substitutedCharacters" value="2">');
    const back = readVoTable(utf8.encode(xml));
    expect(readAll(back)).toEqual([['a\u2401b\u2400c']]);
    expect(back.meta[0]).toMatchObject({ key: 'substitutedCharacters', value: '2' });
  });

  it('declares unicodeChar only for columns holding non-ASCII text', () => {
    const xml = writeVoTable({
      name: 't', columns: [{ name: 'a', datatype: 'string' }, { name: 'b', datatype: 'string' }], rows: [['plain', 'café']], meta: [],
    });
    expect(xml).toContain('<FIELD name="a" datatype="char" arraysize="*"/>');
    expect(xml).toContain('<FIELD name="b" datatype="unicodeChar" arraysize="*"/>');
  });
});

describe('FITS writer -> FITS reader round trip', () => {
  it('keeps every value, unit, UCD and meta keyword (fast-check)', () => {
    fc.assert(fc.property(tableArb, (table) => {
      const bytes = writeFitsTable(table);
      expect(bytes.length % 2880).toBe(0);
      const back = readFitsTable(bytes);
      expect(back.format).toBe('fits');
      expect(back.name).toBe(textAfter(table.name, true) ?? undefined);
      expect(back.columns.map((c) => [c.name, c.datatype, c.unit, c.ucd])).toEqual([
        ['object_id', 'string', undefined, 'meta.id;meta.main'],
        ['ra_deg', 'float64', table.columns[1].unit, 'pos.eq.ra;meta.main'],
        ['slit_index', 'int32', undefined, undefined],
        ['forced', 'bool', undefined, undefined],
      ]);
      expect(readAll(back)).toEqual(table.rows.map((r) => [textAfter(r[0], true), realAfter(r[1]), r[2], r[3]]));
      const meta = Object.fromEntries(back.meta.map((m) => [m.key, m]));
      const instrument = table.meta[0].value as string;
      // a text too long for one 80-character card goes to COMMENT lines instead (documented), else it is read back
      if (meta.instrument) expect(meta.instrument.value).toBe(instrument.replace(/ +$/, ''));
      else expect(back.meta.find((m) => m.key === 'instrument')).toBeUndefined();
      expect(meta.MASK1RA).toMatchObject({ value: table.meta[1].value, unit: 'deg', description: 'centre of mask m1' });
      expect(meta.mask_count.value).toBe(table.rows.length);
    }), { numRuns: 200 });
  });

  it('stores non-ASCII text as UTF-8 bytes in a column sized to the longest byte length', () => {
    const table: OutputTable = { name: 'slits', columns: [{ name: 'object_id', datatype: 'string' }], rows: [['é'], ['星团-7'], ['ab']], meta: [] };
    const bytes = writeFitsTable(table);
    const header = new TextDecoder('latin1').decode(bytes.subarray(2880, 5760));
    expect(header).toContain("TFORM1  = '8A      '"); // '星团-7' is 3 + 3 + 2 = 8 bytes of UTF-8
    expect(readAll(readFitsTable(bytes))).toEqual([['é'], ['星团-7'], ['ab']]);
  });

  it('writes meta keys as standard keywords, HIERARCH, or COMMENT lines when a card cannot hold them', () => {
    const table: OutputTable = {
      name: 'x', columns: [], rows: [],
      meta: [
        { key: 'MASKPA', value: 12.5, unit: 'deg' },
        { key: 'mask_id', value: 'm1' },
        { key: 'naxis', value: 3 },
        { key: 'with space', value: 'v' },
        { key: 'long_text', value: 'y'.repeat(100) },
        { key: 'note', value: 'Ünïcode ☃' },
      ],
    };
    const bytes = writeFitsTable(table);
    const header = new TextDecoder('latin1').decode(bytes.subarray(2880));
    expect(header).toMatch(/MASKPA  =                 12\.5 \/ \[deg\]/);
    expect(header).toContain("HIERARCH mask_id = 'm1      '");
    expect(header).toContain('COMMENT meta: naxis = 3'); // would clash with the structural NAXIS
    expect(header).toContain('COMMENT meta: with space = v');
    expect(header).toContain(`COMMENT meta: long_text = ${'y'.repeat(50)}`);
    expect(header).toContain('HWESCAPE=                    T');
    const meta = readFitsTable(bytes).meta;
    expect(meta.map((m) => [m.key, m.value])).toEqual([['MASKPA', 12.5], ['mask_id', 'm1'], ['note', 'Ünïcode ☃']]);
  });

  it('refuses a cell that does not fit its column, naming table, column and row', () => {
    const bad: OutputTable = { name: 'slits', columns: [{ name: 'mag', datatype: 'float64' }], rows: [[1], ['bright']], meta: [] };
    expect(() => writeFitsTable(bad)).toThrow(InputError);
    expect(() => writeFitsTable(bad)).toThrow(/table slits, column mag, row 2: 'bright' is not a number/);
    expect(() => writeVoTable({ ...bad, columns: [{ name: 'n', datatype: 'int32' }], rows: [[2.5]] })).toThrow(/column n, row 1: '2.5' is not a 32-bit integer/);
  });
});
