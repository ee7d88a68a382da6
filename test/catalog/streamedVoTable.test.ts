/**
 * VOTable documents read from a file in chunks (the XML around the rows parsed once, the rows streamed: TABLEDATA
 * scanned piece by piece, BINARY/BINARY2 base64 decoded as it comes) give what the whole-document reader gives:
 * columns, metadata, rows, structural rejects and errors, for every datatype, nulls, entities, CDATA, comments and CR LF,
 * with chunk boundaries anywhere (inside a TR, a TD, an entity, a multi-byte character or a base64 quad).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { fileTextSource, readCatalogFile } from '../../src/cli/readCatalogFile';
import { readCatalog } from '../../src/core/catalog/read';
import { scratchFiles } from './scratchFiles';
import { readVoTable, readVoTableFrom, voTableEncoding } from '../../src/core/catalog/votable';
import { encodeBase64 } from '../../src/core/formats/base64';
import type { Cell } from '../../src/core/catalog/types';
import type { RawTableWithMeta } from '../../src/core/catalog/tableMeta';

const save = scratchFiles('votable-stream', 'xml');
const enc = (s: string) => new TextEncoder().encode(s);

/** Everything a table gives: columns, name, metadata, rows with their numbers, structural rejects, or the error. */
function outcome(read: () => RawTableWithMeta): unknown {
  try {
    const t = read();
    const rows: [number, Cell[]][] = [];
    t.forEachRow((cells, line) => rows.push([line, [...cells]]));
    return { columns: t.columns, name: t.name, meta: t.meta, rows, structural: t.structuralRejects };
  } catch (e) {
    return { error: String(e) };
  }
}

/** The streamed reading of a file, in chunks of `chunk` bytes. */
function streamed(path: string, bytes: Uint8Array, chunk: number): () => RawTableWithMeta {
  return () => readVoTableFrom(fileTextSource(path, chunk, voTableEncoding(bytes), path, false));
}

const FIELDS = `<FIELD name="id" datatype="char" arraysize="*"/>
<FIELD name="ra" datatype="double" unit="deg"/>
<FIELD name="dec" datatype="double" unit="deg"/>
<FIELD name="mag" datatype="float"><VALUES null="99"/></FIELD>
<FIELD name="n" datatype="int"><VALUES null="-1"/></FIELD>
<FIELD name="big" datatype="long"/>
<FIELD name="ok" datatype="boolean"/>
<FIELD name="tag" datatype="unicodeChar" arraysize="3"/>
<FIELD name="v" datatype="short" arraysize="*"/>
<FIELD name="z" datatype="doubleComplex"/>
<FIELD name="bits" datatype="bit" arraysize="5"/>
<FIELD name="u" datatype="unsignedByte"/>`;

/** One TABLEDATA row, as TD texts (or a broken or empty row); ids with entities, CDATA, comments, CR LF and non-ASCII. */
const tdRow = fc.oneof(
  { weight: 8, arbitrary: fc.record({
    id: fc.constantFrom('c1', 'c&amp;2', 'é&#233;', '<![CDATA[a<b]]>', 'x<!-- no -->y', 'l1\r\nl2', '', '星团', 'c1', ' sp '),
    ra: fc.constantFrom('187.5', '12.25', '', 'NaN', '400', '1e400', 'abc', '+Inf'),
    dec: fc.constantFrom('-5.5', '0', '95', ''),
    mag: fc.constantFrom('21.5', '99', '', '19'),
    n: fc.constantFrom('1', '-1', '', '0x1f', '123456789012345678901'),
    big: fc.constantFrom('9007199254740993', '-3', ''),
    ok: fc.constantFrom('T', 'false', '?', '1', ''),
    tag: fc.constantFrom('abc', 'Ωé', ''),
    v: fc.constantFrom('1 2 3', '', '-4'),
    z: fc.constantFrom('1 -2', ''),
    bits: fc.constantFrom('10101', ''),
    u: fc.constantFrom('255', '0', ''),
    empty: fc.boolean(),
  }).map((r) => {
    const tds = [r.id, r.ra, r.dec, r.mag, r.n, r.big, r.ok, r.tag, r.v, r.z, r.bits, r.u];
    return `<TR>${tds.map((t) => (t === '' && r.empty ? '<TD/>' : `<TD>${t}</TD>`)).join('')}</TR>`;
  }) },
  { weight: 1, arbitrary: fc.constantFrom('<TR><TD>short</TD><TD>1</TD></TR>', '<TR/>', '<!-- between -->', '\r\n', '  <TR>\n<TD>w</TD><TD>1</TD><TD>2</TD><TD>3</TD><TD>4</TD><TD>5</TD><TD>T</TD><TD>x</TD><TD>1</TD><TD>1 1</TD><TD>1</TD><TD>1</TD>\n</TR>') },
);

