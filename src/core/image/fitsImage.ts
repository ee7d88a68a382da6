/**
 * FITS image reader for the editor's backdrop: the primary HDU when it holds an image (NAXIS >= 2), else the first
 * IMAGE extension. BITPIX 8, 16, 32, 64, -32, -64 with BSCALE/BZERO; BLANK (integer images) and NaN become NaN.
 * NAXIS 3 or more: the first plane. Pixel layout: `data[(y - 1) * widthPx + (x - 1)]` is FITS pixel (x, y), 1-based,
 * so row 0 is the bottom row of the image as FITS draws it.
 */
import { type Result, InputError, fail, ok } from '../result';
import { readInt64, readNumeric } from '../formats/fits/binary';
import { headerNumber, headerValue } from '../formats/fits/header';
import { type FitsHdu, axisLengths, walkHdus } from '../formats/fits/hdu';
import { type TanWcs, tanWcsFromHeader } from './wcs';

/** An image plane with its TAN WCS. */
export interface FitsImage {
  widthPx: number;
  heightPx: number;
  data: Float32Array;
  wcs: TanWcs;
  /** Which HDU the image came from (0 = primary). */
  hduIndex: number;
  /** Things read but not applied (extra planes, SIP terms...), for the user to see. */
  warnings: string[];
}

/** Read the image and its TAN WCS; an error value says exactly what is missing (no image HDU, no CTYPE1 RA---TAN, ...). */
export function readFitsImage(bytes: Uint8Array): Result<FitsImage> {
  try {
    return imageOf(bytes, walkHdus(bytes, 'FITS image'));
  } catch (e) {
    if (e instanceof InputError) return fail(e.message);
    throw e;
  }
}

function imageOf(bytes: Uint8Array, hdus: FitsHdu[]): Result<FitsImage> {
  const isImage = (h: FitsHdu) => (h.kind === 'PRIMARY' || h.kind === 'IMAGE') && (headerNumber(h.header, 'NAXIS') ?? 0) >= 2;
  const hdu = hdus.find(isImage);
  if (!hdu) {
    const compressed = hdus.some((h) => h.kind === 'BINTABLE' && headerValue(h.header, 'ZIMAGE') === true);
    return fail(compressed
      ? 'the image is tile-compressed (a BINTABLE with ZIMAGE = T); decompress it to a plain FITS image first'
      : `no image HDU with NAXIS >= 2 (HDUs: ${hdus.map((h) => `${h.index}:${h.kind}`).join(', ')})`);
  }
  const axes = axisLengths(hdu.header, `FITS HDU ${hdu.index}`);
  const [widthPx, heightPx] = axes;
  const warnings: string[] = [];
  if (axes.slice(2).some((n) => n > 1)) warnings.push(`the image has ${axes.length} axes (${axes.join(' x ')}); only the first plane is shown`);
  const wcs = tanWcsFromHeader(hdu.header);
  if (!wcs.ok) return fail(`FITS HDU ${hdu.index}: ${wcs.error}`);
  warnings.push(...wcs.value.warnings);

  const bitpix = headerNumber(hdu.header, 'BITPIX')!;
  const bscale = headerNumber(hdu.header, 'BSCALE') ?? 1;
  const bzero = headerNumber(hdu.header, 'BZERO') ?? 0;
  const blankValue = headerValue(hdu.header, 'BLANK');
  const blank = typeof blankValue === 'number' ? blankValue : undefined;
  const n = widthPx * heightPx;
  const data = new Float32Array(n);
  const view = new DataView(bytes.buffer, bytes.byteOffset + hdu.dataOffset, hdu.dataBytes);
  const size = Math.abs(bitpix) / 8;
  if (bitpix === 64) {
    const blank64 = typeof blankValue === 'number' || typeof blankValue === 'bigint' ? BigInt(blankValue) : undefined;
    for (let i = 0; i < n; i++) {
      const raw = readInt64(view, i * 8);
      data[i] = raw === blank64 ? NaN : bzero + bscale * Number(raw);
    }
  } else {
    const code = ({ 8: 'B', 16: 'I', 32: 'J', [-32]: 'E', [-64]: 'D' } as const)[bitpix as 8];
    const integer = bitpix > 0;
    for (let i = 0; i < n; i++) {
      const raw = readNumeric(view, i * size, code);
      data[i] = integer && raw === blank ? NaN : bzero + bscale * raw;
    }
  }
  return ok({ widthPx, heightPx, data, wcs: wcs.value, hduIndex: hdu.index, warnings });
}
