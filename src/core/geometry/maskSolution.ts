/**
 * Solver types. Mask frame: x along the dispersion, y along the slits, arcsec, about the mask
 * centre (gnomonic) at position angle paDeg (East of North).
 */

import type { SlitShape } from './slitGeometry';

export type SlitRole = 'tracer' | 'starlight' | 'sky' | 'alignment';

/** A mask pointing: centre in ICRS degrees and PA in degrees East of North, [0, 360). */
export interface MaskPointing {
  id: string;
  raDeg: number;
  decDeg: number;
  paDeg: number;
  locked: boolean;
  /** Profile id of the mask's spectrograph in a plan with several (plan key `instruments`); absent with one. */
  instrument?: string;
}

/** One slit or alignment box, exactly the columns of slits.csv; its mask-frame shape is a SlitShape. */
export interface Slit extends SlitShape {
  maskId: string;
  slitId: string;
  objectId: string;
  role: SlitRole;
  raDeg: number;
  decDeg: number;
  priority: number;
  /** Magnitude of the object, or null for starlight and sky slits. */
  mag: number | null;
}

/** The slits chosen for one mask. */
export interface MaskSolution {
  mask: MaskPointing;
  slits: Slit[];
}
