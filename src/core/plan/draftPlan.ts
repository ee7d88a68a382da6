/**
 * A first plan from what a user has: the galaxy (centre, size, shape, velocity), a read catalog and a profile. Chooses
 * the goals and says why for each choice, in the words an observer would use. Galaxy frame as in the contract
 * (u major axis, v minor, circularised radius R = sqrt(q u^2 + v^2/q)); sky offsets arcsec; velocities km/s.
 */
import type { InstrumentProfile } from '../profile/schema';
import type { Target } from '../catalog/types';
import type { ColumnMapping } from '../catalog/types';
import { PLAN_FORMAT, type GalaxyModel } from './schema';
import { tangentCentre, skyToTangentArcsec } from '../sky/tangentPlane';
import { circularisedRadiusArcsec, skyToGalaxyArcsec } from '../sky/frames';
import { sersicMuMagPerArcsec2 } from '../sky/sersic';
import { polygonBounds, type Corner } from '../geometry/polygon';
import { polygonSignedAreaArcsec2 } from '../profile/inspect';
import { PMath } from '../numeric/portableMath';

/** What the user gives about the galaxy; unknown numbers are left out and chosen (and explained) by the draft. */
export type DraftGalaxy = Omit<GalaxyModel, 'distanceMpc' | 'sersicN' | 'muE'> & Partial<Pick<GalaxyModel, 'distanceMpc' | 'sersicN' | 'muE'>>;

export interface DraftInputs {
  galaxy: DraftGalaxy;
  profile: InstrumentProfile;
  /** The plan's `instrument` value and `catalog` path (relative to the plan file). */
  instrument: string;
  catalogPath: string;
  catalogColumns: ColumnMapping;
  targets: readonly Target[];
  linesA: number[];
  /** Masks wanted, when the user says; else chosen. */
  masks?: number;
}

/** One choice of the draft: the plan key, the value, and why. */
export interface DraftChoice {
  key: string;
  value: unknown;
  why: string;
}

export interface DraftResult {
  plan: Record<string, unknown>;
  choices: DraftChoice[];
  /** Counts the user should see: tracer candidates, alignment stars in range near the galaxy... */
  facts: DraftFacts;
  warnings: string[];
}

export interface DraftFacts {
  tracers: number;
  alignmentRows: number;
  /** Alignment stars in the profile's magnitude range within reach of the masks, and the expected number a mask. */
  alignmentInRangeNear: number;
  alignmentPerMaskExpected: number;
  nearRadiusArcsec: number;
  /** R/Re percentiles of the tracer candidates (50 %, 90 %, 100 %). */
  tracerRadiusRe: [number, number, number];
  tracerMag: [number, number, number];
  fieldAreaArcmin2: number;
}

/** Hubble constant for a distance from the velocity when none is given (km/s/Mpc; common practice, round value). */
export const DRAFT_H0_KMS_PER_MPC = 70;
/** Below this systemic velocity peculiar motions dominate the Hubble flow: a distance must be given (km/s). */
const MIN_HUBBLE_FLOW_KMS = 1000;

const quantile = (sorted: readonly number[], q: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] : NaN);
/** Degrees written with 8 decimals, as every output of the tool. */
const round8 = (v: number) => Number(v.toFixed(8));
const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));

