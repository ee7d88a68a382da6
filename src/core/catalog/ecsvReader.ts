/**
 * ECSV 1.0 reader (the Enhanced Character Separated Values specification of the astropy project): a header of
 * `# `-prefixed lines, `# %ECSV 1.0` then `# ---` then YAML with `datatype` (name, datatype, unit, description,
 * format, meta per column), optional `delimiter` (space, the default, or comma), `meta` and `schema`; then a row
 * of column names and the data. Cells stay text (64-bit integers keep every digit); the validator converts them.
 * Line numbers are file lines counting the header lines.
 */
import { parse as parseYaml } from 'yaml';
import { InputError } from '../result';
import type { ColumnInfo } from './types';
import type { RawTableWithMeta, TableMetaItem } from './tableMeta';
import { delimitedRawTable, stringSource, stripBom, type CsvDialect, type TextSource } from './csvReader';

/** The parsed ECSV header: columns, delimiter, table metadata and the number of header lines. */
export interface EcsvHeader {
  version: string;
  columns: ColumnInfo[];
  delimiter: ' ' | ',';
  meta: TableMetaItem[];
  schema?: string;
  headerLines: number;
}

/** True when the text starts (after an optional BOM) with the ECSV signature line `# %ECSV`. */
export function looksLikeEcsv(head: string): boolean {
  return /^#\s*%ECSV\s/.test(stripBom(head));
}

/** A metadata value as table metadata: scalars as they are, lists and maps as JSON text. */
function metaValue(v: unknown): TableMetaItem['value'] {
  if (v === null || v === undefined) return null;
  if (typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean') return v;
  return JSON.stringify(v instanceof Map ? Object.fromEntries(v) : v);
}

/** Flatten ECSV `meta` (a mapping, or the `!!omap` list of one-key mappings astropy writes) to items. */
function metaItems(meta: unknown): TableMetaItem[] {
  const out: TableMetaItem[] = [];
  const add = (k: unknown, v: unknown) => out.push({ key: String(k), value: metaValue(v) });
  if (meta instanceof Map) for (const [k, v] of meta) add(k, v);
  else if (Array.isArray(meta)) {
    for (const item of meta) {
      if (item instanceof Map) for (const [k, v] of item) add(k, v);
      else if (item && typeof item === 'object') for (const [k, v] of Object.entries(item)) add(k, v);
    }
  } else if (meta && typeof meta === 'object') for (const [k, v] of Object.entries(meta)) add(k, v);
  return out;
}

/** Parse the `#` header of an ECSV text (`head` must hold the whole header). Throws InputError naming the line. */
export function parseEcsvHeader(head: string, source = 'ECSV file'): EcsvHeader {
  const text = stripBom(head);
  const lines = text.split(/\r\n|\n|\r/);
  let n = 0;
  while (n < lines.length && lines[n].startsWith('#')) n++;
  const sig = /^#\s*%ECSV\s+(\S+)/.exec(lines[0] ?? '');
  if (!sig) throw new InputError([{ where: `${source}:1`, what: 'does not start with "# %ECSV 1.0"', fix: 'write the ECSV signature line first' }]);
  const version = sig[1];
  if (!/^(0\.9|1\.\d+)$/.test(version)) {
    throw new InputError([{ where: `${source}:1`, what: `ECSV version ${version} is not supported`, fix: 'write ECSV 1.0' }]);
  }
  const yamlLines: string[] = [];
  let sawStart = false;
  for (let i = 1; i < n; i++) {
    const body = lines[i].replace(/^# ?/, '');
    if (!sawStart) {
      if (body.trim() === '') continue;
      if (body.trim() !== '---') throw new InputError([{ where: `${source}:${i + 1}`, what: 'expected "# ---" after the ECSV signature', fix: 'start the YAML header with "# ---"' }]);
      sawStart = true;
      continue;
    }
    yamlLines.push(body);
  }
  let doc: unknown;
  try {
    doc = parseYaml(yamlLines.join('\n'));
  } catch (e) {
    const pos = (e as { linePos?: { line: number }[] }).linePos?.[0]?.line;
    throw new InputError([
      { where: `${source}:${pos !== undefined ? pos + 2 : 2}`, what: `the ECSV header is not valid YAML: ${(e as Error).message.split('\n')[0]}`, fix: 'check the header lines' },
    ]);
  }
  const header = (doc && typeof doc === 'object' ? doc : {}) as Record<string, unknown>;
  const dt = header.datatype;
  if (!Array.isArray(dt)) {
    throw new InputError([{ where: source, what: 'the ECSV header has no "datatype" list of columns', fix: 'describe each column under datatype:' }]);
  }
  const columns: ColumnInfo[] = dt.map((c: Record<string, unknown>, i) => {
    if (!c || typeof c.name !== 'string') {
      throw new InputError([{ where: `${source}: datatype[${i}]`, what: 'a column without a name', fix: 'give every column a name' }]);
    }
    const info: ColumnInfo = { name: c.name, datatype: typeof c.datatype === 'string' ? c.datatype : 'string' };
    if (c.unit !== undefined && c.unit !== null) info.unit = String(c.unit);
    if (typeof c.description === 'string') info.description = c.description;
    const colMeta = c.meta instanceof Map ? Object.fromEntries(c.meta) : (c.meta as Record<string, unknown> | undefined);
    if (colMeta && typeof colMeta.ucd === 'string') info.ucd = colMeta.ucd;
    return info;
  });
  const delim = header.delimiter ?? ' ';
  if (delim !== ' ' && delim !== ',') {
    throw new InputError([{ where: source, what: `the ECSV delimiter ${JSON.stringify(delim)} is not allowed`, fix: 'use a space or a comma' }]);
  }
  return {
    version,
    columns,
    delimiter: delim,
    meta: metaItems(header.meta),
    schema: typeof header.schema === 'string' ? header.schema : undefined,
    headerLines: n,
  };
}

/** The line end of a text: the first one found (default "\n"). */
function lineEndOf(head: string): CsvDialect['newline'] {
  const m = /\r\n|\n|\r/.exec(head);
  return (m?.[0] as CsvDialect['newline']) ?? '\n';
}

/** An ECSV table over a text source; `head` is the start of the text and must hold the whole header. */
export function ecsvRawTable(head: string, source: TextSource, where = 'ECSV file'): RawTableWithMeta {
  const h = parseEcsvHeader(head, where);
  const problems: string[] = [];
  const t = delimitedRawTable('ecsv', source, { delimiter: h.delimiter, newline: lineEndOf(head), collapseSpaces: h.delimiter === ' ' }, h.columns, problems);
  if (problems.length > 0) throw new InputError(problems.map((p) => ({ where, what: p, fix: 'make the column-name row match the header' })));
  return Object.assign(t, { meta: h.meta });
}

/** Read a whole ECSV text. */
export function readEcsvTable(text: string, where = 'ECSV file'): RawTableWithMeta {
  return ecsvRawTable(text.slice(0, 1 << 20), stringSource(text), where);
}
