/**
 * Walking the header-data units (HDUs) of a FITS file (FITS standard 4.0, sections 3 and 4.4.1):
 * data size = |BITPIX|/8 * GCOUNT * (PCOUNT + NAXIS1 * ... * NAXISn), padded to 2880-byte blocks.
 */
import { InputError } from '../../result';
import { FITS_BLOCK_BYTES, type FitsHeader, headerNumber, headerString, headerValue, readHeaderFrom } from './header';
import { type ByteSource, bytesSource } from '../byteSource';

/** One HDU: its header, where its data starts and how many data bytes it holds (before padding). */
export interface FitsHdu {
  /** 0 for the primary HDU, then 1, 2, ... for extensions. */
  index: number;
  /** `PRIMARY`, or the XTENSION value (`IMAGE`, `BINTABLE`, `TABLE`, ...). */
  kind: string;
  header: FitsHeader;
  headerOffset: number;
  dataOffset: number;
  dataBytes: number;
}

/** The NAXISn values of a header, in axis order (NAXIS1 first). */
export function axisLengths(header: FitsHeader, where: string): number[] {
  const naxis = headerNumber(header, 'NAXIS');
  if (naxis === undefined || !Number.isInteger(naxis) || naxis < 0 || naxis > 999) {
    throw new InputError([{ where, what: 'NAXIS is missing or not an integer from 0 to 999', fix: 'the header is not valid FITS' }]);
  }
  const out: number[] = [];
  for (let i = 1; i <= naxis; i++) {
    const n = headerNumber(header, `NAXIS${i}`);
    if (n === undefined || !Number.isInteger(n) || n < 0) {
      throw new InputError([{ where, what: `NAXIS${i} is missing or not a non-negative integer`, fix: 'the header is not valid FITS' }]);
    }
    out.push(n);
  }
  return out;
}

/** Every HDU of a FITS file, in order. Throws InputError (with the HDU and byte offset) when the structure is broken. */
export function walkHdus(bytes: Uint8Array, where = 'FITS file'): FitsHdu[] {
  return walkHdusFrom(bytesSource(bytes), where);
}

/** `walkHdus` on a ByteSource (a file read a block at a time): only the headers are read. */
export function walkHdusFrom(source: ByteSource, where = 'FITS file'): FitsHdu[] {
  const first = String.fromCharCode(...source.read(0, 30));
  if (!/^SIMPLE  =\s+T/.test(first)) {
    throw new InputError([{ where, what: 'does not start with the card SIMPLE = T', fix: 'this is not a FITS file' }]);
  }
  const hdus: FitsHdu[] = [];
  let offset = 0;
  while (offset < source.length) {
    const index = hdus.length;
    const hduWhere = `${where}, HDU ${index}`;
    if (offset + FITS_BLOCK_BYTES > source.length) {
      if (String.fromCharCode(...source.read(offset, 8)) === 'XTENSION') {
        throw new InputError([{ where: `${hduWhere}, header at byte ${offset}`, what: 'no END card before the end of the file (file truncated)', fix: 'check that the whole file was copied; FITS files are a multiple of 2880 bytes' }]);
      }
      break; // short trailing bytes that start no extension: ignored like padding
    }
    const { header, dataOffset } = readHeaderFrom(source, offset, hduWhere);
    const kind = index === 0 ? 'PRIMARY' : headerString(header, 'XTENSION')?.trim();
    if (kind === undefined) {
      if (index > 0) break; // trailing blocks that are not an extension (allowed "special records")
      throw new InputError([{ where: hduWhere, what: 'extension without XTENSION keyword' }]);
    }
    const bitpix = headerNumber(header, 'BITPIX');
    if (bitpix === undefined || ![8, 16, 32, 64, -32, -64].includes(bitpix)) {
      throw new InputError([{ where: hduWhere, what: `BITPIX is ${String(headerValue(header, 'BITPIX'))}, not one of 8, 16, 32, 64, -32, -64` }]);
    }
    const axes = axisLengths(header, hduWhere);
    const randomGroups = index === 0 && headerValue(header, 'GROUPS') === true && axes[0] === 0;
    const counted = randomGroups ? axes.slice(1) : axes;
    const pcount = headerNumber(header, 'PCOUNT') ?? 0;
    const gcount = headerNumber(header, 'GCOUNT') ?? 1;
    const elements = axes.length === 0 ? 0 : counted.reduce((a, b) => a * b, 1);
    const dataBytes = axes.length === 0 && pcount === 0 ? 0 : (Math.abs(bitpix) / 8) * gcount * (pcount + elements);
    if (dataOffset + dataBytes > source.length) {
      throw new InputError([{
        where: hduWhere,
        what: `header announces ${dataBytes} data bytes from byte ${dataOffset}, but the file has only ${source.length} bytes`,
        fix: 'the file is truncated; copy it again',
      }]);
    }
    hdus.push({ index, kind, header, headerOffset: offset, dataOffset, dataBytes });
    offset = dataOffset + Math.ceil(dataBytes / FITS_BLOCK_BYTES) * FITS_BLOCK_BYTES;
  }
  return hdus;
}

/** Zero padding that brings `length` bytes of data to a whole number of 2880-byte blocks. */
export function paddingBytes(length: number): number {
  return (FITS_BLOCK_BYTES - (length % FITS_BLOCK_BYTES)) % FITS_BLOCK_BYTES;
}
