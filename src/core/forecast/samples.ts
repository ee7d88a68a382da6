/**
 * The plan's own sampling as the forecast sees it: every tracer and starlight slit with its circularised radius
 * (Re), position angle about the galaxy centre (degrees East of North), azimuth from the major axis (galaxy frame,
 * degrees in [0, 360)) and S/N per Angstrom in the planned exposure (solver/exposure.ts).
 */
import type { GalaxyModel } from '../plan/schema';
import type { MaskSolution } from '../geometry/maskSolution';
import type { MaskExposureReport } from '../solver/exposure';
import { skyToTangentArcsec, tangentCentre } from '../sky/tangentPlane';
import { circularisedRadiusArcsec, galaxyAzimuthDeg, skyToGalaxyArcsec } from '../sky/frames';
import { PMath } from '../numeric/portableMath';

export interface SlitSample {
  maskId: string;
  slitId: string;
  objectId: string;
  radiusRe: number;
  /** Position angle of the slit about the galaxy centre, degrees East of North in [0, 360). */
  paDeg: number;
  /** Azimuth from the galaxy's major axis (phi = atan2(v, u)), degrees in [0, 360). */
  azimuthDeg: number;
  snPerA: number;
  /** Catalog magnitude (tracers) or mean surface brightness, mag/arcsec^2 (starlight); null when unknown. */
  mag: number | null;
  muMagPerArcsec2: number | null;
  /** Slit area, arcsec^2 (starlight flux weights). */
  areaArcsec2: number;
}

/** Tracer and starlight samples of the solved masks with the S/N of their exposure estimates. */
export function slitSamples(galaxy: GalaxyModel, masks: readonly MaskSolution[], exposures: readonly MaskExposureReport[]): { tracers: SlitSample[]; starlight: SlitSample[] } {
  const centre = tangentCentre(galaxy.raDeg, galaxy.decDeg);
  const sn = new Map<string, { snPerA: number; mu: number | null }>();
  for (const e of exposures) for (const s of e.slits) sn.set(`${e.maskId}\u0000${s.slitId}`, { snPerA: s.snPerA, mu: s.muMagPerArcsec2 });
  const tracers: SlitSample[] = [], starlight: SlitSample[] = [];
  for (const m of masks) {
    for (const s of m.slits) {
      if (s.role !== 'tracer' && s.role !== 'starlight') continue;
      const t = skyToTangentArcsec(centre, s.raDeg, s.decDeg);
      const est = sn.get(`${m.mask.id}\u0000${s.slitId}`);
      if (!t || !est) continue;
      const g = skyToGalaxyArcsec(t.xiArcsec, t.etaArcsec, galaxy.paDeg);
      const pa = (PMath.atan2(t.xiArcsec, t.etaArcsec) * 180) / Math.PI;
      const sample: SlitSample = {
        maskId: m.mask.id, slitId: s.slitId, objectId: s.objectId,
        radiusRe: circularisedRadiusArcsec(g.uArcsec, g.vArcsec, galaxy.axisRatio) / galaxy.reArcsec,
        paDeg: (pa + 360) % 360, azimuthDeg: (galaxyAzimuthDeg(g.uArcsec, g.vArcsec) + 360) % 360,
        snPerA: est.snPerA, mag: s.mag, muMagPerArcsec2: est.mu, areaArcsec2: (s.lenBelowArcsec + s.lenAboveArcsec) * s.widthArcsec,
      };
      (s.role === 'tracer' ? tracers : starlight).push(sample);
    }
  }
  return { tracers, starlight };
}
