/**
 * `haloweave demo --out DIR`: write the invented demo scenario (examples/demo/: a made-up galaxy and a synthetic
 * catalog from the documented generator, fixed seed) and solve it, DIR becoming one complete output folder: the
 * outputs of `haloweave plan` (masks.csv, slits.csv, coverage.json, solved.plan.json, catalog-report.csv,
 * excluded-targets.csv) beside the scenario's plan and catalog, all written in one atomic step, so
 * `haloweave check DIR` works on it and solved.plan.json's catalog path names the catalog in DIR.
 */
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { CliIO } from '../io';
import { optionText, parseArgs, unknownOptions } from '../args';
import { DEMO_PLAN_FILE, demoScenario } from '../../core/scenario/generator';
import { loadPlanInputs } from '../loadPlanInputs';
import { solveAndWrite } from './plan';

const USAGE = 'usage: haloweave demo --out DIR [--quiet]';

/** The demo's plan and catalog texts, exactly as committed in examples/demo/. */
export function demoFiles(): Record<string, string> {
  const s = demoScenario();
  return { [DEMO_PLAN_FILE]: JSON.stringify(s.plan, null, 2) + '\n', [String(s.plan.catalog)]: s.catalogCsv };
}

/** The `solved/` subfolder an earlier demo layout solved into (it holds a solved.plan.json): replaced by a new run. */
function earlierDemoLayout(entry: string, dir: string): boolean {
  return entry === 'solved' && existsSync(join(dir, entry, 'solved.plan.json'));
}

export async function run(argv: string[], io: CliIO): Promise<number> {
  const args = parseArgs(argv, ['quiet']);
  const bad = unknownOptions(args, ['out', 'quiet']);
  const out = optionText(args, 'out');
  if (!out || bad.length || args.positionals.length) {
    if (bad.length) io.err(`haloweave demo: unknown option${bad.length > 1 ? 's' : ''} ${bad.map((b) => `--${b}`).join(', ')}`);
    if (!out) io.err('haloweave demo: --out DIR is required (the folder the demo is written to)');
    if (args.positionals.length) io.err(`haloweave demo: unexpected argument ${args.positionals[0]}`);
    io.err(USAGE);
    return 2;
  }
  const inputs = demoFiles();
  // The inputs are read back from a scratch folder through the same loader as `haloweave plan`; the output folder
  // receives them together with the outputs, in the same atomic rename.
  const scratch = mkdtempSync(join(tmpdir(), 'haloweave-demo-'));
  try {
    for (const [name, text] of Object.entries(inputs)) writeFileSync(join(scratch, name), text);
    const loaded = loadPlanInputs(join(scratch, DEMO_PLAN_FILE));
    io.out(`haloweave demo: the invented galaxy ${loaded.plan.galaxy.id} and its synthetic catalog (${DEMO_PLAN_FILE}, ${String(loaded.plan.catalog)}), solved into ${out}/`);
    return solveAndWrite(loaded, out, io, {
      quiet: args.options.quiet === true,
      extraFiles: inputs,
      catalogInFolder: String(loaded.plan.catalog),
      alsoReplaces: earlierDemoLayout,
    });
  } finally {
    rmSync(scratch, { recursive: true, force: true });
  }
}
