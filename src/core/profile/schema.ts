/**
 * Instrument profile: one spectrograph configuration (interface contract, "Instrument profile").
 * All lengths in the mask frame are arcsec (x along dispersion, y along slits); wavelengths in
 * Angstrom (air); site longitude East positive. Extra keys are kept; the listed ones are checked.
 */
import { z } from 'zod';

const finite = () => z.number().refine(Number.isFinite, 'must be a finite number');
const positive = () => z.number().positive('must be greater than 0').refine(Number.isFinite, 'must be finite');
const nonNegative = () => z.number().min(0, 'must not be negative').refine(Number.isFinite, 'must be finite');

export const cornerSchema = z.tuple([finite(), finite()]);

export const profileSchema = z.looseObject({
  id: z.string().min(1, 'must be a non-empty text'),
  label: z.string().min(1, 'must be a non-empty text'),
  note: z.string().optional(),
  telescope: z.looseObject({
    apertureM: positive(),
    /** Optional extension: fraction of photons reaching the detector (telescope + spectrograph + CCD). */
    throughput: z.number().gt(0).max(1).optional(),
  }),
  site: z.looseObject({
    latDeg: z.number().min(-90).max(90),
    lonDeg: z.number().min(-180).max(360),
    elevationM: z.number().min(-500).max(9000),
    pressureHPa: positive(),
    temperatureC: z.number().min(-90).max(60),
    relativeHumidity: z.number().min(0).max(1),
  }),
  footprint: z.array(cornerSchema).min(3, 'needs at least three corners [x, y] in arcsec'),
  slits: z.looseObject({
    minLengthArcsec: positive(),
    gapArcsec: nonNegative(),
    widthArcsec: positive(),
    maxTiltDeg: z.number().min(0).max(89),
  }),
  alignment: z.looseObject({
    boxSizeArcsec: positive(),
    minCount: z.number().int('must be a whole number').min(0),
    magRange: z
      .tuple([finite(), finite()])
      .refine(([b, f]) => b < f, 'must be [bright, faint] with bright < faint'),
  }),
  detector: z.looseObject({
    pixels: z.number().int('must be a whole number').positive(),
    dispersionAPerPixel: positive(),
    centralWavelengthA: positive(),
    xArcsecPerPixel: positive(),
    gapsPixels: z.array(
      z.tuple([finite(), finite()]).refine(([a, b]) => a < b, 'each gap must be [p0, p1] with p0 < p1'),
    ),
    edgeMarginPixels: nonNegative(),
    /** Optional extensions for exposure estimates. */
    yArcsecPerPixel: positive().optional(),
    readNoiseE: nonNegative().optional(),
    darkEPerPixelPerS: nonNegative().optional(),
  }),
});

export type InstrumentProfile = z.infer<typeof profileSchema>;
