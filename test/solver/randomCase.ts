/** Random plan inputs for property tests: galaxy, instrument profile, catalog, masks (some locked). */
import { parseProfile } from '../../src/core/profile/load';
import { parsePlan } from '../../src/core/plan/validate';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import { makeRng } from '../../src/core/numeric/random';
import type { Target } from '../../src/core/catalog/types';
import { catalogOf } from './helpers';

export function randomFootprint(rng: ReturnType<typeof makeRng>): [number, number][] {
  const kind = rng.int(3);
  const w = rng.uniform(120, 500), h = rng.uniform(120, 900);
  if (kind === 0) return [[-w / 2, -h / 2], [w / 2, -h / 2], [w / 2, h / 2], [-w / 2, h / 2]];
  if (kind === 1) {
    const n = 5 + rng.int(12), r = rng.uniform(100, 400);
    return Array.from({ length: n }, (_, i) => [r * Math.cos((2 * Math.PI * i) / n), r * Math.sin((2 * Math.PI * i) / n)] as [number, number]);
  }
  // Rectangle with a notch cut into the top edge and a corner cut (non-convex).
  const nx0 = rng.uniform(-w / 3, 0), nx1 = nx0 + rng.uniform(10, w / 3), depth = rng.uniform(10, h / 2);
  return [[-w / 2, -h / 2 + 40], [-w / 2 + 40, -h / 2], [w / 2, -h / 2], [w / 2, h / 2], [nx1, h / 2], [nx1, h / 2 - depth], [nx0, h / 2 - depth], [nx0, h / 2], [-w / 2, h / 2]];
}

/** Inputs of one random case: RA sometimes within 0.05 deg of 0/360, Dec in [-85, 85], footprint rectangle, polygon or notched. */
export function randomCase(seed: number) {
  const rng = makeRng(seed);
  const raDeg = rng.int(3) === 0 ? (rng.next() < 0.5 ? rng.uniform(0, 0.05) : rng.uniform(359.95, 360) % 360) : rng.uniform(0, 360);
  const decDeg = rng.uniform(-85, 85);
  const gaps: [number, number][] = [];
  const pixels = 2048 + rng.int(6145);
  for (let g = rng.int(4), i = 0; i < g; i++) { const p0 = rng.uniform(100, pixels - 200); gaps.push([p0, p0 + rng.uniform(5, 80)]); }
  const profile = parseProfile({
    id: `random-${seed}`, label: 'random profile',
    telescope: { apertureM: 8 },
    site: { latDeg: -30, lonDeg: -70, elevationM: 2400, pressureHPa: 760, temperatureC: 8, relativeHumidity: 0.3 },
    footprint: randomFootprint(rng),
    slits: { minLengthArcsec: rng.uniform(3, 8), gapArcsec: rng.uniform(0.2, 2), widthArcsec: rng.uniform(0.5, 1.5), maxTiltDeg: 30 },
    alignment: { boxSizeArcsec: rng.uniform(2, 5), minCount: rng.int(5), magRange: [14, 19] },
    detector: { pixels, dispersionAPerPixel: rng.uniform(0.2, 0.8), centralWavelengthA: rng.uniform(8300, 8800), xArcsecPerPixel: rng.uniform(0.1, 0.25), gapsPixels: gaps, edgeMarginPixels: rng.uniform(5, 30) },
  });
  const reArcsec = rng.uniform(10, 60);
  const nMasks = 1 + rng.int(4);
  const galaxy = { id: 'G', ra: raDeg, dec: decDeg, reArcsec, axisRatio: rng.uniform(0.3, 1), paDeg: rng.uniform(0, 180), distanceMpc: 15, vsysKms: rng.uniform(-300, 3000), sersicN: 4, muE: 21 };
  const centre = tangentCentre(raDeg, decDeg);
  const field = 900;
  const targets: Target[] = [];
  const at = (xi: number, eta: number) => tangentToSkyDeg(centre, xi, eta);
  for (let i = 0; i < 150 + rng.int(350); i++) {
    const p = at(rng.uniform(-field, field), rng.uniform(-field, field));
    targets.push({ id: `t${i}`, raDeg: p.raDeg, decDeg: p.decDeg, mag: rng.uniform(20, 23), color: null, priority: rng.next() < 0.5 ? null : rng.uniform(0.1, 5), role: 'tracer', line: 0, extra: {} });
  }
  for (let i = 0; i < 250; i++) {
    const p = at(rng.uniform(-field, field), rng.uniform(-field, field));
    targets.push({ id: `s${i}`, raDeg: p.raDeg, decDeg: p.decDeg, mag: rng.uniform(13, 20), color: null, priority: null, role: 'alignment', line: 0, extra: {} });
  }
  // Some masks locked at random offsets (PA random), the rest placed by the solver.
  const masks = Array.from({ length: nMasks }, (_, i) => {
    if (rng.next() < 0.5) return { id: `m${i + 1}` };
    const p = at(rng.uniform(-400, 400), rng.uniform(-400, 400));
    return { id: `m${i + 1}`, raDeg: p.raDeg, decDeg: p.decDeg, paDeg: rng.uniform(0, 360), locked: true };
  });
  const plan = parsePlan({
    format: 'haloweave.plan/1', galaxy, instrument: profile.id, catalog: 'random.csv',
    goals: { masks: nMasks, tracerReachRe: 10, starlightReachRe: rng.int(2) * 3, linesA: [8498.0, 8542.1, 8662.1] },
    masks, search: { seed: seed, maxEvaluations: 60 },
  });
  return { plan, profile, catalog: catalogOf(targets) };
}

