/**
 * The plan's `forecast` section: the assumptions behind `haloweave forecast` (docs/forecast.md). Every key is
 * optional; forecast/settings.ts fills the documented defaults. Velocities km/s, radii in effective radii (Re,
 * circularised), angles degrees East of North, magnitudes in the catalog's band, distances Mpc, times hours.
 */
import { z } from 'zod';

const positive = (what: string) => z.number().positive(`must be greater than 0 (${what})`);
const edges = z
  .array(z.number().min(0))
  .min(2, 'give at least two bin edges')
  .refine((a) => a.every((v, i) => i === 0 || v > a[i - 1]), 'bin edges must increase');

/** Schema of the plan's `forecast` section (every key optional; unknown keys kept). */
export const forecastSectionSchema = z.looseObject({
  /** The kinematic model the mocks are drawn from. */
  kinematics: z
    .looseObject({
      /** Line-of-sight velocity dispersion of the clusters at 1 Re, km/s. */
      sigmaKms: positive('km/s').max(1500).optional(),
      /** Logarithmic slope of the dispersion profile: sigma(R) = sigmaKms (R/Re)^slope. */
      sigmaSlope: z.number().min(-2).max(2).optional(),
      /** Rotation amplitude of the clusters, km/s (0: no rotation). */
      rotationKms: z.number().min(0).max(1500).optional(),
      /** Kinematic position angle (receding side), degrees East of North; default the galaxy's major-axis PA. */
      kinematicPaDeg: z.number().min(-360).max(360).optional(),
      /** Rotation amplitude of the integrated starlight, km/s. */
      starlightRotationKms: z.number().min(0).max(1500).optional(),
      /** Logarithmic slope of the clusters' 3-D number density (gamma of the mass estimator). */
      tracerDensitySlope: z.number().gt(1, 'must be greater than 1').max(6).optional(),
    })
    .optional(),
  /** From S/N per Angstrom to a velocity error (docs/forecast.md, "Velocity errors"). */
  velocityErrors: z
    .looseObject({
      /** A tracer slit below this S/N per Angstrom gives no velocity. */
      minSnPerA: positive('S/N per Angstrom').optional(),
      /** Factor on the Monte Carlo velocity errors (sky residuals, calibration: what the mock fits leave out). */
      noiseFactor: z.number().min(1, 'must be at least 1').max(20).optional(),
      /** Template-mismatch floor added in quadrature, km/s. */
      floorKms: z.number().min(0).max(200).optional(),
      /** Intrinsic Gaussian sigma of the lines, Angstrom, added in quadrature to the instrumental width. */
      intrinsicLineSigmaA: z.number().min(0).max(20).optional(),
      /** Equivalent widths of the lines of goals.linesA, Angstrom, in the same order. */
      equivalentWidthsA: z.array(positive('Angstrom')).min(1).optional(),
    })
    .optional(),
  /** Probability that a candidate is a cluster rather than a foreground star or background galaxy. */
  contamination: z
    .looseObject({
      /** Contaminant fraction among candidates at pivotRe, at the turnover magnitude and the mean colour (0..1). */
      fractionAtPivot: z.number().min(0).lt(1, 'must be below 1').optional(),
      pivotRe: positive('Re').optional(),
      /** Absolute magnitude of the cluster luminosity-function turnover in the catalog's band. */
      turnoverAbsMag: z.number().min(-15).max(0).optional(),
      /** Width (Gaussian sigma) of the cluster luminosity function, mag. */
      luminositySigmaMag: positive('mag').max(3).optional(),
      /** Contaminant counts rise as 10^(countSlope m). */
      countSlope: z.number().min(0).max(1).optional(),
      /** Cluster colour distribution (Gaussian); contaminants are taken flat in colour. Off unless given. */
      colourMean: z.number().optional(),
      colourSigma: positive('mag').optional(),
    })
    .optional(),
  /** Tracer mass estimator settings (Watkins, Evans & An 2010). */
  mass: z
    .looseObject({
      /** Logarithmic slope alpha of the potential (0: flat rotation curve; 1: point mass). */
      potentialSlope: z.number().min(-1).max(1).optional(),
      /** Velocity anisotropy beta (0: isotropic). */
      anisotropy: z.number().min(-5).lt(1, 'must be below 1').optional(),
    })
    .optional(),
  /** Distance used for kpc and the mass; its error enters the mass error. Default the galaxy's distanceMpc. */
  distanceMpc: positive('Mpc').optional(),
  distanceErrorMpc: z.number().min(0).optional(),
  /** Radial bin edges of the dispersion profile, Re; bins with fewer than minPerBin expected velocities are merged. */
  radialBinsRe: edges.optional(),
  minPerBin: z.number().int().min(2).max(1000).optional(),
  /** Starlight bins: radial edges (Re) and the number of azimuthal sectors from the major axis. */
  starlightBinsRe: edges.optional(),
  starlightSectors: z.number().int().min(1).max(36).optional(),
  /** Fraction of a mask's tracer slits that must reach the target S/N; overhead per mask, hours. */
  completeness: z.number().gt(0).max(1).optional(),
  overheadHoursPerMask: z.number().min(0).max(10).optional(),
  /** Semester for the nights estimate, YYYY-MM-DD (also --from/--to on the command line). */
  semesterFrom: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'write the date as YYYY-MM-DD').optional(),
  semesterTo: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'write the date as YYYY-MM-DD').optional(),
});

export type ForecastSection = z.infer<typeof forecastSectionSchema>;
