/**
 * FITS binary tables read a block of rows at a time from a file handle give what the whole-file reader gives:
 * every column type (L, X, B, I, J, K, A, E, D, C, M, repeats, P/Q heap arrays), TNULL, TSCAL/TZERO, NaN, blocks that end
 * inside a row, and the same errors for damaged files.
 */
import { describe, expect, it } from 'vitest';
import { readCatalogFile } from '../../src/cli/readCatalogFile';
import { withFileByteSource } from '../../src/cli/fileByteSource';
import { readCatalog } from '../../src/core/catalog/read';
import { scratchFiles } from './scratchFiles';
import { readFitsTable, readFitsTableFrom } from '../../src/core/catalog/fitsTable';
import { CellArray } from '../../src/core/catalog/validate';
import type { Cell, RawTable } from '../../src/core/catalog/types';
import type { RowCellsTable } from '../../src/core/catalog/validate';
import { formatCard, headerBytes } from '../../src/core/formats/fits/header';
import { paddingBytes } from '../../src/core/formats/fits/hdu';

const save = scratchFiles('fits-stream', 'fits');

/** A column of the hand-built table: its cards and how row i writes its field (and heap bytes). */
interface Col { ttype: string; tform: string; bytes: number; cards?: [string, string | number | bigint | boolean][]; write(d: DataView, at: number, i: number, heap: HeapWriter): void }
/** Appends heap bytes and returns their offset. */
type HeapWriter = (bytes: number[]) => number;

let seed = 99;
const rnd = () => (seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0) / 4294967296;

const be = (n: number, set: (d: DataView) => void) => { const d = new DataView(new ArrayBuffer(n)); set(d); return [...new Uint8Array(d.buffer)]; };

/** Every column type the reader knows, nulls in several rows; id, ra, dec, mag make a catalog with good and bad rows. */
const COLUMNS: Col[] = [
  { ttype: 'id', tform: '8A', bytes: 8, write: (d, at, i) => { const s = i % 17 === 5 ? '' : i === 31 ? 'c2' : `c${i}`; for (let k = 0; k < s.length; k++) d.setUint8(at + k, s.charCodeAt(k)); } },
  { ttype: 'ra', tform: '1D', bytes: 8, cards: [['TUNIT2', 'deg']], write: (d, at, i) => d.setFloat64(at, i % 23 === 7 ? NaN : 187 + rnd()) },
  { ttype: 'dec', tform: '1E', bytes: 4, cards: [['TUNIT3', 'deg']], write: (d, at, i) => d.setFloat32(at, i % 29 === 3 ? 95 : -5 + rnd()) },
  { ttype: 'mag', tform: '1I', bytes: 2, cards: [['TSCAL4', 0.01], ['TZERO4', 20], ['TNULL4', -32768]], write: (d, at, i) => d.setInt16(at, i % 13 === 4 ? -32768 : Math.round(rnd() * 300)) },
  { ttype: 'flag', tform: '1L', bytes: 1, write: (d, at, i) => d.setUint8(at, [0x54, 0x46, 0][i % 3]) },
  { ttype: 'bits', tform: '13X', bytes: 2, write: (d, at, i) => d.setUint16(at, (i * 2654435761) & 0xfff8) },
  { ttype: 'u8', tform: '1B', bytes: 1, write: (d, at, i) => d.setUint8(at, i & 255) },
  { ttype: 'i8', tform: '1B', bytes: 1, cards: [['TZERO8', -128]], write: (d, at, i) => d.setUint8(at, (i * 7) & 255) },
  { ttype: 'u16', tform: '1I', bytes: 2, cards: [['TZERO9', 32768]], write: (d, at, i) => d.setInt16(at, (i * 331) - 32768) },
  { ttype: 'j', tform: '1J', bytes: 4, cards: [['TNULL10', -1]], write: (d, at, i) => d.setInt32(at, i % 5 === 0 ? -1 : i * 1000003) },
  { ttype: 'k', tform: '1K', bytes: 8, cards: [['TNULL11', 7n]], write: (d, at, i) => d.setBigInt64(at, i % 6 === 0 ? 7n : BigInt(i) * 3000000000000000n) },
  { ttype: 'u64', tform: '1K', bytes: 8, cards: [['TZERO12', 2n ** 63n]], write: (d, at, i) => d.setBigInt64(at, BigInt(i) - 2n ** 62n) },
  { ttype: 'c', tform: '1C', bytes: 8, write: (d, at, i) => { d.setFloat32(at, i / 4); d.setFloat32(at + 4, -i / 8); } },
  { ttype: 'm', tform: '1M', bytes: 16, write: (d, at, i) => { d.setFloat64(at, i); d.setFloat64(at + 8, i % 2 ? -0 : 0.25); } },
  { ttype: 'vec', tform: '3J', bytes: 12, write: (d, at, i) => { for (let k = 0; k < 3; k++) d.setInt32(at + 4 * k, i - k); } },
  { ttype: 'note', tform: '5A', bytes: 5, write: (d, at, i) => { const s = i % 4 === 0 ? 'é b' : 'x  '; const b = new TextEncoder().encode(s); for (let k = 0; k < b.length; k++) d.setUint8(at + k, b[k]); } },
  {
    ttype: 'pe', tform: '1PE(4)', bytes: 8,
    write: (d, at, i, heap) => { const n = i % 4; const off = heap(Array.from({ length: n }, (_, k) => be(4, (v) => v.setFloat32(0, i + k / 2))).flat()); d.setInt32(at, n); d.setInt32(at + 4, off); },
  },
  {
    ttype: 'pa', tform: '1PA(6)', bytes: 8,
    write: (d, at, i, heap) => { const s = `r${i}`; const off = heap([...new TextEncoder().encode(s)]); d.setInt32(at, s.length); d.setInt32(at + 4, off); },
  },
  {
    ttype: 'qd', tform: '1QD(2)', bytes: 16,
    write: (d, at, i, heap) => { const n = i % 3; const off = heap(Array.from({ length: n }, (_, k) => be(8, (v) => v.setFloat64(0, -i * k))).flat()); d.setBigInt64(at, BigInt(n)); d.setBigInt64(at + 8, BigInt(off)); },
  },
];

