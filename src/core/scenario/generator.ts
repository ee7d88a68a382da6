/**
 * Invented-scenario generator: a made-up galaxy ("Halo Demo A" by default, invented position) with a
 * synthetic candidate catalog — a globular-cluster system, field contaminants and alignment stars —
 * drawn from a seeded generator, so the same options always give the same catalog.
 *
 * Model (documented in docs/search.md, "Scenarios"):
 * - Cluster positions: circularised radius R drawn from a cored power-law surface density
 *   Sigma(R) ∝ (1 + (R/Rc)^2)^(-alpha/2) out to `maxRadiusRe` (default 15 Re), flattened like the
 *   galaxy (same axis ratio and PA), azimuth uniform in the galaxy frame.
 * - Colours (V-I, mag): two Gaussian subpopulations, blue and red (defaults 0.95 ± 0.06 and 1.18 ± 0.07,
 *   blue fraction 0.6; illustrative values typical of cluster systems of early-type galaxies, from memory).
 * - Luminosity function: Gaussian in absolute magnitude, peak M_V = -7.4, sigma 1.3 mag (Harris 1991,
 *   ARA&A 29, 543, from memory; used only to invent demo data). Apparent catalog magnitude in the I band:
 *   m_I = M_V + (m - M) - (V - I), distance modulus (m - M) = 5 log10(D / 10 pc).
 * - Contaminants (foreground stars, background galaxies): uniform over the field square, number counts
 *   rising as 10^(0.3 m), colours uniform in [0.2, 2.2].
 * - Alignment stars: uniform over the field, magnitudes uniform in the profile's alignment range.
 * Candidates fainter than `magLimit` are not in the catalog (the photometric selection).
 */
import type { CatalogReadResult, Target } from '../catalog/types';
import type { GalaxyModel } from '../plan/schema';
import { PLAN_FORMAT } from '../plan/schema';
import { galaxyToSkyArcsec } from '../sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../sky/tangentPlane';
import { toCsv } from '../export/csvText';
import { makeRng, type Rng } from '../numeric/random';
import { PMath, sq } from '../numeric/portableMath';

/** The invented demo galaxy: name and position are made up; numbers typical of a nearby early-type galaxy. */
export const DEMO_GALAXY: GalaxyModel = {
  id: 'Halo Demo A',
  raDeg: 161.8125,
  decDeg: -21.405,
  reArcsec: 40,
  axisRatio: 0.8,
  paDeg: 35,
  distanceMpc: 12,
  vsysKms: 1180,
  sersicN: 4,
  muE: 21.2,
};

export interface ScenarioOptions {
  /** Seed of the generator (number or text). */
  seed: number | string;
  /** Total rows of the catalog: clusters + contaminants + alignment stars. */
  candidates: number;
  /** Fraction of rows that are field contaminants (default 0.3). */
  contaminantFraction?: number;
  /** Number of alignment stars (default: max(40, 2 % of the rows)). */
  alignmentStars?: number;
  /** Alignment-star magnitude range [bright, faint] (use the profile's `alignment.magRange`). */
  alignmentMagRange?: [number, number];
  galaxy?: Partial<GalaxyModel>;
  /** Outer radius of the cluster system in Re (default 15). */
  maxRadiusRe?: number;
  /** Power-law slope alpha of the surface density (default 2) and core radius in Re (default 1). */
  densitySlope?: number;
  coreRadiusRe?: number;
  /** Half-size of the square field for contaminants and stars, in Re (default = maxRadiusRe). */
  fieldHalfSizeRe?: number;
  /** Faint limit of the catalog (I mag); default: the cluster luminosity-function peak + 0.8 mag. */
  magLimit?: number;
  /** Luminosity function: peak absolute V magnitude (default -7.4) and sigma (default 1.3). */
  lfPeakMv?: number;
  lfSigmaMag?: number;
  blueFraction?: number;
  /** Instrument profile id written into the plan (default `ridge10-narrow`). */
  instrument?: string;
  /** Catalog file name written into the plan (default `halo-demo.catalog.csv`). */
  catalogFile?: string;
  /** Half-size (arcsec) of the square about the galaxy over which alignment stars are spread (default: the field's). */
  alignmentFieldHalfSizeArcsec?: number;
  /** Masks asked for in the plan's goals (default 4). */
  masks?: number;
}

