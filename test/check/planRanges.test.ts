/**
 * Plan-file number ranges (src/core/plan/numberRanges.ts): every range names a key the plan schema has (a range on a
 * path the plan does not have checks nothing), and a value out of range under `search.objective` is refused with
 * the field named. The demo and the shipped examples still load.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { PLAN_RANGES } from '../../src/core/plan/numberRanges';
import { planSchema } from '../../src/core/plan/schema';
import { parsePlan, parsePlanText } from '../../src/core/plan/validate';
import { InputError } from '../../src/core/result';

type Def = { type: string; [k: string]: unknown };
const defOf = (s: z.ZodType): Def => (s as unknown as { _zod: { def: Def } })._zod.def;

/** The schemas a dotted path part leads to from `s` (several through a union); empty when the key does not exist. */
function step(s: z.ZodType, part: string): z.ZodType[] {
  const d = defOf(s);
  switch (d.type) {
    case 'optional': case 'nullable': case 'default': case 'prefault': case 'readonly': case 'catch': case 'nonoptional':
      return step(d.innerType as z.ZodType, part);
    case 'pipe': return step(d.in as z.ZodType, part);
    case 'lazy': return step((d.getter as () => z.ZodType)(), part);
    case 'union': return (d.options as z.ZodType[]).flatMap((o) => step(o, part));
    case 'intersection': return [...step(d.left as z.ZodType, part), ...step(d.right as z.ZodType, part)];
    case 'object': {
      const shape = d.shape as Record<string, z.ZodType>;
      return part === '*' ? Object.values(shape) : shape[part] ? [shape[part]] : [];
    }
    case 'record': return [d.valueType as z.ZodType];
    case 'array': return part === '*' || /^\d+$/.test(part) ? [d.element as z.ZodType] : [];
    case 'tuple': {
      const items = d.items as z.ZodType[];
      return part === '*' ? items : /^\d+$/.test(part) && items[Number(part)] ? [items[Number(part)]] : [];
    }
    default: return [];
  }
}

/** True when `s` (after unwrapping) accepts a number somewhere. */
function acceptsNumber(s: z.ZodType): boolean {
  const d = defOf(s);
  if (d.type === 'number' || d.type === 'int') return true;
  if (['optional', 'nullable', 'default', 'prefault', 'readonly', 'catch', 'nonoptional'].includes(d.type)) return acceptsNumber(d.innerType as z.ZodType);
  if (d.type === 'pipe') return acceptsNumber(d.in as z.ZodType);
  if (d.type === 'union') return (d.options as z.ZodType[]).some(acceptsNumber);
  if (d.type === 'literal') return (d.values as unknown[]).some((v) => typeof v === 'number');
  return false;
}

const leaves = (path: string): z.ZodType[] => path.split('.').reduce<z.ZodType[]>((at, part) => at.flatMap((s) => step(s, part)), [planSchema]);

describe('plan number ranges name keys the plan has', () => {
  it('the schema walk itself finds a known key and misses an invented one', () => {
    // Guard of the walk: without it a walk that found nothing (or everything) would pass the next test vacuously.
    expect(leaves('galaxy.reArcsec').some(acceptsNumber)).toBe(true);
    expect(leaves('search.objective.aBin').some(acceptsNumber)).toBe(true);
    expect(leaves('search.aBin')).toEqual([]);
    expect(leaves('galaxy.noSuchKey')).toEqual([]);
  });

  it('every PLAN_RANGES path leads to a number in the plan schema', () => {
    const missing = PLAN_RANGES.map((r) => r.path).filter((p) => !leaves(p).some(acceptsNumber));
    expect(missing).toEqual([]);
  });

  it('every objective coefficient of the search has a range', () => {
    const shape = defOf(leaves('search.objective')[0]!);
    const inner = defOf(shape.type === 'optional' ? (shape.innerType as z.ZodType) : leaves('search.objective')[0]!);
    const keys = Object.keys(inner.shape as object).map((k) => `search.objective.${k}`);
    expect(keys.length).toBeGreaterThanOrEqual(8);
    const ranged = new Set(PLAN_RANGES.map((r) => r.path));
    expect(keys.filter((k) => !ranged.has(k))).toEqual([]);
  });
});

const demo = JSON.parse(readFileSync(join(__dirname, '../../examples/demo/halo-demo.plan.json'), 'utf8')) as Record<string, unknown>;

function refusal(json: unknown): string[] {
  try {
    parsePlan(json, 'halo.plan.json');
  } catch (e) {
    if (e instanceof InputError) return e.problems.map((p) => `${p.where}: ${p.what}`);
    throw e;
  }
  return [];
}

describe('an out-of-range objective coefficient is refused with the field named', () => {
  const withObjective = (objective: Record<string, unknown>) => ({ ...demo, search: { ...(demo.search as object ?? {}), objective } });

  it.each([
    ['aBin', 1e9, /search\.objective\.aBin: 1000000000 is not a search-objective weight a real observation can have \(0 <= value <= 1000000\)/],
    ['kSector', 5000, /search\.objective\.kSector: 5000 is not a search-objective count .*\(a whole number 1 <= value <= 1000\)/],
    ['kBin', 2.5, /search\.objective\.kBin: 2\.5 .*whole number/],
    ['aStarlightReach', 1e7, /search\.objective\.aStarlightReach: 10000000 /],
    ['aRefraction', 2e6, /search\.objective\.aRefraction: 2000000 /],
  ])('%s = %s', (key, value, message) => {
    const problems = refusal(withObjective({ [key]: value }));
    expect(problems.join('\n')).toMatch(message);
    expect(problems.every((p) => p.startsWith('halo.plan.json: search.objective.'))).toBe(true);
  });

  it('an in-range objective is accepted', () => {
    expect(refusal(withObjective({ aBin: 5, kBin: 5, aSector: 4, kSector: 10, aStarlightBin: 10, aStarlightReach: 10, aRefraction: 1 }))).toEqual([]);
  });
});

describe('the demo and the examples still load', () => {
  const root = join(__dirname, '../../examples');
  const plans = readdirSync(root, { recursive: true, encoding: 'utf8' }).filter((f) => f.endsWith('.plan.json'));
  it('finds the example plans', () => expect(plans.length).toBeGreaterThanOrEqual(8));
  it.each(plans)('%s', (f) => {
    const plan = parsePlanText(readFileSync(join(root, f), 'utf8'), f);
    expect(plan.format).toBe('haloweave.plan/1');
  });
});
