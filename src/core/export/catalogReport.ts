/**
 * DIR/catalog-report.csv: one row per problem of a catalog row that was not used, columns `line,column,reason`
 * (line: 1-based file line counting the header for CSV/ECSV, 1-based row for VOTable/FITS), sorted by line.
 */
import type { RowReject } from '../catalog/types';
import { toCsv } from './csvText';

export const CATALOG_REPORT_COLUMNS = ['line', 'column', 'reason'] as const;

/** catalog-report.csv text for the rejects (sorted by line; the order of problems within a line is kept). */
export function catalogReportCsv(rejects: readonly RowReject[]): string {
  const sorted = rejects
    .map((r, i) => ({ r, i }))
    .sort((a, b) => a.r.line - b.r.line || a.i - b.i)
    .map(({ r }) => [r.line, r.column, r.reason]);
  return toCsv(CATALOG_REPORT_COLUMNS, sorted, { neutraliseFormulas: true });
}
