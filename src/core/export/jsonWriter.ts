/**
 * JSON writer for an OutputTable: `{ format, name, meta, columns, rows }` where `rows` holds one object per row
 * keyed by column name (values typed by the column: numbers, booleans, text; null when missing or non-finite).
 */
import type { OutputTable } from './outputTable';
import { typedCell } from './typedCell';

export const JSON_TABLE_FORMAT = 'haloweave.table/1';

/** The JSON text of an OutputTable (two-space indented, LF line ends). */
export function writeJsonTable(table: OutputTable): string {
  const rows = table.rows.map((r, i) => {
    const o: Record<string, unknown> = {};
    table.columns.forEach((col, j) => {
      const v = typedCell(table, col, i, r[j]);
      o[col.name] = typeof v === 'number' && !Number.isFinite(v) ? null : v;
    });
    return o;
  });
  return JSON.stringify({ format: JSON_TABLE_FORMAT, name: table.name, meta: table.meta, columns: table.columns, rows }, null, 2) + '\n';
}
