/**
 * A VOTable document split for streaming: the XML around the bulk row data (the content of every TABLEDATA and
 * STREAM element) is kept as text to be checked and parsed, while the bulk content is only located (its character
 * span in the document) and read again, a piece at a time, when the rows are visited. The document is read once for
 * the split, from a TextSource (a file read in chunks, or a string held in memory).
 */
import type { TextSource } from './csvReader';

/** Where the content of one TABLEDATA or STREAM element lies: characters [start, end) and the file line of `start`. */
export interface BulkSpan {
  start: number;
  end: number;
  line: number;
}

/** The document without its bulk content, for the XML validator and the parser, and where that content lies. */
export interface VoTableSkeleton {
  /** The document with each bulk content reduced to its newlines (the validator's line numbers are the file's). */
  validatorText: string;
  /** The document with each bulk content replaced by its index in `spans` (how the parsed tree finds it). */
  parserText: string;
  spans: BulkSpan[];
}

const BULK_OPEN = /<((?:[A-Za-z_][\w.-]*:)?(?:TABLEDATA|STREAM))\b[^>]*>/g;

/** Number of '\n' in text[from, to). */
function newlinesIn(text: string, from = 0, to = text.length): number {
  let k = 0;
  for (let i = text.indexOf('\n', from); i >= 0 && i < to; i = text.indexOf('\n', i + 1)) k++;
  return k;
}

/**
 * Split a VOTable document read from `source`: a bulk element's content runs from the end of its opening tag to the
 * first `</NAME` after it. A bulk element that is never closed keeps its content in both texts (the validator
 * reports it).
 */
export function splitVoTable(source: TextSource): VoTableSkeleton {
  const validatorParts: string[] = [];
  const parserParts: string[] = [];
  const spans: BulkSpan[] = [];
  let lines = 1; // file line at the end of the text emitted so far
  const emit = (t: string) => {
    validatorParts.push(t);
    parserParts.push(t);
    lines += newlinesIn(t);
  };
  let pending = ''; // text not yet emitted or skipped; it starts at document offset `pendingAt`
  let pendingAt = 0;
  let close: string | null = null; // the closing tag sought while inside bulk content
  let open: BulkSpan | null = null;
  let contentNewlines = 0;

  const step = (final: boolean) => {
    for (;;) {
      if (close === null) {
        BULK_OPEN.lastIndex = 0;
        let m: RegExpExecArray | null;
        while ((m = BULK_OPEN.exec(pending)) && m[0].endsWith('/>'));
        if (m) {
          const bodyStart = m.index + m[0].length;
          emit(pending.slice(0, bodyStart));
          open = { start: pendingAt + bodyStart, end: -1, line: lines };
          close = `</${m[1]}`;
          contentNewlines = 0;
          pending = pending.slice(bodyStart);
          pendingAt += bodyStart;
          continue;
        }
        // Keep a tag that may be a bulk opening tag completed by the next piece: from the first '<' after the last '>'.
        const gt = pending.lastIndexOf('>');
        const lt = final ? -1 : pending.indexOf('<', gt + 1);
        const keep = lt < 0 ? pending.length : lt;
        emit(pending.slice(0, keep));
        pending = pending.slice(keep);
        pendingAt += keep;
        return;
      }
      const at = pending.indexOf(close);
      if (at >= 0) {
        contentNewlines += newlinesIn(pending, 0, at);
        open!.end = pendingAt + at;
        spans.push(open!);
        validatorParts.push('\n'.repeat(contentNewlines));
        parserParts.push(String(spans.length - 1));
        lines += contentNewlines;
        pending = pending.slice(at);
        pendingAt += at;
        close = null;
        open = null;
        continue;
      }
      // Not closed yet: the content seen so far is skipped, except a tail that may begin the closing tag.
      const keep = final ? pending.length : Math.max(0, pending.length - close.length + 1);
      contentNewlines += newlinesIn(pending, 0, keep);
      pending = pending.slice(keep);
      pendingAt += keep;
      return;
    }
  };
  source((chunk) => {
    pending = pending.length === 0 ? chunk : pending + chunk;
    step(false);
    return true;
  });
  step(true);
  if (open !== null) {
    // Never closed: the document from the bulk content on is given to the validator as it is.
    const rest = sliceOf(source, (open as BulkSpan).start, Infinity);
    validatorParts.push(rest);
    parserParts.push(rest);
  }
  return { validatorText: validatorParts.join(''), parserText: parserParts.join(''), spans };
}

/** Call `onPiece` with the text of characters [start, end) of the document, a chunk's worth at a time. */
export function forEachPieceOf(source: TextSource, start: number, end: number, onPiece: (text: string) => void): void {
  let at = 0;
  source((chunk) => {
    const from = Math.max(start - at, 0);
    const to = Math.min(end - at, chunk.length);
    if (from < to) onPiece(from === 0 && to === chunk.length ? chunk : chunk.slice(from, to));
    at += chunk.length;
    return at < end;
  });
}

/** Characters [start, end) of the document as one string. */
export function sliceOf(source: TextSource, start: number, end: number): string {
  const parts: string[] = [];
  forEachPieceOf(source, start, end, (t) => parts.push(t));
  return parts.join('');
}

/** The file line of character `offset` of a bulk span's content (for error messages: reads the span again). */
export function lineInSpan(source: TextSource, span: BulkSpan, offset: number): number {
  let line = span.line;
  forEachPieceOf(source, span.start, Math.min(span.end, span.start + offset), (t) => { line += newlinesIn(t); });
  return line;
}

/** The source with a leading byte-order mark character removed from its first chunk. */
export function withoutLeadingBom(source: TextSource): TextSource {
  return (onChunk) => {
    let first = true;
    source((chunk) => {
      if (first) {
        first = false;
        if (chunk.charCodeAt(0) === 0xfeff) chunk = chunk.slice(1);
      }
      return onChunk(chunk);
    });
  };
}
