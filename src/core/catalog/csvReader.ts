/**
 * Delimited text (CSV, TSV and the body of ECSV) split into records with their 1-based file line, through
 * papaparse; a chunk of text without any quote is split directly (every record is then one line and every
 * field the text between two delimiters, as in papaparse's own fast mode), into spans of the text rather than
 * strings, so the validator reads numbers straight from the text.
 * Rules: a UTF-8 BOM is dropped; CRLF, LF and CR line ends are accepted; lines starting with `#` before the
 * header row are comments (skipped, but counted in line numbers); quoted fields may hold delimiters, quotes ("")
 * and line ends. The parser takes the text in chunks, so a file can be streamed, and gives the same records as
 * the whole text at once.
 */
import Papa from 'papaparse';
import type { CatalogFormat, ColumnInfo, RowReject } from './types';
import { cellNumber, textSpanNumber, type CellWhy, type RowCells, type RowCellsTable } from './validate';

/** One record of delimited text: its cells, the 1-based file line it starts on, and a parse problem if any. */
export interface CsvRecord {
  cells: string[];
  line: number;
  /** Set when the record could not be split cleanly (an unterminated quoted field). */
  error?: string;
}

/**
 * A record as the splitter hands it to its consumer: its fields as a RowCells view, with the 1-based file line
 * it starts on, the field count and a parse problem if any. The splitter reuses the object for the next record,
 * so copy what must outlive the call (`cells`).
 */
export interface CsvRecordView extends RowCells {
  readonly line: number;
  readonly count: number;
  /** Set when the record could not be split cleanly (an unterminated quoted field). */
  readonly error: string | undefined;
  /** With an error: the last file line the record swallowed (an unclosed quote runs to the end of the file). */
  readonly lastLine?: number;
  /** True when field `k` holds nothing but blanks. */
  blank(k: number): boolean;
  /** The first `n` fields (default: all) as an array the caller may keep. */
  cells(n?: number): string[];
}

/**
 * A one-line record of "simple" text: field k is src[starts[k], ends[k]). A simple line has no quote, or quotes only
 * around whole fields that hold no quote and end right before a delimiter or the line end (`"a b",1`); papaparse
 * reads such a line the same way. `reset` points the record at a text, then `nextLine` takes that text's lines in
 * order (the searches for the next delimiter and quote carry over from line to line, so a line without them costs
 * no search of the lines after it).
 */
class SpanRecord implements CsvRecordView {
  src = '';
  line = 0;
  count = 0;
  readonly error = undefined;
  private starts = new Int32Array(16);
  private ends = new Int32Array(16);
  private delimiter = ',';
  /** Index of the first delimiter in `src` not yet used, or -1 when there is none. */
  private nextDelimiter = -1;
  /** Index of the first quote in `src` not yet used, or -1 when there is none. */
  private nextQuote = -1;

  /** Point the record at a new text with the given field delimiter. */
  reset(src: string, delimiter: string): void {
    this.src = src;
    this.delimiter = delimiter;
    this.nextDelimiter = src.indexOf(delimiter);
    this.nextQuote = src.indexOf('"');
  }

  /** The record of src[from, to), file line `line` (the line after the previous call's), or null when it is not simple. */
  nextLine(from: number, to: number, line: number): this | null {
    this.line = line;
    if (this.nextQuote < 0 || this.nextQuote >= to) return this.splitPlain(from, to);
    return this.splitWithQuotes(from, to) ? this : null;
  }

  /** Fields of a line without quotes: the text between delimiters. */
  private splitPlain(from: number, to: number): this {
    const { src, delimiter } = this;
    let k = 0;
    let fieldStart = from;
    let d = this.nextDelimiter;
    while (d >= 0 && d < to) {
      this.setField(k++, fieldStart, d);
      fieldStart = d + delimiter.length;
      d = src.indexOf(delimiter, fieldStart);
    }
    this.nextDelimiter = d;
    this.setField(k++, fieldStart, to);
    this.count = k;
    return this;
  }