/** A FITS file: empty primary HDU, then the BINTABLE of `rows` rows of COLUMNS (with its heap), padded. */
function fitsFile(rows: number): Uint8Array {
  const rowBytes = COLUMNS.reduce((a, c) => a + c.bytes, 0);
  const heapBytes: number[] = [];
  const heap: HeapWriter = (b) => { const off = heapBytes.length; heapBytes.push(...b); return off; };
  const main = new Uint8Array(rowBytes * rows);
  const d = new DataView(main.buffer);
  seed = 99;
  for (let i = 0; i < rows; i++) {
    let at = i * rowBytes;
    for (const c of COLUMNS) { c.write(d, at, i, heap); at += c.bytes; }
  }
  const card = (k: string, v: string | number | bigint | boolean) => formatCard(k, v)!;
  const cards = [card('XTENSION', 'BINTABLE'), card('BITPIX', 8), card('NAXIS', 2), card('NAXIS1', rowBytes), card('NAXIS2', rows),
    card('PCOUNT', heapBytes.length), card('GCOUNT', 1), card('TFIELDS', COLUMNS.length)];
  COLUMNS.forEach((c, j) => {
    cards.push(card(`TTYPE${j + 1}`, c.ttype), card(`TFORM${j + 1}`, c.tform));
    for (const [k, v] of c.cards ?? []) cards.push(card(k, v));
  });
  cards.push(card('EXTNAME', 'streamed'), card('OBSERVER', 'nobody'));
  const primary = headerBytes([card('SIMPLE', true), card('BITPIX', 8), card('NAXIS', 0), card('EXTEND', true)]);
  const data = main.length + heapBytes.length;
  const out = new Uint8Array(primary.length + headerBytes(cards).length + data + paddingBytes(data));
  out.set(primary, 0);
  out.set(headerBytes(cards), primary.length);
  out.set(main, primary.length + headerBytes(cards).length);
  out.set(heapBytes, primary.length + headerBytes(cards).length + main.length);
  return out;
}

/** Rows of a RawTable as [line, cells]. */
function rowsOf(t: RawTable): [number, Cell[]][] {
  const out: [number, Cell[]][] = [];
  t.forEachRow((cells, line) => out.push([line, [...cells]]));
  return out;
}