/** One generated object with its true kind (kept as an extra catalog column `kind`). */
export type ScenarioKind = 'gc-blue' | 'gc-red' | 'field' | 'star';

export interface Scenario {
  galaxy: GalaxyModel;
  /** The catalog as validated targets (what a reader would return for `catalogCsv`). */
  targets: Target[];
  /** The catalog text: id,ra,dec,mag,color,role,kind. */
  catalogCsv: string;
  /** A plan file object (format haloweave.plan/1) for this scenario. */
  plan: Record<string, unknown>;
  /** The options after defaults, as used. */
  options: Required<Omit<ScenarioOptions, 'galaxy'>> & { galaxy: GalaxyModel };
}

/** Distance modulus m - M = 5 log10(D / 10 pc), D in Mpc. */
export function distanceModulusMag(distanceMpc: number): number {
  return 5 * PMath.log10((distanceMpc * 1e6) / 10);
}

/** Draw a circularised radius (arcsec) from Sigma ∝ (1 + (R/Rc)^2)^(-alpha/2) on [0, Rmax], inverse CDF on a grid. */
function radialSampler(rcArcsec: number, alpha: number, rMaxArcsec: number): (u: number) => number {
  const n = 4000;
  const cdf = new Float64Array(n + 1);
  for (let i = 1; i <= n; i++) {
    const r0 = (rMaxArcsec * (i - 1)) / n, r1 = (rMaxArcsec * i) / n, rm = 0.5 * (r0 + r1);
    cdf[i] = cdf[i - 1] + PMath.pow(1 + sq(rm / rcArcsec), -alpha / 2) * rm * (r1 - r0);
  }
  const total = cdf[n];
  return (u: number) => {
    const t = u * total;
    let lo = 0, hi = n;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (cdf[mid] < t) lo = mid;
      else hi = mid;
    }
    const f = (t - cdf[lo]) / Math.max(cdf[hi] - cdf[lo], 1e-300);
    return (rMaxArcsec * (lo + f)) / n;
  };
}

/** Draw an apparent magnitude from number counts ∝ 10^(0.3 m) on [mBright, mFaint]. */
function countsMag(rng: Rng, mBright: number, mFaint: number): number {
  const a = PMath.pow(10, 0.3 * mBright), b = PMath.pow(10, 0.3 * mFaint);
  return PMath.log10(a + (b - a) * rng.next()) / 0.3;
}

const round = (v: number, digits: number) => Number(v.toFixed(digits));