  /** Fields of a line with quotes, when each quote opens or closes a whole simple field (else false). */
  private splitWithQuotes(from: number, to: number): boolean {
    const { src, delimiter } = this;
    let k = 0;
    let i = from;
    let quote = this.nextQuote; // the first quote at or after i
    for (;;) {
      let next: number; // where the text after the field starts (a delimiter or the line end)
      if (quote === i) {
        const close = src.indexOf('"', i + 1);
        if (close < 0 || close >= to) return false; // closed on a later line, or never
        next = close + 1;
        if (next < to && !src.startsWith(delimiter, next)) return false; // `""` or text after the closing quote
        this.setField(k++, i + 1, close);
        quote = src.indexOf('"', next);
      } else {
        next = src.indexOf(delimiter, i);
        if (next < 0 || next >= to) next = to;
        if (quote >= 0 && quote < next) return false; // a quote inside an unquoted field
        this.setField(k++, i, next);
      }
      if (next >= to) break;
      i = next + delimiter.length;
    }
    this.count = k;
    this.nextDelimiter = src.indexOf(delimiter, to);
    this.nextQuote = quote; // at or after `to`, or -1
    return true;
  }

  private setField(k: number, start: number, end: number): void {
    if (k === this.starts.length) {
      const starts = new Int32Array(2 * k);
      const ends = new Int32Array(2 * k);
      starts.set(this.starts);
      ends.set(this.ends);
      this.starts = starts;
      this.ends = ends;
    }
    this.starts[k] = start;
    this.ends[k] = end;
  }

  number(k: number, why: CellWhy): number {
    return textSpanNumber(this.src, this.starts[k], this.ends[k], why);
  }

  text(k: number): string {
    return this.src.slice(this.starts[k], this.ends[k]);
  }

  isText(): boolean {
    return true;
  }

  blank(k: number): boolean {
    const start = this.starts[k];
    if (start === this.ends[k]) return true;
    const c = this.src.charCodeAt(start);
    if (c > 32 && c < 127) return false; // a visible ASCII character: no need to make the string
    return this.text(k).trim() === '';
  }

  cells(n = this.count): string[] {
    const out: string[] = [];
    for (let k = 0; k < n; k++) out.push(this.text(k));
    return out;
  }
}

/** A record whose fields papaparse has already made into strings (the path for text with quotes). */
class ArrayRecord implements CsvRecordView {
  private fields: string[] = [];
  line = 0;
  error: string | undefined = undefined;
  lastLine: number | undefined = undefined;

  /** Point the record at `fields`, from file line `line` (to `lastLine` when it could not be split). */
  of(fields: string[], line: number, error: string | undefined, lastLine?: number): this {
    this.fields = fields;
    this.line = line;
    this.error = error;
    this.lastLine = lastLine;
    return this;
  }

  get count(): number {
    return this.fields.length;
  }

  number(k: number, why: CellWhy): number {
    return cellNumber(this.fields[k], why);
  }

  text(k: number): string {
    return this.fields[k];
  }

  isText(): boolean {
    return true;
  }

  blank(k: number): boolean {
    return this.fields[k].trim() === '';
  }

  cells(n = this.fields.length): string[] {
    return n === this.fields.length ? this.fields : this.fields.slice(0, n);
  }
}

export interface CsvDialect {
  delimiter: string;
  /** Line end used by the file: "\r\n", "\n" or "\r". */
  newline: '\r\n' | '\n' | '\r';
  /**
   * Space-delimited text where a run of spaces is one delimiter and spaces at either end of a line are ignored
   * (ECSV with the space delimiter, as astropy reads it; quoted fields keep their spaces).
   */
  collapseSpaces?: boolean;
  /** Split every record with papaparse, without the fast path (to check the fast path against it). */
  generalPathOnly?: boolean;
}

/** Column placeholder for a reject that concerns the whole row rather than one column. */
export const WHOLE_ROW = '(row)';

const CANDIDATE_DELIMITERS = [',', '\t', ';', '|'] as const;

/** Count of `ch` in `line` outside double-quoted parts. */
function countOutsideQuotes(line: string, ch: string): number {
  let n = 0;
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (c === '"') quoted = !quoted;
    else if (!quoted && c === ch) n++;
  }
  return n;
}

