/**
 * Catalog format from the content, not the file name: FITS (the primary header starts with `SIMPLE  =`),
 * VOTable (XML whose root element is VOTABLE), ECSV (`# %ECSV` signature line), else delimited text,
 * TSV when the header row holds more tabs than commas, semicolons or bars, CSV otherwise.
 * Text is decoded by the shared rule of textDecoding.ts: UTF-16 or UTF-8 by a byte-order mark, else UTF-8 when
 * valid, else Latin-1.
 */
import { InputError } from '../result';
import type { CatalogFormat } from './types';
import { sniffCsvDialect, stripBom } from './csvReader';
import { looksLikeEcsv } from './ecsvReader';
import { bomEncoding, decodeText, type TextEncodingName } from './textDecoding';

export type { TextEncodingName } from './textDecoding';

const FITS_SIGNATURE = 'SIMPLE  =';

/** True when the bytes start like a FITS file (the first card is `SIMPLE  =`). */
export function looksLikeFits(bytes: Uint8Array): boolean {
  if (bytes.length < FITS_SIGNATURE.length) return false;
  for (let i = 0; i < FITS_SIGNATURE.length; i++) if (bytes[i] !== FITS_SIGNATURE.charCodeAt(i)) return false;
  return true;
}

/** True when the text is XML with a VOTABLE root element (after the XML declaration, comments and doctype). */
export function looksLikeVoTable(head: string): boolean {
  const t = stripBom(head).trimStart();
  if (!t.startsWith('<')) return false;
  const rest = t.replace(/^(<\?[\s\S]*?\?>\s*|<!--[\s\S]*?-->\s*|<!DOCTYPE[^>]*>\s*)*/, '');
  return /^<([A-Za-z_][\w.-]*:)?VOTABLE[\s>/]/.test(rest);
}

/** The text encoding of a file from its byte-order mark: UTF-16 LE/BE when it has one, UTF-8 otherwise (Latin-1 is told from the whole file). */
export function textEncodingOf(head: Uint8Array): TextEncodingName {
  const bom = bomEncoding(head);
  return bom === 'utf-16le' || bom === 'utf-16be' ? bom : 'utf-8';
}

/** Why the bytes are not a table Haloweave reads (compressed, an archive, binary), or null when they may be one. */
export function unsupportedContent(head: Uint8Array): string | null {
  if (head.length >= 2 && head[0] === 0x1f && head[1] === 0x8b) return 'is gzip-compressed; decompress it first (gunzip)';
  if (head.length >= 4 && head[0] === 0x50 && head[1] === 0x4b && head[2] === 0x03 && head[3] === 0x04) {
    return 'is a ZIP archive (a spreadsheet workbook?); save the sheet as CSV, or the table as ECSV, VOTable or FITS';
  }
  if (looksLikeFits(head) || textEncodingOf(head) !== 'utf-8') return null;
  const n = Math.min(head.length, 65536);
  for (let i = 0; i < n; i++) {
    if (head[i] === 0) return 'holds binary data, not text; give a CSV, TSV, ECSV, VOTable or FITS table';
  }
  return null;
}

/** Throws InputError when the bytes cannot be a catalog (see `unsupportedContent`). */
export function assertSupportedContent(head: Uint8Array, source: string): void {
  const why = unsupportedContent(head);
  if (why) throw new InputError([{ where: source, what: why }]);
}

/** Decode a whole text file by the shared rule (UTF-16/UTF-8 by byte-order mark, else UTF-8 when valid, else Latin-1). */
export function decodeCatalogText(bytes: Uint8Array, _source?: string): string {
  return decodeText(bytes).text;
}

/** The format of a catalog from its first bytes or characters (64 kB are plenty). */
export function detectFormat(head: Uint8Array | string): CatalogFormat {
  let text: string;
  if (typeof head === 'string') text = head;
  else {
    if (looksLikeFits(head)) return 'fits';
    text = new TextDecoder(textEncodingOf(head)).decode(head.subarray(0, 65536));
  }
  if (text.startsWith(FITS_SIGNATURE)) return 'fits';
  if (looksLikeVoTable(text)) return 'votable';
  if (looksLikeEcsv(text)) return 'ecsv';
  return sniffCsvDialect(text.slice(0, 65536)).delimiter === '\t' ? 'tsv' : 'csv';
}
