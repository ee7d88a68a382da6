/**
 * FITS header cards (FITS standard 4.0, section 4): 80-byte ASCII cards in 2880-byte blocks, ending with END.
 * Reading: keyword, value (string, logical, integer, real) and comment; the HIERARCH convention for long keywords.
 * Writing: fixed-format cards; text outside printable ASCII escaped as `\uXXXX` (see `escapeHeaderText`).
 */
import { InputError } from '../../result';
import { type ByteSource, bytesSource } from '../byteSource';

export const FITS_BLOCK_BYTES = 2880;
export const FITS_CARD_BYTES = 80;
const CARDS_PER_BLOCK = FITS_BLOCK_BYTES / FITS_CARD_BYTES;

/** A header value: text, logical, integer (bigint when beyond 2^53), real, or null for an empty value. */
export type FitsValue = string | number | boolean | bigint | null;

/** One header card. `value` is undefined for commentary cards (COMMENT, HISTORY, blank, CONTINUE). */
export interface FitsCard {
  keyword: string;
  value: FitsValue | undefined;
  comment: string;
  /** True when the keyword came from a `HIERARCH ...` card (case kept as written). */
  hierarch: boolean;
}

/** A parsed header: cards in order and the first value of each keyword (keys upper-cased, HIERARCH keys as written). */
export interface FitsHeader {
  cards: FitsCard[];
  values: Map<string, FitsValue>;
}

/** Value of `keyword` (standard keywords are looked up upper-cased), undefined when absent. */
export function headerValue(header: FitsHeader, keyword: string): FitsValue | undefined {
  return header.values.has(keyword) ? header.values.get(keyword) : header.values.get(keyword.toUpperCase());
}

/** A header value as a finite number (integers and reals), undefined when absent or not numeric. */
export function headerNumber(header: FitsHeader, keyword: string): number | undefined {
  const v = headerValue(header, keyword);
  if (typeof v === 'number' && Number.isFinite(v)) return v;
  if (typeof v === 'bigint') return Number(v);
  return undefined;
}

/** A header value as text, undefined when absent or not a string. */
export function headerString(header: FitsHeader, keyword: string): string | undefined {
  const v = headerValue(header, keyword);
  return typeof v === 'string' ? v : undefined;
}

const INT_RE = /^[+-]?\d+$/;
const REAL_RE = /^[+-]?(\d+\.?\d*|\.\d+)([EeDd][+-]?\d+)?$/;

/** Parse the value field of a card (the text after "= "): value and comment. */
export function parseValueField(text: string): { value: FitsValue; comment: string } {
  let i = 0;
  while (i < text.length && text[i] === ' ') i++;
  if (text[i] === "'") {
    let s = '';
    let j = i + 1;
    for (; j < text.length; j++) {
      if (text[j] === "'") {
        if (text[j + 1] === "'") { s += "'"; j++; continue; }
        break;
      }
      s += text[j];
    }
    const rest = text.slice(j + 1);
    const slash = rest.indexOf('/');
    return { value: s.replace(/ +$/, ''), comment: slash >= 0 ? rest.slice(slash + 1).trim() : '' };
  }
  const slash = text.indexOf('/', i);
  const raw = (slash >= 0 ? text.slice(i, slash) : text.slice(i)).trim();
  const comment = slash >= 0 ? text.slice(slash + 1).trim() : '';
  if (raw === '') return { value: null, comment };
  if (raw === 'T') return { value: true, comment };
  if (raw === 'F') return { value: false, comment };
  if (INT_RE.test(raw)) {
    const n = Number(raw);
    return { value: Number.isSafeInteger(n) ? n : BigInt(raw), comment };
  }
  if (REAL_RE.test(raw)) return { value: Number(raw.replace(/[Dd]/, 'E')), comment };
  return { value: raw, comment }; // complex "(re, im)" and other forms kept as text
}

const COMMENTARY = new Set(['COMMENT', 'HISTORY', '', 'CONTINUE']);

/** Parse one 80-character card. */
export function parseCard(card: string): FitsCard {
  if (card.startsWith('HIERARCH ')) {
    const eq = card.indexOf('=');
    if (eq > 0) {
      const { value, comment } = parseValueField(card.slice(eq + 1));
      return { keyword: card.slice(9, eq).trim(), value, comment, hierarch: true };
    }
  }
  const keyword = card.slice(0, 8).trimEnd();
  if (!COMMENTARY.has(keyword) && card.slice(8, 10) === '= ') {
    const { value, comment } = parseValueField(card.slice(10));
    return { keyword, value, comment, hierarch: false };
  }
  return { keyword, value: undefined, comment: card.slice(8).trimEnd(), hierarch: false };
}

