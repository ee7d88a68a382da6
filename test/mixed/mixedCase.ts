/** Mixed-instrument plans for the tests: shipped and generated profiles, solved in memory, checked by the core checker. */
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { parseProfileText } from '../../src/core/profile/load';
import type { InstrumentProfile } from '../../src/core/profile/schema';
import { parsePlan } from '../../src/core/plan/validate';
import { solvePlan, type PlanSolution } from '../../src/core/pipeline/pipeline';
import { mixedScenario, type ScenarioInstrument } from '../../src/core/scenario/mixedScenario';
import { scenarioCatalog, type ScenarioOptions } from '../../src/core/scenario/generator';
import { checkOutput, type Violation } from '../../src/core/check/checkOutput';

export const ROOT = resolve(__dirname, '../..');

/** A shipped profile by id. */
export function shippedProfile(id: string): InstrumentProfile {
  return parseProfileText(readFileSync(join(ROOT, 'instrument-profiles', `${id}.json`), 'utf8'), `${id}.json`);
}

/**
 * Invented profiles unlike the shipped ones: a hexagonal field without detector gaps on a 4-m at a southern site, and
 * a long strip with two detector gaps on an 8.2-m at a northern site (numbers invented for the tests).
 */
export function generatedProfiles(): InstrumentProfile[] {
  const base = shippedProfile('quad8-square');
  const hex = Array.from({ length: 6 }, (_, k) => [Math.round(420 * Math.cos((k * Math.PI) / 3)), Math.round(420 * Math.sin((k * Math.PI) / 3))] as [number, number]);
  return [
    {
      ...base, id: 'gen-hex4', label: 'generated hexagonal field, 4 m, no gaps', telescope: { apertureM: 4, throughput: 0.12 },
      site: { latDeg: -30.2, lonDeg: -70.8, elevationM: 2200, pressureHPa: 780, temperatureC: 10, relativeHumidity: 0.3 },
      footprint: hex, slits: { minLengthArcsec: 7, gapArcsec: 1.5, widthArcsec: 1.2, maxTiltDeg: 15 },
      alignment: { boxSizeArcsec: 5, minCount: 3, magRange: [14.5, 19.5] },
      detector: { ...base.detector, pixels: 6144, gapsPixels: [], dispersionAPerPixel: 0.6, xArcsecPerPixel: 0.25 },
    },
    {
      ...base, id: 'gen-strip8', label: 'generated strip, 8.2 m, two gaps', telescope: { apertureM: 8.2, throughput: 0.16 },
      site: { latDeg: 19.8, lonDeg: -155.5, elevationM: 4100, pressureHPa: 615, temperatureC: 0, relativeHumidity: 0.15 },
      footprint: [[-110, -420], [110, -420], [110, 420], [-110, 420]], slits: { minLengthArcsec: 5, gapArcsec: 0.8, widthArcsec: 0.8, maxTiltDeg: 30 },
      alignment: { boxSizeArcsec: 3, minCount: 3, magRange: [15.5, 20.5] },
      detector: { ...base.detector, pixels: 8192, gapsPixels: [[2700, 2740], [5450, 5490]], dispersionAPerPixel: 0.3, xArcsecPerPixel: 0.1 },
    },
  ];
}

/** A solved mixed plan: the scenario, the profiles by reference and the solution. */
export interface MixedCase {
  plan: Record<string, unknown>;
  profiles: Record<string, InstrumentProfile>;
  solution: PlanSolution;
}

/** Generate and solve a mixed scenario (a quick search: one level, one pass, unless `search` says otherwise). */
export function solveMixed(options: Omit<ScenarioOptions, 'instrument' | 'alignmentMagRange'>, instruments: ScenarioInstrument[], planExtra: Record<string, unknown> = {}): MixedCase {
  const s = mixedScenario(options, instruments);
  const plan = { ...s.plan, search: { seed: 3, levels: 1, passes: 1 }, ...planExtra };
  const profiles = Object.fromEntries(instruments.map((i) => [i.ref ?? i.profile.id, i.profile]));
  const solution = solvePlan({ plan: parsePlan(plan), profile: instruments[0].profile, catalog: scenarioCatalog(s), profiles }, { skipObservingReport: true });
  return { plan, profiles, solution };
}

/** Every violation the core checker finds in a solution, each mask checked against its own profile by id. */
export function violationsOf(c: MixedCase): Violation[] {
  const byId = new Map(Object.values(c.profiles).map((p) => [p.id, p]));
  const masks = c.solution.masks.map((m) => ({ maskId: m.mask.id, instrument: m.mask.instrument ?? '', raDeg: m.mask.raDeg, decDeg: m.mask.decDeg, paDeg: m.mask.paDeg }));
  const g = c.plan.galaxy as { vsysKms: number };
  return checkOutput({ masks, slits: c.solution.masks.flatMap((m) => m.slits), profileFor: (id) => byId.get(id) ?? null, linesRestA: [8498.0, 8542.1, 8662.1], vsysKms: g.vsysKms });
}
