/**
 * FITS binary table reader (FITS standard 4.0, section 7.3, BINTABLE): the first BINTABLE extension of a file.
 * TFORM L, X, B, I, J, K, A, E, D, C, M and variable-length P/Q; TTYPE, TUNIT, TNULL, TSCAL/TZERO (including the
 * unsigned-integer offsets). Row numbers (`line`) are 1-based. Cells: numbers, booleans, text; null for TNULL, NaN,
 * logical 0 and empty text. Text is cut at the first NUL, trailing blanks removed (as astropy does) and decoded as
 * UTF-8 (Haloweave writes non-ASCII text as UTF-8 bytes). Columns with repeat > 1 give the values as one
 * space-separated text. 64-bit integers beyond 2^53 are kept exact as decimal text.
 * The rows are read a block at a time from a ByteSource (the whole file in memory, or a file read in chunks by the
 * command line) and handed out as RowCells views of the block, without one array of cells per row.
 */
import { InputError } from '../result';
import type { Cell, ColumnInfo } from './types';
import { type CellWhy, type RowCells, type RowCellsTable, cellNumber, cellText } from './validate';
import { type ByteSource, bytesSource } from '../formats/byteSource';
import type { RawTableWithMeta, TableMetaItem } from './tableMeta';
import {
  type ElementCode, type TForm, decodeTextBytes, int64ToCell, parseTform, readInt64, readNumeric,
} from '../formats/fits/binary';
import {
  type FitsHeader, HEADER_ESCAPE_KEYWORD, STRUCTURAL_KEYWORD, headerNumber, headerString, headerValue, unescapeHeaderText,
} from '../formats/fits/header';
import { type FitsHdu, axisLengths, walkHdusFrom } from '../formats/fits/hdu';

/** A cell of one column, read from the row that starts at byte `rowOffset` of `view` (a block of rows). */
type CellReader = (view: DataView, rowOffset: number) => Cell;

/** The heap of variable-length arrays: element `off` of a descriptor is at byte `base + off` of `view`. */
interface Heap {
  view: DataView;
  base: number;
}

/** A BINTABLE read as RowCells views of its row blocks (and as cell arrays), with its name and header metadata. */
export type FitsRawTable = RawTableWithMeta & RowCellsTable;

/** Read the first BINTABLE extension of a FITS file as a RawTable (throws InputError naming the HDU and column). */
export function readFitsTable(bytes: Uint8Array): FitsRawTable {
  return readFitsTableFrom(bytesSource(bytes));
}

/** `readFitsTable` on a ByteSource: the headers are read first, then the rows a block of `source.chunkBytes` at a time. */
export function readFitsTableFrom(source: ByteSource): FitsRawTable {
  const hdus = walkHdusFrom(source);
  const hdu = hdus.find((h) => h.kind === 'BINTABLE');
  if (!hdu) {
    const kinds = hdus.map((h) => `${h.index}:${h.kind}`).join(', ');
    const ascii = hdus.some((h) => h.kind === 'TABLE');
    throw new InputError([{
      where: 'FITS file',
      what: `no BINTABLE extension (HDUs found: ${kinds})`,
      fix: ascii ? 'ASCII TABLE extensions are not read; save the table as a FITS binary table' : 'save the catalog as a FITS binary table',
    }]);
  }
  return bintableFrom(source, hdu);
}

/** The RawTable of one BINTABLE HDU of a FITS file held in memory. */
export function bintableFromHdu(bytes: Uint8Array, hdu: FitsHdu): FitsRawTable {
  return bintableFrom(bytesSource(bytes), hdu);
}

