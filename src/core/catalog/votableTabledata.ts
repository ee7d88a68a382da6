/**
 * Scanner of the raw content of a VOTable TABLEDATA element (TR rows of TD cells; namespace prefixes, empty
 * `<TD/>`, CDATA sections, comments and XML character references handled). The XML around it is parsed by
 * fast-xml-parser; this content is scanned here because a generic XML object tree costs far more for large tables.
 */
import { InputError } from '../result';

/** Decode the five XML entities and numeric character references of a text segment (others are kept as written). */
export function decodeXmlEntities(text: string): string {
  if (text.indexOf('&') < 0) return text;
  return text.replace(/&(lt|gt|amp|quot|apos|#\d+|#x[0-9A-Fa-f]+);/g, (m, e: string) => {
    switch (e) {
      case 'lt': return '<';
      case 'gt': return '>';
      case 'amp': return '&';
      case 'quot': return '"';
      case 'apos': return "'";
    }
    const code = e[1] === 'x' ? parseInt(e.slice(2), 16) : parseInt(e.slice(1), 10);
    return code <= 0x10ffff ? String.fromCodePoint(code) : m;
  });
}

/**
 * Visit each TR of the TABLEDATA content with its TD texts (entities decoded, CDATA kept as written) and its
 * 1-based row number. `lineOf(offset)` turns an offset in `content` into a file line for error messages.
 */
export function scanTabledata(content: string, visit: (cells: string[], row: number) => void, lineOf: (offset: number) => number): void {
  const fail = (offset: number, what: string): never => {
    throw new InputError([{ where: `VOTable TABLEDATA, line ${lineOf(offset)}`, what, fix: 'repair or re-export the file' }]);
  };
  let pos = 0;
  let row = 0;
  const n = content.length;
  /** Read the tag at `lt` (content[lt] === '<'): local name, closing or self-closing, and the offset after '>'. */
  const readTag = (lt: number) => {
    const gt = content.indexOf('>', lt);
    if (gt < 0) fail(lt, 'a tag is not closed with >');
    const closing = content.charCodeAt(lt + 1) === 0x2f;
    const selfClosing = content.charCodeAt(gt - 1) === 0x2f;
    let i = lt + (closing ? 2 : 1);
    let j = i;
    while (j < gt) {
      const c = content.charCodeAt(j);
      if (c === 0x20 || c === 0x0a || c === 0x0d || c === 0x09 || c === 0x2f) break;
      j++;
    }
    const qname = content.slice(i, j);
    const colon = qname.indexOf(':');
    i = gt + 1;
    return { name: colon >= 0 ? qname.slice(colon + 1) : qname, closing, selfClosing, end: i };
  };
  /** Skip whitespace and comments; returns the offset of the next '<' or n. */
  const skip = (from: number) => {
    let p = from;
    for (;;) {
      while (p < n && content.charCodeAt(p) !== 0x3c) {
        const c = content.charCodeAt(p);
        if (c !== 0x20 && c !== 0x0a && c !== 0x0d && c !== 0x09) fail(p, `unexpected text '${content.slice(p, p + 20)}' between rows or cells`);
        p++;
      }
      if (content.startsWith('<!--', p)) {
        const e = content.indexOf('-->', p + 4);
        if (e < 0) fail(p, 'a comment is not closed');
        p = e + 3;
        continue;
      }
      return p;
    }
  };

  for (;;) {
    pos = skip(pos);
    if (pos >= n) return;
    const tr = readTag(pos);
    if (tr.name !== 'TR' || tr.closing) fail(pos, `expected <TR>, found <${tr.closing ? '/' : ''}${tr.name}>`);
    pos = tr.end;
    row++;
    const cells: string[] = [];
    if (!tr.selfClosing) {
      for (;;) {
        pos = skip(pos);
        if (pos >= n) fail(pos, `row ${row} is not closed with </TR>`);
        const td = readTag(pos);
        if (td.closing && td.name === 'TR') { pos = td.end; break; }
        if (td.name !== 'TD' || td.closing) fail(pos, `expected <TD> or </TR> in row ${row}, found <${td.closing ? '/' : ''}${td.name}>`);
        pos = td.end;
        if (td.selfClosing) { cells.push(''); continue; }
        let text = '';
        for (;;) {
          const lt = content.indexOf('<', pos);
          if (lt < 0) fail(pos, `a TD of row ${row} is not closed with </TD>`);
          const segment = content.slice(pos, lt);
          // XML end-of-line handling: literal CR LF and CR read as LF (escaped &#13; is kept)
          text += decodeXmlEntities(segment.indexOf('\r') >= 0 ? segment.replace(/\r\n?/g, '\n') : segment);
          if (content.startsWith('<![CDATA[', lt)) {
            const e = content.indexOf(']]>', lt + 9);
            if (e < 0) fail(lt, 'a CDATA section is not closed');
            text += content.slice(lt + 9, e);
            pos = e + 3;
          } else if (content.startsWith('<!--', lt)) {
            const e = content.indexOf('-->', lt + 4);
            if (e < 0) fail(lt, 'a comment is not closed');
            pos = e + 3;
          } else {
            const close = readTag(lt);
            if (!close.closing || close.name !== 'TD') fail(lt, `expected </TD> in row ${row}, found <${close.closing ? '/' : ''}${close.name}>`);
            pos = close.end;
            break;
          }
        }
        cells.push(text);
      }
    }
    visit(cells, row);
  }
}
