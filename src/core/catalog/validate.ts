/**
 * Row validation: turns a RawTable into Targets (ICRS degrees) and RowRejects. Every problem of a row is
 * reported (one reject per problem, so a row may appear more than once); a row with any problem is not used.
 * `rowsRead` counts every data row the format holds, including blank lines and rows the format could not
 * split, so rowsRead = targets + distinct rejected lines.
 */
import { truncateText, InputError } from '../result';
import { parseDecDeg, parseRaDeg } from '../sky/sexagesimal';
import { resolveColumns, type AngleUnit, type ResolvedColumns } from './columns';
import { IdIndex } from './idIndex';
import type { CatalogReadResult, Cell, ColumnMapping, RawTable, RowReject, Target, TargetRole } from './types';
import { ALIGNMENT_ROLE, TargetColumns, targetColumnsOf } from './targetColumns';

const NUMBER_TEXT = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const MISSING_TEXT = /^(nan|null|none|n\/a|--)$/i;

/** True for `0x..`, `0b..`, `0o..` (which Number() reads as hexadecimal, binary, octal; signed forms give NaN). */
function hasRadixPrefix(c: string): boolean {
  if (c.length < 2 || c.charCodeAt(0) !== 48) return false;
  const k = c.charCodeAt(1) | 32;
  return k === 120 || k === 98 || k === 111;
}

/** True for a character that can start a plain decimal number: digit, sign or point (not a blank). */
function isPlainDecimalStart(code: number): boolean {
  return (code >= 48 && code <= 57) || code === 45 || code === 43 || code === 46;
}

/** The text without blanks at either end (no new string when there are none). */
function trimmed(t: string): string {
  return t.length > 0 && t.charCodeAt(0) > 32 && t.charCodeAt(t.length - 1) > 32 ? t : t.trim();
}

/**
 * Why a cell converter returned NaN: `reason` null means the value is missing, else it says what is wrong.
 * One object is reused for every cell (the converters run a million times for a large catalog).
 */
export interface CellWhy {
  reason: string | null;
}

/** Text of a cell as a user would see it ('' for null). */
export function cellText(c: Cell): string {
  if (c === null) return '';
  if (typeof c === 'number') return Number.isNaN(c) ? '' : String(c);
  if (typeof c === 'boolean') return c ? 'true' : 'false';
  return c;
}

/**
 * A cell as a finite number, or NaN with `why.reason` set (null: missing). Numbers as they are; text as a
 * plain decimal number; '', NaN and `nan`/`null`/`none`/`n/a`/`--` are missing values.
 */
export function cellNumber(c: Cell, why: CellWhy): number {
  if (typeof c === 'string') {
    // Fast path: Number() accepts every plain decimal; it also accepts '', blanks and 0x/0b/0o forms, excluded here.
    const quick = Number(c);
    if (quick === quick && c.length > 0 && isPlainDecimalStart(c.charCodeAt(0)) && (quick !== 0 || NUMBER_TEXT.test(c)) && !hasRadixPrefix(c)) {
      if (quick - quick === 0) return quick;
    }
    const t = c.trim();
    if (NUMBER_TEXT.test(t)) {
      // Number text too large for a double (1e400) reads as Infinity: refused, never carried on as a value.
      const v = Number(t);
      if (Number.isFinite(v)) return v;
      why.reason = `${shownCell(t)} is too large to be a number this table can hold`;
      return NaN;
    }
    why.reason = t === '' || MISSING_TEXT.test(t) ? null : `${shownCell(t)} is not a number`;
    return NaN;
  }
  if (typeof c === 'number') {
    if (Number.isFinite(c)) return c;
    why.reason = Number.isNaN(c) ? null : `${c} is not a finite number`;
    return NaN;
  }
  why.reason = c === null ? null : `${c} is not a number`;
  return NaN;
}

/** A cell's text as quoted in a reason, cut after 40 characters (a huge bad value is not echoed whole). */
function shownCell(t: string): string {
  return t.length <= 40 ? `"${t}"` : `"${t.slice(0, 40)}..." (${t.length} characters)`;
}

/** 10^k for k = 0..15, each an exact double. */
const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];
const MAX_FAST_DIGITS = 15;

/**
 * The value of text[start, end) when it is `[+-]digits[.digits]` with 1 to 15 digits in all, else NaN.
 * Exact: the digits as an integer (below 10^15 < 2^53) and 10^(fraction digits) are both exact doubles, so one
 * division rounds once, to the double nearest the decimal, which is what Number() gives (the exact-operand
 * fast path of decimal-to-binary conversion, Clinger 1990; recalled from memory and confirmed against Number() by the
 * property test in test/catalog/fastPath.test.ts). A sign before zero gives -0 as Number('-0') does.
 */
