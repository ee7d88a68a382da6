/**
 * A CSV quote that is never closed: reported on the line where it opens (lines counted by hand below, header = line 1),
 * and every line it swallowed listed and counted as a row not used, whole-text and streamed in small chunks alike,
 * with LF, CRLF and no final line end.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readCatalog } from '../../src/core/catalog/read';
import { readCatalogFile } from '../../src/cli/readCatalogFile';

const ROWS = ['id,ra,dec,mag,note', 'a,1,1,20,ok', 'b,2,2,20,"quoted, fine"', 'c,3,3,20,"opens here', 'd,4,4,20,ok', 'e,5,5,20,ok', 'f,6,6,20,ok'];
// File lines: 1 header, 2 a, 3 b, 4 c (the quote opens), 5 d, 6 e, 7 f.

describe('an unclosed quote', () => {
  const dir = mkdtempSync(join(tmpdir(), 'haloweave-quote-'));
  it.each([
    ['LF', ROWS.join('\n') + '\n'],
    ['no final line end', ROWS.join('\n')],
    ['CRLF', ROWS.join('\r\n') + '\r\n'],
  ])('%s: the opening line named, the swallowed lines listed and counted', (name, text) => {
    const results = [readCatalog(text, 'q.csv')];
    const path = join(dir, `${name.replace(/ /g, '-')}.csv`);
    writeFileSync(path, text);
    for (const chunkBytes of [7, 16, 1 << 16]) results.push(readCatalogFile(path, undefined, { chunkBytes, source: 'q.csv' }));
    for (const r of results) {
      expect(r.rowsRead).toBe(6);
      expect(r.targets.map((t) => t.id)).toEqual(['a', 'b']);
      expect(r.rejects.map((x) => x.line)).toEqual([4, 5, 6, 7]);
      expect(r.rejects[0].reason).toMatch(/^a quoted field opens on this line and is never closed; the 3 lines after it \(to line 7\)/);
      expect(r.rejects[1].reason).toBe('swallowed by the quoted field opened on line 4 and never closed');
    }
  });

  it('on the last line: nothing swallowed, the line itself named', () => {
    const r = readCatalog([...ROWS.slice(0, 3), 'c,3,3,20,"opens'].join('\n') + '\n', 'q.csv');
    expect(r.rejects.map((x) => [x.line, x.reason.slice(0, 55)])).toEqual([[4, 'a quoted field opens on this line and is never closed; ']]);
    expect(r.rowsRead).toBe(3);
  });
});
