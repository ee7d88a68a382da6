/**
 * Read and validate a catalog file from disk. CSV, TSV and ECSV are streamed: the file is read in chunks and
 * validated row by row, so only the usable targets stay in memory. FITS binary tables are read a block of rows at a
 * time through a file handle (header first); VOTable files are read in chunks too: once to check and parse the XML
 * around the rows, once more for the rows (TABLEDATA, or a BINARY/BINARY2 base64 stream decoded as it comes).
 * The result is the same as `readCatalog` on the whole file's bytes.
 */
import { Buffer, isAscii } from 'node:buffer';
import { closeSync, openSync, readSync, statSync } from 'node:fs';
import { InputError } from '../core/result';
import type { CatalogReadResult, ColumnMapping } from '../core/catalog/types';
import { assertSupportedContent, detectFormat, textEncodingOf, type TextEncodingName } from '../core/catalog/detect';
import { delimitedRawTable, sniffCsvDialect, type TextSource } from '../core/catalog/csvReader';
import { ecsvRawTable } from '../core/catalog/ecsvReader';
import { readFitsTableFrom } from '../core/catalog/fitsTable';
import { readVoTableFrom, voTableEncoding } from '../core/catalog/votable';
import { withFileByteSource } from './fileByteSource';
import { validateTable } from '../core/catalog/validate';

const HEAD_BYTES = 1 << 20;

/**
 * A TextSource over a file, decoded in chunks of `chunkBytes` (UTF-8, Latin-1, or UTF-16 by its BOM); each call reads from the
 * start. Invalid UTF-8 is an InputError naming the byte offset (never replaced silently). A UTF-8 chunk of ASCII bytes
 * only is copied as Latin-1 (the same characters, without the decoder's validation work) when the decoder holds no
 * partial character, i.e. when the chunk before it ended with an ASCII byte; the first chunk always goes through the
 * decoder, which drops the byte-order mark. With `fatal` false, invalid UTF-8 is read as U+FFFD (as an XML document is).
 */
export function fileTextSource(path: string, chunkBytes = 1 << 16, encoding: TextEncodingName = 'utf-8', name = path, fatal = true): TextSource {
  return (onChunk) => {
    const fd = openSync(path, 'r');
    let offset = 0;
    try {
      const buf = new Uint8Array(chunkBytes);
      const decoder = new TextDecoder(encoding, { fatal });
      const decode = (bytes?: Uint8Array) => {
        try {
          return bytes ? decoder.decode(bytes, { stream: true }) : decoder.decode();
        } catch {
          throw new InputError([{ where: name, what: `is not valid ${encoding.toUpperCase()} text (near byte ${offset})`, fix: 'save the file as UTF-8' }]);
        }
      };
      const bytes = Buffer.from(buf.buffer, buf.byteOffset, buf.byteLength);
      let decoderIdle = false; // true once the decoder has started and holds no partial character
      for (;;) {
        const n = readSync(fd, buf, 0, chunkBytes, null);
        if (n === 0) {
          const tail = decode();
          if (tail !== '') onChunk(tail);
          return;
        }
        const chunk = buf.subarray(0, n);
        const text = decoderIdle && encoding === 'utf-8' && isAscii(chunk) ? bytes.toString('latin1', 0, n) : decode(chunk);
        decoderIdle = chunk[n - 1] < 0x80;
        offset += n;
        if (!onChunk(text)) return;
      }
    } finally {
      closeSync(fd);
    }
  };
}

/**
 * True when the whole file is valid UTF-8, read in chunks (ASCII chunks skipped without decoding): the shared
 * decoding rule (core/catalog/textDecoding.ts) then reads it as UTF-8, else as Latin-1.
 */
export function fileIsValidUtf8(path: string, chunkBytes = 1 << 20): boolean {
  const fd = openSync(path, 'r');
  try {
    const buf = new Uint8Array(chunkBytes);
    const decoder = new TextDecoder('utf-8', { fatal: true });
    let idle = true; // the decoder holds no partial character
    for (;;) {
      const n = readSync(fd, buf, 0, chunkBytes, null);
      if (n === 0) {
        decoder.decode();
        return true;
      }
      const chunk = buf.subarray(0, n);
      if (!(idle && isAscii(chunk))) decoder.decode(chunk, { stream: true });
      idle = chunk[n - 1] < 0x80;
    }
  } catch {
    return false;
  } finally {
    closeSync(fd);
  }
}

/** The first `n` bytes of a file. */
function readHead(path: string, n: number): Uint8Array {
  const fd = openSync(path, 'r');
  try {
    const buf = new Uint8Array(n);
    const got = readSync(fd, buf, 0, n, 0);
    return buf.subarray(0, got);
  } finally {
    closeSync(fd);
  }
}

/**
 * Read and validate the catalog at `path` (format from its content). `opts.source` names the file in the result and
 * in errors (default: the path). Throws InputError when it cannot be used.
 */
export function readCatalogFile(path: string, mapping?: ColumnMapping, opts: { chunkBytes?: number; source?: string } = {}): CatalogReadResult {
  const name = opts.source ?? path;
  let isFile = false;
  try {
    isFile = statSync(path).isFile();
  } catch {
    throw new InputError([{ where: name, what: 'the catalog file does not exist', fix: 'check the catalog path in the plan (it is relative to the plan file)' }]);
  }
  if (!isFile) throw new InputError([{ where: name, what: 'is not a file', fix: 'give the path of the catalog file' }]);
  const headBytes = readHead(path, HEAD_BYTES);
  assertSupportedContent(headBytes, name);
  const format = detectFormat(headBytes);
  if (format === 'fits') return withFileByteSource(path, (source) => validateTable(readFitsTableFrom(source), name, mapping), opts.chunkBytes);
  if (format === 'votable') {
    return validateTable(readVoTableFrom(fileTextSource(path, opts.chunkBytes, voTableEncoding(headBytes), name, false)), name, mapping);
  }
  // The shared rule: a UTF-16 byte-order mark, else UTF-8 when the whole file is valid UTF-8, else Latin-1.
  const bom = textEncodingOf(headBytes);
  const encoding: TextEncodingName = bom !== 'utf-8' || fileIsValidUtf8(path) ? bom : 'latin1';
  const head = new TextDecoder(encoding).decode(headBytes);
  const source = fileTextSource(path, opts.chunkBytes, encoding, name);
  const table = format === 'ecsv' ? ecsvRawTable(head, source, name) : delimitedRawTable(format, source, sniffCsvDialect(head.slice(0, 65536)));
  return validateTable(table, name, mapping);
}