function plainDecimal(text: string, start: number, end: number): number {
  let i = start;
  let c = text.charCodeAt(i);
  const negative = c === 45;
  if (negative || c === 43) i++;
  let mantissa = 0;
  let digits = 0;
  let point = -1; // index of the decimal point, -1 when none
  for (; i < end; i++) {
    c = text.charCodeAt(i);
    if (c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      digits++;
    } else if (c === 46 && point < 0) point = i;
    else return NaN;
  }
  if (digits === 0 || digits > MAX_FAST_DIGITS) return NaN;
  const v = point < 0 ? mantissa : mantissa / POW10[end - 1 - point];
  return negative ? -v : v;
}

/** `cellNumber(text.slice(start, end), why)`, without making the string when the cell is empty or a plain decimal. */
export function textSpanNumber(text: string, start: number, end: number, why: CellWhy): number {
  if (start === end) {
    why.reason = null; // an empty cell is a missing value, as in cellNumber
    return NaN;
  }
  const v = plainDecimal(text, start, end);
  return v === v ? v : cellNumber(text.slice(start, end), why);
}

/**
 * The cells of one row, read by column index (0-based). Readers of delimited text hand rows out this way so that
 * numbers are read straight from the text; `CellArray` gives the same view of a row held as an array of cells.
 */
export interface RowCells {
  /** The cell as `cellNumber` reads it. */
  number(k: number, why: CellWhy): number;
  /** The cell as `cellText` shows it. */
  text(k: number): string;
  /** True when the cell is text (only text is read as sexagesimal). */
  isText(k: number): boolean;
}

/** RowCells over an array of cells; point it at a row with `of` (one object serves every row). */
export class CellArray implements RowCells {
  cells: readonly Cell[] = [];

  /** This view, now of `cells`. */
  of(cells: readonly Cell[]): this {
    this.cells = cells;
    return this;
  }

  number(k: number, why: CellWhy): number {
    return cellNumber(this.cells[k], why);
  }

  text(k: number): string {
    return cellText(this.cells[k]);
  }

  isText(k: number): boolean {
    return typeof this.cells[k] === 'string';
  }
}

/** RA of cell `k` in degrees [0, 360), or NaN with `why`: numbers in the column's unit, or sexagesimal text (hours unless d:m:s or d letters). */
export function rowRaDeg(row: RowCells, k: number, unit: AngleUnit, why: CellWhy): number {
  const v = row.number(k, why);
  if (!Number.isNaN(v)) return raDegOfNumber(v, unit, why);
  if (why.reason === null || !row.isText(k)) return NaN;
  return raDegOfText(row.text(k), unit, why);
}

/** RA cell to degrees [0, 360), or NaN with `why` (see `rowRaDeg`). */
export function cellRaDeg(c: Cell, unit: AngleUnit, why: CellWhy): number {
  return rowRaDeg(new CellArray().of([c]), 0, unit, why);
}

/** RA in degrees [0, 360) of a number `v` in the column's unit, or NaN with `why`. */
function raDegOfNumber(v: number, unit: AngleUnit, why: CellWhy): number {
  let deg: number;
  if (unit.kind === 'number' && unit.name === 'hour') {
    if (v < 0 || v >= 24) {
      why.reason = `RA ${v} h is outside [0, 24) h`;
      return NaN;
    }
    deg = v * 15;
  } else if (unit.kind === 'sexagesimal') deg = unit.name === 'h:m:s' ? v * 15 : v;
  else {
    if (unit.name === 'rad' && (v < 0 || v >= 2 * Math.PI)) {
      why.reason = `RA ${v} rad is outside [0, 2 pi)`;
      return NaN;
    }
    deg = v * unit.factorDeg;
  }
  if (deg >= 0 && deg < 360) return deg;
  const r = parseRaDeg(deg); // tolerates rounding just outside [0, 360) and wraps it
  if (r.ok) return r.value;
  why.reason = unit.kind === 'number' && unit.name !== 'deg' ? `RA ${v} ${unit.name} is outside [0, 360) deg` : r.error;
  return NaN;
}

/** RA in degrees [0, 360) of text that is not a plain number (sexagesimal), or NaN with `why`. */
function raDegOfText(cell: string, unit: AngleUnit, why: CellWhy): number {
  let text = cell.trim();
  if (!/\d/.test(text)) return NaN; // keeps "... is not a number"
  if (unit.kind === 'sexagesimal' && unit.name === 'd:m:s' && !/[hHdD°]/.test(text)) text = text.replace(/^(\d+)[\s:]+/, '$1d');
  const r = parseRaDeg(text);
  if (r.ok) return r.value;
  why.reason = `${r.error}; write RA in degrees, hours or as 12:34:56.7`;
  return NaN;
}