/** The RawTable of one BINTABLE HDU of a ByteSource; the heap (variable-length arrays) is read when first needed. */
function bintableFrom(source: ByteSource, hdu: FitsHdu): FitsRawTable {
  const h = hdu.header;
  const where = `FITS HDU ${hdu.index} (BINTABLE)`;
  const axes = axisLengths(h, where);
  if (axes.length !== 2) throw new InputError([{ where, what: `NAXIS is ${axes.length}; a binary table has NAXIS = 2`, fix: 'the table header is damaged' }]);
  const [rowBytes, rowCount] = axes;
  const nFields = headerNumber(h, 'TFIELDS') ?? 0;
  const escaped = headerValue(h, HEADER_ESCAPE_KEYWORD) === true;
  const text = (s: string | undefined) => (s === undefined ? undefined : escaped ? unescapeHeaderText(s) : s);
  const heapStart = headerNumber(h, 'THEAP') ?? rowBytes * rowCount;
  let heapRead: Heap | null = null;
  const heap = (): Heap => {
    if (heapRead) return heapRead;
    const whole = source.whole;
    if (whole) heapRead = { view: new DataView(whole.buffer, whole.byteOffset + hdu.dataOffset, hdu.dataBytes), base: heapStart };
    else {
      const bytes = source.read(hdu.dataOffset + heapStart, Math.max(0, hdu.dataBytes - heapStart)).slice();
      heapRead = { view: new DataView(bytes.buffer), base: 0 };
    }
    return heapRead;
  };

  const columns: ColumnInfo[] = [];
  const readers: CellReader[] = [];
  let offset = 0;
  let heapColumns = false;
  for (let n = 1; n <= nFields; n++) {
    const tformText = headerString(h, `TFORM${n}`);
    const tform = tformText === undefined ? null : parseTform(tformText);
    const name = text(headerString(h, `TTYPE${n}`)) || `col${n}`;
    if (!tform) {
      throw new InputError([{
        where: `${where}, column ${n} '${name}'`,
        what: tformText === undefined ? `TFORM${n} is missing` : `TFORM${n} = '${tformText}' is not a binary-table format`,
        fix: 'the table header is damaged; write it again with a FITS library',
      }]);
    }
    const unit = text(headerString(h, `TUNIT${n}`))?.trim() || undefined;
    const ucd = text(headerString(h, `TUCD${n}`))?.trim() || undefined;
    const ttypeCard = h.cards.find((c) => c.keyword === `TTYPE${n}`);
    const description = ttypeCard?.comment ? text(ttypeCard.comment) : undefined;
    const { reader, datatype } = columnReader(h, n, tform, offset, heap, `${where}, column ${n} '${name}'`);
    columns.push({ name, datatype, ...(unit ? { unit } : {}), ...(ucd ? { ucd } : {}), ...(description ? { description } : {}) });
    readers.push(reader);
    offset += tform.bytes;
    heapColumns ||= tform.code === 'P' || tform.code === 'Q';
  }
  if (offset !== rowBytes) {
    throw new InputError([{ where, what: `the columns take ${offset} bytes per row but NAXIS1 = ${rowBytes}`, fix: 'the table header is damaged' }]);
  }

  const meta = headerMeta(h, text);
  const name = text(headerString(h, 'EXTNAME')) || undefined;
  const rowsPerBlock = rowBytes === 0 ? rowCount : Math.max(1, Math.floor(source.chunkBytes / rowBytes));
  /** Visit each block of rows: a view of its bytes, its first row (0-based) and its row count. */
  const forEachBlock = (visit: (view: DataView, firstRow: number, rows: number) => void) => {
    if (heapColumns) heap(); // read before the rows: a file source reuses its buffer for every read
    for (let r0 = 0; r0 < rowCount; r0 += rowsPerBlock) {
      const rows = Math.min(rowsPerBlock, rowCount - r0);
      const bytes = source.read(hdu.dataOffset + r0 * rowBytes, rows * rowBytes);
      visit(new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength), r0, rows);
    }
  };
  return {
    format: 'fits',
    columns,
    structuralRejects: [],
    name,
    meta,
    forEachRow(visit) {
      forEachBlock((view, r0, rows) => {
        for (let r = 0; r < rows; r++) {
          const base = r * rowBytes;
          const cells: Cell[] = new Array(readers.length);
          for (let c = 0; c < readers.length; c++) cells[c] = readers[c](view, base);
          visit(cells, r0 + r + 1);
        }
      });
    },
    forEachRowCells(visit) {
      const row = new BintableRow(readers);
      forEachBlock((view, r0, rows) => {
        row.view = view;
        for (let r = 0; r < rows; r++) {
          row.rowOffset = r * rowBytes;
          visit(row, r0 + r + 1);
        }
      });
    },
  };
}