function tabledataDoc(rows: string[], sep: string, prefix: boolean, latin1: boolean): Uint8Array {
  const p = prefix ? 'v:' : '';
  const doc = `<?xml version="1.0" encoding="${latin1 ? 'ISO-8859-1' : 'UTF-8'}"?>
<${p}VOTABLE version="1.4"${prefix ? ' xmlns:v="http://www.ivoa.net/xml/VOTable/v1.3"' : ''}>
<${p}RESOURCE><${p}INFO name="note" value="invented"/><${p}TABLE name="t">
<${p}PARAM name="epoch" datatype="double" value="2000"/>
${prefix ? FIELDS.replace(/<(\/?)(FIELD|VALUES)/g, '<$1v:$2') : FIELDS}
<${p}DATA><${p}TABLEDATA>
${rows.map((r) => (prefix ? r.replace(/<(\/?)(TR|TD)/g, '<$1v:$2') : r)).join(sep)}
</${p}TABLEDATA></${p}DATA></${p}TABLE></${p}RESOURCE></${p}VOTABLE>
`;
  if (!latin1) return enc(doc);
  const out = new Uint8Array(doc.length);
  for (let i = 0; i < doc.length; i++) out[i] = doc.charCodeAt(i) < 256 ? doc.charCodeAt(i) : 0x3f;
  return out;
}