/** Dec of cell `k` in degrees [-90, 90], or NaN with `why`: numbers in the column's unit, or sexagesimal text (degrees). */
export function rowDecDeg(row: RowCells, k: number, unit: AngleUnit, why: CellWhy): number {
  const v = row.number(k, why);
  if (!Number.isNaN(v)) return decDegOfNumber(v, unit, why);
  if (why.reason === null || !row.isText(k)) return NaN;
  return decDegOfText(row.text(k), why);
}

/** Dec cell to degrees [-90, 90], or NaN with `why` (see `rowDecDeg`). */
export function cellDecDeg(c: Cell, unit: AngleUnit, why: CellWhy): number {
  return rowDecDeg(new CellArray().of([c]), 0, unit, why);
}

/** Dec in degrees [-90, 90] of a number `v` in the column's unit, or NaN with `why`. */
function decDegOfNumber(v: number, unit: AngleUnit, why: CellWhy): number {
  const deg = unit.kind === 'number' ? v * unit.factorDeg : v;
  if (deg >= -90 && deg <= 90) return deg;
  why.reason = `Dec ${v}${unit.kind === 'number' && unit.name !== 'deg' ? ` ${unit.name}` : ''} is outside [-90, 90] deg`;
  return NaN;
}

/** Dec in degrees [-90, 90] of text that is not a plain number (sexagesimal), or NaN with `why`. */
function decDegOfText(cell: string, why: CellWhy): number {
  const text = cell.trim();
  if (!/\d/.test(text)) return NaN;
  const r = parseDecDeg(text);
  if (r.ok) return r.value;
  why.reason = `${r.error}; write Dec in degrees or as -05:06:07.8`;
  return NaN;
}

const ROLES = new Map<string, TargetRole>([
  ['tracer', 'tracer'],
  ['alignment', 'alignment'],
]);

/** Validates rows one at a time against resolved columns; keeps the duplicate-id index. */
export class RowValidator {
  /** The usable rows, as columns. */
  readonly table: TargetColumns;
  readonly rejects: RowReject[] = [];
  rowsVisited = 0;
  /** First file line of each id used so far (only rows that became targets claim their id). */
  private readonly firstLineOfId = new IdIndex();
  private readonly names: string[];
  /** View used by `visit` for rows given as cell arrays. */
  private readonly cellArray = new CellArray();

  constructor(
    private readonly cols: ResolvedColumns,
    columnNames: readonly string[],
  ) {
    this.names = [...columnNames];
    this.table = new TargetColumns(cols.extra.map((k) => this.names[k]));
  }

  private readonly why: CellWhy = { reason: null };

  /** Per extra column, one copy of each short text seen (a column of a few kinds repeated over a million rows). */
  private readonly internPools: Map<string, string>[] = [];

  /** `text` itself, or the equal string kept from an earlier row of extra column k (short texts, up to 4096 kinds a column). */
  private interned(k: number, text: string): string {
    if (text.length > 24) return text;
    const pool = (this.internPools[k] ??= new Map());
    const seen = pool.get(text);
    if (seen !== undefined) return seen;
    if (pool.size < 4096) pool.set(text, text);
    return text;
  }

  private reject(line: number, field: number, reason: string): void {
    // A reason quoting a huge cell is cut: the report names the row, it need not repeat megabytes of it.
    this.rejects.push({ line, column: truncateText(this.names[field], 200), reason: truncateText(reason, 200) });
  }

  /** Reject the cell when a converter returned NaN (reason from `why`). */
  private check(line: number, field: number, v: number): number {
    if (Number.isNaN(v)) this.reject(line, field, this.why.reason ?? 'missing value');
    return v;
  }

  /** Validate one data row (cells in column order) from file line / row `line`. */
  visit(cells: Cell[], line: number): void {
    this.visitRow(this.cellArray.of(cells), line);
  }

