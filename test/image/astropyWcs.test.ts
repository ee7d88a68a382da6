/**
 * FITS image and TAN WCS against astropy (outside reference: Debian python3-astropy 5.2.1 run by /usr/bin/python3;
 * the test fails with a clear message when it is missing). astropy writes each image; astropy.wcs pixel_to_world
 * (0-based pixels, so FITS pixel p is astropy p - 1) gives the sky positions our wcs.ts must match to 1e-6 arcsec,
 * and astropy's own reading of the pixels gives the values readFitsImage must return.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { runPython, tempDir } from '../formats/astropy';
import { readFitsImage } from '../../src/core/image/fitsImage';
import { pixelToSkyDeg, skyToPixel } from '../../src/core/image/wcs';

interface Case {
  name: string;
  header: Record<string, string | number>;
  /** How astropy stores the pixels: dtype, optional BSCALE/BZERO scaling, primary or extension, 3-D cube. */
  dtype: 'uint8' | 'int16' | 'int32' | 'int64' | 'float32' | 'float64';
  scale?: [number, number];
  extension?: boolean;
  cube?: boolean;
}

const CASES: Case[] = [
  {
    name: 'CD matrix, rotated and skewed, float32 pixels',
    header: { CTYPE1: 'RA---TAN', CTYPE2: 'DEC--TAN', CRVAL1: 187.5, CRVAL2: 12.4, CRPIX1: 50.5, CRPIX2: 40.25,
      CD1_1: -5.5e-5, CD1_2: 1.2e-5, CD2_1: 1.1e-5, CD2_2: 5.6e-5, CUNIT1: 'deg', CUNIT2: 'deg' },
    dtype: 'float32',
  },
  {
    name: 'CDELT with a PC rotation of 30 degrees, int16 pixels with BSCALE/BZERO',
    header: { CTYPE1: 'RA---TAN', CTYPE2: 'DEC--TAN', CRVAL1: 0.002, CRVAL2: -30.5, CRPIX1: 12, CRPIX2: -3.5,
      CDELT1: -0.0002, CDELT2: 0.0002, PC1_1: Math.cos(Math.PI / 6), PC1_2: -Math.sin(Math.PI / 6),
      PC2_1: Math.sin(Math.PI / 6), PC2_2: Math.cos(Math.PI / 6) },
    dtype: 'int16', scale: [0.25, 1000],
  },
  {
    name: 'CDELT only, near the pole, uint8 pixels in an IMAGE extension',
    header: { CTYPE1: 'RA---TAN', CTYPE2: 'DEC--TAN', CRVAL1: 300.25, CRVAL2: 89.6, CRPIX1: 1, CRPIX2: 1,
      CDELT1: -0.001, CDELT2: 0.001 },
    dtype: 'uint8', extension: true,
  },
  {
    name: 'CDELT with CROTA2, int32 pixels, 3-D cube (first plane)',
    header: { CTYPE1: 'RA---TAN', CTYPE2: 'DEC--TAN', CRVAL1: 359.999, CRVAL2: 45, CRPIX1: 20.5, CRPIX2: 30.5,
      CDELT1: -0.0003, CDELT2: 0.00025, CROTA2: 25 },
    dtype: 'int32', cube: true,
  },
  {
    name: 'axes swapped (DEC on axis 1), float64 pixels',
    header: { CTYPE1: 'DEC--TAN', CTYPE2: 'RA---TAN', CRVAL1: -60.2, CRVAL2: 120.5, CRPIX1: 8, CRPIX2: 9,
      CD1_1: 0.0001, CD1_2: 0, CD2_1: 0, CD2_2: 0.0001 },
    dtype: 'float64',
  },
  {
    name: 'CD matrix with mirror parity, int64 pixels',
    header: { CTYPE1: 'RA---TAN', CTYPE2: 'DEC--TAN', CRVAL1: 45.125, CRVAL2: 3.5, CRPIX1: 4, CRPIX2: 5,
      CD1_1: 2.8e-4, CD1_2: 0, CD2_1: 0, CD2_2: 2.8e-4 },
    dtype: 'int64',
  },
];

// FITS 1-based pixels, including points far outside the image so the projection is exercised off-axis.
const PIXELS: [number, number][] = [[1, 1], [7, 5], [50.5, 40.25], [-200, 350.7], [1000, -1000], [3.3, 4.4]];
const WIDTH = 7, HEIGHT = 5;

