/**
 * TAN (gnomonic) world coordinate system of a FITS image (Calabretta & Greisen 2002; FITS standard 4.0 section 8):
 * pixel (x, y) in the FITS 1-based convention (the centre of the first pixel is (1, 1)) -> intermediate world
 * coordinates CD * (p - CRPIX) in degrees, which for TAN with the default LONPOLE = 180 are the standard
 * coordinates (xi towards East, eta towards North) about CRVAL -> (ra, dec) in degrees by the inverse gnomonic
 * projection of src/core/sky/tangentPlane.ts.
 * The matrix comes from CDi_j, or PCi_j times CDELTi, or CDELTi with CROTA2 (the older convention).
 */
import { type Result, fail, ok } from '../result';
import { ARCSEC_PER_DEG, DEG_PER_RAD, RAD_PER_DEG } from '../sky/angles';
import { type SkyPointDeg, type TangentCentre, skyToTangentArcsec, tangentCentre, tangentToSkyDeg } from '../sky/tangentPlane';
import { type FitsHeader, headerNumber, headerString, headerValue } from '../formats/fits/header';
import { PMath } from '../numeric/portableMath';

/** A TAN WCS: reference sky point, reference pixel (1-based) and the matrix from pixel offsets to (xi, eta) in degrees. */
export interface TanWcs {
  crvalRaDeg: number;
  crvalDecDeg: number;
  /** Reference pixel along image axis 1 (x, columns) and axis 2 (y, rows), FITS 1-based. */
  crpixXPx: number;
  crpixYPx: number;
  /** xi = m[0]*(x - crpixX) + m[1]*(y - crpixY); eta = m[2]*(x - crpixX) + m[3]*(y - crpixY); degrees per pixel. */
  skyDegPerPx: [number, number, number, number];
  centre: TangentCentre;
  /** Notes on what was read but not applied (e.g. SIP distortion terms), for the user to see. */
  warnings: string[];
}

/** Sky position (ra, dec in degrees, ra in [0, 360)) of FITS 1-based pixel (xPx, yPx). */
export function pixelToSkyDeg(wcs: TanWcs, xPx: number, yPx: number): SkyPointDeg {
  const dx = xPx - wcs.crpixXPx, dy = yPx - wcs.crpixYPx;
  const m = wcs.skyDegPerPx;
  const xiDeg = m[0] * dx + m[1] * dy;
  const etaDeg = m[2] * dx + m[3] * dy;
  return tangentToSkyDeg(wcs.centre, xiDeg * ARCSEC_PER_DEG, etaDeg * ARCSEC_PER_DEG);
}

/** FITS 1-based pixel of sky position (ra, dec) in degrees; null when the point is 90 degrees or more from CRVAL. */
export function skyToPixel(wcs: TanWcs, raDeg: number, decDeg: number): { xPx: number; yPx: number } | null {
  const t = skyToTangentArcsec(wcs.centre, raDeg, decDeg);
  if (!t) return null;
  const xi = t.xiArcsec / ARCSEC_PER_DEG, eta = t.etaArcsec / ARCSEC_PER_DEG;
  const [a, b, c, d] = wcs.skyDegPerPx;
  const det = a * d - b * c;
  return { xPx: wcs.crpixXPx + (d * xi - b * eta) / det, yPx: wcs.crpixYPx + (-c * xi + a * eta) / det };
}

/** Pixel scale in arcsec per pixel (square root of |det CD|), for scale bars. */
export function pixelScaleArcsec(wcs: TanWcs): number {
  const [a, b, c, d] = wcs.skyDegPerPx;
  return Math.sqrt(Math.abs(a * d - b * c)) * ARCSEC_PER_DEG;
}

/**
 * The TAN WCS of an image header, or an error naming every missing or unusable keyword
 * (e.g. "no CTYPE1 RA---TAN (found 'GLON-CAR')").
 */
