/** Base64 (RFC 4648, standard alphabet with '=' padding) to bytes and back; whitespace in the input is ignored. */

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
const LOOKUP = new Int16Array(256).fill(-1);
for (let i = 0; i < ALPHABET.length; i++) LOOKUP[ALPHABET.charCodeAt(i)] = i;

/** Decode base64 text; returns null when it holds a character outside the alphabet (position in `badAt`). */
export function decodeBase64(text: string): { bytes: Uint8Array } | { badAt: number } {
  const out = new Uint8Array(Math.floor((text.length * 3) / 4) + 3);
  let n = 0;
  let acc = 0;
  let bits = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 0x3d) break; // '=' padding ends the data
    if (c === 0x20 || c === 0x0a || c === 0x0d || c === 0x09) continue;
    const v = c < 256 ? LOOKUP[c] : -1;
    if (v < 0) return { badAt: i };
    acc = (acc << 6) | v;
    bits += 6;
    if (bits >= 8) {
      bits -= 8;
      out[n++] = (acc >> bits) & 0xff;
    }
  }
  return { bytes: out.subarray(0, n) };
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
