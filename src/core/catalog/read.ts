/**
 * Read and validate a tracer catalog of any supported format (detected from the content): CSV/TSV, ECSV,
 * VOTable, FITS binary table. Positions come out in ICRS degrees; every unusable row is a RowReject.
 */
import { InputError } from '../result';
import type { CatalogReadResult, ColumnMapping, RawTable } from './types';
import { assertSupportedContent, decodeCatalogText, detectFormat } from './detect';
import { readCsvTable } from './csvReader';
import { readEcsvTable } from './ecsvReader';
import { readVoTable } from './votable';
import { readFitsTable } from './fitsTable';
import { usableRowCount, validateTable } from './validate';

/** The RawTable of a catalog's bytes or text, by the format its content shows. */
export function readRawTable(input: Uint8Array | string, source: string): RawTable {
  if (typeof input !== 'string') assertSupportedContent(input.subarray(0, 65536), source);
  const format = detectFormat(typeof input === 'string' ? input.slice(0, 65536) : input.subarray(0, 65536));
  if (format === 'fits') {
    if (typeof input === 'string') {
      throw new InputError([{ where: source, what: 'a FITS file was given as text', fix: 'read the file as bytes (Uint8Array)' }]);
    }
    return readFitsTable(input);
  }
  if (format === 'votable') return readVoTable(typeof input === 'string' ? new TextEncoder().encode(input) : input);
  const text = typeof input === 'string' ? input : decodeCatalogText(input, source);
  if (format === 'ecsv') return readEcsvTable(text, source);
  return readCsvTable(text, format);
}

/**
 * Read a catalog (format detected from the content) and validate it into Targets and RowRejects.
 * Throws InputError when the file cannot be read as a table or lacks a required column.
 */
export function readCatalog(input: Uint8Array | string, source: string, mapping?: ColumnMapping): CatalogReadResult {
  return validateTable(readRawTable(input, source), source, mapping);
}

/** Throws InputError when no row of the catalog is usable (the plan cannot run on it). */
export function assertCatalogUsable(result: CatalogReadResult): void {
  if (usableRowCount(result) > 0) return;
  const first = result.rejects.slice(0, 3).map((r) => `line ${r.line} ${r.column}: ${r.reason}`).join('; ');
  throw new InputError([
    {
      where: result.source,
      what: `no usable row (${result.rowsRead} rows read, ${result.rejects.length} problems${first ? `, e.g. ${first}` : ''})`,
      // Nothing is written when no row is usable, so the reasons are given here, not in a catalog-report.csv.
      fix: 'fix the rows or the column mapping (catalogColumns in the plan); no output folder was written',
    },
  ]);
}
