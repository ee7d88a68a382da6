/**
 * The fast paths of the catalog reader against the general ones: simple lines (split into spans, numbers read
 * straight from the text) against papaparse alone, on random text with and without quotes; the plain-decimal
 * reader against `cellNumber`; the duplicate-id index against a Map; ASCII chunks of a streamed file against the
 * UTF-8 decoder.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readCatalog } from '../../src/core/catalog/read';
import { delimitedRawTable, parseCsvRecords, sniffCsvDialect, stringSource } from '../../src/core/catalog/csvReader';
import { cellNumber, textSpanNumber, validateTable, type CellWhy } from '../../src/core/catalog/validate';
import { IdIndex } from '../../src/core/catalog/idIndex';
import { readCatalogFile } from '../../src/cli/readCatalogFile';

/** Cells that exercise every branch of the row checks: numbers in many forms, blanks, words, sexagesimal, roles. */
const cellArb = fc.oneof(
  fc.constantFrom('', ' ', '1', '-0', '+0.5', '.5', '5.', '007', '1e3', '1E-2', '12:30:00', '-05 06 07', 'nan', 'N/A', '--', 'abc', '0x10', '95', '-91', '400'),
  fc.constantFrom('tracer', 'alignment', 'ALIGNMENT', ' tracer ', 'star', '#x', 'a\tb', 'é', 'x\r'),
  fc.double({ min: -100, max: 400, noNaN: true }).map(String),
  fc.double({ min: 0, max: 360, noNaN: true }).map((v) => v.toFixed(6)),
  fc.stringMatching(/^[a-z0-9 .+-]{0,6}$/),
);
const idArb = fc.oneof(fc.constantFrom('a', 'b', 'c', ' a', '', '#1', 'Nø'), fc.stringMatching(/^[a-z][a-z0-9]{0,3}$/));
/** One data row as fields (no quotes, no delimiter or line end inside a field): sometimes short, long or blank. */
const rowArb = fc.oneof(
  { weight: 8, arbitrary: fc.tuple(idArb, fc.array(cellArb, { minLength: 6, maxLength: 6 })).map(([id, rest]) => [id, ...rest]) },
  { weight: 1, arbitrary: fc.array(cellArb, { minLength: 0, maxLength: 9 }) },
  { weight: 1, arbitrary: fc.constantFrom<string[]>([], [''], ['', '', ''], ['a', '1', '2', '3', '', '', '', '']) },
);
const HEADER = ['id', 'ra', 'dec', 'mag', 'color', 'priority', 'role'];

