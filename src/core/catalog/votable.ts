/**
 * VOTable 1.3/1.4 reader (IVOA standard): the first TABLE of the document, depth-first through RESOURCEs.
 * Serialisations TABLEDATA, BINARY2 (null-flag bitmap before each row), BINARY and inline base64 FITS; big-endian
 * binary. FIELD name/unit/datatype/ucd/arraysize/DESCRIPTION, VALUES `null`; PARAMs and INFOs as metadata.
 * Row numbers (`line`) are 1-based. Cells: numbers, booleans, text; null for empty TD, the VALUES null value, NaN,
 * the BINARY2 null flag and boolean '?'. Arrays (arraysize other than 1, except char) come as space-separated text;
 * 64-bit integers beyond 2^53 as exact decimal text. Datatype names are ECSV's (bool, uint8, int16, ... string).
 * The document is read from a TextSource (votableDocument.ts): the XML around the row data is checked and parsed as a
 * whole, and the rows (TABLEDATA, or a BINARY/BINARY2 base64 STREAM) are read again a piece at a time when visited.
 */
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { InputError } from '../result';
import type { Cell, ColumnInfo, RowReject } from './types';
import type { RawTableWithMeta, TableMetaItem } from './tableMeta';
import { Base64Decoder, decodeBase64 } from '../formats/base64';
import { decodeTextBytes, int64ToCell, readInt64, readNumeric } from '../formats/fits/binary';
import { walkHdus } from '../formats/fits/hdu';
import { bintableFromHdu } from './fitsTable';
import { TabledataScanner } from './votableTabledata';
import { WHOLE_ROW, type TextSource, stringSource } from './csvReader';
import { type BulkSpan, forEachPieceOf, lineInSpan, sliceOf, splitVoTable, withoutLeadingBom } from './votableDocument';

type XmlNode = Record<string, unknown>;

const ARRAY_ELEMENTS = new Set([
  'RESOURCE', 'TABLE', 'FIELD', 'PARAM', 'INFO', 'GROUP', 'OPTION', 'COOSYS', 'TIMESYS', 'LINK', 'FIELDref', 'PARAMref',
]);

const parser = new XMLParser({
  ignoreAttributes: false,
  attributeNamePrefix: '@_',
  parseTagValue: false,
  parseAttributeValue: false,
  trimValues: false,
  removeNSPrefix: true,
  htmlEntities: true,
  isArray: (name) => ARRAY_ELEMENTS.has(name),
  // Row data is kept as raw text and scanned by votableTabledata.ts / decoded from base64: much faster than a tree.
  stopNodes: ['*.TABLEDATA', '*.STREAM'],
});

/** A FIELD's description and how its values are stored. */
interface FieldSpec {
  name: string;
  datatype: string;
  /** Elements per cell for fixed sizes; null for variable length ('*'). */
  count: number | null;
  /** True when the cell is one value (not char, arraysize 1 or absent). */
  scalar: boolean;
  nullText?: string;
  /** The VALUES null as a number and (for integers) as a bigint, when it is numeric. */
  nullNumber?: number;
  nullBig?: bigint;
}

const WHERE = 'VOTable';

/** Read the first TABLE of a VOTable document as a RawTable with its PARAMs and INFOs as metadata. */
export function readVoTable(bytes: Uint8Array): RawTableWithMeta {
  return readVoTableFrom(stringSource(new TextDecoder(voTableEncoding(bytes)).decode(bytes)));
}

/**
 * `readVoTable` on a TextSource (the document's text read in chunks, each call from the start): the same table, rows
 * and errors. The source is read once to split the document and once more each time the rows are visited.
 */
