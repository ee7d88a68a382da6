/** A pool of survey planning workers (worker_threads): jobs run in parallel, each result delivered as it ends. */
import { Worker } from 'node:worker_threads';
import type { PlanJob, WorkerMessage } from './protocol';

/** Run `jobs` on `size` workers; onMessage sees every progress and done message. Resolves when all are done. */
export async function runPlanJobs(jobs: PlanJob[], size: number, onMessage: (m: WorkerMessage) => void): Promise<void> {
  if (jobs.length === 0) return;
  const queue = [...jobs];
  const bootUrl = new URL('./workerBoot.mjs', import.meta.url);
  const workers = Array.from({ length: Math.max(1, Math.min(size, jobs.length)) }, () => new Worker(bootUrl));
  try {
    await Promise.all(workers.map((w) => new Promise<void>((resolveAll) => {
      let current: PlanJob | undefined;
      const next = () => {
        current = queue.shift();
        if (!current) resolveAll();
        else w.postMessage(current);
      };
      w.on('message', (m: WorkerMessage) => {
        onMessage(m);
        if (m.type === 'done') next();
      });
      w.on('error', (e) => {
        // A worker that dies takes its galaxy with it: that galaxy is reported as failed, the other workers go on.
        if (current) onMessage({ type: 'done', index: current.index, ok: false, problems: [`internal error: ${e.stack ?? e.message}`], internal: true });
        current = undefined;
        resolveAll();
      });
      w.on('online', next);
    })));
    for (const job of queue.splice(0)) onMessage({ type: 'done', index: job.index, ok: false, problems: ['internal error: every planning worker stopped before this galaxy'], internal: true });
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
}