describe('the fast path gives exactly what papaparse alone gives', () => {
  /** A field as written in the file: plain, quoted (with `""` for a quote), or raw text with stray quotes and line ends. */
  const writtenFieldArb = (delimiter: string) =>
    fc.oneof(
      { weight: 6, arbitrary: cellArb.map((c) => c.split(delimiter).join('_').split('"').join('')) },
      { weight: 3, arbitrary: fc.oneof(cellArb, fc.constantFrom('a,b', 'a;b', 'a\tb', 'q"q', 'l1\nl2', 'l1\r\nl2', '')).map((c) => `"${c.split('"').join('""')}"`) },
      { weight: 1, arbitrary: fc.stringMatching(/^[ab", \n\r]{0,4}$/) },
    );
  const textArb = fc.constantFrom(',', ';', '\t').chain((delimiter) =>
    fc.tuple(
      fc.constant(delimiter),
      fc.array(fc.oneof({ weight: 9, arbitrary: fc.array(writtenFieldArb(delimiter), { minLength: 0, maxLength: 8 }) }, { weight: 1, arbitrary: fc.constant([] as string[]) }), { maxLength: 30 }),
      fc.constantFrom('\n', '\r\n'),
      fc.boolean(),
    ).map(([d, rows, eol, trailingEol]) => [HEADER.join(d), ...rows.map((r) => r.join(d))].join(eol) + (trailingEol ? eol : '')),
  );
  const generalOnly = (text: string, chunk?: number) =>
    validateTable(delimitedRawTable('csv', stringSource(text, chunk), { ...sniffCsvDialect(text), generalPathOnly: true }), 'c.csv');

  it('on random catalogs with and without quotes: targets, rejects (lines, columns, reasons) and counts', () => {
    let withQuotes = 0;
    fc.assert(
      fc.property(textArb, fc.integer({ min: 1, max: 120 }), (text, chunk) => {
        if (text.includes('"')) withQuotes++;
        const reference = generalOnly(text);
        const fast = readCatalog(text, 'c.csv');
        expect({ ...fast, format: 'csv' }).toEqual(reference);
        // Streamed in chunks, the fast path and the general path alternate.
        const streamed = validateTable(delimitedRawTable('csv', stringSource(text, chunk), sniffCsvDialect(text)), 'c.csv');
        expect(streamed).toEqual(reference);
        expect(generalOnly(text, chunk)).toEqual(reference);
      }),
      { numRuns: 600 },
    );
    expect(withQuotes).toBeGreaterThan(100);
  });

  it('splits the same records (parseCsvRecords)', () => {
    fc.assert(
      fc.property(textArb, (text) => {
        expect(parseCsvRecords(text)).toEqual(parseCsvRecords(text, { ...sniffCsvDialect(text), generalPathOnly: true }));
      }),
      { numRuns: 300 },
    );
  });

  it('counts a lone LF in a CRLF file as a file line, whatever the chunks', () => {
    const text = 'id,ra,dec,mag\r\na\nb,1,2,3\r\nc,1,2,x\r\n';
    const whole = readCatalog(text, 'c.csv');
    expect(whole.targets.map((t) => [t.id, t.line])).toEqual([['a\nb', 2]]);
    expect(whole.rejects).toEqual([{ line: 4, column: 'mag', reason: '"x" is not a number' }]);
    for (let chunk = 1; chunk <= text.length; chunk++) {
      expect(validateTable(delimitedRawTable('csv', stringSource(text, chunk), sniffCsvDialect(text)), 'c.csv')).toEqual(whole);
    }
  });

  it('keeps the file lines when quoted and plain rows alternate in a streamed file', () => {
    const dir = mkdtempSync(join(tmpdir(), 'haloweave-fast-'));
    fc.assert(
      fc.property(fc.array(rowArb, { maxLength: 30 }), fc.array(fc.boolean(), { minLength: 30, maxLength: 30 }), fc.integer({ min: 1, max: 200 }), (rows, quoteRow, chunk) => {
        // Some rows quoted (one holding a line end inside quotes), the rest plain: chunks of both kinds.
        const lines = ['id,ra,dec,mag,color,priority,role', ...rows.map((r, i) => r.map((f) => (quoteRow[i] ? `"${f}"` : f)).join(','))];
        if (rows.length > 2) lines.splice(2, 0, '"multi\nline",1,2,3,,,');
        const text = lines.join('\n') + '\n';
        const path = join(dir, 'mixed.csv');
        writeFileSync(path, text);
        expect(readCatalogFile(path, undefined, { chunkBytes: chunk })).toEqual(readCatalog(text, path));
      }),
      { numRuns: 150 },
    );
  });
});

describe('numbers read straight from the text', () => {
  const read = (s: string) => {
    const why: CellWhy = { reason: 'unset' };
    const v = textSpanNumber(`x,${s},y`, 2, 2 + s.length, why);
    return { v, reason: Number.isNaN(v) ? why.reason : 'unset' };
  };
  const reference = (s: string) => {
    const why: CellWhy = { reason: 'unset' };
    const v = cellNumber(s, why);
    return { v, reason: Number.isNaN(v) ? why.reason : 'unset' };
  };

  it('equal cellNumber (value, sign of zero, and the reason when not a number) for any text', () => {
    const textArb = fc.oneof(
      fc.stringMatching(/^[+-]?[0-9]{0,18}(\.[0-9]{0,18})?([eE][+-]?[0-9]{1,3})?$/),
      fc.stringMatching(/^[0-9 .+\-eExa]{0,10}$/),
      fc.double({ noNaN: true }).map(String),
      fc.double({ min: -1e6, max: 1e6, noNaN: true }).chain((v) => fc.integer({ min: 0, max: 15 }).map((d) => v.toFixed(d))),
      fc.string({ maxLength: 8 }),
    );
    fc.assert(
      fc.property(textArb, (s) => {
        const got = read(s);
        const want = reference(s);
        expect(Object.is(got.v, want.v) || (Number.isNaN(got.v) && Number.isNaN(want.v))).toBe(true);
        expect(got.reason).toBe(want.reason);
      }),
      { numRuns: 20000 },
    );
  });

  it('reads the forms of the fast path exactly as Number() does', () => {
    // 15 significant digits and 15 fraction digits are the limits of the exact path; longer text goes to Number().
    for (const s of ['187.342837', '-5.311492', '0.000000000000001', '999999999999999', '9999999999999999', '0.1', '-0', '+0', '00', '5.', '.5', '123456789012345.']) {
      expect(Object.is(read(s).v, Number(s))).toBe(true);
    }
    expect(read('').reason).toBeNull();
    expect(read('1.2.3').reason).toBe('"1.2.3" is not a number');
  });
});

describe('duplicate-id index', () => {
  it('answers like a Map for any sequence of ids, through growth and hash collisions', () => {
    const keyArb = fc.oneof(fc.stringMatching(/^[ab]{0,4}$/), fc.string({ maxLength: 3 }), fc.integer({ min: 0, max: 3000 }).map((i) => `c${i}`));
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.boolean(), keyArb, fc.nat(1e6)), { maxLength: 3000 }), (ops) => {
        const index = new IdIndex(16);
        const map = new Map<string, number>();
        for (const [isSet, key, value] of ops) {
          if (isSet) {
            index.set(key, value);
            map.set(key, value);
          } else expect(index.get(key)).toBe(map.get(key) ?? -1);
        }
        expect(index.size).toBe(map.size);
        for (const [key, value] of map) expect(index.get(key)).toBe(value);
      }),
      { numRuns: 200 },
    );
  });

  it('sets after a missed get of another id without losing either', () => {
    const index = new IdIndex(16);
    expect(index.get('x')).toBe(-1);
    index.set('y', 1); // may take the slot where the lookup of x stopped
    index.set('x', 2);
    expect([index.get('x'), index.get('y'), index.size]).toEqual([2, 1, 2]);
  });

  it('reports every duplicate of a large catalog with the first line of its id', () => {
    const n = 20000;
    const ids = Array.from({ length: n }, (_, i) => `id${i % 15000}`); // rows 15000.. repeat the first 5000 ids
    const text = 'id,ra,dec,mag\n' + ids.map((id) => `${id},1,2,3`).join('\n') + '\n';
    const r = readCatalog(text, 'dup.csv');
    expect(r.targets.length).toBe(15000);
    expect(r.rejects.length).toBe(5000);
    expect(r.rejects[0]).toEqual({ line: 15002, column: 'id', reason: 'duplicate id "id0", first used on line 2' });
    expect(r.rejects[4999]).toEqual({ line: 20001, column: 'id', reason: 'duplicate id "id4999", first used on line 5001' });
  });
});

describe('streamed chunks of ASCII text', () => {
  it('give the same text as the UTF-8 decoder around multi-byte characters and a mid-file U+FEFF', () => {
    const dir = mkdtempSync(join(tmpdir(), 'haloweave-ascii-'));
    const text = '\ufeffid,ra,dec,mag,note\n' + 'abc,1,2,3,plain\n'.repeat(3) + 'é\ufeffx,1,2,3,\ufeffnote\n' + 'd,1,2,3,ø€😀\n' + 'e,1,2,3,\n';
    const path = join(dir, 'mixed.csv');
    writeFileSync(path, text);
    const whole = readCatalog(new TextEncoder().encode(text), path);
    expect(whole.targets.map((t) => t.id)).toEqual(['abc', 'é\ufeffx', 'd', 'e']);
    expect(whole.rejects.map((x) => x.line)).toEqual([3, 4]); // duplicates of abc
    expect(whole.targets[1].extra.note).toBe('\ufeffnote');
    for (let chunk = 1; chunk <= 64; chunk++) expect(readCatalogFile(path, undefined, { chunkBytes: chunk })).toEqual(whole);
  });
});
