/**
 * Random access to the bytes of a file or of a buffer, so the FITS readers work the same on a whole file held in
 * memory (the editor's ArrayBuffer) and on a file read a block at a time (the command line, src/cli/fileByteSource.ts).
 */

/** Bytes read by offset; what `read` returns is valid until the next call (a file source reuses its buffer). */
export interface ByteSource {
  /** Total number of bytes. */
  readonly length: number;
  /** Bytes wanted per read when a reader can choose (a block of table rows). */
  readonly chunkBytes: number;
  /** The whole content when it is held in memory (then `read` returns views of it, never copies). */
  readonly whole?: Uint8Array;
  /** The bytes [offset, offset + length), cut at the end of the source (0-based byte offset). */
  read(offset: number, length: number): Uint8Array;
}

/** A ByteSource over bytes held in memory: reads are views of `bytes`. */
export function bytesSource(bytes: Uint8Array): ByteSource {
  return {
    length: bytes.length,
    chunkBytes: Math.max(1, bytes.length),
    whole: bytes,
    read: (offset, length) => bytes.subarray(offset, offset + length),
  };
}
