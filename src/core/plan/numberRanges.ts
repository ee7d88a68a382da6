/**
 * Ranges a real observation can have, for every number of a plan file and of an instrument profile, checked on the
 * parsed JSON before anything else reads it: a reach of 1e9 effective radii, a line at 1e6 Angstrom or an exposure
 * of ten years is refused with a message instead of exhausting memory later. Non-finite numbers (JSON's 1e400
 * parses as Infinity) are refused everywhere. Paths are dotted key paths; `*` matches any array index or map key.
 */
import type { Problem } from '../result';

/** One number's range: min/max inclusive unless `minOpen`/`maxOpen`; `int` for whole numbers; `what` says its meaning. */
export interface NumberRange { path: string; min: number; max: number; minOpen?: boolean; maxOpen?: boolean; int?: boolean; what: string }

const R = (path: string, min: number, max: number, what: string, o: Partial<NumberRange> = {}): NumberRange => ({ path, min, max, what, ...o });
const WAVELENGTH = [3000, 25000] as const; // Angstrom: the reach of optical and near-infrared spectrographs

/** Plan-file numbers (interface contract "Plan file" and the optional sections documented in docs/). */
export const PLAN_RANGES: readonly NumberRange[] = [
  R('galaxy.reArcsec', 0, 3600, 'effective radius in arcsec', { minOpen: true }),
  R('galaxy.axisRatio', 0, 1, 'axis ratio b/a', { minOpen: true }),
  R('galaxy.paDeg', -360, 360, 'major-axis PA in degrees'),
  R('galaxy.distanceMpc', 0, 1000, 'distance in Mpc', { minOpen: true }),
  R('galaxy.vsysKms', -1000, 30000, 'systemic velocity in km/s'),
  R('galaxy.sersicN', 0.2, 20, 'Sersic index'),
  R('galaxy.muE', 10, 35, 'surface brightness at Re in mag/arcsec2'),
  R('goals.masks', 1, 50, 'number of masks', { int: true }),
  R('goals.tracerReachRe', 0, 100, 'tracer reach in effective radii', { minOpen: true }),
  R('goals.starlightReachRe', 0, 30, 'starlight reach in effective radii'),
  R('goals.linesA.*', WAVELENGTH[0], WAVELENGTH[1], 'rest wavelength in Angstrom (air)'),
  R('goals.velocityHalfRangeKms', 0, 5000, 'velocity half-range in km/s'),
  R('goals.lineHalfWindowA', 0, 500, 'line half-window in Angstrom'),
  R('masks.*.raDeg', 0, 360, 'mask centre RA in degrees', { maxOpen: true }),
  R('masks.*.decDeg', -90, 90, 'mask centre Dec in degrees'),
  R('masks.*.paDeg', -360, 360, 'mask PA in degrees'),
  R('masks.*.designHourAngleH', -12, 12, 'hour angle in hours'),
  R('targetOverrides.*.weight', 0, 1e6, 'target weight'),
  R('weighting.magRange.*', -5, 40, 'magnitude'),
  R('weighting.colorRange.*', -10, 10, 'colour in magnitudes'),
  R('weighting.radiusRangeRe.*', 0, 1000, 'radius in effective radii'),
  R('weighting.exclusions.*.radiusArcsec', 0, 36000, 'exclusion radius in arcsec', { minOpen: true }),
  R('weighting.exclusions.*.xiArcsec', -36000, 36000, 'offset in arcsec'),
  R('weighting.exclusions.*.etaArcsec', -36000, 36000, 'offset in arcsec'),
  R('weighting.exclusions.*.uArcsec', -36000, 36000, 'offset in arcsec'),
  R('weighting.exclusions.*.vArcsec', -36000, 36000, 'offset in arcsec'),
  R('weighting.exclusions.*.axisRatio', 0, 1, 'axis ratio', { minOpen: true }),
  R('weighting.exclusions.*.paDeg', -360, 360, 'PA in degrees'),
  R('weighting.formula.magPivot', -5, 40, 'pivot magnitude'),
  R('weighting.formula.magSlope', 0, 10, 'weight slope per magnitude'),
  R('weighting.formula.colorPeaks.*', -10, 10, 'colour in magnitudes'),
  R('weighting.formula.colorSigma', 0, 10, 'colour width in magnitudes', { minOpen: true }),
  R('weighting.formula.colorFloor', 0, 1, 'weight floor'),
  R('weighting.formula.radiusExponent', -5, 5, 'radius exponent'),
  R('starlight.exposureS', 0, 86400, 'exposure in seconds', { minOpen: true }),
  R('starlight.throughput', 0, 1, 'throughput', { minOpen: true }),
  R('starlight.skyMagPerArcsec2', 10, 30, 'sky brightness in mag/arcsec2'),
  R('starlight.targetSnPerA', 0, 1000, 'signal-to-noise per Angstrom', { minOpen: true }),
  R('starlight.wavelengthA', WAVELENGTH[0], WAVELENGTH[1], 'wavelength in Angstrom'),
  R('starlight.slitLengthArcsec', 0, 3600, 'slit length in arcsec', { minOpen: true }),
  R('starlight.maxPerMask', 0, 1000, 'slits per mask', { int: true }),
  R('starlight.skyPerMask', 0, 1000, 'sky slits per mask', { int: true }),
  R('starlight.skyContrastMag', 0, 20, 'contrast in magnitudes'),
  R('starlight.obstructedFraction', 0, 1, 'obstructed fraction', { maxOpen: true }),
  R('starlight.reachMarginRe', 0, 30, 'margin in effective radii'),
  R('starlight.readNoiseE', 0, 1000, 'read noise in electrons'),
  R('starlight.darkEPerPixelPerS', 0, 100, 'dark current in electrons per pixel per second'),
  R('starlight.yArcsecPerPixel', 0, 60, 'pixel scale in arcsec', { minOpen: true }),
  R('search.aBin', 0, 1e6, 'objective weight'),
  R('search.kBin', 1, 1000, 'objective count', { int: true }),
  R('search.aSector', 0, 1e6, 'objective weight'),
  R('search.kSector', 1, 1000, 'objective count', { int: true }),
  R('search.aStarlightBin', 0, 1e6, 'objective weight'),
  R('search.aStarlightReach', 0, 1e6, 'objective weight'),
  R('search.seed', -9007199254740991, 9007199254740991, 'random seed', { int: true }),
  R('observing.designHourAngleH', -12, 12, 'hour angle in hours'),
  R('observing.seeingFwhmArcsec', 0, 10, 'seeing FWHM in arcsec', { minOpen: true }),
  R('observing.maxLossFraction', 0, 1, 'slit-loss fraction', { minOpen: true, maxOpen: true }),
  R('observing.guideWavelengthA', WAVELENGTH[0], WAVELENGTH[1], 'wavelength in Angstrom'),
  R('observing.scienceRangeA.*', WAVELENGTH[0], WAVELENGTH[1], 'wavelength in Angstrom'),
  R('observing.exposureTimeS', 0, 86400, 'exposure in seconds', { minOpen: true }),
  R('observing.targetSnPerA', 0, 1000, 'signal-to-noise per Angstrom', { minOpen: true }),
  R('observing.hourAngleStepH', 0, 2, 'step in hours', { minOpen: true }),
  R('observing.maxAirmass', 1, 10, 'airmass'),
  R('allocation.maxSlitLengthArcsec', 0, 3600, 'slit length in arcsec', { minOpen: true }),
];