/** RowCells of one row of a block, read from its bytes on demand (the same values as the row's cell array). */
class BintableRow implements RowCells {
  view: DataView<ArrayBufferLike> = new DataView(new ArrayBuffer(0));
  rowOffset = 0;

  constructor(private readonly readers: readonly CellReader[]) {}

  number(k: number, why: CellWhy): number {
    return cellNumber(this.readers[k](this.view, this.rowOffset), why);
  }

  text(k: number): string {
    return cellText(this.readers[k](this.view, this.rowOffset));
  }

  isText(k: number): boolean {
    return typeof this.readers[k](this.view, this.rowOffset) === 'string';
  }
}

/** Header keywords that are not table structure, as metadata; a comment "[unit] text" gives unit and description. */
function headerMeta(h: FitsHeader, text: (s: string | undefined) => string | undefined): TableMetaItem[] {
  const meta: TableMetaItem[] = [];
  for (const card of h.cards) {
    if (card.value === undefined || (!card.hierarch && STRUCTURAL_KEYWORD.test(card.keyword)) || card.keyword === HEADER_ESCAPE_KEYWORD) continue;
    const m = /^\[([^\]]*)\]\s*(.*)$/.exec(card.comment);
    const unit = m ? m[1].trim() : undefined;
    const description = text(m ? m[2] : card.comment) || undefined;
    const value = typeof card.value === 'bigint' ? card.value.toString() : typeof card.value === 'string' ? text(card.value)! : card.value;
    meta.push({ key: text(card.keyword)!, value, ...(unit ? { unit } : {}), ...(description ? { description } : {}) });
  }
  return meta;
}

const TWO_63 = 2n ** 63n;

/** The reader of one column and its datatype name (ECSV names: bool, uint8, int16, int32, int64, float32, float64, string). */
function columnReader(
  h: FitsHeader, n: number, tform: TForm, fieldOffset: number, heap: () => Heap, where: string,
): { reader: CellReader; datatype: string } {
  const tscal = headerNumber(h, `TSCAL${n}`) ?? 1;
  const tzeroValue = headerValue(h, `TZERO${n}`);
  const tzero = headerNumber(h, `TZERO${n}`) ?? 0;
  const tnullValue = headerValue(h, `TNULL${n}`);
  const code = tform.code;
  const repeat = tform.repeat;

  if (code === 'P' || code === 'Q') {
    const heapCode = tform.heapCode!;
    // (text arrays are read as text: no element reader for them)
    const one = heapCode === 'A' ? null : elementReader(heapCode, tscal, tzero, tzeroValue, tnullValue, where);
    const reader: CellReader = (v, row) => {
      const at = row + fieldOffset;
      const count = code === 'P' ? v.getInt32(at, false) : Number(readInt64(v, at));
      const off = code === 'P' ? v.getInt32(at + 4, false) : Number(readInt64(v, at + 8));
      const { view: hv, base } = heap();
      const start = base + off;
      if (heapCode === 'A') return emptyToNull(decodeTextBytes(bytesOf(hv, start, count)));
      return joinElements(hv, start, count, heapCode, one!.read);
    };
    return { reader, datatype: 'string' };
  }
  if (code === 'A') {
    return { reader: (v, row) => emptyToNull(decodeTextBytes(bytesOf(v, row + fieldOffset, repeat))), datatype: 'string' };
  }
  if (code === 'X') {
    return {
      reader: (v, row) => {
        let s = '';
        for (let i = 0; i < repeat; i++) s += (v.getUint8(row + fieldOffset + (i >> 3)) >> (7 - (i & 7))) & 1 ? '1' : '0';
        return s;
      },
      datatype: 'string',
    };
  }
  const one = elementReader(code, tscal, tzero, tzeroValue, tnullValue, where);
  if (repeat === 0) return { reader: () => null, datatype: one.datatype };
  if (repeat === 1) return { reader: (v, row) => one.read(v, row + fieldOffset), datatype: one.datatype };
  return { reader: (v, row) => joinElements(v, row + fieldOffset, repeat, code, one.read), datatype: 'string' };
}

