/**
 * CSV text shared by every CSV the project writes (slits.csv, masks.csv, reports, exports).
 * RFC 4180 quoting; text cells that a spreadsheet would run as a formula (leading = + - @, tab or CR)
 * are neutralised with a leading apostrophe when `neutraliseFormulas` is set. Numbers are never altered.
 * The neutralising is reversible: a text that itself starts with an apostrophe gets one more, and
 * `unneutraliseCell` (used by the readers of the project's own CSV files) removes exactly one.
 */
import type { Cell } from '../catalog/types';
import type { OutputTable } from './outputTable';
import { typedCell } from './typedCell';

export interface CsvWriteOptions {
  neutraliseFormulas?: boolean;
  /** Line end, default "\n". */
  eol?: string;
  /** Also quote text that starts with `#` (for formats whose readers skip `#` lines, such as ECSV). */
  quoteCommentStart?: boolean;
}

const FORMULA_START = /^[=+\-@\t\r']/;

/** One CSV cell: numbers as shortest round-trip text, null as empty, text quoted when it holds , " or line ends. */
export function csvCell(value: Cell | undefined, opts: CsvWriteOptions = {}): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? (Object.is(value, -0) ? '-0' : String(value)) : '';
  if (typeof value === 'boolean') return value ? 'true' : 'false';
  if (isPlainCell(value)) return value;
  let s = value;
  if (opts.neutraliseFormulas && FORMULA_START.test(s)) s = `'${s}`;
  const quote = /[",\r\n]/.test(s) || /^\s|\s$/.test(s) || (opts.quoteCommentStart === true && s.startsWith('#'));
  return quote ? `"${s.replace(/"/g, '""')}"` : s;
}

/** Character codes of " # ' + , - = @, which a plain cell may not start with. */
const NOT_PLAIN_START = new Set([34, 35, 39, 43, 44, 45, 61, 64]);

/**
 * True for text that every rule above leaves as it is: printable ASCII at both ends, not a formula start, an apostrophe
 * or `#`, and no quote, comma or line end inside (one pass over the characters instead of three patterns).
 */
function isPlainCell(s: string): boolean {
  const n = s.length;
  if (n === 0) return true;
  const first = s.charCodeAt(0), last = s.charCodeAt(n - 1);
  // 33..126 without " # ' + , - = @ at the start; 33..126 at the end (no blank, no control, no non-ASCII space).
  if (first < 33 || first > 126 || NOT_PLAIN_START.has(first)) return false;
  if (last < 33 || last > 126) return false;
  for (let i = 1; i < n - 1; i++) {
    const c = s.charCodeAt(i);
    if (c === 34 || c === 44 || c === 10 || c === 13) return false;
  }
  return last !== 34 && last !== 44;
}

/** One CSV line of cells (csvCell each, comma-separated), without its line end. */
function csvLine(cells: readonly (Cell | undefined)[], opts: CsvWriteOptions = {}): string {
  let line = cells.length > 0 ? csvCell(cells[0], opts) : '';
  for (let k = 1; k < cells.length; k++) line += ',' + csvCell(cells[k], opts);
  return line;
}

/** A whole CSV document: header row then data rows. */
export function toCsv(header: readonly string[], rows: readonly (readonly Cell[])[], opts: CsvWriteOptions = {}): string {
  const eol = opts.eol ?? '\n';
  let text = csvLine(header, opts) + eol;
  for (let i = 0; i < rows.length; i++) text += csvLine(rows[i], opts) + eol;
  return text;
}

/** Undo `neutraliseFormulas` on one text cell: drop one leading apostrophe if there is one. */
export function unneutraliseCell(text: string): string {
  return text.startsWith("'") ? text.slice(1) : text;
}

/**
 * An OutputTable as the project's CSV: a header of column names, then the rows; text cells formula-neutralised,
 * numbers as shortest round-trip text, missing values empty. Units and metadata are not carried (use ECSV for those).
 */
export function outputTableToCsv(table: OutputTable): string {
  const rows = table.rows.map((r, i) => table.columns.map((col, j) => typedCell(table, col, i, r[j])));
  return toCsv(
    table.columns.map((c) => c.name),
    rows,
    { neutraliseFormulas: true },
  );
}
