/**
 * Ranges a real observation can have, for every number of a plan file and of an instrument profile, checked on the
 * parsed JSON before anything else reads it: a reach of 1e9 effective radii, a line at 1e6 Angstrom or an exposure
 * of ten years is refused with a message instead of exhausting memory later. Non-finite numbers (JSON's 1e400
 * parses as Infinity) are refused everywhere. Paths are dotted key paths; `*` matches any array index or map key.
 */
import type { Problem } from '../result';

/** One number's range: min/max inclusive unless `minOpen`/`maxOpen`; `int` for whole numbers; `what` says its meaning. */
export interface NumberRange { path: string; min: number; max: number; minOpen?: boolean; maxOpen?: boolean; int?: boolean; what: string }

export const numberRange = (path: string, min: number, max: number, what: string, o: Partial<NumberRange> = {}): NumberRange => ({ path, min, max, what, ...o });
export const WAVELENGTH_RANGE_A = [3000, 25000] as const; // Angstrom: the reach of optical and near-infrared spectrographs

/** Instrument-profile numbers (interface contract "Instrument profile"). */
export const PROFILE_RANGES: readonly NumberRange[] = [
  numberRange('telescope.apertureM', 0, 50, 'aperture in metres', { minOpen: true }),
  numberRange('telescope.throughput', 0, 1, 'throughput', { minOpen: true }),
  numberRange('site.latDeg', -90, 90, 'latitude in degrees'),
  numberRange('site.lonDeg', -180, 360, 'longitude in degrees East'),
  numberRange('site.elevationM', -500, 9000, 'elevation in metres'),
  numberRange('site.pressureHPa', 300, 1100, 'air pressure in hPa'),
  numberRange('site.temperatureC', -90, 60, 'temperature in Celsius'),
  numberRange('site.relativeHumidity', 0, 1, 'relative humidity (0..1)'),
  numberRange('footprint.*.*', -7200, 7200, 'footprint corner in arcsec'),
  numberRange('slits.minLengthArcsec', 0, 600, 'minimum slit length in arcsec', { minOpen: true }),
  numberRange('slits.gapArcsec', 0, 60, 'gap between slits in arcsec'),
  numberRange('slits.widthArcsec', 0, 30, 'slit width in arcsec', { minOpen: true }),
  numberRange('slits.maxTiltDeg', 0, 89, 'tilt in degrees'),
  numberRange('alignment.boxSizeArcsec', 0, 60, 'box size in arcsec', { minOpen: true }),
  numberRange('alignment.minCount', 0, 50, 'boxes per mask', { int: true }),
  numberRange('alignment.magRange.*', -5, 35, 'magnitude'),
  numberRange('detector.pixels', 16, 100000, 'detector pixels along dispersion', { int: true }),
  numberRange('detector.dispersionAPerPixel', 0, 100, 'dispersion in Angstrom per pixel', { minOpen: true }),
  numberRange('detector.centralWavelengthA', WAVELENGTH_RANGE_A[0], WAVELENGTH_RANGE_A[1], 'central wavelength in Angstrom'),
  numberRange('detector.xArcsecPerPixel', 0, 60, 'arcsec per pixel', { minOpen: true }),
  numberRange('detector.gapsPixels.*.*', -100000, 200000, 'detector pixel'),
  numberRange('detector.edgeMarginPixels', 0, 10000, 'margin in pixels'),
  numberRange('detector.yArcsecPerPixel', 0, 60, 'arcsec per pixel', { minOpen: true }),
  numberRange('detector.readNoiseE', 0, 1000, 'read noise in electrons'),
  numberRange('detector.darkEPerPixelPerS', 0, 100, 'dark current in electrons per pixel per second'),
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