function bytesOf(v: DataView, start: number, length: number): Uint8Array {
  return new Uint8Array(v.buffer, v.byteOffset + start, length);
}

function emptyToNull(s: string): string | null {
  const t = s.replace(/ +$/, '');
  return t === '' ? null : t;
}

function joinElements(v: DataView, start: number, count: number, code: ElementCode, read: (v: DataView, at: number) => Cell): string {
  const size = code === 'C' ? 8 : code === 'M' ? 16 : ({ L: 1, B: 1, I: 2, J: 4, K: 8, E: 4, D: 8 } as Record<string, number>)[code];
  const parts: string[] = [];
  for (let i = 0; i < count; i++) {
    const c = read(v, start + i * size);
    parts.push(c === null ? 'null' : typeof c === 'boolean' ? (c ? 'T' : 'F') : String(c));
  }
  return parts.join(' ');
}

/** Reader of one scalar element with TNULL, TSCAL and TZERO applied. */
function elementReader(
  code: ElementCode, tscal: number, tzero: number, tzeroValue: unknown, tnullValue: unknown, where: string,
): { read: (v: DataView, at: number) => Cell; datatype: string } {
  const scaled = tscal !== 1 || tzero !== 0;
  switch (code) {
    case 'L':
      return { read: (v, at) => { const b = v.getUint8(at); return b === 0x54 ? true : b === 0x46 ? false : null; }, datatype: 'bool' };
    case 'E': case 'D':
      return {
        read: (v, at) => { const x = readNumeric(v, at, code); return Number.isNaN(x) ? null : scaled ? tzero + tscal * x : x; },
        datatype: code === 'E' && !scaled ? 'float32' : 'float64',
      };
    case 'B': case 'I': case 'J': {
      const tnull = typeof tnullValue === 'number' ? tnullValue : undefined;
      const unsignedOffset = { B: -128, I: 32768, J: 2147483648 }[code];
      const datatype = !scaled ? { B: 'uint8', I: 'int16', J: 'int32' }[code]
        : tscal === 1 && tzero === unsignedOffset ? { B: 'int8', I: 'uint16', J: 'uint32' }[code] : 'float64';
      return {
        read: (v, at) => { const x = readNumeric(v, at, code); return x === tnull ? null : tzero + tscal * x; },
        datatype,
      };
    }
    case 'K': {
      const tnull = typeof tnullValue === 'number' || typeof tnullValue === 'bigint' ? BigInt(tnullValue) : undefined;
      const unsigned = tscal === 1 && typeof tzeroValue === 'bigint' && tzeroValue === TWO_63;
      const plain = !scaled;
      return {
        read: (v, at) => {
          const x = readInt64(v, at);
          if (x === tnull) return null;
          if (plain) return int64ToCell(x);
          if (unsigned) return int64ToCell(x + TWO_63);
          return tzero + tscal * Number(x);
        },
        datatype: plain ? 'int64' : unsigned ? 'uint64' : 'float64',
      };
    }
    case 'C': case 'M': {
      const part = code === 'C' ? 'E' : 'D';
      const size = code === 'C' ? 4 : 8;
      return { read: (v, at) => `${readNumeric(v, at, part)}${formatImag(readNumeric(v, at + size, part))}j`, datatype: 'string' };
    }
    default:
      throw new InputError([{ where, what: `element type ${code} cannot be read here` }]);
  }
}

function formatImag(x: number): string {
  return x < 0 || Object.is(x, -0) ? String(x) : `+${x}`;
}
