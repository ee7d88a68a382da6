/**
 * The neutral table every slit-list writer takes (CSV, ECSV, VOTable, FITS, JSON): typed columns with
 * units and UCD1+ words, rows of cells in column order, and table-level metadata (key/value with unit).
 */
import type { Cell } from '../catalog/types';

/** One column: name, datatype, and optional unit (e.g. `deg`, `arcsec`), UCD1+ word and description. */
export interface OutputColumn {
  name: string;
  datatype: 'string' | 'float64' | 'int32' | 'bool';
  unit?: string;
  ucd?: string;
  description?: string;
}

/** A table to write: `rows[i][j]` is the cell of column `columns[j]`; null is a missing value. */
export interface OutputTable {
  name: string;
  columns: OutputColumn[];
  rows: Cell[][];
  meta: { key: string; value: string | number; unit?: string; description?: string }[];
}
