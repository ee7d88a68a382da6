/**
 * Every key of the instrument profile and of the plan file is documented: the keys the zod schemas accept
 * (src/core/profile/schema.ts, src/core/plan/schema.ts and the section schemas it uses) and the keys the shipped
 * profiles and plans use must each appear, as `dotted.path` in backticks, in docs/profile-reference.md and
 * docs/plan-reference.md; and every key a reference table lists must exist. A failure lists the keys to add.
 * Notation: `a.b` nested, `a[].b` inside a list, `a.*.b` inside a map keyed by the user (targetOverrides).
 */
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { planSchema } from '../../src/core/plan/schema';
import { profileSchema } from '../../src/core/profile/schema';
import { jsonKeyPaths, schemaKeyPaths } from './schemaKeys';

const ROOT = join(__dirname, '../..');
const read = (p: string) => readFileSync(join(ROOT, p), 'utf8');

/** JSON files under a folder (recursively) whose names end with `suffix`. */
function jsonFiles(dir: string, suffix: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(join(ROOT, dir))) {
    const rel = join(dir, name);
    if (statSync(join(ROOT, rel)).isDirectory()) out.push(...jsonFiles(rel, suffix));
    else if (name.endsWith(suffix)) out.push(rel);
  }
  return out.sort();
}

/** Keys (dotted paths) not written as `path` in the document. */
function undocumented(keys: readonly string[], doc: string): string[] {
  return [...new Set(keys)].filter((k) => !doc.includes('`' + k + '`'));
}

/** Keys listed in the first column of the document's reference tables. */
function tableKeys(doc: string): string[] {
  return [...doc.matchAll(/^\| `([A-Za-z][\w.*[\]]*)` \|/gm)].map((m) => m[1]);
}

const message = (what: string, doc: string, keys: string[]) =>
  `${keys.length} ${what} not documented in ${doc}; add a row for each (key, unit, default, meaning):\n  ${keys.join('\n  ')}`;

describe('docs/profile-reference.md documents every profile key', () => {
  const doc = read('docs/profile-reference.md');
  const schemaKeys = schemaKeyPaths(profileSchema as never);

  it('every key the profile schema accepts', () => {
    const missing = undocumented(schemaKeys, doc);
    expect(missing, message('profile schema keys', 'docs/profile-reference.md', missing)).toEqual([]);
  });

  it('every key a shipped profile uses', () => {
    const files = jsonFiles('instrument-profiles', '.json');
    expect(files.length).toBeGreaterThanOrEqual(3);
    const used = files.flatMap((f) => jsonKeyPaths(JSON.parse(read(f))).map((k) => k.replace(/^footprint\[\].*$/, 'footprint')));
    const missing = undocumented(used, doc);
    expect(missing, message('keys of the shipped profiles', 'docs/profile-reference.md', missing)).toEqual([]);
  });

  it('no table row names a key the schema does not have', () => {
    const stale = tableKeys(doc).filter((k) => !schemaKeys.includes(k));
    expect(stale, `docs/profile-reference.md lists keys the profile schema does not accept: ${stale.join(', ')}`).toEqual([]);
  });
});

describe('docs/plan-reference.md documents every plan key', () => {
  const doc = read('docs/plan-reference.md');
  const schemaKeys = schemaKeyPaths(planSchema as never);

  it('every key the plan schema and its section schemas accept', () => {
    expect(schemaKeys).toContain('weighting.exclusions[].radiusArcsec');
    expect(schemaKeys).toContain('targetOverrides.*.force');
    const missing = undocumented(schemaKeys, doc);
    expect(missing, message('plan schema keys', 'docs/plan-reference.md', missing)).toEqual([]);
  });

  it('every key a shipped plan uses', () => {
    const files = jsonFiles('examples', '.plan.json');
    expect(files.length).toBeGreaterThanOrEqual(1);
    const used = files.flatMap((f) => jsonKeyPaths(JSON.parse(read(f)), '', ['targetOverrides']));
    const missing = undocumented(used, doc);
    expect(missing, message('keys of the shipped plans', 'docs/plan-reference.md', missing)).toEqual([]);
  });

  it('no table row names a key the schema does not have', () => {
    const stale = tableKeys(doc).filter((k) => !schemaKeys.includes(k));
    expect(stale, `docs/plan-reference.md lists keys the plan schema does not accept: ${stale.join(', ')}`).toEqual([]);
  });
});

describe('the key walk itself', () => {
  it('finds nested, listed and mapped keys and looks through optional and refined wrappers', async () => {
    const { z } = await import('zod');
    const s = z.looseObject({
      a: z.number(),
      b: z.looseObject({ c: z.number().optional() }).optional(),
      d: z.array(z.looseObject({ e: z.string() }).refine(() => true)),
      f: z.record(z.string(), z.looseObject({ g: z.boolean() })),
    });
    expect(schemaKeyPaths(s as never)).toEqual(['a', 'b', 'b.c', 'd', 'd[].e', 'f', 'f.*.g']);
    expect(jsonKeyPaths({ a: 1, d: [{ e: 'x' }, { e: 'y', h: 2 }], f: { id1: { g: true } } }, '', ['f'])).toEqual(['a', 'd', 'd[].e', 'd[].h', 'f', 'f.*', 'f.*.g']);
  });
});