/**
 * Guess the dialect from the start of a text: the line end that occurs first, and the delimiter among
 * comma, tab, semicolon and bar that occurs most often (outside quotes) in the first non-comment line
 * (ties go to the earlier one in that list; no candidate at all means a one-column comma file).
 */
export function sniffCsvDialect(head: string): CsvDialect {
  const text = stripBom(head);
  const crlf = text.indexOf('\r\n');
  const lf = text.indexOf('\n');
  const cr = text.indexOf('\r');
  let newline: CsvDialect['newline'] = '\n';
  if (cr >= 0 && (lf < 0 || cr < lf)) newline = crlf === cr ? '\r\n' : '\r';
  const lines = text.split(newline);
  const headerLine = lines.find((l) => l.trim() !== '' && !l.startsWith('#')) ?? '';
  let best: string = ',';
  let bestCount = 0;
  for (const d of CANDIDATE_DELIMITERS) {
    const n = countOutsideQuotes(headerLine, d);
    if (n > bestCount) {
      best = d;
      bestCount = n;
    }
  }
  return { delimiter: best, newline };
}

/** The text without a leading UTF-8 byte-order mark. */
export function stripBom(text: string): string {
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** Number of occurrences of the line end `nl` in text[from, to). */
function countLineEnds(text: string, nl: string, from: number, to: number): number {
  const ch = nl === '\r' ? '\r' : '\n';
  let n = 0;
  let i = text.indexOf(ch, from);
  while (i >= 0 && i < to) {
    n++;
    i = text.indexOf(ch, i + 1);
  }
  return n;
}

/**
 * Incremental record splitter: `push` chunks of text in order, then `end`. Records are emitted with the
 * 1-based file line on which they start. Before the first record, lines starting with `#` (comments, the
 * ECSV header) and blank lines are skipped but counted; after it every line is data, so an id that starts
 * with `#` is never taken for a comment.
 */
export class CsvRecordSplitter {
  private carry = '';
  /** Line ends consumed before `carry` starts. */
  private linesBefore = 0;
  private first = true;
  private inPreamble = true;
  /** True once `emit` returned false: no record is split or emitted after that. */
  private stopped = false;
  /** The record objects handed to `emit`, one per path, reused for every record. */
  private readonly spanRecord = new SpanRecord();
  private readonly arrayRecord = new ArrayRecord();

  constructor(
    private readonly dialect: CsvDialect,
    /** Takes each record; returning false stops the splitter (e.g. once the header row is found). */
    private readonly emit: (rec: CsvRecordView) => void | boolean,
  ) {}

  /** Add a chunk of text; emits every record known to be complete. */
  push(chunk: string): void {
    if (this.stopped) return;
    if (this.first) {
      chunk = stripBom(chunk);
      this.first = false;
    }
    this.carry += chunk;
    if (this.inPreamble && !this.skipPreamble(false)) return;
    this.parse(false);
  }

  /** Signal the end of the text; emits the remaining records. */
  end(): void {
    if (this.stopped) return;
    if (this.inPreamble) this.skipPreamble(true);
    this.parse(true);
    this.carry = '';
  }

  /** Drop leading comment and blank lines from `carry`; true once the first data line has begun. */
  private skipPreamble(final: boolean): boolean {
    const nl = this.dialect.newline;
    let pos = 0;
    for (;;) {
      const eol = this.carry.indexOf(nl, pos);
      if (eol < 0 && !final) {
        // An incomplete line: decide once it is complete, unless it already shows data.
        const rest = this.carry.slice(pos);
        if (rest.trim() === '' || rest.startsWith('#')) {
          this.carry = rest;
          return false;
        }
        break;
      }
      const line = this.carry.slice(pos, eol < 0 ? this.carry.length : eol);
      if (line.trim() !== '' && !line.startsWith('#')) break;
      if (eol < 0) {
        pos = this.carry.length;
        break;
      }
      pos = eol + nl.length;
      this.linesBefore++;
    }
    this.carry = this.carry.slice(pos);
    this.inPreamble = false;
    return true;
  }

  private parse(final: boolean): void {
    if (this.dialect.collapseSpaces) this.carry = collapseSpaceRuns(this.carry, final);
    const text = this.carry;
    if (text === '') return;
    const rest = this.dialect.generalPathOnly ? 0 : this.parseSimpleLines(text, final);
    if (rest >= 0) this.parseQuoted(rest === 0 ? text : text.slice(rest), final);
  }

  /**
   * Fast path: simple lines (see SpanRecord) are records of one line each, handed out as spans of the text.
   * Lines end at each line end; unless `final`, text after the last line end waits for the next chunk, and at the
   * end it is a last line of its own. Stops at the first line that is not simple and returns where it starts (a
   * record boundary), for the general path to take the rest; returns -1 when it took every line. In a CRLF text a
   * line holding a lone LF is not simple: the general path counts that LF as a file line, as an editor shows it.
   */
  private parseSimpleLines(text: string, final: boolean): number {
    const nl = this.dialect.newline;
    let cut = text.length;
    if (!final) {
      const last = text.lastIndexOf(nl);
      if (last < 0) return -1; // no line end, so no record can be complete yet
      cut = last + nl.length;
    }
    const crlf = nl === '\r\n';
    const lineEnd = crlf ? '\n' : nl; // in CRLF text, look for any LF and check the CR before it
    const rec = this.spanRecord;
    rec.reset(text, this.dialect.delimiter);
    let pos = 0;
    while (pos < cut) {
      let end = text.indexOf(lineEnd, pos); // end of the line's text
      let next = end + lineEnd.length; // start of the next line
      if (end < 0) end = next = cut; // the last line, without a line end (only when final)
      else if (crlf) {
        if (end === pos || text.charCodeAt(end - 1) !== 13) return pos; // a lone LF
        end--;
      }
      const simple = rec.nextLine(pos, end, this.linesBefore + 1);
      if (!simple) return pos;
      this.linesBefore++;
      if (this.emit(simple) === false) {
        this.stopped = true;
        return -1;
      }
      pos = next;
    }
    this.carry = final ? '' : text.slice(cut);
    return -1;
  }

  /** General path: records may span lines inside quotes; lines come from papaparse's cursor after each record. */
  private parseQuoted(text: string, final: boolean): void {
    const nl = this.dialect.newline;
    let prevEnd = 0;
    let linesToPrevEnd = this.linesBefore;
    let pending: { data: string[]; end: number; error?: string } | null = null;
    const flush = (row: { data: string[]; end: number; error?: string }) => {
      if (this.stopped) return;
      const linesToEnd = linesToPrevEnd + countLineEnds(text, nl, prevEnd, row.end);
      const lastLine = endsWithLineEnd(text, row.end, nl) ? linesToEnd : linesToEnd + 1;
      let inner = 0;
      for (const c of row.data) if (c.length > 0) inner += countLineEnds(c, nl, 0, c.length);
      // A record that could not be split (a quote never closed) starts right after the previous one: the line
      // where the quote opens; the lines up to `lastLine` went into it.
      const go = row.error
        ? this.emit(this.arrayRecord.of(row.data, linesToPrevEnd + 1, row.error, lastLine))
        : this.emit(this.arrayRecord.of(row.data, lastLine - inner, row.error));
      if (go === false) this.stopped = true;
      prevEnd = row.end;
      linesToPrevEnd = linesToEnd;
    };
    Papa.parse<string[]>(text, {
      delimiter: this.dialect.delimiter,
      newline: nl,
      quoteChar: '"',
      escapeChar: '"',
      skipEmptyLines: false,
      step: (r) => {
        // Emit with a delay of one record: without the end of input, the last one may be cut by the chunk boundary.
        if (pending) flush(pending);
        const q = r.errors.length > 0 ? r.errors.find((e) => e.type === 'Quotes') : undefined;
        pending = { data: r.data, end: r.meta.cursor, error: q ? 'quoted field is never closed' : undefined };
      },
    });
    const last = pending as { data: string[]; end: number; error?: string } | null;
    if (final) {
      // papaparse reports a final empty record for the text after the last line end: not a line.
      if (last && !(last.data.length === 1 && last.data[0] === '' && prevEnd >= text.length)) flush(last);
      this.carry = '';
      return;
    }
    this.carry = text.slice(prevEnd);
    this.linesBefore = linesToPrevEnd;
  }
}

/**
 * Space runs outside quotes collapsed to one space, and spaces at the start and end of each line removed. `text`
 * starts at a record boundary. Idempotent, so a remainder can be collapsed again with the next chunk; unless `final`,
 * a space run at the very end is kept as one space (the line may go on in the next chunk).
 */
export function collapseSpaceRuns(text: string, final: boolean): string {
  let out = '';
  let from = 0; // start of the slice not yet copied
  let quoted = false;
  let lineStart = true;
  let fieldStart = true;
  let i = 0;
  const n = text.length;
  while (i < n) {
    const c = text.charCodeAt(i);
    if (quoted) {
      if (c === 34) {
        if (text.charCodeAt(i + 1) === 34) i++;
        else quoted = false;
      }
      i++;
      continue;
    }
    if (c === 32) {
      let j = i;
      while (j < n && text.charCodeAt(j) === 32) j++;
      const next = j < n ? text.charCodeAt(j) : -1;
      out += text.slice(from, i);
      const atLineEnd = next === 10 || next === 13 || (next === -1 && final);
      if (!lineStart && !atLineEnd) {
        out += ' ';
        fieldStart = true;
      }
      from = i = j;
      continue;
    }
    if (c === 10 || c === 13) {
      lineStart = true;
      fieldStart = true;
    } else {
      if (c === 34 && fieldStart) quoted = true;
      lineStart = false;
      fieldStart = false;
    }
    i++;
  }
  return from === 0 ? text : out + text.slice(from);
}

/** True when text[0, end) ends with the line end `nl`. */
function endsWithLineEnd(text: string, end: number, nl: string): boolean {
  return end >= nl.length && text.slice(end - nl.length, end) === nl;
}

/** Split a whole delimited text into records with file lines (dialect sniffed unless given). */
export function parseCsvRecords(text: string, dialect: CsvDialect = sniffCsvDialect(text.slice(0, 65536))): CsvRecord[] {
  const out: CsvRecord[] = [];
  const s = new CsvRecordSplitter(dialect, (r) => {
    out.push(recordOf(r));
  });
  s.push(text);
  s.end();
  return out;
}

/** A copy of a record view that outlives the splitter's call (`error` only when there is one). */
function recordOf(r: CsvRecordView): CsvRecord {
  const rec: CsvRecord = { cells: r.cells(), line: r.line };
  if (r.error !== undefined) rec.error = r.error;
  return rec;
}

/** True for a record that holds nothing but blanks (an empty line, or only delimiters and spaces). */
export function isBlankRecord(rec: CsvRecordView): boolean {
  for (let k = 0; k < rec.count; k++) if (!rec.blank(k)) return false;
  return true;
}

/** Delivers a text in order as chunks; `onChunk` returns false to stop early. */
export type TextSource = (onChunk: (chunk: string) => boolean) => void;

/** A TextSource over a string held in memory (slices of `chunkChars`). */
export function stringSource(text: string, chunkChars = 1 << 16): TextSource {
  return (onChunk) => {
    for (let i = 0; i < text.length; i += chunkChars) if (!onChunk(text.slice(i, i + chunkChars))) return;
  };
}

/** The first record that is not blank (the header row), reading only as far as needed. */
function readHeaderRecord(source: TextSource, dialect: CsvDialect): CsvRecord | null {
  let header: CsvRecord | null = null;
  // The splitter stops at the header: the rest of the chunk is not split for nothing.
  const s = new CsvRecordSplitter(dialect, (r) => {
    if (header === null && !isBlankRecord(r)) header = recordOf(r);
    return header === null;
  });
  let exhausted = true;
  source((chunk) => {
    s.push(chunk);
    if (header !== null) {
      exhausted = false;
      return false;
    }
    return true;
  });
  if (exhausted && header === null) s.end();
  return header;
}

/**
 * A RawTable over delimited text. The first non-blank record is the header (names trimmed; a trailing empty
 * name from a trailing delimiter dropped). Later records are rows: blank lines, rows without any value and
 * rows with the wrong number of fields become structural rejects (a row with one extra empty field, from a
 * trailing delimiter, is accepted). `declared` columns (ECSV) replace the header's names, which must match them;
 * a mismatch is added to `problems`. Rows are given as cell arrays (`forEachRow`) or as views (`forEachRowCells`).
 */
export function delimitedRawTable(
  format: CatalogFormat,
  source: TextSource,
  dialect: CsvDialect,
  declared?: ColumnInfo[],
  problems: string[] = [],
): RowCellsTable {
  const header = readHeaderRecord(source, dialect);
  const names = header ? header.cells.map((c) => c.trim()) : [];
  if (names.length > 1 && names[names.length - 1] === '') names.pop();
  let columns: ColumnInfo[] = names.map((name) => ({ name }));
  if (declared) {
    const declaredNames = declared.map((c) => c.name);
    if (header && declaredNames.join('\u0000') !== names.join('\u0000')) {
      problems.push(`line ${header.line}: the header row names the columns ${names.join(', ')} but the ECSV header declares ${declaredNames.join(', ')}`);
    }
    columns = declared;
  }
  const structuralRejects: RowReject[] = [];
  const n = columns.length;
  const headerLine = header?.line ?? 0;

  /** Visit every usable data row with its field count (a trailing empty field left out); report the others. */
  const eachRow = (visit: (row: CsvRecordView, line: number, count: number) => void): void => {
    if (!header) return;
    const s = new CsvRecordSplitter(dialect, (rec) => {
      if (rec.line <= headerLine) return;
      if (rec.error) {
        const last = rec.lastLine ?? rec.line;
        const swallowed = last - rec.line;
        const tail = swallowed > 0 ? `; the ${swallowed} line${swallowed > 1 ? 's' : ''} after it (to line ${last}) went into the open field and ${swallowed > 1 ? 'were' : 'was'} not read as rows` : '';
        structuralRejects.push({ line: rec.line, column: WHOLE_ROW, reason: `a quoted field opens on this line and is never closed${tail}; close it with a double quote (") or remove the stray quote` });
        // Every swallowed line is a row not used: listed and counted, never silently dropped.
        for (let l = rec.line + 1; l <= last; l++) structuralRejects.push({ line: l, column: WHOLE_ROW, reason: `swallowed by the quoted field opened on line ${rec.line} and never closed` });
        return;
      }
      if (isBlankRecord(rec)) {
        structuralRejects.push({ line: rec.line, column: WHOLE_ROW, reason: rec.count === 1 ? 'blank line' : 'row without any value' });
        return;
      }
      let count = rec.count;
      if (count === n + 1 && rec.blank(n)) count = n;
      if (count !== n) {
        const fewer = count < n;
        structuralRejects.push({
          line: rec.line,
          column: fewer ? columns[count].name : WHOLE_ROW,
          reason: `wrong field count: ${fewer ? 'missing field, ' : ''}the row has ${count} fields, the header (line ${headerLine}) has ${n}`,
        });
        return;
      }
      visit(rec, rec.line, count);
    });
    source((chunk) => {
      s.push(chunk);
      return true;
    });
    s.end();
  };

  return {
    format,
    columns,
    structuralRejects,
    forEachRow: (visit) => eachRow((row, line, count) => visit(row.cells(count), line)),
    forEachRowCells: (visit) => eachRow((row, line) => visit(row, line)),
  };
}

/** A RawTable over a whole CSV/TSV text (format from the sniffed delimiter unless given). */
export function readCsvTable(text: string, format?: CatalogFormat): RowCellsTable {
  const dialect = sniffCsvDialect(text.slice(0, 65536));
  return delimitedRawTable(format ?? (dialect.delimiter === '\t' ? 'tsv' : 'csv'), stringSource(text), dialect);
}
