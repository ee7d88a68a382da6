import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { slitArb, awkwardText, finite } from './arbitraries';
import { slitTable } from '../../src/core/export/slitTable';
import { outputTableToCsv } from '../../src/core/export/csvText';
import { writeEcsv } from '../../src/core/export/ecsvWriter';
import { writeJsonTable } from '../../src/core/export/jsonWriter';
import { readEcsvTable } from '../../src/core/catalog/ecsvReader';
import { parseCsvRecords } from '../../src/core/catalog/csvReader';
import { parseSlitsCsv, type MaskRow } from '../../src/core/export/slitsCsv';
import type { Cell } from '../../src/core/catalog/types';
import type { Slit } from '../../src/core/geometry/maskSolution';

/** A solved slit list: masks with awkward ids, and slits that each belong to one of them. */
const solvedArb = fc
  .array(fc.record({ maskId: awkwardText(1), instrument: awkwardText(1), raDeg: finite, decDeg: finite, paDeg: finite }), { minLength: 1, maxLength: 3 })
  .chain((masks: MaskRow[]) =>
    fc.tuple(
      fc.constant(masks),
      fc.array(fc.tuple(slitArb, fc.integer({ min: 0, max: masks.length - 1 })).map(([s, k]): Slit => ({ ...s, maskId: masks[k].maskId })), { maxLength: 10 }),
    ),
  );

describe('export then import gives identical values', () => {
  it('CSV: every slits.csv column and the mask columns', () => {
    fc.assert(
      fc.property(solvedArb, ([masks, slits]) => {
        const table = slitTable(slits, masks);
        const text = outputTableToCsv(table);
        expect(parseSlitsCsv(text, 'export.csv')).toEqual(slits);
        const recs = parseCsvRecords(text);
        expect(recs[0].cells).toEqual(table.columns.map((c) => c.name));
        const byId = new Map(masks.map((m) => [m.maskId, m]));
        recs.slice(1).forEach((r, i) => {
          const m = byId.get(slits[i].maskId)!;
          expect(r.cells.slice(14, 17).map(Number)).toEqual([m.raDeg, m.decDeg, m.paDeg]);
          expect(r.cells[17].replace(/^'/, '')).toBe(m.instrument);
        });
      }),
      { numRuns: 200 },
    );
  });

  it('ECSV: every cell, typed by its declared datatype', () => {
    fc.assert(
      fc.property(solvedArb, ([masks, slits]) => {
        const table = slitTable(slits, masks);
        const back = readEcsvTable(writeEcsv(table));
        expect(back.columns.map((c) => [c.name, c.datatype, c.unit, c.ucd])).toEqual(table.columns.map((c) => [c.name, c.datatype, c.unit, c.ucd]));
        const rows: Cell[][] = [];
        back.forEachRow((cells) => rows.push(cells));
        expect(back.structuralRejects).toEqual([]);
        expect(rows.length).toBe(table.rows.length);
        rows.forEach((r, i) =>
          table.columns.forEach((col, j) => {
            const got = col.datatype === 'float64' ? (r[j] === '' ? null : Number(r[j])) : r[j];
            expect(got).toEqual(table.rows[i][j]);
          }),
        );
      }),
      { numRuns: 200 },
    );
  });

  it('JSON: every cell (JSON has no -0: it comes back as 0)', () => {
    fc.assert(
      fc.property(solvedArb, ([masks, slits]) => {
        const table = slitTable(slits, masks);
        const doc = JSON.parse(writeJsonTable(table));
        expect(doc.format).toBe('haloweave.table/1');
        expect(doc.columns).toEqual(table.columns);
        expect(doc.meta).toEqual(table.meta);
        doc.rows.forEach((o: Record<string, Cell>, i: number) =>
          table.columns.forEach((col, j) => {
            const want = table.rows[i][j];
            expect(o[col.name]).toEqual(Object.is(want, -0) ? 0 : want);
          }),
        );
      }),
      { numRuns: 200 },
    );
  });
});
