/**
 * The plan file (`*.plan.json`, format `haloweave.plan/1`), input of a planning run and output
 * `solved.plan.json`. Interface contract, "Plan file". RA/Dec in degrees or sexagesimal text,
 * PAs in degrees East of North, Re in arcsec (circularised), velocities km/s, wavelengths Angstrom (air).
 * Unknown keys are kept so that a plan round-trips through the tool without loss.
 */
import { z } from 'zod';
import { parseDecDeg, parseRaDeg } from '../sky/sexagesimal';
import { weightingSchema } from './weightingSection';
import { starlightSchema } from './starlightSection';
import { searchSchema } from './searchSection';
import { observingSchema } from './observingSection';
import { photometrySchema } from './photometry';
import { forecastSectionSchema } from './forecastSection';

export const PLAN_FORMAT = 'haloweave.plan/1';

const angleText = z.union([z.number(), z.string()]);

/** RA in degrees or text, validated by the sexagesimal parser. */
const raField = angleText.superRefine((v, ctx) => {
  const r = parseRaDeg(v);
  if (!r.ok) ctx.addIssue({ code: 'custom', message: r.error });
});
const decField = angleText.superRefine((v, ctx) => {
  const r = parseDecDeg(v);
  if (!r.ok) ctx.addIssue({ code: 'custom', message: r.error });
});

export const galaxySchema = z.looseObject({
  id: z.string().min(1),
  ra: raField,
  dec: decField,
  reArcsec: z.number().positive('must be greater than 0 (effective radius in arcsec)'),
  axisRatio: z.number().gt(0, 'must be in (0, 1]').max(1, 'must be in (0, 1]'),
  paDeg: z.number().min(-360).max(360),
  distanceMpc: z.number().positive(),
  vsysKms: z.number().min(-1000).max(30000),
  sersicN: z.number().min(0.2).max(20),
  muE: z.number().min(10).max(35),
});

export const goalsSchema = z.looseObject({
  masks: z.number().int().min(1).max(50),
  tracerReachRe: z.number().positive(),
  starlightReachRe: z.number().min(0),
  linesA: z.array(z.number().positive()).min(1, 'list at least one rest wavelength in Angstrom'),
  /** Wavelength rule: line-of-sight velocities v_sys +- this (km/s) must keep every line on the detector (default 500). */
  velocityHalfRangeKms: z.number().min(0, 'must be 0 or more (km/s about the systemic velocity)').max(5000, 'must be at most 5000 km/s').optional(),
  /** Wavelength rule: half-width (Angstrom) kept around each redshifted line for the line and its continuum (default 10). */
  lineHalfWindowA: z.number().min(0, 'must be 0 or more (Angstrom on each side of the line)').max(500, 'must be at most 500 Angstrom').optional(),
  /** S/N per Angstrom the tracer slits are exposed for: drives the forecast's hours per mask (docs/forecast.md). */
  tracerSnPerA: z.number().positive('must be greater than 0 (signal-to-noise per Angstrom)').max(1000, 'must be at most 1000').optional(),
});

export const planMaskSchema = z.looseObject({
  id: z.string().min(1),
  raDeg: z.number().min(0).max(360).optional(),
  decDeg: z.number().min(-90).max(90).optional(),
  paDeg: z.number().min(-360).max(360).optional(),
  locked: z.boolean().optional(),
  /** Hour angle (hours) the mask is designed for; used by the refraction report. */
  designHourAngleH: z.number().min(-12).max(12).optional(),
  /** The mask's own spectrograph in a plan with `instruments`: one of their `profile` values, or that profile's id. */
  instrument: z.string().min(1, 'name one of the plan\'s instruments (profile id or path)').optional(),
});

/** The observing keys one spectrograph of a mixed plan may set for its own masks (plan/instruments.ts instrumentSections). */
export const instrumentObservingSchema = observingSchema.pick({
  exposureTimeS: true, targetSnPerA: true, seeingFwhmArcsec: true, maxAirmass: true, moon: true, skySystematicFraction: true, guideWavelengthA: true,
});

/** One spectrograph of a mixed plan (contract revision 2): a profile id or path, and how many masks it takes. */
export const planInstrumentSchema = z.looseObject({
  profile: z.string().min(1, 'name a profile id or a path to a profile file'),
  masks: z.number().int('must be a whole number of masks').min(0).max(50),
  /** Observing settings of this spectrograph's masks (exposure time, target S/N, seeing...), over the plan's `observing`. */
  observing: instrumentObservingSchema.optional(),
});

export const columnMappingSchema = z.looseObject({
  id: z.string().optional(),
  ra: z.string().optional(),
  dec: z.string().optional(),
  mag: z.string().optional(),
  color: z.string().optional(),
  priority: z.string().optional(),
  role: z.string().optional(),
  raUnit: z.enum(['deg', 'hour']).optional(),
});

/** Per-target edits made in the editor or by hand: a weight that overrides every rule, and forcing in or out. */
export const targetOverrideSchema = z.looseObject({
  weight: z.number().min(0).optional(),
  force: z.enum(['in', 'out']).optional(),
});

/**
 * Slit allocation settings (pipeline/pipeline.ts, lengthening stage): `maxSlitLengthArcsec` caps a lengthened slit's
 * total length along the mask y axis (arcsec; default a multiple of the profile's slits.minLengthArcsec).
 */
export const allocationSchema = z.looseObject({
  maxSlitLengthArcsec: z.number().positive('must be a positive length in arcsec').optional(),
});

export const planSchema = z.looseObject({
  format: z.literal(PLAN_FORMAT, { message: `must be "${PLAN_FORMAT}"` }),
  galaxy: galaxySchema,
  /** The spectrograph of every mask (profile id or path); or, instead, `instruments` (plan/instruments.ts). */
  instrument: z.string().min(1, 'name a profile id or a path to a profile file').optional(),
  instruments: z.array(planInstrumentSchema).min(1, 'list at least one spectrograph').optional(),
  catalog: z.string().min(1, 'give the catalog path, relative to the plan file'),
  catalogColumns: columnMappingSchema.optional(),
  goals: goalsSchema,
  masks: z.array(planMaskSchema).optional(),
  targetOverrides: z.record(z.string(), targetOverrideSchema).optional(),
  /** Target weighting rules (solver/weighting). */
  weighting: weightingSchema.optional(),
  /** Integrated-starlight and sky slit settings (solver/starlight). */
  starlight: starlightSchema.optional(),
  /** Pointing search settings (solver/pointingSearch). */
  search: searchSchema.optional(),
  /** Observing conditions for refraction and exposure (observe/). */
  observing: observingSchema.optional(),
  /** Slit allocation settings (see allocationSchema). */
  allocation: allocationSchema.optional(),
  /** Band and magnitude system of the catalog (plan/photometry); absent: AB assumed. */
  photometry: photometrySchema.optional(),
  /** Assumptions of the science forecast (plan/forecastSection). */
  forecast: forecastSectionSchema.optional(),
});

export type PlanFile = z.infer<typeof planSchema>;
export type PlanMask = z.infer<typeof planMaskSchema>;
export type PlanInstrument = z.infer<typeof planInstrumentSchema>;

/** The galaxy with its position in decimal degrees (ICRS). */
export interface GalaxyModel {
  id: string;
  raDeg: number;
  decDeg: number;
  reArcsec: number;
  axisRatio: number;
  /** Major-axis PA, degrees East of North. */
  paDeg: number;
  distanceMpc: number;
  vsysKms: number;
  sersicN: number;
  muE: number;
}
