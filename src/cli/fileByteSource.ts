/**
 * A ByteSource (src/core/formats/byteSource.ts) over an open file: each read is a positioned read into one reused
 * buffer, so a FITS table is read a block of rows at a time and the file is never held whole.
 */
import { closeSync, fstatSync, openSync, readSync } from 'node:fs';
import type { ByteSource } from '../core/formats/byteSource';

/** Run `use` with a ByteSource over the file at `path` (reads of up to `chunkBytes` are typical); the file is closed after. */
export function withFileByteSource<T>(path: string, use: (source: ByteSource) => T, chunkBytes = 1 << 20): T {
  const fd = openSync(path, 'r');
  try {
    const length = fstatSync(fd).size;
    let buf = new Uint8Array(Math.max(1, Math.min(chunkBytes, length)));
    const read = (offset: number, wanted: number): Uint8Array => {
      const n = Math.max(0, Math.min(wanted, length - offset));
      if (n > buf.length) buf = new Uint8Array(n);
      let got = 0;
      while (got < n) {
        const k = readSync(fd, buf, got, n - got, offset + got);
        if (k === 0) break; // the file shrank while being read: what is there is returned
        got += k;
      }
      return buf.subarray(0, got);
    };
    return use({ length, chunkBytes, read });
  } finally {
    closeSync(fd);
  }
}
