/**
 * The generated-galaxy suite: one seeded generator (generator.ts) driven over galaxies unlike the demo — effective
 * radius 10" to 120", axis ratio 0.3 to 1, systemic velocity 0 to 6000 km/s, Dec -85 to +85 and RA on both sides of
 * 0/360, 10 to 60 alignment stars, 1 500 to 20 000 candidates, 4 and 6 masks, every instrument profile given.
 * Case i is the same for the same profiles. Positions and names are invented.
 */
import type { InstrumentProfile } from '../profile/schema';
import { polygonBounds } from '../geometry/polygon';
import { generateScenario, type Scenario } from './generator';

/** Number of cases in the suite. */
export const SUITE_SIZE = 32;

const RE_ARCSEC = [10, 25, 45, 80, 120, 15, 60, 35];
const AXIS_RATIO = [1, 0.3, 0.55, 0.8, 0.4, 0.95, 0.65];
const VSYS_KMS = [0, 6000, 1200, 3500, 600, 4800, 2300, 5500, 150];
const DEC_DEG = [-85, 85, -40, 12, 63, -71, 0.5, 33, -8, 78, -55];
/** RA in degrees: several within a degree of 0/360 so the catalog and the masks straddle the wrap. */
const RA_DEG = [359.96, 0.03, 187.2, 44.5, 359.5, 301.7, 0.4, 122.9, 233.3];
const ALIGNMENT_STARS = [10, 60, 15, 35, 25, 12, 45, 20];
const CANDIDATES = [1500, 3000, 2000, 20000, 2500, 1500, 6000, 3000];

/** The suite's case i (0 <= i < SUITE_SIZE) for the given profiles (cycled). */
export function suiteScenario(i: number, profiles: readonly InstrumentProfile[]): Scenario {
  const profile = profiles[i % profiles.length];
  const pick = <T>(a: readonly T[]) => a[i % a.length];
  const b = polygonBounds(profile.footprint);
  const halfLong = Math.max(b.maxX - b.minX, b.maxY - b.minY) / 2;
  const stars = pick(ALIGNMENT_STARS);
  const reArcsec = pick(RE_ARCSEC);
  return generateScenario({
    seed: 1000 + i,
    candidates: pick(CANDIDATES),
    alignmentStars: stars,
    alignmentMagRange: profile.alignment.magRange,
    // Sparse stars over a field a little larger than a mask, more stars over a wider one (density a few per mask).
    alignmentFieldHalfSizeArcsec: halfLong * (1.1 + stars / 40),
    instrument: profile.id,
    catalogFile: `suite-${String(i).padStart(2, '0')}.catalog.csv`,
    masks: i % 3 === 2 ? 6 : 4,
    galaxy: {
      id: `Suite Galaxy ${String(i).padStart(2, '0')}`,
      raDeg: pick(RA_DEG),
      decDeg: pick(DEC_DEG),
      reArcsec,
      axisRatio: pick(AXIS_RATIO),
      paDeg: (37 * i) % 180,
      vsysKms: pick(VSYS_KMS),
      distanceMpc: 8 + ((i * 7) % 23),
      sersicN: 2 + (i % 4),
      muE: 20.5 + 0.2 * (i % 7),
    },
  });
}

/** Candidate counts of the scale suite (bench/scale.bench.ts). */
export const SCALE_CANDIDATES = [3000, 20000, 200000, 1000000] as const;

/**
 * A scale-suite galaxy of `candidates` rows for `profile`: a galaxy unlike the demo (RA across 0/360, northern Dec,
 * flattened, its own velocity), ridge-profile plan of four free masks. From 200 000 rows on, contaminants and alignment
 * stars spread over a wide field (40 Re half-size) as an imaging survey catalog would give.
 */
export function scaleScenario(candidates: number, profile: InstrumentProfile): Scenario {
  const wide = candidates >= 200000;
  return generateScenario({
    seed: 7000 + candidates,
    candidates,
    alignmentStars: Math.max(40, Math.round(candidates / 2000)),
    alignmentMagRange: profile.alignment.magRange,
    fieldHalfSizeRe: wide ? 40 : 15,
    instrument: profile.id,
    catalogFile: `scale-${candidates}.catalog.csv`,
    masks: 4,
    galaxy: {
      id: `Scale Galaxy ${candidates}`,
      raDeg: 359.93,
      decDeg: 41.2,
      reArcsec: 38,
      axisRatio: 0.62,
      paDeg: 117,
      vsysKms: 2750,
      distanceMpc: 21,
      sersicN: 3,
      muE: 21.0,
    },
  });
}
