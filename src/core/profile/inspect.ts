/**
 * A profile checked on its own, beyond its schema: can it hold a slit, an alignment box, and do the lines of a galaxy
 * at a given velocity land on the detector anywhere in the field? Mask frame throughout (x along the dispersion,
 * y along the slits, arcsec); wavelengths Angstrom (air); detector pixels along the dispersion, 0 at the first edge.
 */
import type { InstrumentProfile } from './schema';
import type { Problem } from '../result';
import { polygonBounds, rectInPolygon, type Corner } from '../geometry/polygon';
import { intersectIntervals, usablePixelRanges } from './wavelength';
import { linesXIntervalsArcsec, observedWindowsA, type LineSettings } from './lineWindows';

export interface ProfileInspection {
  boundsArcsec: { minX: number; maxX: number; minY: number; maxY: number };
  /** Area of the footprint, square arcmin (shoelace formula; any corner order). */
  areaArcmin2: number;
  /** Observed window [blue, red] of each line, Angstrom. */
  windowsA: [number, number][];
  /** Mask-x intervals (arcsec) inside the footprint's x range where every line window is usable. */
  usableXArcsec: [number, number][];
  /** Fraction of the footprint's x range that is usable. */
  usableXFraction: number;
  /** Usable detector pixel ranges (inside the margins, away from the gaps). */
  usablePixels: [number, number][];
  /** Wavelengths (Angstrom) recorded at the first and last pixel by a slit at x = 0. */
  rangeAtCentreA: [number, number];
  /** A minimal slit (minLength x width) and an alignment box fit somewhere in the footprint. */
  slitFits: boolean;
  boxFits: boolean;
  /** Impossible profiles for these lines: each blocks any plan. */
  problems: Problem[];
  /** Things that work but deserve a look. */
  warnings: string[];
}

/** Signed area of a polygon (arcsec^2), positive when the corners run counter-clockwise (x right, y up). */
export function polygonSignedAreaArcsec2(polygon: readonly Corner[]): number {
  let s = 0;
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i++) s += polygon[j][0] * polygon[i][1] - polygon[i][0] * polygon[j][1];
  return s / 2;
}

/** True when a w x h rectangle (arcsec, axis-aligned in the mask frame) fits somewhere in the footprint (grid search). */
export function rectangleFits(polygon: readonly Corner[], widthArcsec: number, heightArcsec: number, steps = 120): boolean {
  const b = polygonBounds(polygon);
  if (b.maxX - b.minX < widthArcsec || b.maxY - b.minY < heightArcsec) return false;
  for (let i = 0; i <= steps; i++) {
    const x0 = b.minX + ((b.maxX - b.minX - widthArcsec) * i) / steps;
    for (let j = 0; j <= steps; j++) {
      const y0 = b.minY + ((b.maxY - b.minY - heightArcsec) * j) / steps;
      if (rectInPolygon(x0, x0 + widthArcsec, y0, y0 + heightArcsec, polygon)) return true;
    }
  }
  return false;
}

const fmt = (v: number, d = 1) => v.toFixed(d);

