/**
 * One decoder for the editor and the command line: the same bytes of a catalog (Latin-1, UTF-16 LE/BE with a byte-order
 * mark, UTF-8 with and without one) give the same targets through the editor's path (whole bytes decoded, then read)
 * and through the command line's streaming file reader, with accented ids read as written.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { decodeText } from '../../src/core/catalog/textDecoding';
import { readCatalog } from '../../src/core/catalog/read';
import { readCatalogFile } from '../../src/cli/readCatalogFile';

const TEXT = 'id,ra,dec,mag,note\ngc-é01,10.5,-5.25,21.3,côté nord\ngc-ü02,10.6,-5.3,21.9,plain\nstar-ø,10.55,-5.28,18.1,\n';

function utf16be(s: string): Uint8Array {
  const le = Buffer.from(s, 'utf16le');
  for (let i = 0; i + 1 < le.length; i += 2) [le[i], le[i + 1]] = [le[i + 1], le[i]];
  return le;
}

const ENCODINGS: [string, Uint8Array, string][] = [
  // Buffer's 'latin1' writes each character below U+0100 as one byte (ISO-8859-1), independently of our decoder.
  ['Latin-1', Buffer.from(TEXT, 'latin1'), 'latin1'],
  ['UTF-16LE with BOM', Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(TEXT, 'utf16le')]), 'utf-16le'],
  ['UTF-16BE with BOM', Buffer.concat([Buffer.from([0xfe, 0xff]), utf16be(TEXT)]), 'utf-16be'],
  ['UTF-8 with BOM', Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(TEXT, 'utf8')]), 'utf-8'],
  ['UTF-8', Buffer.from(TEXT, 'utf8'), 'utf-8'],
];

describe('the shared text decoder', () => {
  const dir = mkdtempSync(join(tmpdir(), 'haloweave-decode-'));
  it.each(ENCODINGS)('%s: same text, same targets in the editor and on the command line', (name, bytes, encoding) => {
    const decoded = decodeText(bytes);
    expect(decoded.encoding).toBe(encoding);
    expect(decoded.text).toBe(TEXT);
    const editor = readCatalog(decoded.text, 'cat.csv');
    const path = join(dir, `${name.replace(/\W+/g, '-')}.csv`);
    writeFileSync(path, bytes);
    for (const chunkBytes of [5, 64, 1 << 16]) {
      const cli = readCatalogFile(path, undefined, { chunkBytes, source: 'cat.csv' });
      expect(cli.targets).toEqual(editor.targets);
      expect(cli.rejects).toEqual([]);
    }
    expect(editor.targets.map((t) => t.id)).toEqual(['gc-é01', 'gc-ü02', 'star-ø']);
    expect(editor.targets[0].extra.note).toBe('côté nord');
  });

  it('a Latin-1 byte late in a long file still makes the whole file Latin-1 on the command line', () => {
    const rows = Array.from({ length: 5000 }, (_, i) => `gc${i},10.5,-5.25,21.3,plain`);
    rows.push('gc-é,10.5,-5.25,21.3,late');
    const bytes = Buffer.from(`id,ra,dec,mag,note\n${rows.join('\n')}\n`, 'latin1');
    const path = join(dir, 'late.csv');
    writeFileSync(path, bytes);
    const cli = readCatalogFile(path, undefined, { chunkBytes: 4096, source: 'late.csv' });
    expect(cli.targets.at(-1)!.id).toBe('gc-é');
    expect(cli.targets).toEqual(readCatalog(decodeText(bytes).text, 'late.csv').targets);
  });
});
