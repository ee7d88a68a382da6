/**
 * Plan time at every scale, measured as a user runs it: `haloweave plan` (the prebuilt command line, rebuilt first as
 * `npm ci` does) on generated galaxies of 3 000, 20 000, 200 000 and 1 000 000 candidates (src/core/scenario/suite.ts
 * `scaleScenario`, the generator of the suite of generated galaxies; from 200 000 rows on over a wide field), four free
 * masks on the ridge10-narrow profile. For each size: wall time, CPU time (user + system of the child, /usr/bin/time;
 * steadier than wall time on a shared machine), both also minus the command's own start-up (a `plan` of a missing
 * file, measured in the same run), and peak memory (maximum RSS of the child). Then the log-log slope of CPU time
 * against n (least squares over the sizes, and between neighbouring sizes). Goals (docs/benchmarks.md): 3 000 < 0.3 s,
 * 20 000 < 2 s, 200 000 < 5 s and < 1 GB, 1 000 000 < 15 s and < 1 GB (time minus start-up).
 * `HALOWEAVE_SCALE_SIZES=3000,20000` runs some sizes only; best of 3 runs up to 20 000 rows, one run above.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { performance } from 'node:perf_hooks';
import { printTable, type BenchRow } from './harness';
import { SCALE_CANDIDATES } from '../src/core/scenario/suite';

const ROOT = resolve('.');
const BIN = join(ROOT, 'bin/haloweave.js');
const TIME = '/usr/bin/time';
const CHILD_FLAG = '--scale-bench-generate';
const GOAL_MS: Record<number, number> = { 3000: 300, 20000: 2000, 200000: 5000, 1000000: 15000 };
const GOAL_RSS_MB = 1024;

/** Child mode: write the plan and catalog of the scale scenario of n rows into dir (kept out of the parent's heap). */
async function generate(n: number, dir: string): Promise<void> {
  const { scaleScenario } = await import('../src/core/scenario/suite');
  const { parseProfile } = await import('../src/core/profile/load');
  const profile = parseProfile(JSON.parse(readFileSync(join(ROOT, 'instrument-profiles/ridge10-narrow.json'), 'utf8')), 'ridge10-narrow');
  const s = scaleScenario(n, profile);
  writeFileSync(join(dir, s.options.catalogFile), s.catalogCsv);
  writeFileSync(join(dir, `scale-${n}.plan.json`), JSON.stringify(s.plan, null, 2));
}

interface Run { wallMs: number; cpuMs: number; rssMb: number; status: number | null; stderr: string }

/** One run of node with args in cwd under /usr/bin/time: wall, CPU (user + system) and peak RSS of the child. */
function timed(args: string[], cwd: string): Run {
  const t0 = performance.now();
  const r = existsSync(TIME)
    ? spawnSync(TIME, ['-f', 'haloweave-time %U %S %M', process.execPath, ...args], { cwd, encoding: 'utf8', maxBuffer: 1 << 26 })
    : spawnSync(process.execPath, args, { cwd, encoding: 'utf8', maxBuffer: 1 << 26 });
  const wallMs = performance.now() - t0;
  const m = /haloweave-time ([\d.]+) ([\d.]+) (\d+)/.exec(r.stderr ?? '');
  return { wallMs, cpuMs: m ? 1000 * (Number(m[1]) + Number(m[2])) : NaN, rssMb: m ? Number(m[3]) / 1024 : NaN, status: r.status, stderr: r.stderr ?? '' };
}

/** Best (smallest) wall, CPU and RSS over reps runs; throws when a run does not exit with expectCode. */
function best(args: string[], cwd: string, reps: number, expectCode: number): Run {
  let out: Run | null = null;
  for (let i = 0; i < reps; i++) {
    const r = timed(args, cwd);
    if (r.status !== expectCode) throw new Error(`scale bench: ${args.join(' ')} exited ${r.status}: ${r.stderr.slice(-2000)}`);
    out = out ? { ...r, wallMs: Math.min(out.wallMs, r.wallMs), cpuMs: Math.min(out.cpuMs, r.cpuMs), rssMb: Math.min(out.rssMb, r.rssMb) } : r;
  }
  return out!;
}

