/**
 * VOTable reader on hand-made documents that follow the IVOA VOTable 1.3/1.4 standard: TABLEDATA with namespaces,
 * nulls (empty TD, VALUES null, NaN, '?'), PARAMs/INFOs as metadata; BINARY2 and BINARY streams built byte by byte
 * (big-endian, null-flag bitmap before each BINARY2 row, 4-byte counts for variable-length arrays); FITS inside
 * VOTable; and the errors a user gets for broken files.
 */
import { describe, expect, it } from 'vitest';
import { readVoTable } from '../../src/core/catalog/votable';
import { encodeBase64 } from '../../src/core/formats/base64';
import { writeFitsTable } from '../../src/core/export/fitsWriter';
import type { Cell } from '../../src/core/catalog/types';
import type { RawTableWithMeta } from '../../src/core/catalog/tableMeta';
import { InputError } from '../../src/core/result';

const enc = (s: string) => new TextEncoder().encode(s);
function rows(t: RawTableWithMeta): [number, Cell[]][] {
  const out: [number, Cell[]][] = [];
  t.forEachRow((c, line) => out.push([line, c]));
  return out;
}

describe('VOTable TABLEDATA', () => {
  const doc = `\ufeff<?xml version="1.0" encoding="UTF-8"?>
<vot:VOTABLE version="1.3" xmlns:vot="http://www.ivoa.net/xml/VOTable/v1.3">
  <vot:INFO name="QUERY_STATUS" value="OK"/>
  <vot:RESOURCE>
    <vot:PARAM name="epoch" datatype="double" unit="yr" value="2016.0" ucd="time.epoch"><vot:DESCRIPTION>reference epoch</vot:DESCRIPTION></vot:PARAM>
    <vot:TABLE name="cands">
      <vot:PARAM name="band" datatype="char" arraysize="*" value="i"/>
      <vot:FIELD name="id" datatype="char" arraysize="*" ucd="meta.id;meta.main"/>
      <vot:FIELD name="RAJ2000" datatype="double" unit="deg" ucd="pos.eq.ra;meta.main"><vot:DESCRIPTION>Right ascension</vot:DESCRIPTION></vot:FIELD>
      <vot:FIELD name="n" datatype="int"><vot:VALUES null="-999"/></vot:FIELD>
      <vot:FIELD name="ok" datatype="boolean"/>
      <vot:FIELD name="big" datatype="long"/>
      <vot:FIELD name="pm" datatype="float" arraysize="2" unit="mas/yr"/>
      <vot:FIELD name="mag" datatype="float"><vot:VALUES null="99"/></vot:FIELD>
      <vot:DATA><vot:TABLEDATA>
        <vot:TR><vot:TD>a&amp;b &lt;c&gt; &#233;</vot:TD><vot:TD> 10.5 </vot:TD><vot:TD>7</vot:TD><vot:TD>T</vot:TD><vot:TD>9007199254740993</vot:TD><vot:TD>1.5 -2</vot:TD><vot:TD>21.5</vot:TD></vot:TR>
        <vot:TR><vot:TD><![CDATA[x<y]]></vot:TD><vot:TD></vot:TD><vot:TD>-999</vot:TD><vot:TD>?</vot:TD><vot:TD>-12</vot:TD><vot:TD/><vot:TD>99</vot:TD></vot:TR>
        <vot:TR><vot:TD>short</vot:TD><vot:TD>1</vot:TD></vot:TR>
        <vot:TR><vot:TD/><vot:TD>NaN</vot:TD><vot:TD>0x1F</vot:TD><vot:TD>false</vot:TD><vot:TD>+5</vot:TD><vot:TD>NaN NaN</vot:TD><vot:TD>+Inf</vot:TD></vot:TR>
        <vot:TR><vot:TD>bad</vot:TD><vot:TD>12h30m</vot:TD><vot:TD>1.5</vot:TD><vot:TD>1</vot:TD><vot:TD>0</vot:TD><vot:TD>1 2</vot:TD><vot:TD>-Inf</vot:TD></vot:TR>
      </vot:TABLEDATA></vot:DATA>
    </vot:TABLE>
  </vot:RESOURCE>
</vot:VOTABLE>`;

  it('reads FIELDs, cells, nulls and 1-based row numbers; a short row is a structural reject', () => {
    const t = readVoTable(enc(doc));
    expect(t.format).toBe('votable');
    expect(t.name).toBe('cands');
    expect(t.columns).toEqual([
      { name: 'id', datatype: 'string', ucd: 'meta.id;meta.main' },
      { name: 'RAJ2000', datatype: 'float64', unit: 'deg', ucd: 'pos.eq.ra;meta.main', description: 'Right ascension' },
      { name: 'n', datatype: 'int32' },
      { name: 'ok', datatype: 'bool' },
      { name: 'big', datatype: 'int64' },
      { name: 'pm', datatype: 'string', unit: 'mas/yr' },
      { name: 'mag', datatype: 'float32' },
    ]);
    expect(rows(t)).toEqual([
      [1, ['a&b <c> é', 10.5, 7, true, '9007199254740993', '1.5 -2', 21.5]],
      [2, ['x<y', null, null, null, -12, null, null]],
      // row 3 has 2 cells: reported in structuralRejects, not visited
      [4, [null, null, 31, false, 5, 'NaN NaN', Infinity]],
      // text that is not a number is kept as text, so that validation reports it with the row and column
      [5, ['bad', '12h30m', '1.5', true, 0, '1 2', -Infinity]],
    ]);
    expect(t.structuralRejects).toEqual([{ line: 3, column: '(row)', reason: 'row has 2 TD cells but the table has 7 FIELDs' }]);
    // read before any row is visited, the rejects are the same
    expect(readVoTable(enc(doc)).structuralRejects).toEqual(t.structuralRejects);
  });

  it('returns PARAMs and INFOs of the document, resource and table as metadata', () => {
    const t = readVoTable(enc(doc));
    expect(t.meta).toEqual([
      { key: 'QUERY_STATUS', value: 'OK' },
      { key: 'epoch', value: 2016, datatype: 'double', unit: 'yr', ucd: 'time.epoch', description: 'reference epoch' },
      { key: 'band', value: 'i', datatype: 'char' },
    ]);
  });

  it('gives errors that say where and what', () => {
    const broken = '<?xml version="1.0"?>\n<VOTABLE>\n<RESOURCE><TABLE>\n<FIELD name="a" datatype="int"/>\n</RESOURCE></VOTABLE>';
    expect(() => readVoTable(enc(broken))).toThrow(/VOTable, line 5, column \d+: not well-formed XML/);
    expect(() => readVoTable(enc('<root/>'))).toThrow(/no VOTABLE root element/);
    expect(() => readVoTable(enc('<VOTABLE><RESOURCE/></VOTABLE>'))).toThrow(/no TABLE element/);
    const noType = '<VOTABLE><RESOURCE><TABLE><FIELD name="ra"/></TABLE></RESOURCE></VOTABLE>';
    expect(() => readVoTable(enc(noType))).toThrow(InputError);
    expect(() => readVoTable(enc(noType))).toThrow(/FIELD 1 'ra': has no datatype attribute/);
    const href = '<VOTABLE><RESOURCE><TABLE><FIELD name="ra" datatype="double"/><DATA><BINARY2><STREAM href="http://example.invalid/x"/></BINARY2></DATA></TABLE></RESOURCE></VOTABLE>';
    expect(() => readVoTable(enc(href))).toThrow(/STREAM points to external data/);
  });

  it('reads a table with no DATA as zero rows', () => {
    const t = readVoTable(enc('<VOTABLE><RESOURCE><RESOURCE><TABLE><FIELD name="ra" datatype="double"/></TABLE></RESOURCE></RESOURCE></VOTABLE>'));
    expect(t.columns.map((c) => c.name)).toEqual(['ra']);
    expect(rows(t)).toEqual([]);
  });
});