export function readVoTableFrom(textSource: TextSource): RawTableWithMeta {
  const source = withoutLeadingBom(textSource);
  const { validatorText, parserText, spans } = splitVoTable(source);
  // Well-formedness of everything but the bulk row data (which the TABLEDATA scanner and base64 decoder check);
  // newlines are kept so the validator's line numbers are the file's.
  const valid = XMLValidator.validate(validatorText);
  if (valid !== true) {
    throw new InputError([{ where: `${WHERE}, line ${valid.err.line}, column ${valid.err.col}`, what: `not well-formed XML: ${valid.err.msg}`, fix: 'repair or re-export the file' }]);
  }
  let doc: XmlNode;
  try {
    doc = parser.parse(parserText) as XmlNode;
  } catch (e) {
    throw new InputError([{ where: WHERE, what: `cannot be parsed as XML (${e instanceof Error ? e.message : String(e)})`, fix: 'check that every element, CDATA section and comment is closed' }]);
  }
  /** The bulk content span a TABLEDATA or STREAM node of the parsed skeleton stands for (null when it is empty). */
  const spanOf = (node: unknown): BulkSpan | null => {
    const k = textOf(node);
    return /^\d+$/.test(k) ? spans[Number(k)] ?? null : null;
  };
  const root = doc.VOTABLE as XmlNode | undefined;
  if (!root || typeof root !== 'object') {
    throw new InputError([{ where: WHERE, what: 'no VOTABLE root element', fix: 'the file is XML but not a VOTable' }]);
  }
  const meta: TableMetaItem[] = [];
  collectMeta(root, meta);
  const table = findFirstTable(root, meta);
  if (!table) throw new InputError([{ where: WHERE, what: 'no TABLE element in any RESOURCE', fix: 'the VOTable holds no table' }]);
  collectMeta(table, meta);
  for (const g of arrayOf(table.GROUP)) collectMeta(g, meta);

  const fieldNodes = arrayOf(table.FIELD);
  const fields = fieldNodes.map((f, i) => fieldSpec(f, i));
  const columns: ColumnInfo[] = fieldNodes.map((f, i) => {
    const unit = attr(f, 'unit'), ucd = attr(f, 'ucd'), description = descriptionOf(f);
    return {
      name: fields[i].name,
      datatype: fields[i].scalar ? ecsvDatatype(fields[i].datatype) : 'string',
      ...(unit ? { unit } : {}), ...(ucd ? { ucd } : {}), ...(description ? { description } : {}),
    };
  });
  const name = attr(table, 'name');
  const data = table.DATA as XmlNode | undefined;
  const base = { format: 'votable' as const, columns, name, meta };

  if (!data || typeof data !== 'object') return { ...base, structuralRejects: [], forEachRow() {} };
  if (data.TABLEDATA !== undefined) {
    const span = spanOf(data.TABLEDATA);
    const pieces = (onPiece: (text: string) => void) => { if (span) forEachPieceOf(source, span.start, span.end, onPiece); };
    const lineOf = (offset: number) => (span ? lineInSpan(source, span, offset) : 0); // only called for an error message
    return tabledataRows(base, pieces, fields, lineOf);
  }
  for (const kind of ['BINARY2', 'BINARY'] as const) {
    if (data[kind] !== undefined) {
      const span = streamSpan(data[kind] as XmlNode, kind, spanOf);
      const where = `${WHERE} ${kind}`;
      return {
        ...base,
        structuralRejects: [],
        forEachRow: (visit) => {
          const rows = new BinaryRowReader(fields, kind === 'BINARY2', visit);
          const decoder = new Base64Decoder();
          if (span) {
            forEachPieceOf(source, span.start, span.end, (text) => {
              const bytes = decoder.push(text);
              if (decoder.badAt >= 0) throw notBase64(where, decoder.badAt);
              rows.push(bytes);
            });
          }
          rows.finish();
        },
      };
    }
  }
  if (data.FITS !== undefined) {
    const fitsNode = data.FITS as XmlNode;
    const span = streamSpan(fitsNode, 'FITS', spanOf);
    const decoded = decodeBase64(span ? sliceOf(source, span.start, span.end) : '');
    if ('badAt' in decoded) throw notBase64(`${WHERE} FITS`, decoded.badAt);
    const fitsBytes = decoded.bytes;
    const hdus = walkHdus(fitsBytes, `${WHERE} FITS stream`);
    const extnum = Number(attr(fitsNode, 'extnum') ?? NaN);
    const hdu = Number.isInteger(extnum) ? hdus[extnum] : hdus.find((h) => h.kind === 'BINTABLE');
    if (!hdu || hdu.kind !== 'BINTABLE') throw new InputError([{ where: `${WHERE} FITS stream`, what: 'no BINTABLE extension in the embedded FITS data' }]);
    const t = bintableFromHdu(fitsBytes, hdu);
    if (t.columns.length !== fields.length) {
      throw new InputError([{ where: `${WHERE} FITS stream`, what: `the embedded table has ${t.columns.length} columns but the VOTable declares ${fields.length} FIELDs` }]);
    }
    return { ...base, structuralRejects: [], forEachRow: t.forEachRow };
  }
  throw new InputError([{ where: `${WHERE} TABLE ${name ?? ''}`.trim(), what: 'DATA holds no TABLEDATA, BINARY2, BINARY or FITS element' }]);
}

