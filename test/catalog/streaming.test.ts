import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { readCatalogFile } from '../../src/cli/readCatalogFile';
import { readCatalog } from '../../src/core/catalog/read';
import { toCsv } from '../../src/core/export/csvText';
import { scratchFiles } from './scratchFiles';

const write = scratchFiles('stream', 'csv');
const dir = write.dir;

/** A catalog row: some good, some with awkward ids, blank lines, wrong field counts or bad numbers. */
const rowArb = fc.oneof(
  fc.record({
    id: fc.string({ unit: 'grapheme', maxLength: 6 }).map((s) => s + fc.sample(fc.constantFrom('', ',', '"', '\n', 'é', '\r\n'), 1)[0]),
    ra: fc.double({ min: -10, max: 400, noNaN: true }),
    dec: fc.double({ min: -100, max: 100, noNaN: true }),
    mag: fc.oneof(fc.double({ min: 15, max: 25, noNaN: true }), fc.constant('faint')),
  }).map((r) => toCsv([], [[r.id, r.ra, r.dec, r.mag]]).replace(/^\n/, '').replace(/\n$/, '')),
  fc.constantFrom('', 'x,1,2', 'y,1,2,3,4,5', ',1,2,3', 'dup,1,2,3'),
);

describe('streaming file reader', () => {
  it('gives the same result as readCatalog for any catalog and any chunk size', () => {
    fc.assert(
      fc.property(fc.array(rowArb, { maxLength: 40 }), fc.constantFrom('\n', '\r\n'), fc.boolean(), fc.integer({ min: 1, max: 300 }), (rows, eol, bom, chunk) => {
        const text = (bom ? '\ufeff' : '') + ['id,ra,dec,mag', ...rows].join(eol) + eol;
        const path = write(text);
        const whole = readCatalog(new TextEncoder().encode(text), path);
        const streamed = readCatalogFile(path, undefined, { chunkBytes: chunk });
        expect(streamed).toEqual(whole);
      }),
      { numRuns: 150 },
    );
  });

  it('streams an ECSV file with the same result', () => {
    const text = '# %ECSV 1.0\n# ---\n# datatype:\n# - {name: id, datatype: string}\n# - {name: ra, unit: hourangle, datatype: float64}\n# - {name: dec, unit: deg, datatype: float64}\n# - {name: mag, datatype: float64}\n# schema: astropy-2.0\nid ra dec mag\n"a b" 12.5 -5 20\n#c 1 2 21\n\nd 1 2 ""\n';
    const path = write(text);
    const r = readCatalogFile(path, undefined, { chunkBytes: 5 });
    expect(r).toEqual(readCatalog(text, path));
    expect(r.targets.map((t) => [t.id, t.raDeg, t.line])).toEqual([
      ['a b', 187.5, 10],
      ['#c', 15, 11],
    ]);
    expect(r.rejects).toEqual([
      { line: 12, column: '(row)', reason: 'blank line' },
      { line: 13, column: 'mag', reason: 'missing value' },
    ]);
  });

  it('says when the file does not exist', () => {
    expect(() => readCatalogFile(join(dir, 'nope.csv'))).toThrow(/nope\.csv: the catalog file does not exist/);
  });
});

describe('text encodings and files that are not tables', () => {
  const utf16le = (s: string) => {
    const out = new Uint8Array(2 + s.length * 2);
    out[0] = 0xff;
    out[1] = 0xfe;
    for (let i = 0; i < s.length; i++) {
      out[2 + 2 * i] = s.charCodeAt(i) & 0xff;
      out[3 + 2 * i] = s.charCodeAt(i) >> 8;
    }
    return out;
  };
  const tsv = 'id\tra\tdec\tmag\r\nNø1\t10\t-5\t20\r\n';

  it('reads UTF-16 text with a byte-order mark (spreadsheet "Unicode text"), whole and streamed', () => {
    const bytes = utf16le(tsv);
    const path = join(dir, 'u16.txt');
    writeFileSync(path, bytes);
    const r = readCatalog(bytes, path);
    expect(r.format).toBe('tsv');
    expect(r.targets.map((t) => [t.id, t.raDeg, t.line])).toEqual([['Nø1', 10, 2]]);
    expect(readCatalogFile(path, undefined, { chunkBytes: 3 })).toEqual(r);
  });

  it('reads text that is not valid UTF-8 as Latin-1, the same whole and streamed, never replacing characters', () => {
    const bytes = new Uint8Array([...new TextEncoder().encode('id,ra,dec,mag\na,1,2,3\n'), 0x4e, 0xf8, 0x31, ...new TextEncoder().encode(',1,2,3\n')]);
    const path = join(dir, 'latin1.csv');
    writeFileSync(path, bytes);
    // 0xF8 is "ø" in ISO-8859-1 (and windows-1252).
    expect(readCatalog(bytes, 'latin1.csv').targets.map((t) => t.id)).toEqual(['a', 'N\u00f81']);
    expect(readCatalogFile(path).targets).toEqual(readCatalog(bytes, 'latin1.csv').targets);
  });

  it('says what a compressed, archived or binary file is', () => {
    expect(() => readCatalog(new Uint8Array([0x1f, 0x8b, 8, 0]), 'c.csv.gz')).toThrow('c.csv.gz: is gzip-compressed; decompress it first (gunzip)');
    expect(() => readCatalog(new Uint8Array([0x50, 0x4b, 3, 4, 0]), 'c.xlsx')).toThrow(/c\.xlsx: is a ZIP archive/);
    expect(() => readCatalog(new Uint8Array([0x69, 0x64, 0, 1, 2]), 'c.bin')).toThrow('c.bin: holds binary data, not text; give a CSV, TSV, ECSV, VOTable or FITS table');
  });
});

describe('space-delimited ECSV streamed in small chunks', () => {
  it('collapses space runs the same way for every chunk size', () => {
    const text =
      '# %ECSV 1.0\n# ---\n# datatype:\n# - {name: id, datatype: string}\n# - {name: ra, datatype: float64}\n# - {name: dec, datatype: float64}\n# - {name: mag, datatype: float64}\n' +
      'id   ra   dec  mag\n' +
      Array.from({ length: 60 }, (_, i) => (i % 3 === 0 ? `  "g  ${i}"    ${i}.5   -${i % 90}    20  ` : i % 7 === 0 ? '    ' : `g${i} ${i}   1 2`)).join('\n') +
      '\n';
    const path = write(text);
    const whole = readCatalog(text, path);
    expect(whole.targets.length).toBeGreaterThan(40);
    expect(whole.targets[0]).toMatchObject({ id: 'g  0', raDeg: 0.5, decDeg: -0, line: 9 });
    for (const chunk of [1, 2, 3, 5, 17, 64]) expect(readCatalogFile(path, undefined, { chunkBytes: chunk })).toEqual(whole);
  });
});
