/**
 * The plan's `weighting` section: tracer windows, exclusion regions and the weight formula's parameters
 * (solver/weighting.ts applies them; docs/weighting.md). Magnitudes in the catalog's band, radii in Re
 * (circularised), offsets in arcsec (sky frame xi East, eta North; galaxy frame u major, v minor), PAs East of North.
 */
import { z } from 'zod';
import { parseDecDeg, parseRaDeg } from '../sky/sexagesimal';

const pair = (what: string) =>
  z.tuple([z.number(), z.number()]).refine(([a, b]) => a <= b, `must be [low, high] with low <= high (${what})`);

const angleText = z.union([z.number(), z.string()]);

/** An exclusion region: a circle or an ellipse, centred on a sky position or at an offset from the galaxy centre. */
export const exclusionRegionSchema = z
  .looseObject({
    label: z.string().optional(),
    /** Centre as a sky position (degrees or sexagesimal text)... */
    ra: angleText.optional(),
    dec: angleText.optional(),
    /** ...or as a sky-frame offset from the galaxy centre (xi East, eta North, arcsec)... */
    xiArcsec: z.number().optional(),
    etaArcsec: z.number().optional(),
    /** ...or as a galaxy-frame offset (u along the major axis, v along the minor axis, arcsec). */
    uArcsec: z.number().optional(),
    vArcsec: z.number().optional(),
    /** Circle radius, or the ellipse's semi-major axis, in arcsec. */
    radiusArcsec: z.number().positive('must be greater than 0 (arcsec)'),
    /** Ellipse axis ratio b/a in (0, 1] (default 1: a circle) and major-axis PA in degrees East of North. */
    axisRatio: z.number().gt(0).max(1).optional(),
    paDeg: z.number().min(-360).max(360).optional(),
  })
  .superRefine((r, ctx) => {
    const forms = [r.ra !== undefined || r.dec !== undefined, r.xiArcsec !== undefined || r.etaArcsec !== undefined, r.uArcsec !== undefined || r.vArcsec !== undefined].filter(Boolean).length;
    if (forms !== 1) ctx.addIssue({ code: 'custom', message: 'give the centre exactly one way: ra+dec, xiArcsec+etaArcsec, or uArcsec+vArcsec' });
    if ((r.ra === undefined) !== (r.dec === undefined)) ctx.addIssue({ code: 'custom', message: 'give both ra and dec' });
    if ((r.xiArcsec === undefined) !== (r.etaArcsec === undefined)) ctx.addIssue({ code: 'custom', message: 'give both xiArcsec and etaArcsec' });
    if ((r.uArcsec === undefined) !== (r.vArcsec === undefined)) ctx.addIssue({ code: 'custom', message: 'give both uArcsec and vArcsec' });
    if (r.ra !== undefined && !parseRaDeg(r.ra).ok) ctx.addIssue({ code: 'custom', path: ['ra'], message: 'ra could not be read' });
    if (r.dec !== undefined && !parseDecDeg(r.dec).ok) ctx.addIssue({ code: 'custom', path: ['dec'], message: 'dec could not be read' });
  });

/** Parameters of the weight formula (all optional; defaults in WEIGHT_DEFAULTS). */
export const weightFormulaSchema = z.looseObject({
  magPivot: z.number().optional(),
  magSlope: z.number().min(0).optional(),
  colorPeaks: z.array(z.number()).optional(),
  colorSigma: z.number().positive().optional(),
  colorFloor: z.number().min(0).max(1).optional(),
  radiusExponent: z.number().min(-5).max(5).optional(),
});

/** The plan's `weighting` section. */
export const weightingSchema = z.looseObject({
  /** Keep tracers with bright <= mag <= faint (catalog band). */
  magRange: pair('bright, faint magnitude').optional(),
  /** Keep tracers with min <= color <= max; rows without a colour pass. */
  colorRange: pair('colour').optional(),
  /** Keep tracers with inner <= R/Re <= outer (circularised radius). */
  radiusRangeRe: pair('R/Re').optional(),
  exclusions: z.array(exclusionRegionSchema).optional(),
  formula: weightFormulaSchema.optional(),
});

export type WeightingRules = z.infer<typeof weightingSchema>;
export type ExclusionRegion = z.infer<typeof exclusionRegionSchema>;
