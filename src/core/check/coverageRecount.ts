/**
 * The checker's recount of coverage.json from slits.csv: every row's ra_deg/dec_deg projected about the galaxy
 * centre of solved.plan.json (gnomonic, sky frame xi East, eta North, arcsec), turned into the galaxy frame and the
 * circularised radius by the contract's formulas (u = xi sin theta + eta cos theta, v = xi cos theta - eta sin theta,
 * R = sqrt(q u^2 + v^2/q), phi = atan2(v, u) in [0, 360) from the major axis), then counted per role into the bins
 * and sectors coverage.json declares. It shares no code with the solver's coverage module.
 */
import type { GalaxyModel } from '../plan/schema';
import type { Slit } from '../geometry/maskSolution';
import { skyToTangentArcsec, tangentCentre } from '../sky/tangentPlane';
import type { Violation } from './checkOutput';
import { PMath } from '../numeric/portableMath';

/** A row this close (in R/Re, or degrees of azimuth) to a bin edge may be counted in either bin. */
export const BIN_EDGE_TOL = 1e-9;
/** Relative tolerance on the largest R/Re. */
export const REACH_TOL = 1e-6;

const ROLES = ['tracer', 'starlight', 'sky', 'alignment'] as const;
const DEG = Math.PI / 180;

/** R/Re and azimuth (degrees from the major axis towards +v, [0, 360)) of a sky position about the galaxy. */
export function radiusReAndAzimuthDeg(g: GalaxyModel, raDeg: number, decDeg: number): { rRe: number; phiDeg: number } {
  const t = skyToTangentArcsec(tangentCentre(g.raDeg, g.decDeg), raDeg, decDeg);
  if (!t) return { rRe: Infinity, phiDeg: 0 };
  const th = g.paDeg * DEG;
  const u = t.xiArcsec * PMath.sin(th) + t.etaArcsec * PMath.cos(th);
  const v = t.xiArcsec * PMath.cos(th) - t.etaArcsec * PMath.sin(th);
  const q = g.axisRatio;
  const phi = PMath.atan2(v, u) / DEG;
  return { rRe: Math.sqrt(q * u * u + (v * v) / q) / g.reArcsec, phiDeg: phi < 0 ? phi + 360 : phi };
}

interface Bin { from: number; to: number; count: unknown }

/** Rows surely in [from, to) and rows that may be (within BIN_EDGE_TOL of an edge). */
function countIn(values: readonly number[], from: number, to: number): { lo: number; hi: number; exact: number } {
  let lo = 0, hi = 0, exact = 0;
  for (const x of values) {
    if (x >= from && x < to) exact++;
    if (x >= from + BIN_EDGE_TOL && x < to - BIN_EDGE_TOL) lo++;
    if (x >= from - BIN_EDGE_TOL && x < to + BIN_EDGE_TOL) hi++;
  }
  return { lo, hi, exact };
}

const isObj = (x: unknown): x is Record<string, unknown> => !!x && typeof x === 'object' && !Array.isArray(x);
const num = (x: unknown): number | null => (typeof x === 'number' && Number.isFinite(x) ? x : null);

export interface CoverageCheckInput {
  /** coverage.json, parsed. */
  coverage: unknown;
  galaxy: GalaxyModel;
  goals: { tracerReachRe: number; starlightReachRe: number };
  slits: readonly Slit[];
  coverageSource?: string;
  slitsSource?: string;
}

