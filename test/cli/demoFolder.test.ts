/**
 * `haloweave demo --out DIR`: DIR itself is a complete output folder (outputs beside the scenario's plan and catalog),
 * written atomically; re-running on the same DIR works; a folder with other files is refused untouched. Also the
 * plan summary (each line said once) and the usage lines.
 */
import { describe, expect, it, beforeAll } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/main';

const OUTPUTS = ['catalog-report.csv', 'coverage.json', 'excluded-targets.csv', 'manifest.json', 'masks.csv', 'slits.csv', 'solved.plan.json'];
const INPUTS = ['halo-demo.catalog.csv', 'halo-demo.plan.json'];

function capture() {
  const out: string[] = [], err: string[] = [];
  return { out, err, io: { out: (t: string) => out.push(t), err: (t: string) => err.push(t) } };
}

let work: string;
let first: ReturnType<typeof capture>;
let firstCode: number;
beforeAll(async () => {
  work = mkdtempSync(join(tmpdir(), 'haloweave-demo-folder-'));
  // A folder as the earlier demo layout left it: the inputs, and the outputs in solved/.
  const dir = join(work, 'demo');
  mkdirSync(join(dir, 'solved'), { recursive: true });
  for (const f of INPUTS) writeFileSync(join(dir, f), 'old');
  writeFileSync(join(dir, 'solved', 'solved.plan.json'), '{}');
  first = capture();
  firstCode = await main(['demo', '--out', dir, '--quiet'], first.io);
}, 120_000);

describe('haloweave demo --out DIR', () => {
  it('replaces the earlier layout: DIR holds the outputs and the inputs, nothing else, and no temporary folder is left', () => {
    expect(firstCode).toBe(0);
    expect(readdirSync(join(work, 'demo')).sort()).toEqual([...INPUTS, ...OUTPUTS].sort());
    expect(readdirSync(work)).toEqual(['demo']);
    expect(readFileSync(join(work, 'demo', 'halo-demo.plan.json'), 'utf8')).toBe(readFileSync(new URL('../../examples/demo/halo-demo.plan.json', import.meta.url), 'utf8'));
    expect(JSON.parse(readFileSync(join(work, 'demo', 'solved.plan.json'), 'utf8')).catalog).toBe('halo-demo.catalog.csv');
  });

  it('`haloweave check DIR` passes straight after, reading the catalog in DIR', async () => {
    const c = capture();
    expect(await main(['check', join(work, 'demo')], c.io)).toBe(0);
    expect(c.err).toEqual([]);
    expect(c.out.join('\n')).toContain('objects, positions, mags and weights against halo-demo.catalog.csv and catalog-report.csv');
  });

  it('prints one summary with no line said twice, in the documented order', () => {
    const lines = first.out;
    expect(new Set(lines).size).toBe(lines.length);
    const at = (re: RegExp) => lines.findIndex((l) => re.test(l));
    const order = [/^mask m1: .* tracer, .* starlight, .* sky slits, .* alignment boxes/, /^tracer weight allocated: [\d.]+ \(upper bound/, /^ {2}tracer per 1-Re bin/, /^ {2}tracer per 45-deg sector/, /^ {2}tracer: \d+ slits, reach [\d.]+ Re \(goal 10 Re/, /^ {2}tracer: (every goal bin|empty goal bins)/, /^ {2}starlight per 1-Re bin/, /^weighting rules:/, /^Differential refraction/, /^Exposure estimate/, /^wrote /];
    const idx = order.map(at);
    expect(idx.every((i) => i >= 0), `missing: ${order.filter((_, k) => idx[k] < 0).join(' ')}`).toBe(true);
    expect([...idx].sort((a, b) => a - b)).toEqual(idx);
    expect(lines.filter((l) => /^ {2}tracer: \d+ slits/.test(l))).toHaveLength(1);
  });

  it('runs again on the same DIR', async () => {
    const before = readFileSync(join(work, 'demo', 'slits.csv'), 'utf8');
    const c = capture();
    expect(await main(['demo', '--out', join(work, 'demo'), '--quiet'], c.io)).toBe(0);
    expect(readFileSync(join(work, 'demo', 'slits.csv'), 'utf8')).toBe(before); // the same seed, the same result
    expect(readdirSync(work)).toEqual(['demo']);
  }, 120_000);

  it('refuses a folder holding other files and leaves it, and nothing else, behind', async () => {
    const dir = join(work, 'mine');
    mkdirSync(dir);
    writeFileSync(join(dir, 'notes.txt'), 'mine');
    writeFileSync(join(dir, 'masks.csv'), 'mine too');
    const c = capture();
    expect(await main(['demo', '--out', dir, '--quiet'], c.io)).not.toBe(0);
    expect(c.err.join('\n')).toMatch(/--out .*mine: the folder exists and is not a Haloweave output folder this run may replace \(it holds notes\.txt, which this run does not write\)/);
    expect(readdirSync(dir).sort()).toEqual(['masks.csv', 'notes.txt']);
    expect(readFileSync(join(dir, 'masks.csv'), 'utf8')).toBe('mine too');
    expect(readdirSync(work).sort()).toEqual(['demo', 'mine']);
    expect(existsSync(join(dir, 'solved.plan.json'))).toBe(false);
  }, 120_000);
});

describe('usage lines', () => {
  it('sky lists --step-min and --curve', async () => {
    const c = capture();
    expect(await main(['sky', '--help'], c.io)).toBe(0);
    expect(c.out.join('\n')).toMatch(/haloweave sky PLAN --from DATE --to DATE \[--max-airmass X\] \[--step-min N\] \[--json \[--curve\]\]/);
  });
});