/** Draft a plan; throws nothing: impossible inputs show up as warnings and conservative choices. */
export function draftPlan(inp: DraftInputs): DraftResult {
  const g = inp.galaxy;
  const p = inp.profile;
  const choices: DraftChoice[] = [];
  const warnings: string[] = [];
  const centre = tangentCentre(g.raDeg, g.decDeg);
  const radiusRe = (t: Target) => {
    const s = skyToTangentArcsec(centre, t.raDeg, t.decDeg);
    if (!s) return Infinity;
    const gal = skyToGalaxyArcsec(s.xiArcsec, s.etaArcsec, g.paDeg);
    return circularisedRadiusArcsec(gal.uArcsec, gal.vArcsec, g.axisRatio) / g.reArcsec;
  };
  const tracers = inp.targets.filter((t) => t.role === 'tracer');
  const stars = inp.targets.filter((t) => t.role === 'alignment');
  const rTr = tracers.map(radiusRe).filter(Number.isFinite).sort((a, b) => a - b);
  const magTr = tracers.map((t) => t.mag).sort((a, b) => a - b);

  // Distance: given, else from the Hubble flow.
  let distanceMpc = g.distanceMpc;
  if (distanceMpc === undefined) {
    distanceMpc = Math.max(1, Math.round((10 * g.vsysKms) / DRAFT_H0_KMS_PER_MPC) / 10);
    choices.push({ key: 'galaxy.distanceMpc', value: distanceMpc, why: `not given: ${g.vsysKms} km/s / H0 = ${DRAFT_H0_KMS_PER_MPC} km/s/Mpc; replace it with a measured distance (it sets the physical scale of the reach and of the mass estimate)` });
    if (g.vsysKms < MIN_HUBBLE_FLOW_KMS) warnings.push(`at ${g.vsysKms} km/s peculiar velocities are a large part of the Hubble flow: the distance ${distanceMpc} Mpc from the velocity is rough, give --distance`);
  }
  const sersicN = g.sersicN ?? 4;
  if (g.sersicN === undefined) choices.push({ key: 'galaxy.sersicN', value: 4, why: 'not given: n = 4 (a de Vaucouleurs profile, usual for the early-type hosts of rich cluster systems); it shapes the starlight surface brightness' });
  const muE = g.muE ?? 21.5;
  if (g.muE === undefined) choices.push({ key: 'galaxy.muE', value: 21.5, why: 'not given: a placeholder in the catalog band; it only drives the integrated-starlight slits, which the draft therefore turns off' });

  // Tracer reach: where the candidates are, rounded down to whole Re, between 2 and 20 Re.
  const r90 = quantile(rTr, 0.9), rMax = rTr.length ? rTr[rTr.length - 1] : NaN;
  const tracerReachRe = Number.isFinite(r90) ? clamp(Math.floor(r90), 2, 20) : 10;
  choices.push({
    key: 'goals.tracerReachRe',
    value: tracerReachRe,
    why: rTr.length
      ? `90 % of the ${rTr.length} tracer candidates lie within ${r90.toFixed(1)} Re (the farthest at ${rMax.toFixed(1)} Re); the reach goal asks the masks to sample that far (kept within 2-20 Re)`
      : 'no tracer candidates: 10 Re, a common halo goal',
  });

  // Masks: twice the area out to the reach over the field area (radial fields overlap near the centre), 2 to 6.
  const fp = p.footprint as Corner[];
  const fieldArcsec2 = Math.abs(polygonSignedAreaArcsec2(fp));
  const reachArcsec = tracerReachRe * g.reArcsec;
  const reachArea = Math.PI * reachArcsec * reachArcsec;
  let masks = inp.masks ?? clamp(Math.ceil((2 * reachArea) / fieldArcsec2), 2, 6);
  if (!Number.isFinite(masks)) masks = 4;
  choices.push({
    key: 'goals.masks',
    value: masks,
    why: inp.masks !== undefined
      ? 'as asked'
      : `the ellipse out to ${tracerReachRe} Re covers ${(reachArea / 3600).toFixed(1)} square arcmin and one field ${(fieldArcsec2 / 3600).toFixed(1)}; fields placed along different radii overlap near the centre, so about twice the area's ratio, kept within 2-6 (one night or two for most programmes)`,
  });

  // Starlight: out to 3 Re when the surface brightness is known.
  const starlightReachRe = g.muE === undefined ? 0 : 3;
  const mu3 = sersicMuMagPerArcsec2(3 * g.reArcsec, g.reArcsec, sersicN, muE);
  choices.push({
    key: 'goals.starlightReachRe',
    value: starlightReachRe,
    why: starlightReachRe
      ? `integrated-starlight slits out to 3 Re, where the Sersic profile (n = ${sersicN}, muE = ${muE}) gives ${mu3.toFixed(1)} mag/arcsec^2: within reach of long-slit sums on a large telescope; 0 turns them off`
      : 'off (0): without muE the starlight signal cannot be estimated; give --mu-e to plan starlight slits',
  });
  choices.push({
    key: 'goals.linesA',
    value: inp.linesA,
    why: inp.linesA.join(',') === '8498,8542.1,8662.1' ? 'the calcium triplet (8498.0, 8542.1, 8662.1 A): the strong absorption lines of old stellar populations used for halo tracer velocities' : 'as asked',
  });

  // Alignment stars near the galaxy: within the reach plus a field's half-diagonal.
  const b = polygonBounds(fp);
  const halfDiag = PMath.hypot(b.maxX - b.minX, b.maxY - b.minY) / 2;
  const nearRadius = reachArcsec / Math.sqrt(g.axisRatio) + halfDiag;
  const [bright, faint] = p.alignment.magRange;
  let near = 0;
  for (const s of stars) {
    const t = skyToTangentArcsec(centre, s.raDeg, s.decDeg);
    if (t && PMath.hypot(t.xiArcsec, t.etaArcsec) <= nearRadius && s.mag >= bright && s.mag <= faint) near++;
  }
  const perMask = (near * fieldArcsec2) / (Math.PI * nearRadius * nearRadius);
  if (stars.length === 0) {
    warnings.push(`the catalog marks no alignment star (no row with role "alignment"): every mask needs at least ${p.alignment.minCount} boxes on stars of mag ${bright}-${faint}; add such stars with role alignment`);
  } else if (perMask < p.alignment.minCount) {
    warnings.push(`about ${perMask.toFixed(1)} alignment stars of mag ${bright}-${faint} fall in one field on average, fewer than the ${p.alignment.minCount} boxes a mask needs: add stars, or place masks where stars are`);
  }

  const plan: Record<string, unknown> = {
    format: PLAN_FORMAT,
    galaxy: { id: g.id, ra: round8(g.raDeg), dec: round8(g.decDeg), reArcsec: g.reArcsec, axisRatio: g.axisRatio, paDeg: g.paDeg, distanceMpc, vsysKms: g.vsysKms, sersicN, muE },
    instrument: inp.instrument,
    catalog: inp.catalogPath,
    ...(Object.keys(inp.catalogColumns).length ? { catalogColumns: inp.catalogColumns } : {}),
    goals: { masks, tracerReachRe, starlightReachRe, linesA: inp.linesA },
    search: { seed: 1 },
  };
  choices.push({ key: 'search.seed', value: 1, why: 'a fixed seed: the same plan gives the same masks on every run' });
  return {
    plan,
    choices,
    facts: {
      tracers: tracers.length,
      alignmentRows: stars.length,
      alignmentInRangeNear: near,
      alignmentPerMaskExpected: perMask,
      nearRadiusArcsec: nearRadius,
      tracerRadiusRe: [quantile(rTr, 0.5), r90, rMax],
      tracerMag: [magTr[0], quantile(magTr, 0.5), magTr[magTr.length - 1]],
      fieldAreaArcmin2: fieldArcsec2 / 3600,
    },
    warnings,
  };
}
