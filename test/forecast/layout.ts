/**
 * Synthetic layouts for the forecast tests: the demo plan and profile with tracer slits placed where a test wants
 * them (radius in Re along chosen position angles, magnitude), so the sampling is known exactly.
 */
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { parsePlan } from '../../src/core/plan/validate';
import { parseProfile } from '../../src/core/profile/load';
import { galaxyModel } from '../../src/core/plan/validate';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import type { MaskSolution, Slit } from '../../src/core/geometry/maskSolution';
import type { PlanFile } from '../../src/core/plan/schema';
import type { ForecastSection } from '../../src/core/plan/forecastSection';

const ROOT = resolve(__dirname, '../..');
export const demoPlanJson = JSON.parse(readFileSync(join(ROOT, 'examples/demo/halo-demo.plan.json'), 'utf8'));
export const profile = parseProfile(JSON.parse(readFileSync(join(ROOT, 'instrument-profiles/ridge10-narrow.json'), 'utf8')), 'ridge10-narrow');

/** The demo plan with a forecast section. */
export function planWith(forecast: ForecastSection, extra: Record<string, unknown> = {}): PlanFile {
  // Magnitudes in these tests are AB (the demo plan's own catalog is Vega I), so a magnitude here is what is counted.
  return parsePlan({ ...demoPlanJson, masks: [], forecast, photometry: { band: 'I', system: 'AB' }, ...extra });
}

/** One mask (centred on the galaxy, PA 0) holding slits at (radiusRe, paDeg) pairs of the plan's galaxy, each of magnitude mag. */
export function tracerLayout(plan: PlanFile, points: readonly { radiusRe: number; paDeg: number; mag: number; role?: 'tracer' | 'starlight' | 'sky' }[]): MaskSolution[] {
  const g = galaxyModel(plan);
  const centre = tangentCentre(g.raDeg, g.decDeg);
  const slits: Slit[] = points.map((p, i) => {
    // Radius along the PA in the sky; on the galaxy's major axis (PA = galaxy PA) the circularised radius is R sqrt(q).
    const rArcsec = p.radiusRe * g.reArcsec;
    const xi = rArcsec * Math.sin((p.paDeg * Math.PI) / 180), eta = rArcsec * Math.cos((p.paDeg * Math.PI) / 180);
    const sky = tangentToSkyDeg(centre, xi, eta);
    return {
      maskId: 'm1', slitId: `s${i + 1}`, objectId: `o${i + 1}`, role: p.role ?? 'tracer', raDeg: sky.raDeg, decDeg: sky.decDeg, priority: 1,
      mag: p.role === 'starlight' || p.role === 'sky' ? null : p.mag, xArcsec: xi, yArcsec: eta, // mask at the galaxy centre, PA 0: x = xi, y = eta
      lenBelowArcsec: 3, lenAboveArcsec: 3, widthArcsec: 1, tiltDeg: 0,
    };
  });
  return [{ mask: { id: 'm1', raDeg: g.raDeg, decDeg: g.decDeg, paDeg: 0, locked: true }, slits }];
}

/** n points at one radius (Re, as drawn on the sky) with position angles evenly spread around the circle. */
export function ring(n: number, radiusRe: number, mag: number, offsetDeg = 0): { radiusRe: number; paDeg: number; mag: number }[] {
  return Array.from({ length: n }, (_, i) => ({ radiusRe, paDeg: (offsetDeg + (360 * i) / n) % 360, mag }));
}
