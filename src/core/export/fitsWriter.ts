/**
 * FITS writer (FITS standard 4.0): an empty primary HDU, then one BINTABLE with TTYPE/TFORM/TUNIT (plus TUCDn for
 * the UCD1+ word, TNULLn for integers, the column description as the TTYPE comment) and the table meta as keywords.
 *
 * Decisions (documented in docs/formats.md):
 * - Columns: string -> `wA` with w the longest UTF-8 byte length (at least 1), NUL-padded; float64 -> `1D`
 *   (null = NaN); int32 -> `1J` with TNULL = -2147483648; bool -> `1L` (null = byte 0).
 * - Non-ASCII text in string columns is stored as its UTF-8 bytes (the standard asks for ASCII; astropy reads
 *   them back as bytes, Haloweave decodes them as UTF-8). Empty text and null are the same (all NUL); trailing
 *   blanks of a text are not kept (FITS readers drop them).
 * - Meta keys that are standard keywords (1-8 of A-Z 0-9 _ -, not structural) are written as such (long texts with
 *   the CONTINUE long-string convention); other keys of printable ASCII without spaces or '=' use the HIERARCH
 *   convention; a key or value that fits neither (a structural name, a space, a HIERARCH card over 80 characters)
 *   is written as COMMENT lines `meta: key = value` for a human reader (not read back as meta).
 * - Header text outside printable ASCII is escaped as `\uXXXX` and the keyword HWESCAPE = T says so; Haloweave's
 *   reader undoes it. Units go first in a keyword's comment as `[unit]`.
 */
import { InputError } from '../result';
import type { OutputTable } from './outputTable';
import { typedRows } from './typedCell';
import { writeNumeric } from '../formats/fits/binary';
import {
  type FitsValue, HEADER_ESCAPE_KEYWORD, STRUCTURAL_KEYWORD, escapeHeaderText, formatCard, formatCards, formatCommentCard,
  headerBytes,
} from '../formats/fits/header';
import { paddingBytes } from '../formats/fits/hdu';

const INT32_NULL = -2147483648;
const utf8 = new TextEncoder();

/** The FITS file (primary HDU + BINTABLE) of an OutputTable. Throws InputError for a cell that does not fit its column. */
export function writeFitsTable(table: OutputTable): Uint8Array {
  let escaped = false;
  const esc = (s: string) => { const e = escapeHeaderText(s); escaped ||= e.escaped; return e.text; };
  const cards: string[] = [];
  const card = (key: string, value: FitsValue, comment = '', asReal = false) => {
    const c = formatCards(key, value, comment, asReal);
    if (c === null) throw new InputError([{ where: `table ${table.name}, FITS keyword ${key}`, what: `the value '${String(value)}' cannot be written as a FITS card` }]);
    cards.push(...c);
  };

  // Cells typed by column, and string bytes measured.
  const rows = typedRows(table);
  const widths = table.columns.map((col, j) => {
    if (col.datatype === 'float64') return 8;
    if (col.datatype === 'int32') return 4;
    if (col.datatype === 'bool') return 1;
    let w = 1;
    for (const r of rows) if (typeof r[j] === 'string') w = Math.max(w, utf8Length(r[j] as string));
    return w;
  });
  const rowBytes = widths.reduce((a, b) => a + b, 0);

  card('XTENSION', 'BINTABLE', 'binary table extension');
  card('BITPIX', 8, '8-bit bytes');
  card('NAXIS', 2, '2-dimensional binary table');
  card('NAXIS1', rowBytes, 'width of a row in bytes');
  card('NAXIS2', rows.length, 'number of rows');
  card('PCOUNT', 0, 'size of the heap');
  card('GCOUNT', 1, 'one data group');
  card('TFIELDS', table.columns.length, 'number of columns');
  table.columns.forEach((col, j) => {
    const n = j + 1;
    card(`TTYPE${n}`, esc(col.name), col.description ? esc(col.description) : '');
    const tform = col.datatype === 'string' ? `${widths[j]}A` : col.datatype === 'float64' ? '1D' : col.datatype === 'int32' ? '1J' : '1L';
    card(`TFORM${n}`, tform);
    if (col.datatype === 'int32') card(`TNULL${n}`, INT32_NULL, 'missing value');
    if (col.unit) card(`TUNIT${n}`, esc(col.unit));
    if (col.ucd) card(`TUCD${n}`, esc(col.ucd), 'UCD1+ word');
  });
  if (table.name) card('EXTNAME', esc(table.name), 'table name');
  for (const m of table.meta) metaCards(m, esc, cards);
  if (escaped) cards.splice(8, 0, formatCard(HEADER_ESCAPE_KEYWORD, true, 'header text escapes non-ASCII as \\uXXXX')!);

  const data = new Uint8Array(rowBytes * rows.length + paddingBytes(rowBytes * rows.length));
  const view = new DataView(data.buffer);
  let p = 0;
  const types = table.columns.map((c) => c.datatype);
  for (const r of rows) {
    for (let j = 0; j < types.length; j++) {
      const v = r[j];
      const type = types[j];
      if (type === 'float64') writeNumeric(view, p, 'D', v === null ? NaN : (v as number));
      else if (type === 'int32') writeNumeric(view, p, 'J', v === null ? INT32_NULL : (v as number));
      else if (type === 'bool') data[p] = v === null ? 0 : v ? 0x54 : 0x46;
      else if (v !== null) utf8.encodeInto(v as string, data.subarray(p, p + widths[j]));
      p += widths[j];
    }
  }

  const primary = headerBytes([
    formatCard('SIMPLE', true, 'conforms to FITS standard 4.0')!,
    formatCard('BITPIX', 8)!,
    formatCard('NAXIS', 0, 'no data in the primary HDU')!,
    formatCard('EXTEND', true, 'extensions follow')!,
  ]);
  const ext = headerBytes(cards);
  const out = new Uint8Array(primary.length + ext.length + data.length);
  out.set(primary, 0);
  out.set(ext, primary.length);
  out.set(data, primary.length + ext.length);
  return out;
}

/** Bytes of a text in UTF-8 (ASCII counted without encoding). */
function utf8Length(s: string): number {
  let n = s.length;
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c >= 0x80) { n = utf8.encode(s).length; break; }
  }
  return n;
}

/** The card(s) of one meta item: standard keyword, HIERARCH, or COMMENT lines when neither fits. */
function metaCards(m: OutputTable['meta'][number], esc: (s: string) => string, cards: string[]): void {
  const comment = [m.unit ? `[${esc(m.unit)}]` : '', m.description ? esc(m.description) : ''].filter(Boolean).join(' ');
  const value: FitsValue = typeof m.value === 'string' ? esc(m.value) : m.value;
  const upper = m.key.toUpperCase();
  const keyOk = /^[\x21-\x3c\x3e-\x7e]+$/.test(m.key) && !STRUCTURAL_KEYWORD.test(upper) && upper !== HEADER_ESCAPE_KEYWORD;
  const c = keyOk ? formatCards(m.key, value, comment, typeof m.value === 'number' && !Number.isInteger(m.value)) : null;
  if (c !== null) { cards.push(...c); return; }
  const text = `meta: ${esc(m.key)} = ${String(value)}${comment ? ` / ${comment}` : ''}`;
  for (let i = 0; i < text.length; i += 72) cards.push(formatCommentCard('COMMENT', text.slice(i, i + 72)));
}
