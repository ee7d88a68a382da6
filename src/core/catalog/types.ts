/**
 * Catalog types shared by every reader (CSV/TSV, ECSV, VOTable, FITS) and by the solver.
 * Positions are ICRS degrees; magnitudes as given in the catalog's band.
 */
import type { TargetColumns } from './targetColumns';

export type CatalogFormat = 'csv' | 'tsv' | 'ecsv' | 'votable' | 'fits';
export type TargetRole = 'tracer' | 'alignment';

/** One usable catalog row. `line` is where it came from (1-based file line for CSV/ECSV, 1-based row for VOTable/FITS). */
export interface Target {
  id: string;
  raDeg: number;
  decDeg: number;
  mag: number;
  color: number | null;
  /** Explicit catalog priority (positive weight, larger is more important), or null when the row has none. */
  priority: number | null;
  role: TargetRole;
  line: number;
  /** Every other column, carried through as text. */
  extra: Record<string, string>;
}

/** One catalog row that was not used, for `catalog-report.csv` (`line,column,reason`). */
export interface RowReject {
  line: number;
  column: string;
  reason: string;
}

/** A column as a table format describes it (units and datatype where the format carries them). */
export interface ColumnInfo {
  name: string;
  unit?: string;
  datatype?: string;
  ucd?: string;
  description?: string;
}

export type Cell = string | number | boolean | null;

/**
 * A table as read from any format, before validation: column descriptions and a row visitor.
 * `forEachRow` calls back once per data row with its cells (in column order) and its `line`
 * (file line for text formats, 1-based row for VOTable/FITS), so large files need not be held as rows.
 */
export interface RawTable {
  format: CatalogFormat;
  columns: ColumnInfo[];
  forEachRow(visit: (cells: Cell[], line: number) => void): void;
  /** Rows the format itself could not split into cells (e.g. wrong field count), reported like any reject. */
  structuralRejects: RowReject[];
}

/** Explicit mapping of contract names to the catalog's own column names (plan key `catalogColumns`). */
export interface ColumnMapping {
  id?: string;
  ra?: string;
  dec?: string;
  mag?: string;
  color?: string;
  priority?: string;
  role?: string;
  /** Unit of the RA column when the file does not say: `deg` (default) or `hour`. */
  raUnit?: 'deg' | 'hour';
}

/** The outcome of reading and validating a catalog: what was used, what was not and why. */
export interface CatalogReadResult {
  format: CatalogFormat;
  source: string;
  /** The usable rows as objects (made from `table` on first read when a reader gives one). */
  targets: Target[];
  /**
   * The usable rows as columns, when a reader made them (not enumerable, so a structured clone leaves it out; read it
   * through `catalogTargetColumns`, which also wraps `targets`).
   */
  readonly table?: TargetColumns;
  rejects: RowReject[];
  rowsRead: number;
  /** The file's column names, and which one each contract name was taken from. */
  columns: ColumnInfo[];
  mapping: Record<string, string>;
}