/** Instrument-profile numbers (interface contract "Instrument profile"). */
export const PROFILE_RANGES: readonly NumberRange[] = [
  R('telescope.apertureM', 0, 50, 'aperture in metres', { minOpen: true }),
  R('telescope.throughput', 0, 1, 'throughput', { minOpen: true }),
  R('site.latDeg', -90, 90, 'latitude in degrees'),
  R('site.lonDeg', -180, 360, 'longitude in degrees East'),
  R('site.elevationM', -500, 9000, 'elevation in metres'),
  R('site.pressureHPa', 300, 1100, 'air pressure in hPa'),
  R('site.temperatureC', -90, 60, 'temperature in Celsius'),
  R('site.relativeHumidity', 0, 1, 'relative humidity (0..1)'),
  R('footprint.*.*', -7200, 7200, 'footprint corner in arcsec'),
  R('slits.minLengthArcsec', 0, 600, 'minimum slit length in arcsec', { minOpen: true }),
  R('slits.gapArcsec', 0, 60, 'gap between slits in arcsec'),
  R('slits.widthArcsec', 0, 30, 'slit width in arcsec', { minOpen: true }),
  R('slits.maxTiltDeg', 0, 89, 'tilt in degrees'),
  R('alignment.boxSizeArcsec', 0, 60, 'box size in arcsec', { minOpen: true }),
  R('alignment.minCount', 0, 50, 'boxes per mask', { int: true }),
  R('alignment.magRange.*', -5, 35, 'magnitude'),
  R('detector.pixels', 16, 100000, 'detector pixels along dispersion', { int: true }),
  R('detector.dispersionAPerPixel', 0, 100, 'dispersion in Angstrom per pixel', { minOpen: true }),
  R('detector.centralWavelengthA', WAVELENGTH[0], WAVELENGTH[1], 'central wavelength in Angstrom'),
  R('detector.xArcsecPerPixel', 0, 60, 'arcsec per pixel', { minOpen: true }),
  R('detector.gapsPixels.*.*', -100000, 200000, 'detector pixel'),
  R('detector.edgeMarginPixels', 0, 10000, 'margin in pixels'),
  R('detector.yArcsecPerPixel', 0, 60, 'arcsec per pixel', { minOpen: true }),
  R('detector.readNoiseE', 0, 1000, 'read noise in electrons'),
  R('detector.darkEPerPixelPerS', 0, 100, 'dark current in electrons per pixel per second'),
];