/** Rows of a RowCellsTable as [line, per column: text, number or reason, isText]. */
function rowViewsOf(t: RowCellsTable, n: number): unknown[] {
  const out: unknown[] = [];
  t.forEachRowCells((row, line) => {
    const cols = [];
    for (let k = 0; k < n; k++) {
      const why = { reason: null as string | null };
      const x = row.number(k, why);
      cols.push([row.text(k), Number.isNaN(x) ? why.reason : x, row.isText(k)]);
    }
    out.push([line, cols]);
  });
  return out;
}

describe('FITS BINTABLE read from a file a block of rows at a time', () => {
  const bytes = fitsFile(150);
  const path = save(bytes);
  const whole = readFitsTable(bytes);
  const wholeRows = rowsOf(whole);
  const rowBytes = COLUMNS.reduce((a, c) => a + c.bytes, 0);

  it('reads the test table (every type, with nulls) as the values the columns hold', () => {
    expect(wholeRows.length).toBe(150);
    const [line, cells] = wholeRows[4];
    expect(line).toBe(5);
    expect(cells[0]).toBe('c4');
    expect(cells[3]).toBeNull(); // TNULL
    expect(cells[4]).toBe(false); // 'F'
    expect(cells[11]).toBe(String(4n - 2n ** 62n + 2n ** 63n)); // unsigned 64-bit offset
    expect(cells[17]).toBe('r4');
    expect(whole.meta.map((m) => m.key)).toEqual(['OBSERVER']);
  });

  for (const chunk of [1, 7, rowBytes - 1, rowBytes, rowBytes + 3, 5 * rowBytes + 11, 1 << 20]) {
    it(`gives the same columns, rows and row views with reads of ${chunk} bytes`, () => {
      withFileByteSource(path, (source) => {
        const streamed = readFitsTableFrom(source);
        expect({ ...streamed, forEachRow: null, forEachRowCells: null }).toEqual({ ...whole, forEachRow: null, forEachRowCells: null });
        expect(rowsOf(streamed)).toEqual(wholeRows);
        expect(rowViewsOf(streamed, COLUMNS.length)).toEqual(rowViewsOf(whole, COLUMNS.length));
      }, chunk);
    });
  }

  it('gives the row views the same text, number and reason as the cell arrays', () => {
    const view = new CellArray();
    const fromCells: unknown[] = [];
    whole.forEachRow((cells, line) => {
      view.of(cells);
      const cols = [];
      for (let k = 0; k < COLUMNS.length; k++) {
        const why = { reason: null as string | null };
        const x = view.number(k, why);
        cols.push([view.text(k), Number.isNaN(x) ? why.reason : x, view.isText(k)]);
      }
      fromCells.push([line, cols]);
    });
    expect(rowViewsOf(whole, COLUMNS.length)).toEqual(fromCells);
  });

  it('validates to the same catalog (targets, rejects with row numbers, mapping) as readCatalog on the bytes', () => {
    const expected = readCatalog(bytes, path);
    expect(expected.rejects.length).toBeGreaterThan(20);
    expect(expected.rejects).toContainEqual({ line: 32, column: 'id', reason: 'duplicate id "c2", first used on line 3' });
    for (const chunkBytes of [3, rowBytes + 1, 4096]) {
      const streamed = readCatalogFile(path, undefined, { chunkBytes });
      expect(streamed).toEqual(expected);
      expect(streamed.table).toEqual(expected.table);
    }
  });

  it('says the same about a truncated file, a header without END and a file without a table', () => {
    const message = (f: () => unknown) => { try { f(); } catch (e) { return String(e); } return 'no error'; };
    const cases = [bytes.subarray(0, bytes.length - 3000), bytes.subarray(0, 2880 + 1000), bytes.subarray(0, 2880), bytes.subarray(0, 2880 * 2 + 10)];
    for (const b of cases) {
      const p = save(b);
      const m = message(() => readCatalog(b, p));
      expect(m).toMatch(/InputError|FITS/);
      expect(message(() => readCatalogFile(p, undefined, { chunkBytes: 100 }))).toBe(m);
    }
  });
});
