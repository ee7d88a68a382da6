/**
 * Coverage of a solved plan, per slit role: counts per radial bin of 1 Re (circularised elliptical radius
 * R = sqrt(q u^2 + v^2/q) in the galaxy frame, u along the major axis) out to the role's goal, counts per azimuthal
 * sector of 45 degrees (phi = atan2(v, u) measured from the +u major axis towards +v, in [0, 360), not folded),
 * and the largest R/Re reached. Positions are the slit rows' (ra, dec), projected about the galaxy centre.
 */
import { galaxyRadiusAndAzimuth } from '../sky/galaxyRadius';
import type { GalaxyModel } from '../plan/schema';
import type { Slit, SlitRole } from '../geometry/maskSolution';
import type { GoalStatus } from './goals';
import type { StarlightBinsFile } from '../solver/starlightBins';

export const COVERAGE_FORMAT = 'haloweave.coverage/1';
export const SECTOR_COUNT = 8;
export const SECTOR_WIDTH_DEG = 45;

export interface RadialBin { fromRe: number; toRe: number; count: number }
export interface SectorBin { fromDeg: number; toDeg: number; count: number }

export interface RoleCoverage {
  /** Goal radius in Re (tracerReachRe for tracers, starlightReachRe for starlight, tracerReachRe for the others). */
  goalRe: number;
  count: number;
  radialBins: RadialBin[];
  /** Rows beyond the goal radius (not in any radial bin). */
  beyondGoal: number;
  sectors: SectorBin[];
  /** Largest R/Re of any row of this role (0 when there is none). */
  maxReachRe: number;
  /** Radial bins (by fromRe) with no row. */
  emptyBinsFromRe: number[];
}

export interface CoverageReport {
  format: typeof COVERAGE_FORMAT;
  galaxyId: string;
  reArcsec: number;
  radius: string;
  sectorConvention: { count: number; widthDeg: number; zero: string; direction: string; folded: boolean };
  roles: Record<SlitRole, RoleCoverage>;
  /** The plan's goals against the result (coverage/goals.ts), added when coverage.json is written: [{name, target, achieved, met, reason}]. */
  goals?: GoalStatus[];
  /** Integrated starlight per bin (solver/starlightBins.ts), added by the planning pipeline when starlight is on. */
  starlightBins?: StarlightBinsFile;
}

const ROLES: SlitRole[] = ['tracer', 'starlight', 'sky', 'alignment'];

/** Coverage per role of the slit rows (all masks together) against the goals (radii in Re). */
export function coverageReport(galaxy: GalaxyModel, goals: { tracerReachRe: number; starlightReachRe: number }, slits: readonly Slit[]): CoverageReport {
  const roles = {} as Record<SlitRole, RoleCoverage>;
  for (const role of ROLES) {
    const goalRe = role === 'starlight' ? goals.starlightReachRe : goals.tracerReachRe;
    const nBins = Math.ceil(goalRe - 1e-12);
    const radialBins: RadialBin[] = Array.from({ length: Math.max(0, nBins) }, (_, i) => ({ fromRe: i, toRe: Math.min(i + 1, goalRe), count: 0 }));
    const sectors: SectorBin[] = Array.from({ length: SECTOR_COUNT }, (_, i) => ({ fromDeg: i * SECTOR_WIDTH_DEG, toDeg: (i + 1) * SECTOR_WIDTH_DEG, count: 0 }));
    let count = 0, beyondGoal = 0, maxReachRe = 0;
    for (const s of slits) {
      if (s.role !== role) continue;
      count++;
      const { rRe, phiDeg } = galaxyRadiusAndAzimuth(galaxy, s.raDeg, s.decDeg);
      if (rRe > maxReachRe) maxReachRe = rRe;
      if (rRe < goalRe) radialBins[Math.floor(rRe)].count++;
      else beyondGoal++;
      sectors[Math.min(SECTOR_COUNT - 1, Math.floor(phiDeg / SECTOR_WIDTH_DEG))].count++;
    }
    roles[role] = { goalRe, count, radialBins, beyondGoal, sectors, maxReachRe, emptyBinsFromRe: radialBins.filter((b) => b.count === 0).map((b) => b.fromRe) };
  }
  return {
    format: COVERAGE_FORMAT,
    galaxyId: galaxy.id,
    reArcsec: galaxy.reArcsec,
    radius: 'circularised elliptical radius R = sqrt(q u^2 + v^2 / q) in units of Re; bins [fromRe, toRe)',
    sectorConvention: { count: SECTOR_COUNT, widthDeg: SECTOR_WIDTH_DEG, zero: 'major axis (+u, at the galaxy PA East of North)', direction: 'towards +v (phi = atan2(v, u))', folded: false },
    roles,
  };
}
