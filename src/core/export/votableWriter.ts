/**
 * VOTable 1.4 writer (IVOA standard), TABLEDATA serialisation, UTF-8. One RESOURCE with one TABLE: table meta as
 * PARAMs (unit, description), one FIELD per column with unit, UCD1+ word and DESCRIPTION.
 * Datatypes: float64 -> double, int32 -> int, bool -> boolean, string -> char arraysize="*", or unicodeChar when
 * the column holds non-ASCII text (VOTable 1.4 char is ASCII). Null cells are empty TDs; non-finite reals are
 * written NaN (null), +Inf, -Inf. Every text is XML-escaped (see `escapeXml`); characters XML 1.0 cannot carry are
 * substituted visibly and an INFO element says how many.
 */
import type { OutputColumn, OutputTable } from './outputTable';
import type { Cell } from '../catalog/types';
import { typedRows } from './typedCell';
import { escapeXml } from '../formats/xmlText';

const NON_ASCII = /[^\x00-\x7f]/;

/** The VOTable 1.4 document of an OutputTable. Throws InputError for a cell that does not fit its column. */
export function writeVoTable(table: OutputTable): string {
  const counter = { substituted: 0 };
  const esc = (s: string) => escapeXml(s, counter);
  const rows = typedRows(table);
  const out: string[] = [];
  const ids = new Set<string>();
  /** ` ID="..."` for a name that is not an XML NCName (astropy warns W03 otherwise); unique within the document. */
  const idAttr = (name: string): string => {
    if (/^[A-Za-z_][\w.-]*$/.test(name)) { ids.add(name); return ''; }
    const base = `_${name.replace(/[^\w.-]/g, '_')}`;
    let id = base;
    for (let k = 2; ids.has(id); k++) id = `${base}_${k}`;
    ids.add(id);
    return ` ID="${esc(id)}"`;
  };
  out.push('  <RESOURCE type="results">');
  out.push(`    <TABLE${idAttr(table.name)} name="${esc(table.name)}" nrows="${rows.length}">`);
  for (const m of table.meta) {
    const { datatype, arraysize } = paramType(m.value);
    const value = typeof m.value === 'number' ? numberText(m.value) : m.value;
    out.push(`      <PARAM${idAttr(m.key)} name="${esc(m.key)}" datatype="${datatype}"${arraysize}${m.unit ? ` unit="${esc(m.unit)}"` : ''} value="${esc(value)}"${
      m.description ? `>\n        <DESCRIPTION>${esc(m.description)}</DESCRIPTION>\n      </PARAM>` : '/>'}`);
  }
  table.columns.forEach((col, j) => {
    const datatype = fieldDatatype(col, rows.some((r) => typeof r[j] === 'string' && NON_ASCII.test(r[j] as string)));
    const id = idAttr(col.name);
    const attrs = `${id ? `${id.trimStart()} ` : ''}name="${esc(col.name)}" datatype="${datatype}"${col.datatype === 'string' ? ' arraysize="*"' : ''}`
      + `${col.unit ? ` unit="${esc(col.unit)}"` : ''}${col.ucd ? ` ucd="${esc(col.ucd)}"` : ''}`;
    out.push(col.description
      ? `      <FIELD ${attrs}>\n        <DESCRIPTION>${esc(col.description)}</DESCRIPTION>\n      </FIELD>`
      : `      <FIELD ${attrs}/>`);
  });
  out.push('      <DATA>', '        <TABLEDATA>');
  for (const r of rows) out.push(`          <TR>${r.map((c) => `<TD>${cellText(c, esc)}</TD>`).join('')}</TR>`);
  out.push('        </TABLEDATA>', '      </DATA>', '    </TABLE>', '  </RESOURCE>');
  const info = counter.substituted > 0
    ? [`  <INFO name="substitutedCharacters" value="${counter.substituted}">${counter.substituted} control character(s) that XML 1.0 cannot hold were replaced by visible symbols (U+2400 block or U+FFFD)</INFO>`]
    : [];
  return [
    '<?xml version="1.0" encoding="UTF-8"?>',
    '<VOTABLE version="1.4" xmlns="http://www.ivoa.net/xml/VOTable/v1.3" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance"'
      + ' xsi:schemaLocation="http://www.ivoa.net/xml/VOTable/v1.3 http://www.ivoa.net/xml/VOTable/v1.4">',
    ...info,
    ...out,
    '</VOTABLE>',
    '',
  ].join('\n');
}

function fieldDatatype(col: OutputColumn, nonAscii: boolean): string {
  switch (col.datatype) {
    case 'float64': return 'double';
    case 'int32': return 'int';
    case 'bool': return 'boolean';
    case 'string': return nonAscii ? 'unicodeChar' : 'char';
  }
}

function paramType(value: string | number): { datatype: string; arraysize: string } {
  if (typeof value === 'string') return { datatype: NON_ASCII.test(value) ? 'unicodeChar' : 'char', arraysize: ' arraysize="*"' };
  if (Number.isInteger(value) && !Object.is(value, -0) && Math.abs(value) <= 2147483647) return { datatype: 'int', arraysize: '' };
  if (Number.isSafeInteger(value) && !Object.is(value, -0)) return { datatype: 'long', arraysize: '' };
  return { datatype: 'double', arraysize: '' };
}

/** A real as VOTable text: shortest round-trip digits; NaN, +Inf, -Inf; -0 kept. */
function numberText(x: number): string {
  if (Number.isNaN(x)) return 'NaN';
  if (x === Infinity) return '+Inf';
  if (x === -Infinity) return '-Inf';
  return Object.is(x, -0) ? '-0' : String(x);
}

function cellText(c: Cell, esc: (s: string) => string): string {
  if (c === null) return '';
  if (typeof c === 'number') return Number.isNaN(c) ? '' : numberText(c);
  if (typeof c === 'boolean') return c ? 'T' : 'F';
  return esc(c);
}