export function tanWcsFromHeader(header: FitsHeader): Result<TanWcs> {
  const problems: string[] = [];
  const warnings: string[] = [];
  const ctype1 = headerString(header, 'CTYPE1')?.trim();
  const ctype2 = headerString(header, 'CTYPE2')?.trim();
  const isRa = (c?: string) => c !== undefined && /^RA--(-TAN)(-SIP)?$/.test(c);
  const isDec = (c?: string) => c !== undefined && /^DEC-(-TAN)(-SIP)?$/.test(c);
  let swapped = false;
  if (isDec(ctype1) && isRa(ctype2)) swapped = true;
  else {
    if (!isRa(ctype1)) problems.push(`no CTYPE1 RA---TAN${ctype1 !== undefined ? ` (found '${ctype1}')` : ''}`);
    if (!isDec(ctype2)) problems.push(`no CTYPE2 DEC--TAN${ctype2 !== undefined ? ` (found '${ctype2}')` : ''}`);
  }
  if ([ctype1, ctype2].some((c) => c?.endsWith('-SIP'))) warnings.push('SIP distortion terms (A_*, B_*) are ignored; positions far from CRPIX may be off');
  const num = (key: string): number | undefined => {
    const v = headerNumber(header, key);
    if (v === undefined && headerValue(header, key) !== undefined) problems.push(`${key} is not a number (found '${String(headerValue(header, key))}')`);
    return v;
  };
  const crval1 = num('CRVAL1'), crval2 = num('CRVAL2'), crpix1 = num('CRPIX1'), crpix2 = num('CRPIX2');
  for (const [k, v] of [['CRVAL1', crval1], ['CRVAL2', crval2], ['CRPIX1', crpix1], ['CRPIX2', crpix2]] as const) {
    if (v === undefined && headerValue(header, k) === undefined) problems.push(`no ${k}`);
  }
  for (const k of ['CUNIT1', 'CUNIT2']) {
    const u = headerString(header, k)?.trim();
    if (u !== undefined && u !== '' && u.toLowerCase() !== 'deg') problems.push(`${k} is '${u}', not 'deg'`);
  }
  const lonpole = num('LONPOLE');
  if (lonpole !== undefined && lonpole !== 180) problems.push(`LONPOLE = ${lonpole}; only the default 180 is supported`);
  const radesys = headerString(header, 'RADESYS')?.trim() ?? headerString(header, 'RADECSYS')?.trim();
  if (radesys !== undefined && radesys !== '' && radesys !== 'ICRS' && radesys !== 'FK5') {
    warnings.push(`RADESYS is ${radesys}; positions are used as if ICRS, without conversion`);
  }

  const m = cdMatrix(header, num, problems);
  if (problems.length > 0 || !m || crval1 === undefined || crval2 === undefined || crpix1 === undefined || crpix2 === undefined) {
    return fail(`no usable TAN WCS: ${problems.join('; ')}`);
  }
  // Rows of m map pixel offsets to world axes 1 and 2; with DEC on axis 1 the rows swap so row 0 is always xi.
  const [a, b, c, d] = swapped ? [m[2], m[3], m[0], m[1]] : m;
  if (a * d - b * c === 0) return fail('no usable TAN WCS: the CD matrix is singular (determinant 0)');
  const raDeg = swapped ? crval2 : crval1;
  const decDeg = swapped ? crval1 : crval2;
  if (Math.abs(decDeg) > 90) return fail(`no usable TAN WCS: the reference declination ${decDeg} is outside [-90, 90]`);
  return ok({
    crvalRaDeg: raDeg, crvalDecDeg: decDeg, crpixXPx: crpix1, crpixYPx: crpix2,
    skyDegPerPx: [a, b, c, d], centre: tangentCentre(raDeg, decDeg), warnings,
  });
}

/** CDi_j, or PCi_j * CDELTi, or CDELTi with CROTA2; pushes what is missing. Rows are world axes, columns pixel axes. */
function cdMatrix(header: FitsHeader, num: (k: string) => number | undefined, problems: string[]): [number, number, number, number] | null {
  const has = (k: string) => headerValue(header, k) !== undefined;
  const cdKeys = ['CD1_1', 'CD1_2', 'CD2_1', 'CD2_2'];
  if (cdKeys.some(has)) {
    const v = cdKeys.map((k) => num(k) ?? 0); // FITS 4.0 section 8.2: absent CDi_j default to 0 when any is present
    return [v[0], v[1], v[2], v[3]];
  }
  const cdelt1 = num('CDELT1'), cdelt2 = num('CDELT2');
  if (cdelt1 === undefined || cdelt2 === undefined) {
    problems.push('no CD1_1..CD2_2 matrix and no CDELT1/CDELT2 pixel scale');
    return null;
  }
  if (cdelt1 === 0 || cdelt2 === 0) { problems.push('CDELT1 or CDELT2 is 0'); return null; }
  const pcKeys = ['PC1_1', 'PC1_2', 'PC2_1', 'PC2_2'];
  if (pcKeys.some(has)) {
    const pc = pcKeys.map((k, i) => num(k) ?? (i === 0 || i === 3 ? 1 : 0)); // PC defaults: unit matrix
    return [cdelt1 * pc[0], cdelt1 * pc[1], cdelt2 * pc[2], cdelt2 * pc[3]];
  }
  const rotDeg = num('CROTA2') ?? 0;
  const cr = PMath.cos(rotDeg * RAD_PER_DEG), sr = PMath.sin(rotDeg * RAD_PER_DEG);
  // Calabretta & Greisen 2002 (Paper II, section 6.1): CROTA2 expressed as a CD matrix.
  return [cdelt1 * cr, -cdelt2 * sr, cdelt1 * sr, cdelt2 * cr];
}

/** Position angle (degrees East of North) of the image's +y axis on the sky at CRPIX, for drawing the image rotated. */
export function imageYAxisPaDeg(wcs: TanWcs): number {
  const pa = PMath.atan2(wcs.skyDegPerPx[1], wcs.skyDegPerPx[3]) * DEG_PER_RAD;
  return ((pa % 360) + 360) % 360;
}
