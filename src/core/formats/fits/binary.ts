/**
 * Big-endian binary elements shared by FITS binary tables, FITS images and VOTable BINARY/BINARY2 streams
 * (both formats store numbers big-endian, two's complement integers and IEEE 754 reals).
 */

/** Element types by their FITS TFORM letter (VOTable uses the same storage for the matching datatypes). */
export type ElementCode = 'L' | 'X' | 'B' | 'I' | 'J' | 'K' | 'A' | 'E' | 'D' | 'C' | 'M' | 'P' | 'Q';

/** Bytes per element of each code (X counts bits: see `fieldBytes`). */
export const ELEMENT_BYTES: Record<ElementCode, number> = {
  L: 1, X: 1, B: 1, I: 2, J: 4, K: 8, A: 1, E: 4, D: 8, C: 8, M: 16, P: 8, Q: 16,
};

/** A parsed TFORMn value `rTa`: repeat count, element code, and for P/Q the element code of the heap array. */
export interface TForm {
  repeat: number;
  code: ElementCode;
  /** For variable-length arrays (P, Q): the code of the array elements in the heap. */
  heapCode?: ElementCode;
  /** Bytes this field takes in a row. */
  bytes: number;
}

/** Bytes a field of `repeat` elements of `code` takes in a row (bits of X rounded up to bytes). */
export function fieldBytes(code: ElementCode, repeat: number): number {
  return code === 'X' ? Math.ceil(repeat / 8) : ELEMENT_BYTES[code] * repeat;
}

/** Parse a TFORMn value such as `1D`, `12A`, `J`, `1PE(30)`; null when it is not a valid binary-table form. */
export function parseTform(text: string): TForm | null {
  const m = /^\s*(\d*)([LXBIJKAEDCMPQ])([LXBIJKAEDCM])?(\(\d+\))?.*$/.exec(text);
  if (!m) return null;
  const repeat = m[1] === '' ? 1 : Number(m[1]);
  const code = m[2] as ElementCode;
  if ((code === 'P' || code === 'Q') !== (m[3] !== undefined)) return null;
  return { repeat, code, heapCode: m[3] as ElementCode | undefined, bytes: fieldBytes(code, repeat) };
}

/** Read one signed 64-bit big-endian integer as a bigint. */
export function readInt64(view: DataView, offset: number): bigint {
  return view.getBigInt64(offset, false);
}

/**
 * Read one numeric element (B unsigned 8-bit, I 16-bit, J 32-bit, E float32, D float64) big-endian as a number.
 * K (64-bit) goes through `readInt64`, complex types through `readNumeric` twice.
 */
export function readNumeric(view: DataView, offset: number, code: 'B' | 'I' | 'J' | 'E' | 'D'): number {
  switch (code) {
    case 'B': return view.getUint8(offset);
    case 'I': return view.getInt16(offset, false);
    case 'J': return view.getInt32(offset, false);
    case 'E': return view.getFloat32(offset, false);
    case 'D': return view.getFloat64(offset, false);
  }
}

/** Write one numeric element big-endian (B, I, J, E, D). */
export function writeNumeric(view: DataView, offset: number, code: 'B' | 'I' | 'J' | 'E' | 'D', value: number): void {
  switch (code) {
    case 'B': view.setUint8(offset, value); break;
    case 'I': view.setInt16(offset, value, false); break;
    case 'J': view.setInt32(offset, value, false); break;
    case 'E': view.setFloat32(offset, value, false); break;
    case 'D': view.setFloat64(offset, value, false); break;
  }
}

/** A 64-bit integer as a Cell-friendly value: a number when exact (|n| <= 2^53 - 1), else its decimal text. */
export function int64ToCell(n: bigint): number | string {
  return n >= BigInt(Number.MIN_SAFE_INTEGER) && n <= BigInt(Number.MAX_SAFE_INTEGER) ? Number(n) : n.toString();
}

const utf8Strict = new TextDecoder('utf-8', { fatal: true });

/**
 * Text of a byte field: cut at the first NUL, then decoded as UTF-8 (FITS and VOTable char are ASCII, which
 * is a subset); bytes that are not valid UTF-8 are decoded as Latin-1 so no byte is lost.
 */
export function decodeTextBytes(bytes: Uint8Array): string {
  let end = bytes.indexOf(0);
  if (end < 0) end = bytes.length;
  const b = bytes.subarray(0, end);
  let ascii = true;
  for (let i = 0; i < b.length; i++) if (b[i] > 0x7e || b[i] < 0x20) { ascii = false; break; }
  if (ascii) return String.fromCharCode(...b);
  try {
    return utf8Strict.decode(b);
  } catch {
    let s = '';
    for (let i = 0; i < b.length; i++) s += String.fromCharCode(b[i]);
    return s;
  }
}