/** Every disagreement between coverage.json and a recount from slits.csv (empty when they agree). */
export function checkCoverage(input: CoverageCheckInput): Violation[] {
  const out: Violation[] = [];
  const src = input.coverageSource ?? 'coverage.json';
  const slitsSrc = input.slitsSource ?? 'slits.csv';
  const cov = input.coverage;
  const roles = isObj(cov) && isObj(cov.roles) ? cov.roles : null;
  if (!roles) return [{ where: `${src} roles`, rule: 'coverage', what: 'there is no "roles" object (one entry per slit role)' }];
  const conv = isObj(cov) && isObj(cov.sectorConvention) ? cov.sectorConvention : {};
  const folded = conv.folded === true;
  for (const role of ROLES) {
    const key = `roles.${role}`;
    const rc = roles[role];
    const rows = input.slits.filter((s) => s.role === role);
    if (!isObj(rc)) {
      out.push({ where: `${src} ${key}`, rule: 'coverage', what: `missing (slits.csv has ${rows.length} ${role} rows)` });
      continue;
    }
    const pos = rows.map((s) => radiusReAndAzimuthDeg(input.galaxy, s.raDeg, s.decDeg));
    const radii = pos.map((p) => p.rRe);
    // Folded sectors: the azimuth mirrored about the major axis into [0, 180].
    const phis = pos.map((p) => (folded && p.phiDeg > 180 ? 360 - p.phiDeg : p.phiDeg));
    if (rc.count !== undefined && rc.count !== rows.length) out.push({ where: `${src} ${key}.count`, rule: 'coverage', what: `${String(rc.count)}, but ${slitsSrc} has ${rows.length} ${role} rows` });

    // Radial bins: tracers and starlight out to their goal in bins of 1 Re; every role counted in the bins it declares.
    const bins: Bin[] = Array.isArray(rc.radialBins) ? rc.radialBins.map((b) => (isObj(b) ? { from: num(b.fromRe) ?? NaN, to: num(b.toRe) ?? NaN, count: b.count } : { from: NaN, to: NaN, count: undefined })) : [];
    if (!Array.isArray(rc.radialBins)) out.push({ where: `${src} ${key}.radialBins`, rule: 'coverage', what: 'missing (counts per radial bin of 1 Re)' });
    const goal = role === 'tracer' ? input.goals.tracerReachRe : role === 'starlight' ? input.goals.starlightReachRe : null;
    if (goal !== null && Array.isArray(rc.radialBins)) {
      const n = Math.ceil(goal - 1e-12);
      const layoutOk = bins.length === n && bins.every((b, i) => Math.abs(b.from - i) < 1e-9 && Math.abs(b.to - Math.min(i + 1, goal)) < 1e-9);
      if (!layoutOk) out.push({ where: `${src} ${key}.radialBins`, rule: 'coverage', what: `${bins.length} bins ${bins.map((b) => `[${b.from}, ${b.to})`).join(' ')}; the goal of ${goal} Re in solved.plan.json needs ${n} bins of 1 Re from 0` });
    }
    bins.forEach((b, i) => {
      if (!(b.from < b.to)) { out.push({ where: `${src} ${key}.radialBins[${i}]`, rule: 'coverage', what: 'fromRe/toRe are not an interval' }); return; }
      const c = countIn(radii, b.from, b.to);
      if (typeof b.count !== 'number' || b.count < c.lo || b.count > c.hi) {
        out.push({ where: `${src} ${key}.radialBins[${i}].count`, rule: 'coverage', what: `${String(b.count)}, but ${slitsSrc} has ${c.exact} ${role} rows with ${b.from} <= R/Re < ${b.to} (recounted from ra_deg/dec_deg about the galaxy of solved.plan.json)` });
      }
    });
    if (rc.beyondGoal !== undefined && bins.length && bins.every((b) => Number.isFinite(b.to))) {
      const edge = Math.max(...bins.map((b) => b.to));
      const c = countIn(radii, edge, Infinity);
      if (typeof rc.beyondGoal !== 'number' || rc.beyondGoal < c.lo || rc.beyondGoal > c.hi) out.push({ where: `${src} ${key}.beyondGoal`, rule: 'coverage', what: `${String(rc.beyondGoal)}, but ${slitsSrc} has ${c.exact} ${role} rows at R/Re >= ${edge}` });
    }

    // Every row is in exactly one bin or beyond the goal (the per-bin tolerance must not let a row vanish or double).
    if (typeof rc.beyondGoal === 'number' && bins.every((b) => typeof b.count === 'number')) {
      const sum = bins.reduce((a, b) => a + (b.count as number), 0) + rc.beyondGoal;
      if (sum !== rows.length) out.push({ where: `${src} ${key}.radialBins`, rule: 'coverage', what: `the bin counts plus beyondGoal sum to ${sum}, but ${slitsSrc} has ${rows.length} ${role} rows` });
    }

    // Sectors: 8 of 45 degrees from the major axis.
    if (!Array.isArray(rc.sectors) || rc.sectors.length !== 8) {
      out.push({ where: `${src} ${key}.sectors`, rule: 'coverage', what: `needs 8 azimuthal sectors of 45 deg, found ${Array.isArray(rc.sectors) ? rc.sectors.length : 'none'}` });
    } else {
      rc.sectors.forEach((b, i) => {
        const from = isObj(b) ? num(b.fromDeg) : null, to = isObj(b) ? num(b.toDeg) : null;
        if (from === null || to === null || !(from < to)) { out.push({ where: `${src} ${key}.sectors[${i}]`, rule: 'coverage', what: 'fromDeg/toDeg are not an interval' }); return; }
        // An azimuth just below 360 may be counted in the sector starting at 0.
        const wrapped = from === 0 ? phis.map((p) => (p > 360 - BIN_EDGE_TOL ? p - 360 : p)) : phis;
        const c = countIn(wrapped, from, to);
        const count = (b as Record<string, unknown>).count;
        if (typeof count !== 'number' || count < c.lo || count > c.hi) {
          out.push({ where: `${src} ${key}.sectors[${i}].count`, rule: 'coverage', what: `${String(count)}, but ${slitsSrc} has ${c.exact} ${role} rows with azimuth ${from} <= phi < ${to} deg from the major axis${folded ? ' (folded)' : ''}` });
        }
      });
      // Unfolded sectors cover every azimuth once: their counts sum to the number of rows.
      const counts = rc.sectors.map((b) => (isObj(b) ? b.count : undefined));
      if (!folded && counts.every((c) => typeof c === 'number')) {
        const sum = (counts as number[]).reduce((a, b) => a + b, 0);
        if (sum !== rows.length) out.push({ where: `${src} ${key}.sectors`, rule: 'coverage', what: `the sector counts sum to ${sum}, but ${slitsSrc} has ${rows.length} ${role} rows` });
      }
    }

    const reach = radii.length ? Math.max(...radii) : 0;
    const got = num(rc.maxReachRe);
    if (got === null || Math.abs(got - reach) > REACH_TOL * Math.max(1, reach)) {
      out.push({ where: `${src} ${key}.maxReachRe`, rule: 'coverage', what: `${String(rc.maxReachRe)}, but the ${role} rows of ${slitsSrc} reach ${reach.toPrecision(8)} Re` });
    }
  }
  return out;
}
