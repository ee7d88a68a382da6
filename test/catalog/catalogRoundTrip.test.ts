import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { toCsv } from '../../src/core/export/csvText';
import { readCatalog } from '../../src/core/catalog/read';

const awkwardId = fc
  .array(fc.oneof(fc.constantFrom(',', '"', '\n', '\r\n', '#', '=', "'", 'é', '漢', ' '), fc.string({ unit: 'grapheme', minLength: 1, maxLength: 3 })), { minLength: 1, maxLength: 6 })
  .map((p) => p.join('').trim())
  .filter((s) => s !== '');

const rowArb = fc.record({
  id: awkwardId,
  raDeg: fc.double({ min: 0, max: 360, maxExcluded: true, noNaN: true }),
  decDeg: fc.double({ min: -90, max: 90, noNaN: true }),
  mag: fc.double({ min: -5, max: 30, noNaN: true }),
  color: fc.option(fc.double({ min: -2, max: 4, noNaN: true }), { nil: null }),
  note: fc.string({ unit: 'grapheme', maxLength: 5 }),
});

describe('a catalog written as CSV is read back with the same values', () => {
  it('keeps awkward ids, full double precision and the file line of each row', () => {
    fc.assert(
      fc.property(fc.array(rowArb, { maxLength: 25 }), fc.constantFrom('\n', '\r\n'), (rows, eol) => {
        const unique = rows.map((r, i) => ({ ...r, id: `${r.id}${i}` }));
        const text = toCsv(['id', 'ra', 'dec', 'mag', 'color', 'note'], unique.map((r) => [r.id, r.raDeg, r.decDeg, r.mag, r.color, r.note]), { eol });
        const got = readCatalog(text, 'c.csv');
        expect(got.rejects).toEqual([]);
        expect(got.rowsRead).toBe(unique.length);
        let line = 2;
        got.targets.forEach((t, i) => {
          const r = unique[i];
          expect(t).toEqual({ id: r.id, raDeg: r.raDeg, decDeg: r.decDeg, mag: r.mag, color: r.color, priority: null, role: 'tracer', line, extra: { note: r.note } });
          // A quoted line end counts as a file line (LF or CRLF files count LF characters; a lone CR is not a line end there).
          line += 1 + (r.id.match(/\n/g)?.length ?? 0) + (r.note.match(/\n/g)?.length ?? 0);
        });
      }),
      { numRuns: 300 },
    );
  });
});