describe('VOTable TABLEDATA read in chunks', () => {
  it('gives the same columns, rows, structural rejects and errors as the whole document, for any chunk size', () => {
    fc.assert(
      fc.property(fc.array(tdRow, { maxLength: 25 }), fc.constantFrom('\n', '\r\n', ''), fc.boolean(), fc.boolean(), fc.integer({ min: 1, max: 200 }), (rows, sep, prefix, latin1, chunk) => {
        const bytes = tabledataDoc(rows, sep, prefix, latin1);
        const path = save(bytes);
        const whole = outcome(() => readVoTable(bytes));
        expect(outcome(streamed(path, bytes, chunk))).toEqual(whole);
        const catalogWhole = (() => { try { return readCatalog(bytes, path); } catch (e) { return String(e); } })();
        const catalogStreamed = (() => { try { return readCatalogFile(path, undefined, { chunkBytes: chunk }); } catch (e) { return String(e); } })();
        expect(catalogStreamed).toEqual(catalogWhole);
      }),
      { numRuns: 120 },
    );
  });

  it('reads the generated rows as the values written (entities, CDATA, comments, CR LF, nulls)', () => {
    const bytes = tabledataDoc(['<TR><TD>c&amp;2</TD><TD>187.5</TD><TD>-5.5</TD><TD>99</TD><TD>-1</TD><TD>9007199254740993</TD><TD>T</TD><TD>Ωé</TD><TD>1 2 3</TD><TD>1 -2</TD><TD>10101</TD><TD/></TR>',
      '<TR><TD><![CDATA[a<b]]></TD></TR>', '<TR><TD>x<!-- no -->y\r\nz</TD><TD>1</TD><TD>2</TD><TD>3</TD><TD>4</TD><TD>5</TD><TD>?</TD><TD/><TD/><TD/><TD/><TD>7</TD></TR>'], '\n', false, false);
    const t = outcome(streamed(save(bytes), bytes, 3)) as { rows: [number, Cell[]][]; structural: unknown[]; meta: unknown[] };
    expect(t.rows).toEqual([
      [1, ['c&2', 187.5, -5.5, null, null, '9007199254740993', true, 'Ωé', '1 2 3', '1 -2', '10101', null]],
      [3, ['xy\nz', 1, 2, 3, 4, 5, null, null, null, null, null, 7]],
    ]);
    expect(t.structural).toEqual([{ line: 2, column: '(row)', reason: 'row has 1 TD cells but the table has 12 FIELDs' }]);
    expect(t.meta).toEqual([{ key: 'note', value: 'invented' }, { key: 'epoch', value: 2000, datatype: 'double' }]);
  });

  it('names the same file line for a broken row wherever the chunks end', () => {
    const broken = ['<TR><TD>b</TD><TD>2</TR>', '<TR><TD>b</TD>stray text here<TD>2</TD></TR>', '<TD>b</TD>', '<TR><TD>b</TD><TD><![CDATA[2</TD></TR>',
      '<TR><TD>b<!-- open</TD></TR>', '<TR><TD>b</TD', '<TR><TD>b'];
    for (const row of broken) {
      const bytes = tabledataDoc(['<TR><TD>a</TD></TR>', '\n<!-- c -->\n', row, '<TR/>'], '\n', false, false);
      const path = save(bytes);
      const whole = outcome(() => readVoTable(bytes)) as { error: string };
      const rowLine = new TextDecoder().decode(bytes).split('\n').findIndex((l) => l.includes(row)) + 1;
      if (row.includes('</TR>')) expect(whole.error, row).toContain(`VOTable TABLEDATA, line ${rowLine}: `);
      else expect(whole.error, row).toMatch(/VOTable TABLEDATA, line \d+: /);
      for (const chunk of [1, 2, 5, 9, 64, 1 << 16]) expect(outcome(streamed(path, bytes, chunk)), `${row} in chunks of ${chunk}`).toEqual(whole);
    }
  });

  it('gives the validator\'s line and column for XML that is not well-formed outside the rows', () => {
    const bytes = enc(new TextDecoder().decode(tabledataDoc(['<TR><TD>a</TD></TR>'], '\n', false, false)).replace('</DATA>', '</DAT>'));
    const path = save(bytes);
    const whole = outcome(() => readVoTable(bytes)) as { error: string };
    expect(whole.error).toMatch(/VOTable, line \d+, column \d+: not well-formed XML/);
    for (const chunk of [1, 7, 1 << 16]) expect(outcome(streamed(path, bytes, chunk))).toEqual(whole);
  });
});

/** Big-endian bytes of one row of the binary test table (fields id char*, ra double, n int null -1, v short*, c char 3). */
const BIN_FIELDS = `<FIELD name="id" datatype="char" arraysize="*"/><FIELD name="ra" datatype="double"/>
<FIELD name="n" datatype="int"><VALUES null="-1"/></FIELD><FIELD name="v" datatype="short" arraysize="*"/>
<FIELD name="c" datatype="char" arraysize="3"/><FIELD name="ok" datatype="boolean"/><FIELD name="t" datatype="unicodeChar" arraysize="2"/>
<FIELD name="f" datatype="float"/><FIELD name="big" datatype="long"/>`;

interface BinRow { nulls: number; id: string; ra: number; n: number; v: number[]; ok: string; f: number; big: bigint }

const binRow: fc.Arbitrary<BinRow> = fc.record({
  nulls: fc.integer({ min: 0, max: 0xffff }),
  id: fc.constantFrom('g1', '', 'é-7', 'a-much-longer-identifier'),
  ra: fc.constantFrom(187.5, NaN, -0, 12.125),
  n: fc.constantFrom(1, -1, 2147483647),
  v: fc.array(fc.integer({ min: -32768, max: 32767 }), { maxLength: 4 }),
  ok: fc.constantFrom('T', 'F', '?', '1'),
  f: fc.constantFrom(0.5, NaN, 1e30),
  big: fc.constantFrom(5n, -(2n ** 62n), 2n ** 63n - 1n),
});

