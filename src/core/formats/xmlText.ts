/**
 * XML 1.0 text and attribute escaping for the project's XML writers. & < > " ' become entities; tab, LF, CR and
 * the C1/DEL controls become numeric references (so parsers keep them exactly). Characters XML 1.0 cannot hold at
 * all (C0 controls other than tab/LF/CR, U+FFFE, U+FFFF, lone surrogates) are replaced by a visible substitute
 * (U+2400 + code for C0, U+FFFD otherwise) and counted, so the writer can say so in the file.
 */

const NEEDS_ESCAPE = /[&<>"'\u0000-\u001f\u007f-\u009f\ud800-\udfff\ufffe\uffff]/;

/** Escape `text` for an XML attribute value or element content; `substituted` counts characters XML cannot carry. */
export function escapeXml(text: string, counter?: { substituted: number }): string {
  if (!NEEDS_ESCAPE.test(text)) return text;
  return text.replace(/[&<>"'\u0000-\u001f\u007f-\u009f\ufffe\uffff]|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g, (ch) => {
    switch (ch) {
      case '&': return '&amp;';
      case '<': return '&lt;';
      case '>': return '&gt;';
      case '"': return '&quot;';
      case "'": return '&apos;';
      case '\t': return '&#9;';
      case '\n': return '&#10;';
      case '\r': return '&#13;';
    }
    const code = ch.charCodeAt(0);
    if (code >= 0x7f && code <= 0x9f) return `&#x${code.toString(16).toUpperCase()};`;
    if (counter) counter.substituted++;
    return code < 0x20 ? String.fromCharCode(0x2400 + code) : '\ufffd';
  });
}
