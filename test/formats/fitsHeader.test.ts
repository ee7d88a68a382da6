/**
 * FITS header cards and HDU walking (FITS standard 4.0, sections 3-4): value forms, HIERARCH, CONTINUE long
 * strings, escapes of non-ASCII header text, 2880-byte blocks and the errors for damaged files.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  escapeHeaderText, formatCard, formatCards, headerBytes, parseCard, readHeaderAt, unescapeHeaderText,
} from '../../src/core/formats/fits/header';
import { walkHdus } from '../../src/core/formats/fits/hdu';
import { parseTform } from '../../src/core/formats/fits/binary';
import { readFitsTable } from '../../src/core/catalog/fitsTable';
import { writeFitsTable } from '../../src/core/export/fitsWriter';

const card = (s: string) => s.padEnd(80);

describe('FITS header cards', () => {
  it('parses every value form of the standard', () => {
    expect(parseCard(card("OBJECT  = 'O''Brien field' / quoted with a doubled quote"))).toEqual(
      { keyword: 'OBJECT', value: "O'Brien field", comment: 'quoted with a doubled quote', hierarch: false });
    expect(parseCard(card("NAME    = '  lead  '")).value).toBe('  lead'); // leading blanks count, trailing do not
    expect(parseCard(card('SIMPLE  =                    T / conforms')).value).toBe(true);
    expect(parseCard(card('FLAG    =                    F')).value).toBe(false);
    expect(parseCard(card('NAXIS1  =                 1024')).value).toBe(1024);
    expect(parseCard(card('BIG     =  9223372036854775807')).value).toBe(9223372036854775807n);
    expect(parseCard(card('EXPO    =             1.5D-03 / Fortran exponent')).value).toBe(0.0015);
    expect(parseCard(card('REAL    =                 -.25')).value).toBe(-0.25);
    expect(parseCard(card('EMPTY   =                      / no value')).value).toBeNull();
    expect(parseCard(card('COMMENT   some text = not a value')).value).toBeUndefined();
    expect(parseCard(card("HIERARCH mask centre ra = 187.5 / [deg] text"))).toEqual(
      { keyword: 'mask centre ra', value: 187.5, comment: '[deg] text', hierarch: true });
  });

  it('formats cards of exactly 80 characters that parse back to the same value', () => {
    fc.assert(fc.property(
      fc.oneof(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer(), fc.boolean(),
        fc.string({ unit: fc.constantFrom('a', "'", ' ', 'Z', '/', '='), maxLength: 60 }).map((s) => s.replace(/ +$/, ''))),
      (value) => {
        const c = formatCard('KEY_1', value, 'a comment / with slash');
        expect(c).not.toBeNull();
        expect(c!.length).toBe(80);
        expect(parseCard(c!).value).toEqual(value);
      }));
  });

  it('writes long texts with CONTINUE cards and reads them back whole', () => {
    const text = "a long 'quoted' text ".repeat(12).trim();
    const cards = formatCards('LONGTEXT', text, 'the comment')!;
    expect(cards.length).toBeGreaterThan(3);
    expect(cards.every((c) => c.length === 80)).toBe(true);
    expect(cards[1].startsWith("CONTINUE  '")).toBe(true);
    const { header } = readHeaderAt(headerBytes(cards), 0, 'test');
    expect(header.values.get('LONGTEXT')).toBe(text);
    expect(formatCards('long_hierarch_key', 'x'.repeat(90))).toBeNull(); // no CONTINUE after HIERARCH: caller falls back
  });

  it('escapes header text outside printable ASCII and undoes it', () => {
    fc.assert(fc.property(fc.string({ unit: 'binary', maxLength: 30 }), (s) => {
      const e = escapeHeaderText(s);
      expect(/^[\x20-\x7e]*$/.test(e.text)).toBe(true);
      expect(unescapeHeaderText(e.text)).toBe(s);
    }));
    expect(escapeHeaderText('plain').escaped).toBe(false);
    expect(escapeHeaderText('a\\b').text).toBe('a\\u005Cb');
  });

  it('parses TFORM values', () => {
    expect(parseTform('1D')).toEqual({ repeat: 1, code: 'D', heapCode: undefined, bytes: 8 });
    expect(parseTform('12A')).toMatchObject({ repeat: 12, code: 'A', bytes: 12 });
    expect(parseTform('J')).toMatchObject({ repeat: 1, code: 'J', bytes: 4 });
    expect(parseTform('13X')).toMatchObject({ bytes: 2 });
    expect(parseTform('1PE(30)')).toMatchObject({ code: 'P', heapCode: 'E', bytes: 8 });
    expect(parseTform('1P')).toBeNull();
    expect(parseTform('3Z')).toBeNull();
  });
});

describe('FITS HDU walking', () => {
  const file = writeFitsTable({ name: 't', columns: [{ name: 'a', datatype: 'float64' }], rows: [[1], [2]], meta: [] });

  it('finds the primary HDU and the BINTABLE at block boundaries', () => {
    const hdus = walkHdus(file);
    expect(hdus.map((h) => [h.kind, h.headerOffset % 2880, h.dataBytes])).toEqual([['PRIMARY', 0, 0], ['BINTABLE', 0, 16]]);
  });

  it('says what is wrong with a file that is not FITS, truncated, or without a table', () => {
    expect(() => walkHdus(new TextEncoder().encode('id,ra,dec\n1,2,3\n'))).toThrow(/does not start with the card SIMPLE = T/);
    expect(() => walkHdus(file.subarray(0, 2880 + 1000))).toThrow(/no END card/);
    const noData = file.slice(0, 5760); // headers only: the table's 16 data bytes are missing
    expect(() => walkHdus(noData)).toThrow(/header announces 16 data bytes .* but the file has only 5760 bytes/);
    const primaryOnly = file.slice(0, 2880);
    expect(() => readFitsTable(primaryOnly)).toThrow(/no BINTABLE extension \(HDUs found: 0:PRIMARY\)/);
  });
});
