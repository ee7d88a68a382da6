/**
 * The starting layout of a plan with several spectrographs (plan/instruments.ts has already given every mask its
 * `instrument`): placed masks stay; the unplaced ones are laid out profile by profile, smallest footprint first,
 * along the galaxy's axes +u, -u, +v, -v (galaxy frame, u major axis), each mask beyond what the masks before it
 * already cover in its direction (but its centre no farther out than goals.tracerReachRe), its long side along that direction. So the narrow fields start in the inner halo
 * and the wide fields farther out, as an observer sharing one galaxy between two telescopes would lay them out;
 * the pointing search moves them from there. With one profile: pointingSearch.naiveCrossLayout.
 */
import type { GalaxyModel, PlanFile } from '../plan/schema';
import { polygonBounds, type Corner } from '../geometry/polygon';
import { wrap360Deg } from '../sky/angles';
import { galaxyToSkyArcsec } from '../sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../sky/tangentPlane';
import type { AllocationContext } from './allocateMasks';
import { contextFor } from './maskContext';
import { naiveCrossLayout } from './pointingSearch';
import type { MaskPointing } from '../geometry/maskSolution';

/** Start pointings of every mask (see the module comment); each carries its `instrument` in a mixed plan. */
export function instrumentsCrossLayout(plan: PlanFile, galaxy: GalaxyModel, ctx: AllocationContext): MaskPointing[] {
  if (!ctx.byInstrument) return naiveCrossLayout(plan, galaxy, ctx.profile);
  const masks = plan.masks ?? [];
  const order = new Map([...ctx.byInstrument.values()].map((c) => [c.profile.id, footprintAreaArcsec2(c.profile.footprint)]));
  const unplaced = masks.filter((m) => m.raDeg === undefined || m.decDeg === undefined)
    .map((m, k) => ({ m, k, area: order.get(m.instrument ?? '') ?? 0 }))
    .sort((a, b) => a.area - b.area || a.k - b.k);
  const usedArcsec = [0, 0, 0, 0];
  const centre = tangentCentre(galaxy.raDeg, galaxy.decDeg);
  const placed = new Map<string, MaskPointing>();
  let groupStart = 0, lastArea = NaN;
  unplaced.forEach(({ m, area }, j) => {
    if (area !== lastArea) { groupStart = j; lastArea = area; }
    const profile = contextFor(ctx, m).profile;
    const b = polygonBounds(profile.footprint);
    const longIsY = b.maxY - b.minY >= b.maxX - b.minX;
    const halfLong = (longIsY ? b.maxY - b.minY : b.maxX - b.minX) / 2;
    // Each profile's masks start again at +u, so every group lies beyond the one before it on the same axes.
    const dir = (j - groupStart) % 4, alongMajor = dir < 2, sign = dir % 2 === 0 ? 1 : -1;
    // Never farther out than the tracer goal along that axis (the ellipse of R = tracerReachRe: u = R/sqrt(q), v = R sqrt(q)).
    const reachArcsec = plan.goals.tracerReachRe * galaxy.reArcsec * (alongMajor ? 1 / Math.sqrt(galaxy.axisRatio) : Math.sqrt(galaxy.axisRatio));
    const offset = Math.min(usedArcsec[dir] + halfLong, Math.max(halfLong, reachArcsec));
    usedArcsec[dir] += 2 * halfLong;
    const u = alongMajor ? sign * offset : 0, v = alongMajor ? 0 : sign * offset;
    const dirPa = alongMajor ? galaxy.paDeg : galaxy.paDeg + 90;
    const s = galaxyToSkyArcsec(u, v, galaxy.paDeg);
    const p = tangentToSkyDeg(centre, s.xiArcsec, s.etaArcsec);
    placed.set(m.id, { id: m.id, raDeg: p.raDeg, decDeg: p.decDeg, paDeg: wrap360Deg(m.paDeg ?? (longIsY ? dirPa : dirPa - 90)), locked: m.locked ?? false });
  });
  return masks.map((m) => {
    const own = m.instrument !== undefined ? { instrument: contextFor(ctx, m).profile.id } : {};
    const p = placed.get(m.id);
    if (p) return { ...p, ...own };
    return { id: m.id, raDeg: wrap360Deg(m.raDeg!), decDeg: m.decDeg!, paDeg: wrap360Deg(m.paDeg ?? galaxy.paDeg), locked: m.locked ?? false, ...own };
  });
}

/** Area (arcsec^2) of a footprint polygon (shoelace formula, either orientation). */
function footprintAreaArcsec2(polygon: readonly Corner[]): number {
  let a = 0;
  for (let i = 0; i < polygon.length; i++) {
    const [x1, y1] = polygon[i], [x2, y2] = polygon[(i + 1) % polygon.length];
    a += x1 * y2 - x2 * y1;
  }
  return Math.abs(a) / 2;
}
