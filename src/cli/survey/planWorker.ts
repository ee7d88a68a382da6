/**
 * A survey planning worker: plans one galaxy at a time (the same loader, solver and atomic output folder as
 * `haloweave plan`), reporting progress and the outcome to the main thread. A user's mistake comes back as
 * problems (one line each), never as a stack trace.
 */
import { parentPort } from 'node:worker_threads';
import { InputError, formatProblem } from '../../core/result';
import { loadPlanInputs } from '../loadPlanInputs';
import { solveAndWrite } from '../commands/plan';
import type { PlanJob, WorkerMessage } from './protocol';

const PROGRESS = /^haloweave plan: \[\s*(\d+)%\] (.*)$/;
const WARNING = /^haloweave plan: warning: (.*)$/;

function post(m: WorkerMessage): void {
  parentPort!.postMessage(m);
}

parentPort!.on('message', (job: PlanJob) => {
  const warnings: string[] = [];
  let catalog: string | null = null;
  try {
    const loaded = loadPlanInputs(job.planPath);
    solveAndWrite(loaded, job.outDir, {
      out: () => {},
      err: (t) => {
        const p = PROGRESS.exec(t);
        if (p) post({ type: 'progress', index: job.index, fraction: Number(p[1]) / 100, message: p[2] });
        else if (t.startsWith('haloweave plan: catalog ')) catalog = t.replace(/^haloweave plan: /, '');
        else {
          const w = WARNING.exec(t);
          warnings.push(w ? w[1] : t.replace(/^haloweave plan: /, ''));
        }
      },
    });
    post({ type: 'done', index: job.index, ok: true, warnings, catalog });
  } catch (e) {
    if (e instanceof InputError) post({ type: 'done', index: job.index, ok: false, problems: e.problems.map(formatProblem), internal: false });
    else post({ type: 'done', index: job.index, ok: false, problems: [`internal error: ${(e as Error).stack ?? String(e)}`], internal: true });
  }
});