/** Big-endian byte writer for building binary streams by hand. */
class Bytes {
  parts: number[] = [];
  u8(...b: number[]) { this.parts.push(...b); return this; }
  i16(x: number) { const d = new DataView(new ArrayBuffer(2)); d.setInt16(0, x); return this.u8(...new Uint8Array(d.buffer)); }
  i32(x: number) { const d = new DataView(new ArrayBuffer(4)); d.setInt32(0, x); return this.u8(...new Uint8Array(d.buffer)); }
  i64(x: bigint) { const d = new DataView(new ArrayBuffer(8)); d.setBigInt64(0, x); return this.u8(...new Uint8Array(d.buffer)); }
  f32(x: number) { const d = new DataView(new ArrayBuffer(4)); d.setFloat32(0, x); return this.u8(...new Uint8Array(d.buffer)); }
  f64(x: number) { const d = new DataView(new ArrayBuffer(8)); d.setFloat64(0, x); return this.u8(...new Uint8Array(d.buffer)); }
  chars(s: string) { return this.u8(...new TextEncoder().encode(s)); }
  ucs2(s: string) { for (const ch of s) this.u8(ch.charCodeAt(0) >> 8, ch.charCodeAt(0) & 255); return this; }
  base64() { return encodeBase64(new Uint8Array(this.parts)); }
}