/** Check a (schema-valid) profile for a galaxy's lines; `source` names the file in problems. */
export function inspectProfile(profile: InstrumentProfile, lines: LineSettings, source = 'profile'): ProfileInspection {
  const problems: Problem[] = [];
  const warnings: string[] = [];
  const fp = profile.footprint as Corner[];
  const b = polygonBounds(fp);
  const areaArcsec2 = Math.abs(polygonSignedAreaArcsec2(fp));
  const det = profile.detector;
  const { minLengthArcsec, widthArcsec } = profile.slits;
  const box = profile.alignment.boxSizeArcsec;

  // Degenerate outline: corners on one line or repeated, or a sliver narrower than one slit.
  const bboxArea = (b.maxX - b.minX) * (b.maxY - b.minY);
  const degenerate = !(areaArcsec2 > 1e-6 * Math.max(bboxArea, 1)) || areaArcsec2 < minLengthArcsec * widthArcsec;
  if (degenerate) {
    problems.push({
      where: `${source}: footprint`,
      what: `the outline encloses ${fmt(areaArcsec2, 3)} square arcsec, less than one minimal slit (${fmt(minLengthArcsec)} x ${fmt(widthArcsec)} arcsec): its corners are repeated or on one line`,
      fix: 'give the corners of the slit-mask field in order around its outline, [x, y] in arcsec from the mask centre (x along the dispersion)',
    });
  }
  const fieldHeight = b.maxY - b.minY;
  const slitFits = !degenerate && rectangleFits(fp, widthArcsec, minLengthArcsec);
  if (!degenerate && !slitFits) {
    problems.push({
      where: `${source}: slits.minLengthArcsec`,
      what: minLengthArcsec > fieldHeight
        ? `a minimal slit (${fmt(minLengthArcsec)} arcsec) is longer than the field along the slits (${fmt(fieldHeight)} arcsec from y = ${fmt(b.minY)} to ${fmt(b.maxY)})`
        : `a minimal slit (${fmt(minLengthArcsec)} x ${fmt(widthArcsec)} arcsec) fits nowhere inside the footprint`,
      fix: 'check the unit (arcsec, not mm or pixels) of slits.minLengthArcsec and of the footprint corners',
    });
  }
  const boxFits = !degenerate && rectangleFits(fp, box, box);
  if (!degenerate && !boxFits && profile.alignment.minCount > 0) {
    problems.push({
      where: `${source}: alignment.boxSizeArcsec`,
      what: `an alignment box of ${fmt(box)} arcsec fits nowhere inside the footprint`,
      fix: 'give the box side in arcsec on the sky, or set alignment.minCount to 0 if the masks are aligned another way',
    });
  }
  if (2 * det.edgeMarginPixels >= det.pixels) {
    problems.push({ where: `${source}: detector.edgeMarginPixels`, what: `margins of ${det.edgeMarginPixels} pixels at each end leave nothing of ${det.pixels} pixels`, fix: 'give the margin in pixels, a few to a few tens' });
  }
  for (const [i, [g0, g1]] of det.gapsPixels.entries()) {
    if (g1 <= 0 || g0 >= det.pixels) warnings.push(`detector gap ${i + 1} [${g0}, ${g1}] lies outside the ${det.pixels} pixels along the dispersion: check its numbers`);
  }
  const windowsA = observedWindowsA(lines);
  const inField = intersectIntervals(linesXIntervalsArcsec(det, lines), [[b.minX, b.maxX]]);
  const usableWidth = inField.reduce((s, [a, c]) => s + (c - a), 0);
  const usableXFraction = b.maxX > b.minX ? usableWidth / (b.maxX - b.minX) : 0;
  const half = (det.pixels / 2) * det.dispersionAPerPixel;
  const rangeAtCentreA: [number, number] = [det.centralWavelengthA - half, det.centralWavelengthA + half];
  if (inField.length === 0) {
    const blue = Math.min(...windowsA.map((w) => w[0])), red = Math.max(...windowsA.map((w) => w[1]));
    problems.push({
      where: `${source}: detector`,
      what: `at ${fmt(lines.vsysKms, 0)} +- ${fmt(lines.velocityHalfRangeKms, 0)} km/s the lines need ${fmt(blue)}-${fmt(red)} A (windows +- ${fmt(lines.lineHalfWindowA)} A), but no slit anywhere in the field (x ${fmt(b.minX)} to ${fmt(b.maxX)} arcsec) gets them all on the detector: a slit at x = 0 records ${fmt(rangeAtCentreA[0])}-${fmt(rangeAtCentreA[1])} A${det.gapsPixels.length ? ', minus the gaps' : ''}`,
      fix: `check detector.centralWavelengthA (${fmt((blue + red) / 2, 0)} A would centre the lines), dispersionAPerPixel (A per pixel, not nm) and xArcsecPerPixel; or the galaxy's velocity and lines`,
    });
  } else if (usableXFraction < 0.5) {
    warnings.push(`only ${fmt(100 * usableXFraction, 0)} % of the field's x range puts every line on the detector at ${fmt(lines.vsysKms, 0)} km/s: most of the field cannot hold a science slit`);
  }
  if (profile.slits.gapArcsec > minLengthArcsec) warnings.push(`the gap between slits (${fmt(profile.slits.gapArcsec)} arcsec) is longer than a minimal slit (${fmt(minLengthArcsec)} arcsec): check the numbers`);
  if (box < widthArcsec) warnings.push(`the alignment box (${fmt(box)} arcsec) is narrower than a slit (${fmt(widthArcsec)} arcsec): check the numbers`);
  return {
    boundsArcsec: b,
    areaArcmin2: areaArcsec2 / 3600,
    windowsA,
    usableXArcsec: inField,
    usableXFraction,
    usablePixels: usablePixelRanges(det),
    rangeAtCentreA,
    slitFits,
    boxFits,
    problems,
    warnings,
  };
}