/** Least-squares slope of log(y) against log(x). */
export function logLogSlope(x: readonly number[], y: readonly number[]): number {
  const lx = x.map((v) => Math.log(v)), ly = y.map((v) => Math.log(v));
  const mx = lx.reduce((a, b) => a + b, 0) / lx.length, my = ly.reduce((a, b) => a + b, 0) / ly.length;
  let sxy = 0, sxx = 0;
  for (let i = 0; i < lx.length; i++) { sxy += (lx[i] - mx) * (ly[i] - my); sxx += (lx[i] - mx) * (lx[i] - mx); }
  return sxx > 0 ? sxy / sxx : NaN;
}

export default async function scaleBench(): Promise<void> {
  const sizes = (process.env.HALOWEAVE_SCALE_SIZES ?? SCALE_CANDIDATES.join(',')).split(',').map(Number).filter((n) => n > 0);
  const build = spawnSync(process.execPath, [join(ROOT, 'bin/build-cli.js')], { cwd: ROOT, encoding: 'utf8' });
  if (build.status !== 0) throw new Error(`scale bench: the build failed: ${build.stderr}`);
  const dir = mkdtempSync(join(tmpdir(), 'haloweave-scale-bench-'));
  const load0 = loadavg()[0];
  const rows: BenchRow[] = [];
  try {
    const startup = best([BIN, 'plan', 'missing.plan.json', '--out', 'o'], dir, 3, 2);
    rows.push({ name: 'start-up: plan of a missing file (best of 3)', value: startup.wallMs, unit: 'ms', note: `CPU ${startup.cpuMs.toFixed(0)} ms` });
    const cpu: number[] = [];
    for (const n of sizes) {
      const g = spawnSync(process.execPath, [join(ROOT, 'bin/run-ts.js'), join(ROOT, 'bench/scale.bench.ts'), CHILD_FLAG, String(n), dir], { cwd: ROOT, encoding: 'utf8' });
      if (g.status !== 0) throw new Error(`scale bench: generating ${n} rows failed: ${g.stderr}`);
      const reps = n <= 20000 ? 3 : 1;
      const r = best([BIN, 'plan', `scale-${n}.plan.json`, '--out', `out-${n}`], dir, reps, 0);
      const slits = readFileSync(join(dir, `out-${n}`, 'slits.csv'), 'utf8').trim().split('\n').length - 1;
      const label = `${n} candidates`;
      const of = reps > 1 ? `best of ${reps}` : 'one run';
      rows.push({ name: `${label}: plan, wall time (${of}; ${slits} slits)`, value: r.wallMs, unit: 'ms' });
      rows.push({ name: `${label}: plan, wall time minus start-up`, value: r.wallMs - startup.wallMs, unit: 'ms', goal: GOAL_MS[n], lowerIsBetter: true });
      rows.push({ name: `${label}: plan, CPU time (user + system)`, value: r.cpuMs, unit: 'ms' });
      rows.push({ name: `${label}: plan, CPU time minus start-up CPU`, value: r.cpuMs - startup.cpuMs, unit: 'ms', goal: GOAL_MS[n], lowerIsBetter: true });
      rows.push({ name: `${label}: peak RSS`, value: r.rssMb, unit: 'MB', goal: n >= 200000 ? GOAL_RSS_MB : undefined, lowerIsBetter: true });
      cpu.push(r.cpuMs - startup.cpuMs);
      rmSync(join(dir, `out-${n}`), { recursive: true, force: true });
    }
    if (sizes.length >= 2) {
      rows.push({ name: `log-log slope of CPU time (minus start-up) against n, least squares over ${sizes.join(', ')}`, value: logLogSlope(sizes, cpu), unit: '' });
      for (let i = 0; i + 1 < sizes.length; i++) {
        rows.push({ name: `log-log slope, ${sizes[i]} to ${sizes[i + 1]}`, value: logLogSlope(sizes.slice(i, i + 2), cpu.slice(i, i + 2)), unit: '' });
      }
    }
    rows.push({ name: 'machine load average (1 min) at the start / end', value: load0, unit: 'on 2 cores', note: `end ${loadavg()[0].toFixed(2)}` });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  await printTable('Plan time at every scale (haloweave plan, generated galaxies, four free masks)', rows);
}

if (process.argv[2] === CHILD_FLAG && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) {
  await generate(Number(process.argv[3]), process.argv[4]);
}