function binaryDoc(rows: BinRow[], kind: 'BINARY' | 'BINARY2', lineWidth: number, cut: number): Uint8Array {
  const out: number[] = [];
  const d = new DataView(new ArrayBuffer(8));
  const push = (n: number) => { for (let i = 0; i < n; i++) out.push(d.getUint8(i)); };
  for (const r of rows) {
    if (kind === 'BINARY2') out.push(r.nulls >> 8, r.nulls & 0xff);
    const id = enc(r.id);
    d.setUint32(0, id.length); push(4); out.push(...id);
    d.setFloat64(0, r.ra); push(8);
    d.setInt32(0, r.n); push(4);
    d.setUint32(0, r.v.length); push(4);
    for (const x of r.v) { d.setInt16(0, x); push(2); }
    out.push(0x61, 0x62, 0);
    out.push(r.ok.charCodeAt(0));
    out.push(0x03, 0xa9, 0, 0x41); // 'ΩA' as two UCS-2 characters
    d.setFloat32(0, r.f); push(4);
    d.setBigInt64(0, r.big); push(8);
  }
  const bytes = new Uint8Array(out.slice(0, out.length - cut));
  const b64 = encodeBase64(bytes).replace(/\n/g, '').replace(new RegExp(`(.{${lineWidth}})`, 'g'), '$1\n ');
  return enc(`<?xml version="1.0"?><VOTABLE version="1.4"><RESOURCE><TABLE>${BIN_FIELDS}
<DATA><${kind}><STREAM encoding="base64">
${b64}
</STREAM></${kind}></DATA></TABLE></RESOURCE></VOTABLE>`);
}

describe('VOTable BINARY and BINARY2 streams decoded as they are read', () => {
  it('gives the same rows, nulls and errors as the whole document, for any chunk size and base64 line width', () => {
    fc.assert(
      fc.property(fc.array(binRow, { maxLength: 12 }), fc.constantFrom('BINARY', 'BINARY2' as const), fc.integer({ min: 1, max: 90 }),
        fc.constantFrom(0, 0, 0, 1, 3), fc.integer({ min: 1, max: 150 }), (rows, kind, width, cut, chunk) => {
          const bytes = binaryDoc(rows, kind as 'BINARY' | 'BINARY2', width, rows.length > 0 ? cut : 0);
          const path = save(bytes);
          const whole = outcome(() => readVoTable(bytes));
          if (cut > 0 && rows.length > 0) expect(JSON.stringify(whole)).toMatch(/the stream ends inside this row/);
          expect(outcome(streamed(path, bytes, chunk))).toEqual(whole);
        }),
      { numRuns: 120 },
    );
  });

  it('reads the values written, and names the position of a character that is not base64', () => {
    const rows = [{ nulls: 0x4000, id: 'é-7', ra: 187.5, n: -1, v: [1, -2], ok: 'T', f: 0.5, big: 5n }];
    const bytes = binaryDoc(rows, 'BINARY2', 7, 0);
    const t = outcome(streamed(save(bytes), bytes, 2)) as { rows: [number, Cell[]][] };
    expect(t.rows).toEqual([[1, ['é-7', null, null, '1 -2', 'ab', true, 'ΩA', 0.5, 5]]]);
    const bad = enc(new TextDecoder().decode(bytes).replace(/(<STREAM encoding="base64">\n(?:.*\n){2}.{3})/, '$1!'));
    const whole = outcome(() => readVoTable(bad)) as { error: string };
    expect(whole.error).toMatch(/VOTable BINARY2: STREAM has a character that is not base64 at position \d+/);
    for (const chunk of [1, 3, 1 << 16]) expect(outcome(streamed(save(bad), bad, chunk))).toEqual(whole);
  });
});
