/**
 * Benchmark harness. Every figure is printed as an absolute number and as a ratio against a
 * reference measured in the same run (a fixed sort workload), so runs on different machines compare.
 */
import { performance } from 'node:perf_hooks';

export interface BenchRow {
  name: string;
  value: number;
  unit: string;
  /** The goal, in the same unit, when the issue sets one; `lowerIsBetter` says which side passes. */
  goal?: number;
  lowerIsBetter?: boolean;
  note?: string;
}

/** Median wall time in ms of `fn` over `reps` runs after one warm-up run. */
export async function medianMs(fn: () => unknown | Promise<unknown>, reps = 5): Promise<number> {
  await fn();
  const times: number[] = [];
  for (let i = 0; i < reps; i++) {
    const t0 = performance.now();
    await fn();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)];
}

let referenceMsCache: number | null = null;

/** Time in ms of the reference workload: sorting 1e6 pseudo-random doubles (median of 5). */
export async function referenceMs(): Promise<number> {
  if (referenceMsCache !== null) return referenceMsCache;
  let seed = 12345;
  const base = new Float64Array(1_000_000).map(() => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648));
  referenceMsCache = await medianMs(() => base.slice().sort(), 5);
  return referenceMsCache;
}

/** Print a table of rows; times (unit "ms") also as a ratio to the reference workload, goals as pass/miss. */
export async function printTable(title: string, rows: BenchRow[]): Promise<void> {
  const ref = await referenceMs();
  console.log(`\n## ${title}`);
  console.log(`| figure | value | x reference (${ref.toFixed(1)} ms sort of 1e6) | goal | met |`);
  console.log('|---|---|---|---|---|');
  for (const r of rows) {
    const ratio = r.unit === 'ms' ? (r.value / ref).toFixed(3) : '';
    const goal = r.goal === undefined ? '' : `${r.lowerIsBetter === false ? '>=' : '<='} ${r.goal} ${r.unit}`;
    const met = r.goal === undefined ? '' : (r.lowerIsBetter === false ? r.value >= r.goal : r.value <= r.goal) ? 'yes' : 'NO';
    const v = Math.abs(r.value) >= 100 ? r.value.toFixed(0) : r.value.toPrecision(4);
    console.log(`| ${r.name}${r.note ? ` (${r.note})` : ''} | ${v} ${r.unit} | ${ratio} | ${goal} | ${met} |`);
  }
}
