/**
 * CSV text shared by every CSV the project writes (slits.csv, masks.csv, reports, exports).
 * RFC 4180 quoting; text cells that a spreadsheet would run as a formula (leading = + - @, tab or CR)
 * are neutralised with a leading apostrophe when `neutraliseFormulas` is set. Numbers are never altered.
 */
import type { Cell } from '../catalog/types';

export interface CsvWriteOptions {
  neutraliseFormulas?: boolean;
  /** Line end, default "\n". */
  eol?: string;
}

const FORMULA_START = /^[=+\-@\t\r]/;

/** One CSV cell: numbers as shortest round-trip text, null as empty, text quoted when it holds , " or line ends. */
export function csvCell(value: Cell | undefined, opts: CsvWriteOptions = {}): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  if (typeof value === 'boolean') return value ? 'true' : 'false';
  let s = value;
  if (opts.neutraliseFormulas && FORMULA_START.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) || /^\s|\s$/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** A whole CSV document: header row then data rows. */
export function toCsv(header: readonly string[], rows: readonly (readonly Cell[])[], opts: CsvWriteOptions = {}): string {
  const eol = opts.eol ?? '\n';
  const out: string[] = [header.map((h) => csvCell(h, opts)).join(',')];
  for (const r of rows) out.push(r.map((c) => csvCell(c, opts)).join(','));
  return out.join(eol) + eol;
}
