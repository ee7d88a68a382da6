/** Base64 (RFC 4648, standard alphabet with '=' padding) to bytes and back; whitespace in the input is ignored. */

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
const LOOKUP = new Int16Array(256).fill(-1);
for (let i = 0; i < ALPHABET.length; i++) LOOKUP[ALPHABET.charCodeAt(i)] = i;

/** Decode base64 text; returns null when it holds a character outside the alphabet (position in `badAt`). */
export function decodeBase64(text: string): { bytes: Uint8Array } | { badAt: number } {
  const d = new Base64Decoder();
  const bytes = d.push(text);
  return d.badAt >= 0 ? { badAt: d.badAt } : { bytes };
}

/**
 * Base64 decoded a piece of text at a time (a STREAM read in chunks), with the same result as `decodeBase64` on the
 * whole text: whitespace skipped, '=' ends the data, and the first character outside the alphabet stops decoding
 * with its 0-based position in all the text pushed in `badAt`.
 */
export class Base64Decoder {
  /** Position of the first character outside the alphabet, -1 while there is none. */
  badAt = -1;
  private acc = 0;
  private bits = 0;
  private ended = false;
  private position = 0;

  /** The bytes completed by this piece of text (a quad split between pieces is finished by the next one). */
  push(text: string): Uint8Array {
    const out = new Uint8Array(Math.floor(((text.length + 3) * 3) / 4) + 3);
    let n = 0;
    const from = this.position;
    this.position += text.length;
    if (this.ended) return out.subarray(0, 0);
    let acc = this.acc;
    let bits = this.bits;
    for (let i = 0; i < text.length; i++) {
      const c = text.charCodeAt(i);
      if (c === 0x3d) { this.ended = true; break; } // '=' padding ends the data
      if (c === 0x20 || c === 0x0a || c === 0x0d || c === 0x09) continue;
      const v = c < 256 ? LOOKUP[c] : -1;
      if (v < 0) {
        this.badAt = from + i;
        this.ended = true;
        break;
      }
      acc = ((acc << 6) | v) & 0xffffff;
      bits += 6;
      if (bits >= 8) {
        bits -= 8;
        out[n++] = (acc >> bits) & 0xff;
      }
    }
    this.acc = acc;
    this.bits = bits;
    return out.subarray(0, n);
  }
}

/** Encode bytes as base64 text with padding, in lines of 76 characters. */
export function encodeBase64(bytes: Uint8Array): string {
  const parts: string[] = [];
  let line = '';
  for (let i = 0; i < bytes.length; i += 3) {
    const b0 = bytes[i], b1 = bytes[i + 1] ?? 0, b2 = bytes[i + 2] ?? 0;
    line += ALPHABET[b0 >> 2] + ALPHABET[((b0 & 3) << 4) | (b1 >> 4)]
      + (i + 1 < bytes.length ? ALPHABET[((b1 & 15) << 2) | (b2 >> 6)] : '=')
      + (i + 2 < bytes.length ? ALPHABET[b2 & 63] : '=');
    if (line.length >= 76) { parts.push(line); line = ''; }
  }
  if (line) parts.push(line);
  return parts.join('\n');
}
