/**
 * ECSV 1.0 writer (the astropy project's Enhanced CSV): YAML header with one entry per column (name, datatype,
 * unit, description, and the UCD in the column's `meta`), the table metadata under `meta`, comma delimiter.
 * Numbers as shortest round-trip text (`nan`, `inf`, `-inf` for non-finite reals), booleans `True`/`False`,
 * missing values as empty fields. Text is not formula-neutralised (ECSV is read by programs, not spreadsheets);
 * a text starting with `#` is quoted so that no reader takes the row for a comment.
 */
import { Document, isMap, isSeq } from 'yaml';
import type { OutputTable } from './outputTable';
import { csvCell } from './csvText';
import { typedCell } from './typedCell';

const ECSV_DATATYPE = { string: 'string', float64: 'float64', int32: 'int32', bool: 'bool' } as const;

/** One ECSV data cell. */
function ecsvCell(v: ReturnType<typeof typedCell>): string {
  if (v === null) return '';
  if (typeof v === 'number') {
    if (Number.isNaN(v)) return 'nan';
    if (!Number.isFinite(v)) return v > 0 ? 'inf' : '-inf';
    return csvCell(v);
  }
  if (typeof v === 'boolean') return v ? 'True' : 'False';
  return v === '' ? '""' : csvCell(v, { quoteCommentStart: true });
}

/** The ECSV 1.0 text of an OutputTable (LF line ends). Throws InputError for a cell that does not fit its column. */
export function writeEcsv(table: OutputTable): string {
  const datatype = table.columns.map((c) => {
    const entry: Record<string, unknown> = { name: c.name };
    if (c.unit) entry.unit = c.unit;
    entry.datatype = ECSV_DATATYPE[c.datatype];
    if (c.description) entry.description = c.description;
    if (c.ucd) entry.meta = { ucd: c.ucd };
    return entry;
  });
  const meta: Record<string, unknown> = {};
  for (const m of table.meta) meta[m.key] = m.value;
  const units = table.meta.filter((m) => m.unit).map((m) => ({ key: m.key, unit: m.unit }));
  if (units.length > 0) meta.meta_units = Object.fromEntries(units.map((u) => [u.key, u.unit]));
  meta.table_name = table.name;
  const header: Record<string, unknown> = { datatype, delimiter: ',', meta, schema: 'astropy-2.0' };
  // One flow mapping per column, as astropy writes them: `- {name: ra_deg, unit: deg, datatype: float64, ...}`.
  const doc = new Document(header);
  const seq = doc.get('datatype');
  if (isSeq(seq)) for (const item of seq.items) if (isMap(item)) item.flow = true;
  const yamlText = doc.toString({ lineWidth: 0 }).replace(/\n$/, '');
  const out: string[] = ['# %ECSV 1.0', '# ---', ...yamlText.split('\n').map((l) => `# ${l}`)];
  out.push(table.columns.map((c) => csvCell(c.name, { quoteCommentStart: true })).join(','));
  table.rows.forEach((r, i) => out.push(table.columns.map((col, j) => ecsvCell(typedCell(table, col, i, r[j]))).join(',')));
  return out.join('\n') + '\n';
}