/** The text encoding of a VOTable document from its first bytes: Latin-1 when the XML declaration names ISO-8859-1 / Latin-1, else UTF-8. */
export function voTableEncoding(head: Uint8Array): 'latin1' | 'utf-8' {
  const text = String.fromCharCode(...head.subarray(0, 200));
  return /encoding=["'](ISO-8859-1|latin-?1)["']/i.test(text) ? 'latin1' : 'utf-8';
}

function arrayOf(v: unknown): XmlNode[] {
  return Array.isArray(v) ? (v as XmlNode[]) : v === undefined ? [] : [v as XmlNode];
}

function attr(node: XmlNode, name: string): string | undefined {
  const v = node[`@_${name}`];
  return typeof v === 'string' ? v : undefined;
}

function textOf(v: unknown): string {
  if (typeof v === 'string') return v;
  if (v && typeof v === 'object' && typeof (v as XmlNode)['#text'] === 'string') return (v as XmlNode)['#text'] as string;
  return '';
}

function descriptionOf(node: XmlNode): string | undefined {
  const d = textOf(node.DESCRIPTION).trim();
  return d === '' ? undefined : d;
}

/** Depth-first search for the first TABLE; PARAMs/INFOs of the RESOURCEs on the way are collected. */
function findFirstTable(node: XmlNode, meta: TableMetaItem[]): XmlNode | undefined {
  for (const res of arrayOf(node.RESOURCE)) {
    const before = meta.length;
    collectMeta(res, meta);
    const table = arrayOf(res.TABLE)[0];
    if (table) return table;
    const inner = findFirstTable(res, meta);
    if (inner) return inner;
    meta.length = before;
  }
  return undefined;
}

/** PARAMs (typed values with unit/ucd/description) and INFOs (text) directly under `node`. */
function collectMeta(node: XmlNode, meta: TableMetaItem[]): void {
  const params = arrayOf(node.PARAM);
  for (const [i, p] of params.entries()) {
    const spec = fieldSpec(p, i, 'PARAM');
    const raw = attr(p, 'value') ?? '';
    const unit = attr(p, 'unit'), ucd = attr(p, 'ucd'), description = descriptionOf(p);
    meta.push({
      key: spec.name, value: parseText(raw, spec), datatype: spec.datatype,
      ...(unit ? { unit } : {}), ...(ucd ? { ucd } : {}), ...(description ? { description } : {}),
    });
  }
  for (const info of arrayOf(node.INFO)) {
    const key = attr(info, 'name') ?? attr(info, 'ID');
    if (key) meta.push({ key, value: attr(info, 'value') ?? textOf(info) });
  }
}

/** FIELD or PARAM attributes: name, datatype, arraysize (product of dimensions; '*' = variable), VALUES null. */
function fieldSpec(node: XmlNode, index: number, kind: 'FIELD' | 'PARAM' = 'FIELD'): FieldSpec {
  const name = attr(node, 'name') ?? attr(node, 'ID') ?? `col${index + 1}`;
  const datatype = attr(node, 'datatype');
  const where = `${WHERE} ${kind} ${index + 1} '${name}'`;
  if (!datatype) throw new InputError([{ where, what: 'has no datatype attribute', fix: `every ${kind} needs a datatype (e.g. double, int, char)` }]);
  if (!(datatype in ELEMENT_SIZE)) throw new InputError([{ where, what: `datatype '${datatype}' is not a VOTable datatype` }]);
  const arraysize = attr(node, 'arraysize')?.trim();
  let count: number | null = 1;
  if (arraysize) {
    if (arraysize.endsWith('*')) count = null;
    else {
      const dims = arraysize.split('x').map((d) => Number(d));
      if (dims.some((d) => !Number.isInteger(d) || d < 0)) throw new InputError([{ where, what: `arraysize '${arraysize}' is not valid`, fix: "use e.g. 8, 3x4, * or 10*" }]);
      count = dims.reduce((a, b) => a * b, 1);
    }
  }
  const isChar = datatype === 'char' || datatype === 'unicodeChar';
  const values = node.VALUES as XmlNode | undefined;
  const nullText = values && typeof values === 'object' ? attr(values, 'null') : undefined;
  const t = nullText?.trim();
  const nullNumber = t !== undefined && t !== '' && !Number.isNaN(Number(t)) ? Number(t) : undefined;
  const nullBig = t !== undefined && /^[+-]?\d+$|^0x[0-9a-f]+$/i.test(t) ? BigInt(t.startsWith('+') ? t.slice(1) : t) : undefined;
  return { name, datatype, count, scalar: !isChar && count === 1, nullText, nullNumber, nullBig };
}

const ELEMENT_SIZE: Record<string, number> = {
  boolean: 1, bit: 1, unsignedByte: 1, short: 2, int: 4, long: 8, char: 1, unicodeChar: 2,
  float: 4, double: 8, floatComplex: 8, doubleComplex: 16,
};

function ecsvDatatype(votableType: string): string {
  return ({
    boolean: 'bool', bit: 'bool', unsignedByte: 'uint8', short: 'int16', int: 'int32', long: 'int64', float: 'float32', double: 'float64',
  } as Record<string, string>)[votableType] ?? 'string';
}

const INTEGER = new Set(['unsignedByte', 'short', 'int', 'long']);
const REAL = new Set(['float', 'double']);

/** The Cell of a TABLEDATA TD (or PARAM value) text for a field. Unparsable numbers are kept as text for validation to report. */
function parseText(raw: string, f: FieldSpec): Cell {
  if (f.datatype === 'char' || f.datatype === 'unicodeChar') return raw === '' ? null : raw;
  const t = raw.trim();
  if (t === '' || (f.nullText !== undefined && t === f.nullText.trim())) return null;
  if (!f.scalar) return t;
  if (f.datatype === 'boolean' || f.datatype === 'bit') {
    const c = t.toLowerCase();
    return c === 't' || c === 'true' || c === '1' ? true : c === 'f' || c === 'false' || c === '0' ? false : c === '?' ? null : t;
  }
  if (INTEGER.has(f.datatype)) {
    if (/^[+-]?\d{1,15}$/.test(t)) {
      const x = Number(t);
      return x === f.nullNumber ? null : x;
    }
    if (/^[+-]?\d+$/.test(t) || /^0x[0-9a-f]+$/i.test(t)) {
      const big = BigInt(t.startsWith('+') ? t.slice(1) : t);
      if (f.nullBig === big) return null;
      return int64ToCell(big);
    }
    return t;
  }
  if (REAL.has(f.datatype)) {
    const x = /^[+-]?inf(inity)?$/i.test(t) ? (t.startsWith('-') ? -Infinity : Infinity) : Number(t);
    if (Number.isNaN(x)) return /^nan$/i.test(t) ? null : t;
    if (f.nullNumber === x) return null;
    return x;
  }
  return t;
}

/**
 * TABLEDATA rows, scanned from the content's pieces; a TR whose TD count differs from the FIELD count is a structural
 * reject (column `(row)`), found while the rows are visited (or by a counting scan when the rejects are read first).
 */
function tabledataRows(
  base: Omit<RawTableWithMeta, 'forEachRow' | 'structuralRejects'>, pieces: (onPiece: (text: string) => void) => void,
  fields: FieldSpec[], lineOf: (offset: number) => number,
): RawTableWithMeta {
  let rejects: RowReject[] | null = null;
  const reject = (row: number, n: number): RowReject => ({ line: row, column: WHOLE_ROW, reason: `row has ${n} TD cells but the table has ${fields.length} FIELDs` });
  const scan = (visit: (tds: string[], row: number) => void) => {
    const scanner = new TabledataScanner(visit, lineOf);
    pieces((text) => scanner.push(text));
    scanner.finish();
  };
  return {
    ...base, // (a literal, not a spread of this object: spreading would run the getter and scan twice)
    get structuralRejects(): RowReject[] {
      if (rejects === null) {
        const found: RowReject[] = [];
        scan((tds, row) => { if (tds.length !== fields.length) found.push(reject(row, tds.length)); });
        rejects = found;
      }
      return rejects;
    },
    forEachRow(visit) {
      const found: RowReject[] | null = rejects === null ? [] : null;
      scan((tds, row) => {
        if (tds.length !== fields.length) { found?.push(reject(row, tds.length)); return; }
        const cells: Cell[] = new Array(tds.length);
        for (let c = 0; c < tds.length; c++) cells[c] = parseText(tds[c], fields[c]);
        visit(cells, row);
      });
      if (found) rejects = found;
    },
  };
}

/** The content span of a base64 STREAM (null when empty); external href streams are not fetched. */
function streamSpan(node: XmlNode, kind: string, spanOf: (node: unknown) => BulkSpan | null): BulkSpan | null {
  const stream = node.STREAM as XmlNode | string | undefined;
  const where = `${WHERE} ${kind}`;
  if (stream === undefined) throw new InputError([{ where, what: 'no STREAM element' }]);
  const s = typeof stream === 'object' ? stream : ({ '#text': stream } as XmlNode);
  if (attr(s, 'href')) throw new InputError([{ where, what: `STREAM points to external data (${attr(s, 'href')})`, fix: 'download it and save the table with inline data' }]);
  const enc = attr(s, 'encoding') ?? 'base64';
  if (enc !== 'base64') throw new InputError([{ where, what: `STREAM encoding '${enc}' is not read`, fix: 'use base64 encoding' }]);
  return spanOf(s);
}

function notBase64(where: string, badAt: number): InputError {
  return new InputError([{ where, what: `STREAM has a character that is not base64 at position ${badAt}` }]);
}

/**
 * The rows of a BINARY (v1) or BINARY2 stream, fed its decoded bytes a piece at a time (`push`, then `finish`);
 * big-endian, variable sizes prefixed by a 4-byte count. A row is visited once all its bytes have arrived; bytes
 * left over at the end are a row the stream ends inside (an error naming it).
 */
class BinaryRowReader {
  private buf = new Uint8Array(1 << 16);
  private start = 0;
  private end = 0;
  private row = 0;
  private readonly flagBytes: number;

  constructor(
    private readonly fields: FieldSpec[],
    private readonly withNullFlags: boolean,
    private readonly visit: (cells: Cell[], line: number) => void,
  ) {
    this.flagBytes = withNullFlags ? Math.ceil(fields.length / 8) : 0;
  }

  /** Add decoded bytes and visit the rows they complete. */
  push(bytes: Uint8Array): void {
    if (this.end + bytes.length > this.buf.length) {
      const keep = this.end - this.start;
      const next = keep + bytes.length > this.buf.length ? new Uint8Array(2 * (keep + bytes.length)) : this.buf;
      next.set(this.buf.subarray(this.start, this.end), 0);
      this.buf = next;
      this.start = 0;
      this.end = keep;
    }
    this.buf.set(bytes, this.end);
    this.end += bytes.length;
    this.rows(false);
  }

  /** Visit the last rows; bytes that do not make a whole row are an error. */
  finish(): void {
    this.rows(true);
  }

  private rows(final: boolean): void {
    const { fields, withNullFlags, flagBytes, buf } = this;
    const view = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
    const end = this.end;
    let p = this.start;
    const need = (n: number): boolean => {
      if (p + n <= end) return true;
      if (!final) return false;
      throw new InputError([{ where: `${WHERE} ${withNullFlags ? 'BINARY2' : 'BINARY'} row ${this.row + 1}`, what: 'the stream ends inside this row', fix: 'the file is truncated or its FIELDs do not match the data' }]);
    };
    rows: while (p < end) {
      const rowStart = p;
      if (!need(flagBytes)) break;
      const flagsAt = p;
      p += flagBytes;
      const cells: Cell[] = new Array(fields.length);
      for (let c = 0; c < fields.length; c++) {
        const f = fields[c];
        let count = f.count;
        if (count === null) {
          if (!need(4)) { p = rowStart; break rows; }
          count = view.getUint32(p, false);
          p += 4;
        }
        const size = f.datatype === 'bit' ? Math.ceil(count / 8) : ELEMENT_SIZE[f.datatype] * count;
        if (!need(size)) { p = rowStart; break rows; }
        const isNull = withNullFlags && (buf[flagsAt + (c >> 3)] & (0x80 >> (c & 7))) !== 0;
        cells[c] = isNull ? null : binaryCell(view, buf, p, count, f);
        p += size;
      }
      this.row++;
      this.visit(cells, this.row);
    }
    this.start = p;
  }
}

/** One cell of a binary stream: `count` elements of the field's datatype starting at byte `p`. */
function binaryCell(view: DataView, bytes: Uint8Array, p: number, count: number, f: FieldSpec): Cell {
  switch (f.datatype) {
    case 'char': { const s = decodeTextBytes(bytes.subarray(p, p + count)); return s === '' ? null : s; }
    case 'unicodeChar': {
      let s = '';
      for (let i = 0; i < count; i++) { const u = view.getUint16(p + 2 * i, false); if (u === 0) break; s += String.fromCharCode(u); }
      return s === '' ? null : s;
    }
    case 'bit': {
      // A single bit: any non-zero byte is true (the standard puts it at 0x80; astropy 5.2 writes 0x08).
      if (f.scalar) return bytes[p] !== 0;
      let s = '';
      for (let i = 0; i < count; i++) s += (bytes[p + (i >> 3)] >> (7 - (i & 7))) & 1 ? '1' : '0';
      return s;
    }
  }
  if (f.scalar) return binaryElement(view, p, f);
  const size = ELEMENT_SIZE[f.datatype];
  const parts: string[] = [];
  for (let i = 0; i < count; i++) { const c = binaryElement(view, p + i * size, f); parts.push(c === null ? 'null' : String(c)); }
  return parts.join(' ');
}

const NUMERIC_CODE = { unsignedByte: 'B', short: 'I', int: 'J', float: 'E', double: 'D' } as const;

function binaryElement(view: DataView, at: number, f: FieldSpec): Cell {
  switch (f.datatype) {
    case 'boolean': {
      const b = String.fromCharCode(view.getUint8(at)).toLowerCase();
      return b === 't' || b === '1' ? true : b === 'f' || b === '0' ? false : null;
    }
    case 'long': {
      const x = readInt64(view, at);
      if (f.nullBig === x) return null;
      return int64ToCell(x);
    }
    case 'floatComplex': case 'doubleComplex': {
      const code = f.datatype === 'floatComplex' ? 'E' : 'D';
      const half = f.datatype === 'floatComplex' ? 4 : 8;
      return `${readNumeric(view, at, code)} ${readNumeric(view, at + half, code)}`;
    }
  }
  const code = NUMERIC_CODE[f.datatype as 'int'];
  const x = readNumeric(view, at, code);
  if (Number.isNaN(x) || x === f.nullNumber) return null;
  return x;
}
