/**
 * The plan's `starlight` section: integrated-starlight and sky slit settings (solver/starlight.ts places the slits;
 * docs/signal-to-noise.md lists every setting and its default). Lengths arcsec, times seconds, wavelengths Angstrom.
 */
import { z } from 'zod';

/** The plan's `starlight` section (docs/signal-to-noise.md lists every setting and its default). */
export const starlightSchema = z.looseObject({
  exposureS: z.number().positive().optional(),
  throughput: z.number().gt(0).max(1).optional(),
  skyMagPerArcsec2: z.number().min(10).max(30).optional(),
  targetSnPerA: z.number().positive().optional(),
  wavelengthA: z.number().positive().optional(),
  slitLengthArcsec: z.number().positive().optional(),
  /** Longest starlight slit (arcsec): slits lengthen with radius, up to this, to reach the S/N target (default 4 x slitLengthArcsec). */
  maxSlitLengthArcsec: z.number().positive().optional(),
  maxPerMask: z.number().int().min(0).optional(),
  skyPerMask: z.number().int().min(0).optional(),
  skyContrastMag: z.number().min(0).optional(),
  obstructedFraction: z.number().min(0).lt(1).optional(),
  /** Starlight slits are placed out to starlightReachRe + reachMarginRe (default 0.5), so the goal radius itself is reached. */
  reachMarginRe: z.number().min(0).optional(),
  /** false: starlight slits only in the space the tracers leave free (default true: trade where the objective gains). */
  displaceTracers: z.boolean().optional(),
  readNoiseE: z.number().min(0).optional(),
  darkEPerPixelPerS: z.number().min(0).optional(),
  yArcsecPerPixel: z.number().positive().optional(),
});
export type StarlightRules = z.infer<typeof starlightSchema>;
