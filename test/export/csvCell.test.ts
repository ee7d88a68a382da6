import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { awkwardText } from './arbitraries';
import { csvCell, unneutraliseCell } from '../../src/core/export/csvText';
import { parseCsvRecords } from '../../src/core/catalog/csvReader';

/**
 * RFC 4180 (common practice for CSV): a field holding a comma, a double quote or a line end is enclosed in double
 * quotes, and a double quote inside it is doubled. The rules written out here, one pattern each, as the spreadsheet
 * guidance on formula injection states them (cells starting = + - @ tab or CR get a leading apostrophe).
 */
function byTheRules(s: string, neutralise: boolean, commentStart: boolean): string {
  if (neutralise && /^[=+\-@\t\r']/.test(s)) s = `'${s}`;
  const quote = /[",\r\n]/.test(s) || /^\s|\s$/.test(s) || (commentStart && s.startsWith('#'));
  return quote ? `"${s.replace(/"/g, '""')}"` : s;
}

describe('csvCell', () => {
  it('writes every text cell as the quoting and neutralising rules say, plain text unchanged', () => {
    const text = fc.oneof(awkwardText(), fc.string(), fc.stringMatching(/^[A-Za-z0-9_. :;#'=+@-]{0,12}$/));
    fc.assert(
      fc.property(text, fc.boolean(), fc.boolean(), (s, neutralise, commentStart) => {
        const cell = csvCell(s, { neutraliseFormulas: neutralise, quoteCommentStart: commentStart });
        expect(cell).toBe(byTheRules(s, neutralise, commentStart));
      }),
      { numRuns: 3000 },
    );
  });

  it('reads back as the same text through the catalog reader', () => {
    fc.assert(
      fc.property(fc.oneof(awkwardText(), fc.string()), (s) => {
        const line = `${csvCell('id', { neutraliseFormulas: true })},${csvCell(s, { neutraliseFormulas: true })}\n`;
        const recs = parseCsvRecords(line + line, { delimiter: ',', newline: '\n' });
        expect(unneutraliseCell(recs[1].cells[1])).toBe(s);
      }),
      { numRuns: 1000 },
    );
  });
});
