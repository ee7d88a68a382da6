/**
 * The catalog's photometric declaration (plan key `photometry`): the band its magnitudes (and the galaxy's muE) are
 * in, the system (AB or Vega) and the offset AB - Vega at the science wavelength. The S/N model counts photons from
 * AB magnitudes (spectro/signalToNoise.ts), so every catalog magnitude m becomes m + catalogToAbMag before counting.
 */
import { z } from 'zod';

/**
 * AB - Vega offsets (mag) by band: Blanton & Roweis 2007, AJ 133, 734, Table 1 (I = Cousins I; i, z of the usual
 * five-band system; R = Cousins R; V = Johnson V).
 */
export const AB_MINUS_VEGA_MAG: Readonly<Record<string, number>> = { I: 0.45, i: 0.37, z: 0.54, R: 0.21, V: 0.02 };
export const AB_MINUS_VEGA_SOURCE = 'Blanton & Roweis 2007, AJ 133, 734, Table 1';

export const photometrySchema = z
  .looseObject({
    /** Band of the catalog magnitudes, e.g. "I". */
    band: z.string().min(1, 'name the band of the catalog magnitudes, e.g. "I"'),
    /** Magnitude system of the catalog. */
    system: z.enum(['AB', 'Vega'], { message: 'must be "AB" or "Vega"' }),
    /** AB - Vega (mag) in this band at the science wavelength; defaults to the table value for a known band. */
    abMinusVegaMag: z.number().min(-3, 'must be between -3 and 3 mag').max(3, 'must be between -3 and 3 mag').optional(),
    /** Where the offset comes from (named in the summary). */
    source: z.string().optional(),
  })
  .superRefine((p, ctx) => {
    if (p.system === 'Vega' && p.abMinusVegaMag === undefined && AB_MINUS_VEGA_MAG[p.band] === undefined) {
      ctx.addIssue({
        code: 'custom', path: ['abMinusVegaMag'],
        message: `no tabulated AB - Vega offset for band "${p.band}": give abMinusVegaMag (AB minus Vega at the science wavelength, mag) or use one of ${Object.keys(AB_MINUS_VEGA_MAG).join(', ')}`,
      });
    }
  });

export type PhotometrySection = z.infer<typeof photometrySchema>;

/** The declaration resolved: catalogToAbMag is added to a catalog magnitude (or surface brightness) to make it AB. */
export interface Photometry {
  band: string;
  system: 'AB' | 'Vega';
  catalogToAbMag: number;
  source: string;
  /** True when the plan declares nothing and the magnitudes are taken as AB. */
  assumed: boolean;
}

/** Resolve the plan's `photometry` section (absent: AB assumed, offset 0). */
export function resolvePhotometry(section: PhotometrySection | undefined): Photometry {
  if (!section) return { band: 'catalog band', system: 'AB', catalogToAbMag: 0, source: 'not declared: magnitudes taken as AB', assumed: true };
  if (section.system === 'AB') return { band: section.band, system: 'AB', catalogToAbMag: 0, source: section.source ?? 'AB magnitudes (Oke & Gunn 1983)', assumed: false };
  const given = section.abMinusVegaMag;
  return {
    band: section.band, system: 'Vega',
    catalogToAbMag: given ?? AB_MINUS_VEGA_MAG[section.band],
    source: section.source ?? (given === undefined ? `${AB_MINUS_VEGA_SOURCE} (band ${section.band})` : 'given in the plan'),
    assumed: false,
  };
}

/** One line for the plan summary: band, system and the offset applied. */
export function photometryLine(p: Photometry): string {
  if (p.assumed) return 'photometry: not declared; catalog magnitudes and muE taken as AB (declare "photometry": {"band", "system"} in the plan)';
  if (p.system === 'AB') return `photometry: ${p.band} band, AB magnitudes (${p.source})`;
  return `photometry: ${p.band} band, Vega magnitudes; AB = Vega ${p.catalogToAbMag >= 0 ? '+' : '-'} ${Math.abs(p.catalogToAbMag).toFixed(2)} mag (${p.source})`;
}
