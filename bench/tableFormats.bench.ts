/**
 * VOTable and FITS table speed: writing and reading an invented table of 100 000 rows (id, ra, dec, mag, an
 * int and a bool; fixed seed), and reading the same rows from a BINARY2 stream. No goals set by the issue;
 * the figures show how big a VOTable/FITS catalog stays interactive in the editor.
 */
import { printTable, medianMs, type BenchRow } from './harness';
import { writeVoTable } from '../src/core/export/votableWriter';
import { writeFitsTable } from '../src/core/export/fitsWriter';
import { readVoTable } from '../src/core/catalog/votable';
import { readFitsTable } from '../src/core/catalog/fitsTable';
import { encodeBase64 } from '../src/core/formats/base64';
import type { OutputTable } from '../src/core/export/outputTable';
import type { RawTable } from '../src/core/catalog/types';

const ROWS = 100_000;

function inventedTable(rows: number): OutputTable {
  let seed = 7;
  const rnd = () => (seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0) / 4294967296;
  return {
    name: 'bench',
    columns: [
      { name: 'id', datatype: 'string' }, { name: 'ra', datatype: 'float64', unit: 'deg' },
      { name: 'dec', datatype: 'float64', unit: 'deg' }, { name: 'mag', datatype: 'float64', unit: 'mag' },
      { name: 'n', datatype: 'int32' }, { name: 'flag', datatype: 'bool' },
    ],
    rows: Array.from({ length: rows }, (_, i) => [`c${i}`, 187.5 + rnd() - 0.5, -5 + rnd() - 0.5, 19 + 5 * rnd(), i, i % 3 === 0]),
    meta: [],
  };
}

/** The same table as a BINARY2 VOTable (built directly: the project writes TABLEDATA only). */
function binary2Doc(t: OutputTable): Uint8Array {
  const bytes: number[] = [];
  const dv = new DataView(new ArrayBuffer(8));
  const push = (n: number) => { for (let i = 0; i < n; i++) bytes.push(dv.getUint8(i)); };
  for (const r of t.rows) {
    bytes.push(0);
    const id = r[0] as string;
    dv.setInt32(0, id.length); push(4);
    for (let i = 0; i < id.length; i++) bytes.push(id.charCodeAt(i));
    for (const j of [1, 2, 3]) { dv.setFloat64(0, r[j] as number); push(8); }
    dv.setInt32(0, r[4] as number); push(4);
    bytes.push(r[5] ? 0x54 : 0x46);
  }
  const doc = `<?xml version="1.0"?><VOTABLE version="1.4"><RESOURCE><TABLE>
<FIELD name="id" datatype="char" arraysize="*"/><FIELD name="ra" datatype="double" unit="deg"/>
<FIELD name="dec" datatype="double" unit="deg"/><FIELD name="mag" datatype="double" unit="mag"/>
<FIELD name="n" datatype="int"/><FIELD name="flag" datatype="boolean"/>
<DATA><BINARY2><STREAM encoding="base64">${encodeBase64(new Uint8Array(bytes))}</STREAM></BINARY2></DATA></TABLE></RESOURCE></VOTABLE>`;
  return new TextEncoder().encode(doc);
}

function countRows(t: RawTable): number {
  let n = 0;
  t.forEachRow(() => { n++; });
  return n;
}

export default async function run(): Promise<void> {
  const table = inventedTable(ROWS);
  const xml = new TextEncoder().encode(writeVoTable(table));
  const fits = writeFitsTable(table);
  const b2 = binary2Doc(table);
  for (const [label, bytes, read] of [['TABLEDATA', xml, readVoTable], ['FITS', fits, readFitsTable], ['BINARY2', b2, readVoTable]] as const) {
    const n = countRows(read(bytes));
    if (n !== ROWS) throw new Error(`${label}: read ${n} rows, expected ${ROWS}`);
  }
  const rows: BenchRow[] = [
    { name: `write VOTable TABLEDATA, ${ROWS} rows`, value: await medianMs(() => writeVoTable(table), 3), unit: 'ms' },
    { name: `write FITS BINTABLE, ${ROWS} rows`, value: await medianMs(() => writeFitsTable(table), 3), unit: 'ms' },
    { name: `read VOTable TABLEDATA (${(xml.length / 1e6).toFixed(1)} MB)`, value: await medianMs(() => countRows(readVoTable(xml)), 3), unit: 'ms' },
    { name: `read VOTable BINARY2 (${(b2.length / 1e6).toFixed(1)} MB)`, value: await medianMs(() => countRows(readVoTable(b2)), 3), unit: 'ms' },
    { name: `read FITS BINTABLE (${(fits.length / 1e6).toFixed(1)} MB)`, value: await medianMs(() => countRows(readFitsTable(fits)), 3), unit: 'ms' },
  ];
  await printTable('VOTable and FITS tables (100 000 invented rows)', rows);
}
