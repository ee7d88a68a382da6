/**
 * `haloweave demo --out DIR`: write the invented demo scenario (examples/demo/: a made-up galaxy and a synthetic
 * catalog from the documented generator, fixed seed) into DIR, then solve it into DIR/solved/ with `haloweave plan`,
 * printing its summary.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { CliIO } from '../io';
import { optionText, parseArgs, unknownOptions } from '../args';
import { DEMO_PLAN_FILE, demoScenario } from '../../core/scenario/generator';
import { run as runPlan } from './plan';

const USAGE = 'usage: haloweave demo --out DIR [--quiet]';

/** The demo's plan and catalog texts, exactly as committed in examples/demo/. */
export function demoFiles(): Record<string, string> {
  const s = demoScenario();
  return { [DEMO_PLAN_FILE]: JSON.stringify(s.plan, null, 2) + '\n', [String(s.plan.catalog)]: s.catalogCsv };
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
  const dir = resolve(out);
  mkdirSync(dir, { recursive: true });
  for (const [name, text] of Object.entries(demoFiles())) writeFileSync(join(dir, name), text);
  io.out(`haloweave demo: wrote ${join(dir, DEMO_PLAN_FILE)} and its catalog (invented galaxy, synthetic catalog)`);
  return runPlan([join(dir, DEMO_PLAN_FILE), '--out', join(dir, 'solved'), ...(args.options.quiet ? ['--quiet'] : [])], io);
}
