/**
 * Start-up of the command line as a user runs it: `node bin/haloweave.js plan missing.plan.json --out DIR` (exits 2
 * at once) and `haloweave --help`, best of several runs each, from the prebuilt bundle (rebuilt first by
 * bin/build-cli.js, as `npm ci` does) and from the TypeScript sources through tsx (HALOWEAVE_CLI=sources, what every
 * start cost before the bundle). A bare `node -e 0` is measured in the same run as the floor no launcher can beat.
 * The bundle runs from its V8 code cache; HALOWEAVE_CODE_CACHE=off measures it without, on the missing plan and on a
 * real plan (the demo scenario's, 2 500 candidates: the functions the solver first runs are compiled, or not).
 * CPU time (user + system, /usr/bin/time) is reported too: on a shared machine it is steadier than wall time.
 * Goal (docs/startup.md): a failing `plan` starts and stops in under 300 ms.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { performance } from 'node:perf_hooks';
import { printTable, type BenchRow } from './harness';

const RUNS = 7;
/** Runs of the demo plan (about a second each): best of these. */
const PLAN_RUNS = 3;
const ROOT = resolve('.');
const BIN = join(ROOT, 'bin/haloweave.js');

const TIME = '/usr/bin/time';
const haveTime = existsSync(TIME);

/**
 * Best wall time (ms) of RUNS runs of node with `args`, started from `cwd` (each must exit with `expectCode`), and the
 * best CPU time (user + system, ms) of the child as /usr/bin/time reports it: steadier than wall time on a shared machine.
 */
function best(args: string[], env: NodeJS.ProcessEnv, cwd: string, expectCode: number, runs = RUNS): { wallMs: number; cpuMs: number } {
  let wallMs = Infinity, cpuMs = Infinity;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    const r = haveTime
      ? spawnSync(TIME, ['-f', 'haloweave-cpu %U %S', process.execPath, ...args], { cwd, env, encoding: 'utf8' })
      : spawnSync(process.execPath, args, { cwd, env, encoding: 'utf8' });
    wallMs = Math.min(wallMs, performance.now() - t0);
    if (r.status !== expectCode) throw new Error(`startup bench: ${args.join(' ')} exited ${r.status}: ${r.stderr}`);
    const m = /haloweave-cpu ([\d.]+) ([\d.]+)/.exec(r.stderr);
    if (m) cpuMs = Math.min(cpuMs, 1000 * (Number(m[1]) + Number(m[2])));
  }
  return { wallMs, cpuMs };
}

export default async function startupBench(): Promise<void> {
  const build = spawnSync(process.execPath, [join(ROOT, 'bin/build-cli.js')], { cwd: ROOT, encoding: 'utf8' });
  if (build.status !== 0) throw new Error(`startup bench: the build failed: ${build.stderr}`);
  const cwd = mkdtempSync(join(tmpdir(), 'haloweave-startup-bench-'));
  const bundled = { ...process.env, HALOWEAVE_CLI: '' };
  const sources = { ...process.env, HALOWEAVE_CLI: 'sources' };
  const noCache = { ...bundled, HALOWEAVE_CODE_CACHE: 'off' };
  const planMissing = [BIN, 'plan', 'missing.plan.json', '--out', 'o'];
  const planDemo = [BIN, 'plan', join(ROOT, 'examples/demo/halo-demo.plan.json'), '--out', 'demo', '--quiet'];
  try {
    const floor = best(['-e', '0'], process.env, cwd, 0);
    const bPlan = best(planMissing, bundled, cwd, 2);
    const nPlan = best(planMissing, noCache, cwd, 2);
    const bHelp = best([BIN, '--help'], bundled, cwd, 0);
    const bDemo = best(planDemo, bundled, cwd, 0, PLAN_RUNS);
    const nDemo = best(planDemo, noCache, cwd, 0, PLAN_RUNS);
    const sPlan = best(planMissing, sources, cwd, 2);
    const sHelp = best([BIN, '--help'], sources, cwd, 0);
    const rows: BenchRow[] = [
      { name: 'node -e 0 (floor)', value: floor.wallMs, unit: 'ms' },
      { name: 'plan, missing file: prebuilt bundle', value: bPlan.wallMs, unit: 'ms', goal: 300, lowerIsBetter: true },
      { name: 'plan, missing file: bundle minus the floor', value: bPlan.wallMs - floor.wallMs, unit: 'ms' },
      { name: 'plan, missing file: bundle without its code cache', value: nPlan.wallMs, unit: 'ms' },
      { name: '--help: prebuilt bundle', value: bHelp.wallMs, unit: 'ms' },
      { name: 'plan, missing file: sources through tsx', value: sPlan.wallMs, unit: 'ms' },
      { name: '--help: sources through tsx', value: sHelp.wallMs, unit: 'ms' },
      { name: 'plan, missing file: sources / bundle (wall)', value: sPlan.wallMs / bPlan.wallMs, unit: 'x' },
      { name: `plan of the demo scenario (best of ${PLAN_RUNS}): bundle`, value: bDemo.wallMs, unit: 'ms' },
      { name: `plan of the demo scenario (best of ${PLAN_RUNS}): bundle without its code cache`, value: nDemo.wallMs, unit: 'ms' },
    ];
    if (haveTime) {
      rows.push(
        { name: 'CPU time, node -e 0 (user + system)', value: floor.cpuMs, unit: 'cpu ms' },
        { name: 'CPU time, plan, missing file: prebuilt bundle', value: bPlan.cpuMs, unit: 'cpu ms', goal: 300, lowerIsBetter: true },
        { name: 'CPU time, plan, missing file: bundle without its code cache', value: nPlan.cpuMs, unit: 'cpu ms' },
        { name: 'CPU time, --help: prebuilt bundle', value: bHelp.cpuMs, unit: 'cpu ms' },
        { name: 'CPU time, plan, missing file: sources through tsx', value: sPlan.cpuMs, unit: 'cpu ms' },
        { name: 'CPU time, plan, missing file: sources / bundle', value: sPlan.cpuMs / bPlan.cpuMs, unit: 'x' },
        { name: 'CPU time, plan of the demo scenario: bundle', value: bDemo.cpuMs, unit: 'cpu ms' },
        { name: 'CPU time, plan of the demo scenario: bundle without its code cache', value: nDemo.cpuMs, unit: 'cpu ms' },
      );
    }
    await printTable(`Command-line start-up (best of ${RUNS}; load average ${loadavg()[0].toFixed(2)})`, rows);
  } finally {
    rmSync(cwd, { recursive: true, force: true });
  }
}