const SCRIPT = String.raw`
import json, sys, warnings
import numpy as np
from astropy.io import fits
from astropy.wcs import WCS
inp = json.load(sys.stdin)
out = []
for i, c in enumerate(inp["cases"]):
    h = fits.Header()
    for k, v in c["header"].items():
        h[k] = v
    w, hgt = inp["width"], inp["height"]
    vals = (np.arange(w * hgt, dtype=np.float64).reshape(hgt, w) * 3.5 - 20.0)
    dt = c["dtype"]
    if dt in ("uint8",):
        data = (np.arange(w * hgt) * 7 % 256).astype(np.uint8).reshape(hgt, w)
    elif dt.startswith("int") and "scale" not in c:
        data = ((np.arange(w * hgt) - 17) * 123457).astype(dt).reshape(hgt, w)
        if dt == "int64":
            data[0, 1] = 2**40 + 3
    else:
        data = vals.astype(dt if dt.startswith("float") else np.float64)
    if c.get("cube"):
        data = np.stack([data, data + 1000, data - 7])
    if c.get("extension"):
        hdu = fits.ImageHDU(data=data, header=h)
        hl = fits.HDUList([fits.PrimaryHDU(), hdu])
    else:
        hdu = fits.PrimaryHDU(data=data, header=h)
        hl = fits.HDUList([hdu])
    if "scale" in c:
        hdu.scale("int16", bscale=c["scale"][0], bzero=c["scale"][1])
    path = inp["dir"] + "/img%d.fits" % i
    hl.writeto(path, overwrite=True)
    with fits.open(path) as back:
        hd = back[1] if c.get("extension") else back[0]
        bitpix = hd.header["BITPIX"]  # read before .data: astropy rewrites it in memory for scaled images
        hdr = hd.header.copy()
        pix = np.asarray(hd.data, dtype=np.float64)
        if pix.ndim == 3:
            pix = pix[0]
        wcs = WCS(hdr, naxis=2)
        sky = []
        for (x, y) in inp["pixels"]:
            sc = wcs.pixel_to_world(x - 1, y - 1)  # astropy pixels are 0-based
            sky.append([float(sc.ra.deg), float(sc.dec.deg)])
        out.append({"path": path, "bitpix": bitpix, "pixels": [float(v) for v in pix.ravel()], "sky": sky})
print(json.dumps(out))
`;

describe('FITS image and TAN WCS against astropy 5.2.1 (astropy.wcs pixel_to_world, astropy.io.fits)', () => {
  let results: { path: string; bitpix: number; pixels: number[]; sky: [number, number][] }[];
  beforeAll(() => {
    results = runPython(SCRIPT, { cases: CASES, pixels: PIXELS, width: WIDTH, height: HEIGHT, dir: tempDir('astropy-wcs') });
  });

  CASES.forEach((c, i) => {
    it(`${c.name}: pixels equal astropy's, pixel_to_world agrees to 1e-6 arcsec`, () => {
      const r = results[i];
      const img = readFitsImage(new Uint8Array(readFileSync(r.path)));
      if (!img.ok) throw new Error(img.error);
      expect(img.value.widthPx).toBe(WIDTH);
      expect(img.value.heightPx).toBe(HEIGHT);
      expect(img.value.hduIndex).toBe(c.extension ? 1 : 0);
      expect(r.bitpix).toBe({ uint8: 8, int16: 16, int32: 32, int64: 64, float32: -32, float64: -64 }[c.dtype]);
      // astropy's values in float64; ours are stored as float32
      expect(Array.from(img.value.data)).toEqual(r.pixels.map((v) => Math.fround(v)));
      if (c.cube) expect(img.value.warnings.join(' ')).toMatch(/first plane/);
      PIXELS.forEach(([x, y], k) => {
        const ours = pixelToSkyDeg(img.value.wcs, x, y);
        const [raDeg, decDeg] = r.sky[k];
        const dRaArcsec = (((ours.raDeg - raDeg + 540) % 360) - 180) * Math.cos((decDeg * Math.PI) / 180) * 3600;
        const dDecArcsec = (ours.decDeg - decDeg) * 3600;
        expect(Math.hypot(dRaArcsec, dDecArcsec), `pixel (${x}, ${y})`).toBeLessThan(1e-6);
        const back = skyToPixel(img.value.wcs, raDeg, decDeg)!;
        expect(Math.abs(back.xPx - x) + Math.abs(back.yPx - y), `inverse at pixel (${x}, ${y})`).toBeLessThan(1e-6);
      });
    });
  });
});