/** Generate a scenario; deterministic for given options (same seed, same rows in the same order). */
export function generateScenario(options: ScenarioOptions): Scenario {
  const galaxy: GalaxyModel = { ...DEMO_GALAXY, ...(options.galaxy ?? {}) };
  const o = {
    seed: options.seed,
    candidates: Math.max(0, Math.floor(options.candidates)),
    contaminantFraction: options.contaminantFraction ?? 0.3,
    alignmentStars: options.alignmentStars ?? Math.max(40, Math.round(0.02 * options.candidates)),
    alignmentMagRange: options.alignmentMagRange ?? ([15, 20] as [number, number]),
    maxRadiusRe: options.maxRadiusRe ?? 15,
    densitySlope: options.densitySlope ?? 2,
    coreRadiusRe: options.coreRadiusRe ?? 1,
    fieldHalfSizeRe: options.fieldHalfSizeRe ?? options.maxRadiusRe ?? 15,
    lfPeakMv: options.lfPeakMv ?? -7.4,
    lfSigmaMag: options.lfSigmaMag ?? 1.3,
    blueFraction: options.blueFraction ?? 0.6,
    instrument: options.instrument ?? 'ridge10-narrow',
    catalogFile: options.catalogFile ?? 'halo-demo.catalog.csv',
    alignmentFieldHalfSizeArcsec: options.alignmentFieldHalfSizeArcsec ?? (options.fieldHalfSizeRe ?? options.maxRadiusRe ?? 15) * galaxy.reArcsec,
    masks: options.masks ?? 4,
    magLimit: 0,
    galaxy,
  };
  const dm = distanceModulusMag(galaxy.distanceMpc);
  // Peak in I for a typical cluster colour V-I = 1.05.
  o.magLimit = options.magLimit ?? round(o.lfPeakMv + dm - 1.05 + 0.8, 2);

  const rng = makeRng(o.seed);
  const centre = tangentCentre(galaxy.raDeg, galaxy.decDeg);
  const nStars = Math.min(o.alignmentStars, o.candidates);
  const nField = Math.min(o.candidates - nStars, Math.round(o.contaminantFraction * o.candidates));
  const nClusters = o.candidates - nStars - nField;
  const sampleR = radialSampler(o.coreRadiusRe * galaxy.reArcsec, o.densitySlope, o.maxRadiusRe * galaxy.reArcsec);
  const half = o.fieldHalfSizeRe * galaxy.reArcsec;

  interface Row { xi: number; eta: number; mag: number; color: number; role: 'tracer' | 'alignment'; kind: ScenarioKind }
  const rows: Row[] = [];
  const sqrtQ = Math.sqrt(galaxy.axisRatio);
  while (rows.length < nClusters) {
    const blue = rng.next() < o.blueFraction;
    const color = blue ? rng.normal(0.95, 0.06) : rng.normal(1.18, 0.07);
    const mag = rng.normal(o.lfPeakMv, o.lfSigmaMag) + dm - color;
    const r = sampleR(rng.next());
    const phi = rng.uniform(0, 2 * Math.PI);
    if (mag > o.magLimit) continue;
    // Circularised R: u = R cos(phi)/sqrt(q), v = R sin(phi) sqrt(q) gives q u^2 + v^2/q = R^2.
    const s = galaxyToSkyArcsec((r * PMath.cos(phi)) / sqrtQ, r * PMath.sin(phi) * sqrtQ, galaxy.paDeg);
    rows.push({ xi: s.xiArcsec, eta: s.etaArcsec, mag, color, role: 'tracer', kind: blue ? 'gc-blue' : 'gc-red' });
  }
  for (let i = 0; i < nField; i++) {
    rows.push({ xi: rng.uniform(-half, half), eta: rng.uniform(-half, half), mag: countsMag(rng, o.magLimit - 4, o.magLimit), color: rng.uniform(0.2, 2.2), role: 'tracer', kind: 'field' });
  }
  const [mb, mf] = o.alignmentMagRange;
  const starHalf = o.alignmentFieldHalfSizeArcsec;
  for (let i = 0; i < nStars; i++) {
    rows.push({ xi: rng.uniform(-starHalf, starHalf), eta: rng.uniform(-starHalf, starHalf), mag: rng.uniform(mb + 0.1, mf - 0.1), color: rng.uniform(0.4, 1.6), role: 'alignment', kind: 'star' });
  }
  // Catalog order: by RA offset (a survey catalog is not sorted by kind), ids assigned in that order.
  rows.sort((a, b) => a.xi - b.xi || a.eta - b.eta);
  const width = String(rows.length).length;
  const targets: Target[] = rows.map((r, i) => {
    const sky = tangentToSkyDeg(centre, r.xi, r.eta);
    return {
      id: `hd${String(i + 1).padStart(Math.max(5, width), '0')}`,
      raDeg: round(sky.raDeg, 7),
      decDeg: round(sky.decDeg, 7),
      mag: round(r.mag, 3),
      color: round(r.color, 3),
      priority: null,
      role: r.role,
      line: i + 2,
      extra: { kind: r.kind },
    };
  });
  const catalogCsv = toCsv(
    ['id', 'ra', 'dec', 'mag', 'color', 'role', 'kind'],
    targets.map((t) => [t.id, t.raDeg, t.decDeg, t.mag, t.color, t.role, t.extra.kind]),
  );
  return { galaxy, targets, catalogCsv, plan: scenarioPlan(galaxy, o), options: o };
}