/** Latin-1 text of a byte range (FITS headers are ASCII; other bytes are kept visible, not dropped). */
export function bytesToLatin1(bytes: Uint8Array, start: number, end: number): string {
  let s = '';
  for (let i = start; i < end; i += 4096) {
    s += String.fromCharCode(...bytes.subarray(i, Math.min(end, i + 4096)));
  }
  return s;
}

/**
 * Read the header that starts at byte `offset` (a block boundary). Returns the header and the byte offset of
 * its data (the block after END). Throws InputError when the header has no END card.
 */
export function readHeaderAt(bytes: Uint8Array, offset: number, where: string): { header: FitsHeader; dataOffset: number } {
  return readHeaderFrom(bytesSource(bytes), offset, where);
}

/** `readHeaderAt` on a ByteSource (a file read a block at a time): the same header, data offset and errors. */
export function readHeaderFrom(source: ByteSource, offset: number, where: string): { header: FitsHeader; dataOffset: number } {
  const cards: FitsCard[] = [];
  const values = new Map<string, FitsValue>();
  for (let block = offset; block + FITS_BLOCK_BYTES <= source.length; block += FITS_BLOCK_BYTES) {
    const text = bytesToLatin1(source.read(block, FITS_BLOCK_BYTES), 0, FITS_BLOCK_BYTES);
    for (let c = 0; c < CARDS_PER_BLOCK; c++) {
      const raw = text.slice(c * FITS_CARD_BYTES, (c + 1) * FITS_CARD_BYTES);
      if (raw.startsWith('END') && raw.slice(3).trim() === '') {
        return { header: { cards, values }, dataOffset: block + FITS_BLOCK_BYTES };
      }
      const card = parseCard(raw);
      const prev = cards[cards.length - 1];
      if (card.keyword === 'CONTINUE' && prev && typeof prev.value === 'string' && prev.value.endsWith('&')) {
        // long-string convention (FITS 4.0 section 4.2.1.2): the text goes on in this card
        const more = parseValueField(raw.slice(10));
        prev.value = prev.value.slice(0, -1) + (typeof more.value === 'string' ? more.value : '');
        if (more.comment) prev.comment = prev.comment ? `${prev.comment} ${more.comment}` : more.comment;
        if (values.get(prev.keyword) !== undefined && cards.findIndex((c) => c.keyword === prev.keyword) === cards.length - 1) values.set(prev.keyword, prev.value);
        continue;
      }
      cards.push(card);
      if (card.value !== undefined && !values.has(card.keyword)) values.set(card.keyword, card.value);
    }
  }
  throw new InputError([{
    where: `${where}, header at byte ${offset}`,
    what: 'no END card before the end of the file (file truncated, or not FITS)',
    fix: 'check that the whole file was copied; FITS files are a multiple of 2880 bytes',
  }]);
}

// ---------------------------------------------------------------- writing

/** Keywords whose meaning the table and image structure fixes; metadata never overrides them. */
export const STRUCTURAL_KEYWORD = /^(SIMPLE|BITPIX|NAXIS\d*|EXTEND|XTENSION|PCOUNT|GCOUNT|TFIELDS|THEAP|END|EXTNAME|T(TYPE|FORM|UNIT|NULL|SCAL|ZERO|DISP|DIM|UCD)\d+|BSCALE|BZERO|BLANK|GROUPS|CONTINUE|COMMENT|HISTORY|HIERARCH)$/;

/** A keyword that can stand as a standard 8-character FITS keyword (A-Z, 0-9, _ and -). */
export function isStandardKeyword(key: string): boolean {
  return /^[A-Z0-9_-]{1,8}$/.test(key);
}

/**
 * Header text in printable ASCII: characters outside 0x20-0x7E and the backslash itself are written as `\uXXXX`
 * (UTF-16 code units, so astral characters become a surrogate pair). `unescapeHeaderText` undoes it.
 */
export function escapeHeaderText(text: string): { text: string; escaped: boolean } {
  let escaped = false;
  const out = text.replace(/[^\x20-\x5b\x5d-\x7e]/g, (ch) => {
    escaped = true;
    return `\\u${ch.charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}`;
  });
  return { text: out, escaped };
}

/** Undo `escapeHeaderText` (only for files that declare the escape, see `HEADER_ESCAPE_KEYWORD`). */
export function unescapeHeaderText(text: string): string {
  return text.replace(/\\u([0-9A-Fa-f]{4})/g, (_, hex: string) => String.fromCharCode(parseInt(hex, 16)));
}

