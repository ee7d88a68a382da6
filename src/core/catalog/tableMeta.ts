/** Table-level metadata read from a table file (VOTable PARAMs and INFOs, FITS header keywords), in file order. */
import type { RawTable } from './types';

/** One metadata item: key, value, and the unit, UCD, datatype and description the file gives for it. */
export interface TableMetaItem {
  key: string;
  value: string | number | boolean | null;
  unit?: string;
  ucd?: string;
  datatype?: string;
  description?: string;
}

/** A RawTable plus the table's name (VOTable TABLE name, FITS EXTNAME) and its metadata. */
export interface RawTableWithMeta extends RawTable {
  name?: string;
  meta: TableMetaItem[];
}