const FIELDS = `
  <FIELD name="id" datatype="char" arraysize="*"/>
  <FIELD name="ra" datatype="double" unit="deg"/>
  <FIELD name="n" datatype="int"><VALUES null="-1"/></FIELD>
  <FIELD name="ok" datatype="boolean"/>
  <FIELD name="tag" datatype="unicodeChar" arraysize="4"/>
  <FIELD name="big" datatype="long"/>
  <FIELD name="s" datatype="short"/>
  <FIELD name="u" datatype="unsignedByte"/>
  <FIELD name="f" datatype="float"/>
  <FIELD name="code" datatype="char" arraysize="3"/>
  <FIELD name="v" datatype="int" arraysize="*"/>`;

function binaryDoc(kind: 'BINARY2' | 'BINARY', stream: string): Uint8Array {
  return enc(`<?xml version="1.0"?><VOTABLE version="1.4" xmlns="http://www.ivoa.net/xml/VOTable/v1.3"><RESOURCE><TABLE>${FIELDS}
  <DATA><${kind}><STREAM encoding="base64">
${stream}
</STREAM></${kind}></DATA></TABLE></RESOURCE></VOTABLE>`);
}

describe('VOTable BINARY2 and BINARY streams', () => {
  it('reads every datatype big-endian and honours the BINARY2 null flags', () => {
    const b = new Bytes();
    // row 1: no nulls. 11 fields -> 2 flag bytes.
    b.u8(0, 0).i32(6).chars('gc-001').f64(187.25).i32(42).chars('T').ucs2('Ωé').u8(0, 0, 0, 0).i64(-(2n ** 60n)).i16(-300).u8(250).f32(0.5)
      .chars('ab').u8(0).i32(2).i32(7).i32(-8);
    // row 2: ra (field 2 -> bit 0x40 of byte 0) and v (field 11 -> bit 0x20 of byte 1) flagged null; n = VALUES null
    b.u8(0x40, 0x20).i32(0).f64(0).i32(-1).chars('?').ucs2('abcd').i64(5n).i16(0).u8(0).f32(NaN).chars('xyz').i32(0);
    const t = readVoTable(binaryDoc('BINARY2', b.base64()));
    expect(t.columns.map((c) => c.datatype)).toEqual(['string', 'float64', 'int32', 'bool', 'string', 'int64', 'int16', 'uint8', 'float32', 'string', 'string']);
    expect(rows(t)).toEqual([
      [1, ['gc-001', 187.25, 42, true, 'Ωé', '-1152921504606846976', -300, 250, 0.5, 'ab', '7 -8']],
      [2, [null, null, null, null, 'abcd', 5, 0, 0, null, 'xyz', null]],
    ]);
  });

  it('reads BINARY (version 1, no null flags) with VALUES null and NaN as nulls', () => {
    const b = new Bytes();
    b.i32(1).chars('a').f64(NaN).i32(-1).chars('F').ucs2('x').u8(0, 0, 0, 0, 0, 0).i64(1n).i16(1).u8(1).f32(1).chars('abc').i32(1).i32(3);
    expect(rows(readVoTable(binaryDoc('BINARY', b.base64())))).toEqual([[1, ['a', null, null, false, 'x', 1, 1, 1, 1, 'abc', '3']]]);
  });

  it('reports a stream that ends inside a row, with the row number', () => {
    const b = new Bytes();
    b.u8(0, 0).i32(1).chars('a').f64(1).i32(1).chars('T').ucs2('x').u8(0, 0, 0, 0, 0, 0).i64(1n).i16(1).u8(1).f32(1).chars('abc').i32(0);
    b.u8(0, 0).i32(5).chars('ab');
    const t = readVoTable(binaryDoc('BINARY2', b.base64()));
    expect(() => rows(t)).toThrow(/BINARY2 row 2: the stream ends inside this row/);
  });

  it('reads FITS data embedded in a VOTable', () => {
    const fits = writeFitsTable({
      name: 'x', columns: [{ name: 'id', datatype: 'string' }, { name: 'ra', datatype: 'float64', unit: 'deg' }],
      rows: [['a', 1.5], ['b', null]], meta: [],
    });
    const doc = `<VOTABLE><RESOURCE><TABLE><FIELD name="id" datatype="char" arraysize="*"/><FIELD name="ra" datatype="double"/>
      <DATA><FITS extnum="1"><STREAM encoding="base64">${encodeBase64(fits)}</STREAM></FITS></DATA></TABLE></RESOURCE></VOTABLE>`;
    expect(rows(readVoTable(enc(doc)))).toEqual([[1, ['a', 1.5]], [2, ['b', null]]]);
  });
});

