/** Messages between `haloweave survey` and its planning workers (worker_threads). */

/** Main to worker: plan one galaxy into its output folder. */
export interface PlanJob {
  index: number;
  planPath: string;
  outDir: string;
}

/** Worker to main. */
export type WorkerMessage =
  | { type: 'progress'; index: number; fraction: number; message: string }
  | { type: 'done'; index: number; ok: true; warnings: string[]; catalog: string | null }
  | { type: 'done'; index: number; ok: false; problems: string[]; internal: boolean };