/** Longest text of a value shown in a message; longer values are cut with a note of their length. */
export const SHOWN_VALUE_CHARS = 60;

/** A value as shown in a message: short text as is, long text cut (a 10 MB value is not echoed). */
export function shownValue(v: unknown): string {
  const s = typeof v === 'string' ? JSON.stringify(v) : String(v);
  return s.length <= SHOWN_VALUE_CHARS ? s : `${s.slice(0, SHOWN_VALUE_CHARS)}... (${s.length} characters)`;
}

const matches = (pattern: string[], path: readonly string[]) => pattern.length === path.length && pattern.every((p, i) => p === '*' || p === path[i]);

function describe(r: NumberRange): string {
  const lo = `${r.min} ${r.minOpen ? '<' : '<='}`, hi = `${r.maxOpen ? '<' : '<='} ${r.max}`;
  return `${r.int ? 'a whole number ' : ''}${lo} value ${hi}`;
}

/** Every number of `json` outside its range (or not finite), as problems named "source: dotted.path". */
export function numberRangeProblems(json: unknown, ranges: readonly NumberRange[], source: string): Problem[] {
  const out: Problem[] = [];
  const compiled = ranges.map((r) => ({ r, parts: r.path.split('.') }));
  const visit = (v: unknown, path: string[]) => {
    if (typeof v === 'number') {
      const where = `${source}: ${path.join('.') || '(top level)'}`;
      if (!Number.isFinite(v)) {
        out.push({ where, what: `${v} is not a finite number (a number too large to hold, such as 1e400, reads as infinite)`, fix: 'give an ordinary number' });
        return;
      }
      const hit = compiled.find((c) => matches(c.parts, path));
      if (!hit) return;
      const r = hit.r;
      const ok = (r.minOpen ? v > r.min : v >= r.min) && (r.maxOpen ? v < r.max : v <= r.max) && (!r.int || Number.isInteger(v));
      if (!ok) out.push({ where, what: `${shownValue(v)} is not a ${r.what} a real observation can have (${describe(r)})`, fix: 'give a value in that range' });
      return;
    }
    if (Array.isArray(v)) v.forEach((x, i) => visit(x, [...path, String(i)]));
    else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) visit(x, [...path, k]);
  };
  visit(json, []);
  return out;
}
