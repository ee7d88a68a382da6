/**
 * The one text decoder of the project, for the command line and the editor alike: UTF-16 (LE or BE) or UTF-8 when
 * the bytes start with that byte-order mark; else UTF-8 when every byte sequence is valid UTF-8; else Latin-1 (read
 * as the WHATWG "latin1" label, i.e. windows-1252, which spreadsheets on Windows write), so an accented id is read
 * as written and never mangled or rejected. The byte-order mark is not part of the text.
 */

export type TextEncodingName = 'utf-8' | 'utf-16le' | 'utf-16be' | 'latin1';

/** The encoding a byte-order mark names, or null without one. */
export function bomEncoding(bytes: Uint8Array): 'utf-8' | 'utf-16le' | 'utf-16be' | null {
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) return 'utf-16le';
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) return 'utf-16be';
  if (bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) return 'utf-8';
  return null;
}

/** True when the bytes are valid UTF-8 throughout. */
export function isValidUtf8(bytes: Uint8Array): boolean {
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    return true;
  } catch {
    return false;
  }
}

/** The encoding of a whole text file's bytes (see the module comment for the rule). */
export function detectTextEncoding(bytes: Uint8Array): TextEncodingName {
  return bomEncoding(bytes) ?? (isValidUtf8(bytes) ? 'utf-8' : 'latin1');
}

/** Decode a whole text file's bytes by the shared rule; the encoding used is returned with the text. */
export function decodeText(bytes: Uint8Array): { text: string; encoding: TextEncodingName } {
  const encoding = detectTextEncoding(bytes);
  // TextDecoder drops a byte-order mark of its own encoding.
  return { text: new TextDecoder(encoding).decode(bytes), encoding };
}
