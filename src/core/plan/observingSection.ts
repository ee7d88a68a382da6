/**
 * The plan's `observing` section: conditions and choices for the refraction/hour-angle report and the exposure
 * estimates. Every key is optional; resolveObservingSettings (observe/observingSettings.ts) fills the documented
 * defaults (docs/observability.md).
 * Hour angles in hours (positive West), wavelengths Angstrom (air), seeing FWHM arcsec, times seconds.
 */
import { z } from 'zod';
import { isoInstantUnixMs, parseDateText } from '../sky/calendarText';

/** A night (YYYY-MM-DD, the local evening's date) or an instant (YYYY-MM-DDTHH:MM[:SS]Z, UTC). */
const dateOrInstant = z.string().superRefine((t, ctx) => {
  if (isoInstantUnixMs(t) !== null) return;
  const d = parseDateText(t);
  if (!d.ok) ctx.addIssue({ code: 'custom', message: `${d.error}; give the night as YYYY-MM-DD (local evening date) or an instant as YYYY-MM-DDTHH:MMZ (UTC)` });
});
const night = z.string().superRefine((t, ctx) => {
  const d = parseDateText(t);
  if (!d.ok) ctx.addIssue({ code: 'custom', message: `${d.error}; give nights as YYYY-MM-DD (local evening date)` });
});

const range = (lo: number, hi: number, what: string) =>
  z
    .tuple([z.number().min(lo).max(hi), z.number().min(lo).max(hi)])
    .refine(([a, b]) => a < b, `must be [start, end] with start < end (${what})`);

export const observingSchema = z.looseObject({
  /** Hour angle (hours) the masks are designed for, unless a mask gives its own designHourAngleH. */
  designHourAngleH: z.number().min(-12).max(12).optional(),
  seeingFwhmArcsec: z.number().positive('must be greater than 0 (seeing FWHM in arcsec)').max(10).optional(),
  /** Largest acceptable light loss of any tracer slit to refraction, relative to a centred image (0..1). */
  maxLossFraction: z.number().gt(0, 'must be in (0, 1)').lt(1, 'must be in (0, 1)').optional(),
  /** Effective wavelength of the guider, Angstrom. */
  guideWavelengthA: z.number().min(3000).max(25000).optional(),
  /** Wavelength at which the slits are cut (the images' positions at the design hour angle), Angstrom. */
  designWavelengthA: z.number().min(3000).max(25000).optional(),
  /** Systematic sky-subtraction error as a fraction of the sky, capping co-added starlight S/N (default 0.01). */
  skySystematicFraction: z.number().min(0, 'must be in [0, 0.2]').max(0.2, 'must be in [0, 0.2]').optional(),
  /** Moon at the time of observation, for the sky brightness (Krisciunas & Schaefer 1991; observe/moonSky.ts). */
  moon: z.looseObject({
    /** Lunar phase angle, degrees (0 full, 180 new). */
    phaseAngleDeg: z.number().min(0, 'must be in [0, 180] degrees (0 = full Moon)').max(180, 'must be in [0, 180] degrees (0 = full Moon)'),
    /** Moon-galaxy separation, degrees. */
    separationDeg: z.number().gt(0, 'must be in (0, 180] degrees').max(180, 'must be in (0, 180] degrees'),
    /** Altitude of the Moon, degrees (below 0: no moonlight). */
    altitudeDeg: z.number().min(-90).max(90),
    /** V-band extinction, mag per airmass (default 0.15). */
    extinctionV: z.number().min(0).max(1).optional(),
  }).optional(),
  /** Night of the observation (local evening date) or its UTC instant: the Moon is computed for it (observe/moonAtDate.ts). */
  date: dateOrInstant.optional(),
  /** First and last night the plan may be observed on (e.g. a semester): the Moon of the middle night is used. */
  dateRange: z.tuple([night, night]).refine(([a, b]) => a <= b, 'must be [first night, last night] with first <= last').optional(),
  /** Science wavelength range [blue, red], Angstrom. */
  scienceRangeA: range(3000, 25000, 'Angstrom').optional(),
  /** Planned exposure time per mask, seconds. */
  exposureTimeS: z.number().positive('must be greater than 0 (seconds)').optional(),
  /** Signal-to-noise per Angstrom to reach, for the time estimate. */
  targetSnPerA: z.number().positive('must be greater than 0').optional(),
  hourAngleRangeH: range(-12, 12, 'hours of hour angle').optional(),
  hourAngleStepH: z.number().positive('must be greater than 0 (hours)').max(2, 'must be at most 2 hours').optional(),
  /** Airmass limit for dark hours and for the hour-angle window. */
  maxAirmass: z.number().min(1, 'must be at least 1').max(10).optional(),
});

export type ObservingSection = z.infer<typeof observingSchema>;