/** Keyword written when any header text was escaped with `\uXXXX`, so our reader knows to undo it. */
export const HEADER_ESCAPE_KEYWORD = 'HWESCAPE';

/** A real number as FITS header text: shortest round-trip digits, always with a '.' or an exponent. */
export function formatFitsReal(x: number): string {
  if (Object.is(x, -0)) return '-0.0';
  let s = String(x).toUpperCase();
  if (!/[.E]/.test(s)) s += '.0';
  return s;
}

/** The value field text of a card value (strings quoted with '' doubling, minimum 8 characters inside quotes). */
export function formatValue(value: FitsValue, asReal = false): string {
  if (value === null) return '';
  if (typeof value === 'boolean') return (value ? 'T' : 'F').padStart(20);
  if (typeof value === 'bigint') return value.toString().padStart(20);
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) return '';
    const integer = Number.isSafeInteger(value) && !asReal && !Object.is(value, -0);
    return (integer ? String(value) : formatFitsReal(value)).padStart(20);
  }
  return `'${value.replace(/'/g, "''").padEnd(8)}'`;
}

/**
 * The card(s) of one keyword: `formatCard`, or for a text too long for one card under a standard keyword, the
 * long-string convention (FITS 4.0 section 4.2.1.2): pieces ending in '&' continued on `CONTINUE` cards.
 * Returns null when the value cannot be written (a long text under a HIERARCH key).
 */
export function formatCards(keyword: string, value: FitsValue, comment = '', asReal = false): string[] | null {
  const one = formatCard(keyword, value, comment, asReal);
  if (one !== null) return [one];
  if (typeof value !== 'string' || !isStandardKeyword(keyword)) return null;
  const pieces: string[] = [];
  let piece = '';
  let width = 0;
  for (const ch of value) {
    const w = ch === "'" ? 2 : ch.length;
    if (width + w > 66) { pieces.push(piece); piece = ''; width = 0; }
    piece += ch;
    width += w;
  }
  pieces.push(piece);
  return pieces.map((p, i) => {
    const last = i === pieces.length - 1;
    const quoted = `'${p.replace(/'/g, "''")}${last ? '' : '&'}'`;
    let card = i === 0 ? `${keyword.padEnd(8)}= ${quoted}` : `CONTINUE  ${quoted}`;
    if (last && comment && FITS_CARD_BYTES - card.length - 3 > 0) card += ` / ${comment.slice(0, FITS_CARD_BYTES - card.length - 3)}`;
    return card.padEnd(FITS_CARD_BYTES);
  });
}

/**
 * One 80-character card: `KEYWORD = value / comment`, or `HIERARCH key = value / comment` for keys that are not
 * standard keywords. The comment is shortened to fit; returns null when the value itself does not fit in one card.
 */
export function formatCard(keyword: string, value: FitsValue, comment = '', asReal = false): string | null {
  const hierarch = !isStandardKeyword(keyword);
  const head = hierarch ? `HIERARCH ${keyword} = ` : `${keyword.padEnd(8)}= `;
  let card = head + formatValue(value, asReal);
  if (card.length > FITS_CARD_BYTES) return null;
  if (comment) {
    const room = FITS_CARD_BYTES - card.length - 3;
    if (room > 0) card += ` / ${comment.slice(0, room)}`;
  }
  return card.padEnd(FITS_CARD_BYTES);
}

/** A commentary card (COMMENT or HISTORY) with up to 72 characters of text. */
export function formatCommentCard(keyword: 'COMMENT' | 'HISTORY', text: string): string {
  return `${keyword.padEnd(8)}${text.slice(0, 72)}`.padEnd(FITS_CARD_BYTES);
}

/** Cards plus END, padded with blanks to whole 2880-byte blocks, as bytes. */
export function headerBytes(cards: string[]): Uint8Array {
  const all = [...cards, 'END'.padEnd(FITS_CARD_BYTES)];
  const n = Math.ceil((all.length * FITS_CARD_BYTES) / FITS_BLOCK_BYTES) * FITS_BLOCK_BYTES;
  const out = new Uint8Array(n).fill(0x20);
  let p = 0;
  for (const card of all) {
    if (card.length !== FITS_CARD_BYTES) throw new Error(`internal: FITS card of ${card.length} characters: ${card}`);
    for (let i = 0; i < FITS_CARD_BYTES; i++) {
      const code = card.charCodeAt(i);
      if (code < 0x20 || code > 0x7e) throw new Error(`internal: non-ASCII character in FITS card: ${card}`);
      out[p++] = code;
    }
  }
  return out;
}
