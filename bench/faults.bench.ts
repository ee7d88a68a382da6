/**
 * Faults and checks: `haloweave sky --json --curve` streamed at half-minute steps (peak heap while 10 and 40 nights
 * are written: streaming keeps it flat, where the whole array once grew with the range), and `haloweave check` on the
 * solved demo folder (manifest hashes, catalog re-derivation, coverage recount). Run in-process; output counted, not kept.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { medianMs, printTable } from './harness';
import { main } from '../src/cli/main';

/** Run the CLI in-process; returns bytes written to stdout and the peak heap (MB) sampled at each write. */
async function runCounted(argv: string[]): Promise<{ bytes: number; peakHeapMB: number; code: number }> {
  let bytes = 0;
  let peak = 0;
  const code = await main(argv, {
    out: (t) => { bytes += t.length + 1; peak = Math.max(peak, process.memoryUsage().heapUsed); },
    err: () => {},
  });
  return { bytes, peakHeapMB: peak / 1048576, code };
}

export default async function faultsBench(): Promise<void> {
  const work = mkdtempSync(join(tmpdir(), 'haloweave-bench-faults-'));
  try {
    await runCounted(['demo', '--out', join(work, 'demo'), '--quiet']);
    const plan = join(work, 'demo', 'halo-demo.plan.json');
    const sky = (to: string) => ['sky', plan, '--from', '2027-01-01', '--to', to, '--json', '--curve', '--step-min', '0.5'];
    (globalThis as { gc?: () => void }).gc?.();
    const short = await runCounted(sky('2027-01-10'));
    (globalThis as { gc?: () => void }).gc?.();
    const long = await runCounted(sky('2027-02-09'));
    const skyMs = await medianMs(() => runCounted(sky('2027-01-10')), 3);
    const checkMs = await medianMs(() => runCounted(['check', join(work, 'demo')]), 3);
    await printTable('Faults and checks (cli/, core/check/)', [
      { name: 'sky --json --curve, 10 nights at 0.5-min steps', value: skyMs, unit: 'ms', note: `${(short.bytes / 1e6).toFixed(1)} MB written` },
      { name: 'peak heap while writing 10 nights', value: short.peakHeapMB, unit: 'MB' },
      { name: 'peak heap while writing 40 nights', value: long.peakHeapMB, unit: 'MB', note: `${(long.bytes / 1e6).toFixed(1)} MB written; ratio to 10 nights ${(long.peakHeapMB / short.peakHeapMB).toFixed(2)}` },
      { name: 'check on the solved demo folder', value: checkMs, unit: 'ms' },
    ]);
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}
