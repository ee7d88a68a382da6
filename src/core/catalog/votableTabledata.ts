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

/** Thrown inside the scanner when a row goes on past the text pushed so far (the row is read again with more text). */
const NEED_MORE = Symbol('need more text');

/**
 * Visits each TR of the TABLEDATA content with its TD texts (entities decoded, CDATA kept as written) and its 1-based
 * row number. The content is fed a piece at a time (`push`, then `finish`): each row is visited once all of it has
 * arrived, so a piece may end anywhere (inside a tag, a TD, an entity, a CDATA section or a comment) and the rows,
 * cells and errors are those of the whole content in one piece. `lineOf(offset)` turns an offset in the whole
 * content into a file line for error messages.
 */
export class TabledataScanner {
  /** Content not yet consumed (it starts at a row boundary or inside the row being read). */
  private content = '';
  /** Offset in the whole content of `content[0]`. */
  private base = 0;
  private row = 0;
  private final = false;

  constructor(
    private readonly visit: (cells: string[], row: number) => void,
    private readonly lineOf: (offset: number) => number,
  ) {}

  /** Scan the rows that the content pushed so far completes. */
  push(text: string): void {
    this.content = this.content.length === 0 ? text : this.content + text;
    this.scan();
  }

  /** Scan what is left: a row that is not closed is now an error. */
  finish(): void {
    this.final = true;
    this.scan();
  }

  private scan(): void {
    const content = this.content;
    const final = this.final;
    const n = content.length;
    const fail = (offset: number, what: string): never => {
      throw new InputError([{ where: `VOTable TABLEDATA, line ${this.lineOf(this.base + offset)}`, what, fix: 'repair or re-export the file' }]);
    };
    /** Fail, or ask for more text when the content pushed so far ends before `end` (a later piece may complete it). */
    const failOrMore = (end: number, offset: number, what: string): never => {
      if (!final && end > n) throw NEED_MORE;
      return fail(offset, what);
    };
    let pos = 0;
    // The tags most rows are made of, read without scanning for '>' (what readTag gives for them).
    const OPEN_TR = { name: 'TR', closing: false, selfClosing: false, end: 0 };
    const OPEN_TD = { name: 'TD', closing: false, selfClosing: false, end: 0 };
    const CLOSE_TR = { name: 'TR', closing: true, selfClosing: false, end: 0 };
    const CLOSE_TD = { name: 'TD', closing: true, selfClosing: false, end: 0 };
    /** Read the tag at `lt` (content[lt] === '<'): local name, closing or self-closing, and the offset after '>'. */
    const readTag = (lt: number) => {
      if (content.charCodeAt(lt + 1) === 0x2f) {
        if (content.startsWith('</TD>', lt)) { CLOSE_TD.end = lt + 5; return CLOSE_TD; }
        if (content.startsWith('</TR>', lt)) { CLOSE_TR.end = lt + 5; return CLOSE_TR; }
      } else {
        if (content.startsWith('<TD>', lt)) { OPEN_TD.end = lt + 4; return OPEN_TD; }
        if (content.startsWith('<TR>', lt)) { OPEN_TR.end = lt + 4; return OPEN_TR; }
      }
      return readAnyTag(lt);
    };
    const readAnyTag = (lt: number) => {
      const gt = content.indexOf('>', lt);
      if (gt < 0) failOrMore(Infinity, lt, 'a tag is not closed with >');
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
          if (c !== 0x20 && c !== 0x0a && c !== 0x0d && c !== 0x09) failOrMore(p + 20, p, `unexpected text '${content.slice(p, p + 20)}' between rows or cells`);
          p++;
        }
        if (!final && p < n && p + 4 > n) throw NEED_MORE; // '<!--' may be split
        if (content.startsWith('<!--', p)) {
          const e = content.indexOf('-->', p + 4);
          if (e < 0) failOrMore(Infinity, p, 'a comment is not closed');
          p = e + 3;
          continue;
        }
        return p;
      }
    };

    let rowStart = 0;
    try {
      for (;;) {
        rowStart = pos;
        pos = skip(pos);
        if (pos >= n) { rowStart = pos; break; }
        const tr = readTag(pos);
        if (tr.name !== 'TR' || tr.closing) fail(pos, `expected <TR>, found <${tr.closing ? '/' : ''}${tr.name}>`);
        pos = tr.end;
        const row = this.row + 1;
        const cells: string[] = [];
        if (!tr.selfClosing) {
          for (;;) {
            pos = skip(pos);
            if (pos >= n) failOrMore(Infinity, pos, `row ${row} is not closed with </TR>`);
            const td = readTag(pos);
            if (td.closing && td.name === 'TR') { pos = td.end; break; }
            if (td.name !== 'TD' || td.closing) fail(pos, `expected <TD> or </TR> in row ${row}, found <${td.closing ? '/' : ''}${td.name}>`);
            pos = td.end;
            if (td.selfClosing) { cells.push(''); continue; }
            let text = '';
            for (;;) {
              const lt = content.indexOf('<', pos);
              if (lt < 0) failOrMore(Infinity, pos, `a TD of row ${row} is not closed with </TD>`);
              if (!final && lt + 9 > n) throw NEED_MORE; // '<![CDATA[' or '<!--' may be split
              const segment = content.slice(pos, lt);
              // XML end-of-line handling: literal CR LF and CR read as LF (escaped &#13; is kept)
              text += decodeXmlEntities(segment.indexOf('\r') >= 0 ? segment.replace(/\r\n?/g, '\n') : segment);
              if (content.startsWith('<![CDATA[', lt)) {
                const e = content.indexOf(']]>', lt + 9);
                if (e < 0) failOrMore(Infinity, lt, 'a CDATA section is not closed');
                text += content.slice(lt + 9, e);
                pos = e + 3;
              } else if (content.startsWith('<!--', lt)) {
                const e = content.indexOf('-->', lt + 4);
                if (e < 0) failOrMore(Infinity, lt, 'a comment is not closed');
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
        this.row = row;
        this.visit(cells, row);
      }
    } catch (e) {
      if (e !== NEED_MORE) throw e;
    }
    // Keep the row being read (or the whitespace after the last row) for the next piece.
    this.content = rowStart >= n ? '' : content.slice(rowStart);
    this.base += rowStart;
  }
}
