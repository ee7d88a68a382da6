/**
 * Each mask's own footprint in a plan with several spectrographs: the polygon of its `instrument` profile (a bundled
 * profile, io/profiles.ts), in the mask frame (arcsec, x along dispersion, y along slits), flattened for Konva, with
 * its top y for the rotate handle. The same arrays are returned for a profile every time, so memoised shapes keep them.
 */
import type { InstrumentProfile } from '../../core/profile/schema';
import { bundledProfileFor } from '../io/profiles';

export interface FootprintShape {
  /** The polygon [[x, y], ...] (arcsec, mask frame), for hit tests. */
  polygon: readonly (readonly [number, number])[];
  points: number[];
  yMaxArcsec: number;
}

const shapes = new WeakMap<InstrumentProfile, FootprintShape>();

/** The flattened polygon and top y (arcsec) of a profile's footprint (cached per profile object). */
export function footprintShape(profile: InstrumentProfile): FootprintShape {
  let s = shapes.get(profile);
  if (!s) shapes.set(profile, (s = { polygon: profile.footprint as FootprintShape['polygon'], points: profile.footprint.flatMap((c) => [c[0], c[1]]), yMaxArcsec: Math.max(...profile.footprint.map((c) => c[1])) }));
  return s;
}

/** The footprint of a mask: its own instrument's profile when it names a bundled one other than the document's, else the document's. */
export function maskFootprint(docProfile: InstrumentProfile, instrument: string | undefined): FootprintShape {
  const own = instrument !== undefined && instrument !== docProfile.id ? bundledProfileFor(instrument) : undefined;
  return footprintShape(own ?? docProfile);
}
