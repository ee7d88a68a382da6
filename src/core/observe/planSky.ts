/**
 * The sky a plan is observed under (AB mag/arcsec^2 at the science wavelength): the dark sky brightened by the Moon of
 * the plan's `observing` section (Krisciunas & Schaefer 1991, observe/moonSky.ts). The Moon is taken from
 * `observing.moon` when given (explicit values win; the galaxy then at its transit altitude), else computed for
 * `observing.date` / `observing.dateRange` at the design time (observe/moonAtDate.ts); without either, the dark sky.
 */
import { moonlitSkyMagPerArcsec2, type MoonGeometry } from './moonSky';
import { designMomentJd, moonAtTime, type MoonAtTime } from './moonAtDate';
import { altitudeDeg } from './horizon';
import type { SiteGeodetic } from './moon';
import type { ObservingSection } from '../plan/observingSection';
import { AB_MINUS_VEGA_MAG, resolvePhotometry, type PhotometrySection } from '../plan/photometry';

/** V-band extinction (mag per airmass) when none is given: a good dark site (common practice value). */
export const DEFAULT_EXTINCTION_V = 0.15;

/** The Moon the plan's sky uses: where it comes from and its geometry (null: no Moon, dark sky). */
export interface PlanMoon {
  source: 'given' | 'date';
  geometry: MoonGeometry;
  /** The computed Moon at the design time (source 'date'). */
  computed?: MoonAtTime;
}

/** The Moon of a plan's observing section for a galaxy at J2000 (raDeg, decDeg) seen from `site`; null without one. */
export function planMoon(observing: ObservingSection | undefined, site: SiteGeodetic, galaxy: { raDeg: number; decDeg: number }): PlanMoon | null {
  const moon = observing?.moon;
  if (moon) {
    return {
      source: 'given',
      geometry: {
        phaseAngleDeg: moon.phaseAngleDeg, separationDeg: moon.separationDeg, moonZenithDeg: 90 - moon.altitudeDeg,
        targetZenithDeg: Math.min(89, 90 - altitudeDeg(0, galaxy.decDeg, site.latDeg)), extinctionV: moon.extinctionV ?? DEFAULT_EXTINCTION_V,
      },
    };
  }
  const jd = observing ? designMomentJd({ date: observing.date, dateRange: observing.dateRange as [string, string] | undefined, designHourAngleH: observing.designHourAngleH }, galaxy, site) : null;
  if (jd === null) return null;
  const c = moonAtTime(jd, galaxy, site);
  return {
    source: 'date', computed: c,
    geometry: {
      phaseAngleDeg: c.phaseAngleDeg, separationDeg: c.separationDeg, moonZenithDeg: 90 - c.altitudeDeg,
      targetZenithDeg: Math.min(89, 90 - c.galaxyAltitudeDeg), extinctionV: DEFAULT_EXTINCTION_V,
    },
  };
}

/** AB - Vega of the catalog's band (the Moon's V light is moved to it): the plan's offset, else the table's I. */
export function bandAbMinusVegaMag(photometry: PhotometrySection | undefined): number {
  const ph = resolvePhotometry(photometry);
  return ph.system === 'Vega' ? ph.catalogToAbMag : AB_MINUS_VEGA_MAG[ph.band] ?? AB_MINUS_VEGA_MAG.I;
}

/** The plan's sky (AB mag/arcsec^2): `darkSkyAbMagPerArcsec2` plus the plan's Moon, summed in flux. */
export function planSkyMagPerArcsec2(darkSkyAbMagPerArcsec2: number, observing: ObservingSection | undefined, photometry: PhotometrySection | undefined, site: SiteGeodetic, galaxy: { raDeg: number; decDeg: number }): number {
  const m = planMoon(observing, site, galaxy);
  return m ? moonlitSkyMagPerArcsec2(darkSkyAbMagPerArcsec2, m.geometry, bandAbMinusVegaMag(photometry)) : darkSkyAbMagPerArcsec2;
}
