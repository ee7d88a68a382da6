/**
 * The output folder's slits.csv and masks.csv (columns and order exactly as the contract lists them),
 * written and read back. Numbers are written as the shortest text that reads back to the same double;
 * text cells are formula-neutralised (see csvText.ts) and the readers undo that, so a round trip is exact.
 */
import { InputError, type Problem } from '../result';
import type { Slit, SlitRole } from '../geometry/maskSolution';
import { parseCsvRecords, type CsvRecord } from '../catalog/csvReader';
import { toCsv, unneutraliseCell } from './csvText';

/** Columns of slits.csv, in the contract's order. */
export const SLIT_COLUMNS = [
  'mask_id',
  'slit_id',
  'object_id',
  'role',
  'ra_deg',
  'dec_deg',
  'x_arcsec',
  'y_arcsec',
  'len_below_arcsec',
  'len_above_arcsec',
  'width_arcsec',
  'tilt_deg',
  'priority',
  'mag',
] as const;

/** Columns of masks.csv, in the contract's order. */
export const MASK_COLUMNS = ['mask_id', 'instrument', 'ra_deg', 'dec_deg', 'pa_deg'] as const;

/** One row of masks.csv: mask centre in ICRS degrees, PA in degrees East of North [0, 360), instrument profile id. */
export interface MaskRow {
  maskId: string;
  instrument: string;
  raDeg: number;
  decDeg: number;
  paDeg: number;
}

export const SLIT_ROLES: readonly SlitRole[] = ['tracer', 'starlight', 'sky', 'alignment'];

const CSV_OPTS = { neutraliseFormulas: true } as const;

/** slits.csv text: header plus one row per slit or box, in the given order. */
export function slitsToCsv(slits: readonly Slit[]): string {
  const rows = slits.map((s) => [
    s.maskId,
    s.slitId,
    s.objectId,
    s.role,
    s.raDeg,
    s.decDeg,
    s.xArcsec,
    s.yArcsec,
    s.lenBelowArcsec,
    s.lenAboveArcsec,
    s.widthArcsec,
    s.tiltDeg,
    s.priority,
    s.mag,
  ]);
  return toCsv(SLIT_COLUMNS, rows, CSV_OPTS);
}

/** masks.csv text: header plus one row per mask. */
export function masksToCsv(masks: readonly MaskRow[]): string {
  return toCsv(
    MASK_COLUMNS,
    masks.map((m) => [m.maskId, m.instrument, m.raDeg, m.decDeg, m.paDeg]),
    CSV_OPTS,
  );
}

/** Reads cells of one record by column name, collecting a Problem (file, line, column) for each bad cell. */
class RowReader {
  constructor(
    private readonly source: string,
    private readonly index: Map<string, number>,
    private readonly problems: Problem[],
    private rec: CsvRecord = { cells: [], line: 0 },
  ) {}

  at(rec: CsvRecord): this {
    this.rec = rec;
    return this;
  }

  private raw(column: string): string {
    return this.rec.cells[this.index.get(column)!] ?? '';
  }

  /** Record a problem with one cell of the current record. */
  fail(column: string, what: string, fix: string): void {
    this.problems.push({ where: `${this.source}:${this.rec.line}, column ${column}`, what, fix });
  }

  text(column: string, required = true): string {
    const v = unneutraliseCell(this.raw(column));
    if (required && v === '') this.fail(column, 'missing value', `give a ${column}`);
    return v;
  }

  /** A finite number; empty gives null when `optional`, else a problem. */
  number(column: string, optional = false): number | null {
    const t = this.raw(column).trim();
    if (t === '') {
      if (!optional) this.fail(column, 'missing value', 'give a decimal number');
      return null;
    }
    const v = Number(t);
    if (!Number.isFinite(v) || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) {
      this.fail(column, `"${t}" is not a number`, 'write a decimal number such as 12.5');
      return null;
    }
    return v;
  }
}

/** Parse one of the project's own CSV files: header check, then a RowReader per data record. */
function parseOwnCsv<T>(text: string, source: string, columns: readonly string[], build: (r: RowReader) => T): T[] {
  const records = parseCsvRecords(text);
  const problems: Problem[] = [];
  if (records.length === 0) throw new InputError([{ where: source, what: 'the file is empty', fix: `it must start with the header ${columns.join(',')}` }]);
  const header = records[0].cells.map((c) => c.trim());
  const index = new Map<string, number>();
  header.forEach((name, i) => {
    if (!index.has(name)) index.set(name, i);
  });
  const missing = columns.filter((c) => !index.has(c));
  if (missing.length > 0) {
    throw new InputError([
      {
        where: `${source}:${records[0].line}`,
        what: `the header lacks the column${missing.length > 1 ? 's' : ''} ${missing.join(', ')}`,
        fix: `the header must be ${columns.join(',')}`,
      },
    ]);
  }
  const reader = new RowReader(source, index, problems);
  const out: T[] = [];
  for (const rec of records.slice(1)) {
    if (rec.error) {
      problems.push({ where: `${source}:${rec.line}`, what: rec.error, fix: 'close the quoted field with a double quote' });
      continue;
    }
    if (rec.cells.length === 1 && rec.cells[0].trim() === '') continue; // blank line
    if (rec.cells.length !== header.length) {
      problems.push({
        where: `${source}:${rec.line}`,
        what: `the row has ${rec.cells.length} fields, the header has ${header.length}`,
        fix: 'quote fields that hold commas',
      });
      continue;
    }
    const before = problems.length;
    const value = build(reader.at(rec));
    if (problems.length === before) out.push(value);
  }
  if (problems.length > 0) throw new InputError(problems);
  return out;
}

/** Parse slits.csv text; `source` names the file in errors ("file:line, column name: what"). Blank lines are skipped. */
export function parseSlitsCsv(text: string, source: string): Slit[] {
  return parseOwnCsv(text, source, SLIT_COLUMNS, (r) => {
    const role = r.text('role') as SlitRole;
    const slit: Slit = {
      maskId: r.text('mask_id'),
      slitId: r.text('slit_id'),
      objectId: r.text('object_id', false),
      role,
      raDeg: r.number('ra_deg') as number,
      decDeg: r.number('dec_deg') as number,
      xArcsec: r.number('x_arcsec') as number,
      yArcsec: r.number('y_arcsec') as number,
      lenBelowArcsec: r.number('len_below_arcsec') as number,
      lenAboveArcsec: r.number('len_above_arcsec') as number,
      widthArcsec: r.number('width_arcsec') as number,
      tiltDeg: r.number('tilt_deg') as number,
      priority: r.number('priority') as number,
      mag: r.number('mag', true),
    };
    if (role !== ('' as SlitRole) && !SLIT_ROLES.includes(role)) r.fail('role', `unknown role "${role}"`, `use one of ${SLIT_ROLES.join(', ')}`);
    return slit;
  });
}

/** Parse masks.csv text; `source` names the file in errors. */
export function parseMasksCsv(text: string, source: string): MaskRow[] {
  return parseOwnCsv(text, source, MASK_COLUMNS, (r) => ({
    maskId: r.text('mask_id'),
    instrument: r.text('instrument'),
    raDeg: r.number('ra_deg') as number,
    decDeg: r.number('dec_deg') as number,
    paDeg: r.number('pa_deg') as number,
  }));
}
