/**
 * Cells of an OutputTable checked against their column's datatype, for the binary and XML writers.
 * A cell that does not fit its column is an error naming table, column and row (never written wrongly).
 */
import { InputError } from '../result';
import type { Cell } from '../catalog/types';
import type { OutputColumn, OutputTable } from './outputTable';

/** Value of a cell for its column's datatype: number (float64, int32), boolean, text, or null when missing. */
export function typedCell(table: OutputTable, column: OutputColumn, rowIndex: number, cell: Cell | undefined): Cell {
  let cached = converters.get(column);
  if (!cached || cached.table !== table) {
    cached = { table, convert: cellConverter(table, column) };
    converters.set(column, cached);
  }
  return cached.convert(cell, rowIndex);
}

const converters = new WeakMap<OutputColumn, { table: OutputTable; convert: (cell: Cell | undefined, rowIndex: number) => Cell }>();

/** The converter of one column's cells (made once per column; throws InputError naming table, column and row). */
export function cellConverter(table: OutputTable, column: OutputColumn): (cell: Cell | undefined, rowIndex: number) => Cell {
  const fail = (rowIndex: number, what: string): never => {
    throw new InputError([{ where: `table ${table.name}, column ${column.name}, row ${rowIndex + 1}`, what, fix: 'fix the value or the column datatype' }]);
  };
  const numeric = (cell: Cell): number => (typeof cell === 'number' ? cell : typeof cell === 'string' && cell.trim() !== '' ? Number(cell) : NaN);
  switch (column.datatype) {
    case 'string':
      return (cell) => (cell === null || cell === undefined ? null : typeof cell === 'string' ? cell : typeof cell === 'boolean' ? (cell ? 'true' : 'false') : String(cell));
    case 'float64':
      return (cell, rowIndex) => {
        if (cell === null || cell === undefined) return null;
        if (typeof cell === 'number') return Number.isNaN(cell) ? null : cell;
        const x = numeric(cell);
        return Number.isNaN(x) ? fail(rowIndex, `'${String(cell)}' is not a number`) : x;
      };
    case 'int32':
      return (cell, rowIndex) => {
        if (cell === null || cell === undefined) return null;
        const x = numeric(cell);
        return !Number.isInteger(x) || x < -2147483647 || x > 2147483647 ? fail(rowIndex, `'${String(cell)}' is not a 32-bit integer`) : x;
      };
    case 'bool':
      return (cell, rowIndex) => {
        if (cell === null || cell === undefined) return null;
        if (typeof cell === 'boolean') return cell;
        if (cell === 'true' || cell === 'T' || cell === 1) return true;
        if (cell === 'false' || cell === 'F' || cell === 0) return false;
        return fail(rowIndex, `'${String(cell)}' is not a boolean`);
      };
  }
}

/** Every row of the table converted to its columns' datatypes. */
export function typedRows(table: OutputTable): Cell[][] {
  const conv = table.columns.map((c) => cellConverter(table, c));
  return table.rows.map((r, i) => conv.map((f, j) => f(r[j], i)));
}
