/**
 * FITS image reader and TAN WCS on hand-made headers: the errors for images without a usable WCS name exactly
 * what is missing; BLANK becomes NaN; the projection matches the closed form of Calabretta & Greisen (2002),
 * R = (180/pi) cot(theta), i.e. a point N arcsec from CRVAL along the RA axis on the equator has RA = atan(N / 206264.806...) .
 */
import { describe, expect, it } from 'vitest';
import { formatCard, headerBytes, type FitsValue } from '../../src/core/formats/fits/header';
import { paddingBytes } from '../../src/core/formats/fits/hdu';
import { readFitsImage } from '../../src/core/image/fitsImage';
import { pixelScaleArcsec, pixelToSkyDeg, skyToPixel, imageYAxisPaDeg } from '../../src/core/image/wcs';

/** A primary-HDU image of int16 (or float32) pixels with the given header keywords. */
function image(keys: Record<string, FitsValue>, values: number[], width = 3, height = 2, bitpix = 16): Uint8Array {
  const cards = [formatCard('SIMPLE', true)!, formatCard('BITPIX', bitpix)!, formatCard('NAXIS', 2)!,
    formatCard('NAXIS1', width)!, formatCard('NAXIS2', height)!,
    ...Object.entries(keys).map(([k, v]) => formatCard(k, v, '', typeof v === 'number' && !Number.isInteger(v))!)];
  const head = headerBytes(cards);
  const n = values.length * (Math.abs(bitpix) / 8);
  const data = new Uint8Array(n + paddingBytes(n));
  const view = new DataView(data.buffer);
  values.forEach((v, i) => (bitpix === 16 ? view.setInt16(i * 2, v) : view.setFloat32(i * 4, v)));
  const out = new Uint8Array(head.length + data.length);
  out.set(head);
  out.set(data, head.length);
  return out;
}

const WCS = { CTYPE1: 'RA---TAN', CTYPE2: 'DEC--TAN', CRVAL1: 0, CRVAL2: 0, CRPIX1: 2, CRPIX2: 1, CD1_1: -1 / 3600, CD2_2: 1 / 3600 };

describe('FITS image reader', () => {
  it('applies BSCALE/BZERO and turns BLANK into NaN; row 0 of data is FITS row y = 1', () => {
    const r = readFitsImage(image({ ...WCS, BSCALE: 0.5, BZERO: 10, BLANK: -32768 }, [0, 2, -32768, 4, 6, 8]));
    if (!r.ok) throw new Error(r.error);
    expect(Array.from(r.value.data)).toEqual([10, 11, NaN, 12, 13, 14]);
    expect([r.value.widthPx, r.value.heightPx, r.value.hduIndex]).toEqual([3, 2, 0]);
  });

  it('names exactly what is missing when there is no usable TAN WCS', () => {
    const noWcs = readFitsImage(image({}, [1, 2, 3, 4, 5, 6]));
    expect(noWcs).toEqual({ ok: false, error: expect.stringContaining('no CTYPE1 RA---TAN') });
    expect(!noWcs.ok && noWcs.error).toMatch(/no CTYPE2 DEC--TAN; no CRVAL1; no CRVAL2; no CRPIX1; no CRPIX2; no CD1_1\.\.CD2_2 matrix and no CDELT1\/CDELT2 pixel scale/);
    const galactic = readFitsImage(image({ ...WCS, CTYPE1: 'GLON-TAN', CTYPE2: 'GLAT-TAN' }, [1, 2, 3, 4, 5, 6]));
    expect(!galactic.ok && galactic.error).toMatch(/no CTYPE1 RA---TAN \(found 'GLON-TAN'\); no CTYPE2 DEC--TAN \(found 'GLAT-TAN'\)/);
    const otherProjection = readFitsImage(image({ ...WCS, CTYPE1: 'RA---SIN', CTYPE2: 'DEC--SIN' }, [1, 2, 3, 4, 5, 6]));
    expect(!otherProjection.ok && otherProjection.error).toMatch(/found 'RA---SIN'/);
    const arcsecUnits = readFitsImage(image({ ...WCS, CUNIT1: 'arcsec' }, [1, 2, 3, 4, 5, 6]));
    expect(!arcsecUnits.ok && arcsecUnits.error).toMatch(/CUNIT1 is 'arcsec', not 'deg'/);
    const lonpole = readFitsImage(image({ ...WCS, LONPOLE: 0 }, [1, 2, 3, 4, 5, 6]));
    expect(!lonpole.ok && lonpole.error).toMatch(/LONPOLE = 0; only the default 180 is supported/);
    const singular = readFitsImage(image({ ...WCS, CD1_1: 0, CD2_2: 0, CD1_2: 0, CD2_1: 0 }, [1, 2, 3, 4, 5, 6]));
    expect(!singular.ok && singular.error).toMatch(/singular/);
  });

  it('says when the file holds no image, or is not FITS', () => {
    const notFits = readFitsImage(new TextEncoder().encode('not a fits file'));
    expect(!notFits.ok && notFits.error).toMatch(/does not start with the card SIMPLE = T/);
    const cards = [formatCard('SIMPLE', true)!, formatCard('BITPIX', 8)!, formatCard('NAXIS', 0)!];
    const empty = readFitsImage(headerBytes(cards));
    expect(!empty.ok && empty.error).toMatch(/no image HDU with NAXIS >= 2 \(HDUs: 0:PRIMARY\)/);
  });

  it('keeps SIP images usable, with a warning that the distortion is ignored', () => {
    const r = readFitsImage(image({ ...WCS, CTYPE1: 'RA---TAN-SIP', CTYPE2: 'DEC--TAN-SIP' }, [1, 2, 3, 4, 5, 6]));
    expect(r.ok && r.value.warnings.join(' ')).toMatch(/SIP distortion terms .* are ignored/);
  });
});

describe('TAN WCS closed form (Calabretta & Greisen 2002)', () => {
  const r = readFitsImage(image(WCS, [1, 2, 3, 4, 5, 6]));
  if (!r.ok) throw new Error(r.error);
  const wcs = r.value.wcs;

  it('puts CRPIX at CRVAL and follows R = (180/pi) cot(theta) along the axes', () => {
    expect(pixelToSkyDeg(wcs, 2, 1)).toEqual({ raDeg: 0, decDeg: 0 });
    const arcsecPerRad = (180 / Math.PI) * 3600;
    for (const n of [1, 100, 3600, 36000]) {
      // CD1_1 < 0: pixels to the left (smaller x) are to the East (larger RA)
      const east = pixelToSkyDeg(wcs, 2 - n, 1);
      expect(east.raDeg).toBeCloseTo((Math.atan(n / arcsecPerRad) * 180) / Math.PI, 12);
      expect(east.decDeg).toBeCloseTo(0, 12);
      const north = pixelToSkyDeg(wcs, 2, 1 + n);
      expect(north.decDeg).toBeCloseTo((Math.atan(n / arcsecPerRad) * 180) / Math.PI, 12);
      const back = skyToPixel(wcs, east.raDeg, east.decDeg)!;
      expect(back.xPx).toBeCloseTo(2 - n, 9);
    }
    expect(pixelScaleArcsec(wcs)).toBeCloseTo(1, 12);
    expect(imageYAxisPaDeg(wcs)).toBeCloseTo(0, 12);
    expect(skyToPixel(wcs, 180, 0)).toBeNull(); // the antipode has no gnomonic image
  });
});
