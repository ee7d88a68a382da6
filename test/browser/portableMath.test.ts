// Same bits in Chromium and Node: the editor solves in the browser and `haloweave plan` in Node, and both must give
// the same slits from the same plan. PMath (src/core/numeric/portableMath.ts) is evaluated on a seeded argument set in
// Debian's chromium (through the Vite dev server, as the editor loads it) and here; every result must be bit-identical.
// The engines' own Math is compared too and the differences are printed: that is the reason PMath exists.
import { describe, expect, it } from 'vitest';
import { PMath } from '../../src/core/numeric/portableMath';
import { bitsHex, evaluateProbe, probeArguments } from '../numeric/probeArguments';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { solveChain, type ProbeSolve } from '../numeric/pipelineProbe';
import { demoOnDisk, ROOT, harnessForFile } from './harness';

const harness = harnessForFile();

const N = 20_000;

describe('PMath in chromium', () => {
  it('gives the same bits as in node for every probe argument', async () => {
    const context = await harness().browser.newContext();
    await context.addInitScript({ content: 'window.__name = (f) => f;' });
    const page = await context.newPage();
    await page.goto(`${harness().url}index.html`);
    // A string, not a function: vitest rewrites import() in this file's own code, and the page must do its own.
    const browser = (await page.evaluate(`(async () => {
      const pm = await import('/src/core/numeric/portableMath.ts');
      const probe = await import('/test/numeric/probeArguments.ts');
      const args = probe.probeArguments(${N});
      return {
        ours: probe.bitsHex(probe.evaluateProbe(pm.PMath, args)),
        native: probe.bitsHex(probe.evaluateProbe(Math, args)),
        agent: navigator.userAgent,
      };
    })()`)) as { ours: string[]; native: string[]; agent: string };
    const args = probeArguments(N);
    const ours = bitsHex(evaluateProbe(PMath, args));
    const native = bitsHex(evaluateProbe(Math as never, args));
    expect(browser.ours.length).toBe(ours.length);
    const mismatches = ours.flatMap((b, i) => (b === browser.ours[i] ? [] : [i]));
    expect(mismatches).toStrictEqual([]);
    const nativeDiffer = native.filter((b, i) => b !== browser.native[i]).length;
    console.log(`${browser.agent.match(/Chrom\S+/)?.[0]} vs node ${process.versions.v8}: Math differs on ${nativeDiffer} of ${native.length} results, PMath on 0`);
    await context.close();
  });
});

describe('the planning pipeline in chromium', () => {
  it('gives the same slits and coverage as in node for the searched demo plan and a chain of edits of it', async () => {
    const demo = demoOnDisk();
    const planText = readFileSync(demo.planPath, 'utf8');
    const profileText = readFileSync(join(ROOT, 'instrument-profiles', `${JSON.parse(planText).instrument}.json`), 'utf8');
    const catalogText = readFileSync(demo.catalogPath, 'utf8');
    const edits = 8;
    const context = await harness().browser.newContext();
    const page = await context.newPage();
    await page.goto(`${harness().url}index.html`);
    await page.evaluate((a) => { (window as unknown as { __probe: unknown }).__probe = a; }, { planText, profileText, catalogText, name: demo.catalogName, edits });
    const browser = (await page.evaluate(`(async () => {
      const probe = await import('/test/numeric/pipelineProbe.ts');
      const a = window.__probe;
      return probe.solveChain(a.planText, a.profileText, a.catalogText, a.name, a.edits);
    })()`)) as ProbeSolve[];
    const node = solveChain(planText, profileText, catalogText, demo.catalogName, edits);
    expect(browser.map((s) => s.label)).toStrictEqual(node.map((s) => s.label));
    expect(node).toHaveLength(edits + 1);
    for (let k = 0; k < node.length; k++) {
      expect(node[k].slitsCsv.split('\n').length, node[k].label).toBeGreaterThan(50);
      expect(browser[k].slitsCsv, node[k].label).toBe(node[k].slitsCsv);
      expect(browser[k].coverageJson, node[k].label).toBe(node[k].coverageJson);
    }
    // The edits really change the solution (the comparison is not of one solution with itself).
    expect(new Set(node.map((s) => s.slitsCsv)).size).toBe(node.length);
    await context.close();
  });
});
