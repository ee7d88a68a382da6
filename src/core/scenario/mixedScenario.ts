/**
 * Invented scenarios shared between several spectrographs: the scenario generator (scenario/generator.ts) with
 * alignment stars spread over every profile's magnitude range, and a plan with `instruments` instead of one
 * `instrument` (plan/instruments.ts). Used by the mixed example, the tests and the benchmark.
 */
import type { InstrumentProfile } from '../profile/schema';
import { generateScenario, type Scenario, type ScenarioOptions } from './generator';

/** One spectrograph of a mixed scenario: its profile and how many masks it takes. */
export interface ScenarioInstrument {
  profile: InstrumentProfile;
  masks: number;
  /** What the plan names (default the profile's id). */
  ref?: string;
}

/** A scenario whose plan shares goals.masks = the sum of the instruments' masks between them (alignment stars in every range). */
export function mixedScenario(options: Omit<ScenarioOptions, 'instrument' | 'alignmentMagRange'>, instruments: readonly ScenarioInstrument[]): Scenario {
  const bright = Math.min(...instruments.map((i) => i.profile.alignment.magRange[0]));
  const faint = Math.max(...instruments.map((i) => i.profile.alignment.magRange[1]));
  const s = generateScenario({ ...options, instrument: instruments[0].profile.id, alignmentMagRange: [bright, faint] });
  const { instrument: _one, ...plan } = s.plan;
  s.plan = {
    ...plan,
    instruments: instruments.map((i) => ({ profile: i.ref ?? i.profile.id, masks: i.masks })),
    goals: { ...(plan.goals as Record<string, unknown>), masks: instruments.reduce((a, i) => a + i.masks, 0) },
  };
  return s;
}

/** File names of the mixed example in examples/mixed/. */
export const MIXED_EXAMPLE_PLAN_FILE = 'two-telescopes.plan.json';
export const MIXED_EXAMPLE_CATALOG_FILE = 'two-telescopes.catalog.csv';

/**
 * The mixed example (examples/mixed/ holds exactly what this returns): an invented galaxy twice the demo's size on
 * the sky, shared between two nights on the 10-m narrow field (`narrow`) and two on the 6.5-m wide field (`wide`),
 * at two invented sites in opposite hemispheres.
 */
export function mixedExampleScenario(narrow: InstrumentProfile, wide: InstrumentProfile): Scenario {
  return mixedScenario(
    { seed: 20261203, candidates: 5000, galaxy: { id: 'Halo Demo B', reArcsec: 75 }, maxRadiusRe: 15, fieldHalfSizeRe: 16, alignmentStars: 500, catalogFile: MIXED_EXAMPLE_CATALOG_FILE },
    [{ profile: narrow, masks: 2 }, { profile: wide, masks: 2 }],
  );
}