/** The plan file of a scenario: galaxy, goals, and weighting/starlight/search settings suited to it. */
function scenarioPlan(galaxy: GalaxyModel, o: Scenario['options']): Record<string, unknown> {
  return {
    format: PLAN_FORMAT,
    galaxy: {
      id: galaxy.id, ra: galaxy.raDeg, dec: galaxy.decDeg, reArcsec: galaxy.reArcsec, axisRatio: galaxy.axisRatio,
      paDeg: galaxy.paDeg, distanceMpc: galaxy.distanceMpc, vsysKms: galaxy.vsysKms, sersicN: galaxy.sersicN, muE: galaxy.muE,
    },
    instrument: o.instrument,
    catalog: o.catalogFile,
    goals: { masks: o.masks, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498.0, 8542.1, 8662.1] },
    weighting: {
      magRange: [round(o.magLimit - 5, 2), o.magLimit],
      colorRange: [0.75, 1.4],
      radiusRangeRe: [0, o.maxRadiusRe],
    },
    starlight: { exposureS: 10800, targetSnPerA: 5, skyMagPerArcsec2: 19.6 },
    // The generated magnitudes are Vega I (Cousins); AB - Vega from Blanton & Roweis 2007, AJ 133, 734, Table 1.
    photometry: { band: 'I', system: 'Vega', abMinusVegaMag: 0.45, source: 'Blanton & Roweis 2007, AJ 133, 734, Table 1' },
    search: { seed: typeof o.seed === 'number' ? o.seed : 1 },
  };
}

/** The scenario's targets as a catalog read result (what `readCatalog` gives for `catalogCsv`). */
export function scenarioCatalog(s: Scenario, source = 'scenario.csv'): CatalogReadResult {
  return {
    format: 'csv',
    source,
    targets: s.targets,
    rejects: [],
    rowsRead: s.targets.length,
    columns: ['id', 'ra', 'dec', 'mag', 'color', 'role', 'kind'].map((name) => ({ name })),
    mapping: { id: 'id', ra: 'ra', dec: 'dec', mag: 'mag', color: 'color', role: 'role' },
  };
}

/** The demo's generator options (fixed seed): examples/demo/ holds exactly what `demoScenario()` returns. */
export const DEMO_OPTIONS: ScenarioOptions = {
  seed: 20261202,
  candidates: 2500,
  instrument: 'ridge10-narrow',
  alignmentMagRange: [15, 20],
  catalogFile: 'halo-demo.catalog.csv',
};

/** File names of the demo in examples/demo/ and in `haloweave demo --out DIR`. */
export const DEMO_PLAN_FILE = 'halo-demo.plan.json';

/**
 * The demo scenario: the generator with DEMO_OPTIONS, and a plan whose weighting favours the two cluster colour
 * peaks and excludes an invented bright star and an invented companion galaxy (both made up for the demo).
 */
export function demoScenario(): Scenario {
  const s = generateScenario(DEMO_OPTIONS);
  const w = s.plan.weighting as Record<string, unknown>;
  s.plan.weighting = {
    ...w,
    formula: { magSlope: 0.5, colorPeaks: [0.95, 1.18], colorSigma: 0.1, colorFloor: 0.3, radiusExponent: 0.5 },
    exclusions: [
      { label: 'bright star', xiArcsec: 180, etaArcsec: -240, radiusArcsec: 25 },
      { label: 'companion galaxy', uArcsec: -420, vArcsec: 150, radiusArcsec: 60, axisRatio: 0.6, paDeg: 100 },
    ],
  };
  // The demo's observer nods the sky along the slit: a systematic sky-subtraction floor of 0.3 % of the sky
  // (docs/spectral-realism.md), with which co-added starlight reaches 3 Re; the default 1 % caps it near 2 Re.
  s.plan.observing = { skySystematicFraction: 0.003 };
  return s;
}