describe('VOTable TABLEDATA structure errors', () => {
  const wrap = (rowsXml: string) => enc(`<?xml version="1.0"?>
<VOTABLE><RESOURCE><TABLE><FIELD name="id" datatype="char" arraysize="*"/><FIELD name="n" datatype="int"/>
<DATA><TABLEDATA>
<TR><TD>a</TD><TD>1</TD></TR>
${rowsXml}
</TABLEDATA></DATA></TABLE></RESOURCE></VOTABLE>`);

  // (found while the rows are read: readCatalog reads them at once, so the error reaches the user the same way)
  it('names the file line and the row of a broken TR or TD', () => {
    expect(() => rows(readVoTable(wrap('<TR><TD>b</TD><TD>2</TR>')))).toThrow(/TABLEDATA, line 5: expected <\/TD> in row 2, found <\/TR>/);
    expect(() => rows(readVoTable(wrap('<TR><TD>b</TD>stray<TD>2</TD></TR>')))).toThrow(/line 5: unexpected text 'stray/);
    expect(() => rows(readVoTable(wrap('<TD>b</TD>')))).toThrow(/line 5: expected <TR>, found <TD>/);
    expect(() => rows(readVoTable(wrap('<TR><TD>b</TD><TD><![CDATA[2</TD></TR>')))).toThrow(InputError);
    expect(() => rows(readVoTable(wrap('<TR><TD>b</TD><TD><![CDATA[2</TD></TR>')))).toThrow(/VOTable TABLEDATA, line 5: a CDATA section is not closed/);
  });

  it('keeps comments out of cells and reads literal CR LF inside a TD as LF, escaped CR as CR', () => {
    const t = readVoTable(wrap('<!-- a comment --><TR><TD>x\r\ny&#13;</TD><!-- c --><TD>2<!-- inside --></TD></TR><TR/>'));
    expect(rows(t)).toEqual([[1, ['a', 1]], [2, ['x\ny\r', 2]]]);
    expect(t.structuralRejects).toEqual([{ line: 3, column: '(row)', reason: 'row has 0 TD cells but the table has 2 FIELDs' }]);
  });
});
