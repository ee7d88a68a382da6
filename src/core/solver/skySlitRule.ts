/**
 * Where a sky slit may go: the galaxy's light there must be faint compared with the faintest galaxy light a starlight
 * slit measures, since the sky slit's spectrum is subtracted from the starlight slits' (galaxy light in it removes
 * galaxy signal from them). The faintest starlight light is the Sérsic surface brightness at the outer limit of
 * starlight placement (starlightReachRe + reachMarginRe); a sky slit needs the galaxy at least skyContrastMag fainter
 * (3 mag: under 6.3 % of it). Without starlight slits the sky itself is the reference (sky AB converted to the
 * catalog's system). Surface brightness in the catalog's band, mag/arcsec^2; radii circularised.
 */
import { sersicMuMagPerArcsec2 } from '../sky/sersic';
import type { GalaxyModel } from '../plan/schema';

export interface SkySlitRuleSettings {
  /** Outer limit of starlight placement in Re (0: no starlight slits). */
  maxRe: number;
  skyContrastMag: number;
  skyMagPerArcsec2: number;
  catalogToAbMag: number;
}

/** Faintest galaxy surface brightness (catalog band, mag/arcsec^2) a starlight slit measures, or null without starlight. */
export function faintestStarlightMu(galaxy: GalaxyModel, bn: number, s: Pick<SkySlitRuleSettings, 'maxRe'>): number | null {
  if (!(s.maxRe > 0)) return null;
  return sersicMuMagPerArcsec2(s.maxRe * galaxy.reArcsec, galaxy.reArcsec, galaxy.sersicN, galaxy.muE, bn);
}

/** The galaxy surface brightness (catalog band, mag/arcsec^2) a sky slit's position must be at least as faint as. */
export function skySlitMuThreshold(galaxy: GalaxyModel, bn: number, s: SkySlitRuleSettings): number {
  const ref = faintestStarlightMu(galaxy, bn, s) ?? s.skyMagPerArcsec2 - s.catalogToAbMag;
  return ref + s.skyContrastMag;
}
