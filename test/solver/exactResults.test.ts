/**
 * Exact results kept through speed work: `haloweave plan` (in-process, the CLI's own main) on the demo
 * (examples/demo), a sample of the generated-galaxy suite (src/core/scenario/suite.ts, each shipped profile) and the
 * scale scenario of 3 000 and 20 000 candidates writes a slits.csv whose SHA-256 equals the one recorded in
 * test/reference/slits-sha256.json. The hashes are the outputs of the code before the change to typed columns, the
 * grid-indexed proxy model and the scratch-array one-mask re-solve; a change meant to alter the plans (new objective
 * terms, another search) regenerates them with `HALOWEAVE_UPDATE_SLIT_HASHES=1 npx vitest run test/solver/exactResults.test.ts`
 * and says so in its commit.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/main';
import { parseProfile } from '../../src/core/profile/load';
import { suiteScenario, scaleScenario } from '../../src/core/scenario/suite';
import { PROFILE_IDS, loadProfile } from '../search/helpers';
import type { Scenario } from '../../src/core/scenario/generator';

const REF = join(__dirname, '../reference/slits-sha256.json');
const update = process.env.HALOWEAVE_UPDATE_SLIT_HASHES === '1';
const recorded: Record<string, string> = update ? {} : JSON.parse(readFileSync(REF, 'utf8'));
const work = mkdtempSync(join(tmpdir(), 'haloweave-exact-'));
afterAll(() => {
  if (update) writeFileSync(REF, JSON.stringify(recorded, null, 2) + '\n');
  rmSync(work, { recursive: true, force: true });
});

const io = () => { const err: string[] = []; return { err, io: { out: () => {}, err: (t: string) => err.push(t) } }; };
const sha = (path: string) => createHash('sha256').update(readFileSync(path)).digest('hex');

/** Solve a plan file with the CLI's main and return the SHA-256 of the slits.csv it wrote. */
async function planHash(planPath: string, name: string): Promise<string> {
  const out = join(work, `${name}-out`);
  const { err, io: sink } = io();
  expect(await main(['plan', planPath, '--out', out, '--quiet'], sink), err.join('\n')).toBe(0);
  return sha(join(out, 'slits.csv'));
}

/** Write a generated scenario's plan and catalog into a fresh folder, solve it, and return the slits.csv hash. */
async function scenarioHash(s: Scenario, name: string): Promise<string> {
  const dir = join(work, name);
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, s.options.catalogFile), s.catalogCsv);
  writeFileSync(join(dir, 'case.plan.json'), JSON.stringify(s.plan, null, 2));
  return planHash(join(dir, 'case.plan.json'), name);
}

function check(name: string, hash: string): void {
  if (update) { recorded[name] = hash; return; }
  expect(hash, `${name}: slits.csv differs from the recorded output`).toBe(recorded[name]);
}

describe('slits.csv byte-identical to the recorded outputs', () => {
  it('the demo', async () => {
    const dir = join(work, 'demo');
    const { err, io: sink } = io();
    expect(await main(['demo', '--out', dir, '--quiet'], sink), err.join('\n')).toBe(0);
    check('demo', sha(join(dir, 'slits.csv')));
  }, 120_000);

  const profiles = PROFILE_IDS.map(loadProfile);
  it.each([1, 6, 11, 19])('generated-galaxy suite case %i', async (i) => {
    check(`suite-${i}`, await scenarioHash(suiteScenario(i, profiles), `suite-${i}`));
  }, 120_000);

  it.each([3000, 20000])('scale scenario of %i candidates', async (n) => {
    const profile = parseProfile(JSON.parse(readFileSync(join(__dirname, '../../instrument-profiles/ridge10-narrow.json'), 'utf8')), 'ridge10-narrow');
    check(`scale-${n}`, await scenarioHash(scaleScenario(n, profile), `scale-${n}`));
  }, 180_000);
});