  /** Validate one data row, read through a RowCells view, from file line / row `line`. */
  visitRow(row: RowCells, line: number): void {
    this.rowsVisited++;
    const { index, raUnit, decUnit } = this.cols;
    const why = this.why;
    const before = this.rejects.length;

    const id = trimmed(row.text(index.id));
    if (id === '') this.reject(line, index.id, 'missing value');
    const raDeg = this.check(line, index.ra, rowRaDeg(row, index.ra, raUnit, why));
    const decDeg = this.check(line, index.dec, rowDecDeg(row, index.dec, decUnit, why));
    const mag = this.check(line, index.mag, row.number(index.mag, why));

    let color: number | null = null;
    if (index.color >= 0) {
      const v = row.number(index.color, why);
      if (!Number.isNaN(v)) color = v;
      else if (why.reason !== null) this.reject(line, index.color, why.reason);
    }
    let priority: number | null = null;
    if (index.priority >= 0) {
      const v = row.number(index.priority, why);
      if (!Number.isNaN(v)) {
        if (v > 0) priority = v;
        else this.reject(line, index.priority, `non-positive priority ${v}; a priority is a positive weight (leave it empty for the default)`);
      } else if (why.reason !== null) this.reject(line, index.priority, why.reason);
    }
    let role: TargetRole = 'tracer';
    if (index.role >= 0) {
      const t = row.text(index.role).trim();
      if (t !== '') {
        const r = t === 'tracer' || t === 'alignment' ? t : ROLES.get(t.toLowerCase());
        if (r) role = r;
        else this.reject(line, index.role, `unknown role "${t}"; use tracer or alignment (empty means tracer)`);
      }
    }
    if (id !== '') {
      const first = this.firstLineOfId.get(id);
      if (first >= 0) this.reject(line, index.id, `duplicate id "${id}", first used on line ${first}`);
      else if (this.rejects.length === before) this.firstLineOfId.set(id, line);
    }
    if (this.rejects.length !== before) return;
    const t = this.table;
    t.push(id, raDeg, decDeg, mag, color ?? NaN, priority ?? NaN, role === 'alignment' ? ALIGNMENT_ROLE : 0, line);
    const extraIdx = this.cols.extra;
    for (let k = 0; k < extraIdx.length; k++) t.extraValues[k].push(this.interned(k, row.text(extraIdx[k])));
  }
}

/** A RawTable that can also hand out its rows as RowCells views (delimited text), which saves making a string per cell. */
export interface RowCellsTable extends RawTable {
  /** Like `forEachRow`; the view is valid only during the call. */
  forEachRowCells(visit: (row: RowCells, line: number) => void): void;
}

function hasRowCells(table: RawTable): table is RowCellsTable {
  return typeof (table as Partial<RowCellsTable>).forEachRowCells === 'function';
}

/**
 * Validate a whole RawTable: resolve columns (throws InputError when a required column is missing), check every row,
 * and merge the format's structural rejects. Rejects are sorted by line.
 */
export function validateTable(table: RawTable, source: string, mapping?: ColumnMapping): CatalogReadResult {
  if (table.columns.length === 0) {
    throw new InputError([{ where: source, what: 'the catalog is empty (no header row with column names)', fix: 'start the file with a header row such as id,ra,dec,mag' }]);
  }
  const cols = resolveColumns(table.columns, mapping, source);
  const v = new RowValidator(
    cols,
    table.columns.map((c) => c.name),
  );
  if (hasRowCells(table)) table.forEachRowCells((row, line) => v.visitRow(row, line));
  else table.forEachRow((cells, line) => v.visit(cells, line));
  return finishValidation(table, source, cols, v);
}

/** Assemble the CatalogReadResult once every row has been visited. */
export function finishValidation(table: RawTable, source: string, cols: ResolvedColumns, v: RowValidator): CatalogReadResult {
  const structural = table.structuralRejects;
  const rejects = structural.length > 0 ? [...v.rejects, ...structural] : v.rejects;
  const structuralLines = new Set(structural.map((r) => r.line)).size;
  if (structural.length > 0) rejects.sort((a, b) => a.line - b.line);
  const fields = { format: table.format, source, rejects, rowsRead: v.rowsVisited + structuralLines, columns: table.columns, mapping: cols.mapping };
  return catalogResult(fields, v.table.trim());
}

/**
 * A CatalogReadResult over a table of rows: `table` (not enumerable, so a structured clone or a spread leaves it out) and
 * `targets`, the rows as Target objects, made on first read and then kept (enumerable: a clone or a spread carries them).
 */
export function catalogResult(fields: Omit<CatalogReadResult, 'targets' | 'table'>, table: TargetColumns): CatalogReadResult {
  const result = { ...fields } as CatalogReadResult;
  Object.defineProperty(result, 'table', { value: table, enumerable: false });
  let objects: Target[] | null = null;
  Object.defineProperty(result, 'targets', {
    enumerable: true,
    configurable: true,
    get: () => (objects ??= table.toTargets()),
    set: (v: Target[]) => { objects = v; },
  });
  return result;
}

/** The usable rows of a catalog as columns (the reader's table, or a table of its Target objects). */
export function catalogTargetColumns(result: CatalogReadResult): TargetColumns {
  return result.table ?? targetColumnsOf(result.targets);
}

/** Number of usable rows of a catalog (without making its Target objects). */
export function usableRowCount(result: CatalogReadResult): number {
  return result.table ? result.table.length : result.targets.length;
}

/** Number of rows that were not used (distinct lines among the rejects). */
export function rejectedRowCount(result: CatalogReadResult): number {
  return result.rowsRead - usableRowCount(result);
}
