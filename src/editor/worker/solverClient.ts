/**
 * Main-thread side of the solver worker. Latest request wins: while one solve runs, newer requests
 * replace each other in a single pending slot, so a drag never queues stale work; when the running
 * solve ends, only the newest pending request is sent. `cancel` ends the worker and starts a fresh one.
 */
import type { CatalogReadResult } from '../../core/catalog/types';
import type { PlanFile } from '../../core/plan/schema';
import type { InstrumentProfile } from '../../core/profile/schema';
import type { FromWorker, SolveMode, SolveResult } from './protocol';
import type { MaskSolution } from '../../core/geometry/maskSolution';
import { restoreKeptMasks } from './keptMasks';

export interface SolveOutcome {
  requestId: number;
  mode: SolveMode;
  result: SolveResult;
  /** Time the worker spent inside the pipeline, ms. */
  computeMs: number;
  /** Time from posting to receiving, ms (includes message passing). */
  roundTripMs: number;
  /** True when a newer request was made after this one. */
  superseded: boolean;
}

export interface SolverCallbacks {
  onResult(o: SolveOutcome): void;
  onError(message: string, problems: { where: string; what: string; fix?: string }[] | undefined, requestId: number): void;
  onProgress?(fraction: number, message: string, requestId: number): void;
  /** Called when the client becomes idle or busy. */
  onBusy?(busy: boolean): void;
}

type MakeWorker = () => Worker;

/** The default worker factory (Vite bundles the worker module from this URL). */
export const makeSolveWorker: MakeWorker = () => new Worker(new URL('./solveWorker.ts', import.meta.url), { type: 'module' });

export class SolverClient {
  private worker: Worker;
  private nextId = 1;
  private inFlight: { id: number; postedAt: number; mode: SolveMode } | null = null;
  private pending: { plan: PlanFile; mode: SolveMode } | null = null;
  private inputs: { version: number; profile: InstrumentProfile; catalog: CatalogReadResult } | null = null;
  /** The masks of the last result received from the current worker (a result may refer to them, protocol.ts keptMasks). */
  private lastMasks: MaskSolution[] | null = null;
  /** Requests made, requests actually sent to the worker, and requests dropped because a newer one came. */
  readonly stats = { requested: 0, sent: 0, dropped: 0 };

  constructor(private readonly cb: SolverCallbacks, private readonly make: MakeWorker = makeSolveWorker) {
    this.worker = this.start();
  }

  private start(): Worker {
    const w = this.make();
    this.lastMasks = null;
    w.onmessage = (ev: MessageEvent<FromWorker>) => this.receive(ev.data);
    w.onerror = (ev) => {
      ev.preventDefault();
      const id = this.inFlight?.id ?? 0;
      this.inFlight = null;
      this.cb.onError(`solver worker failed: ${ev.message}`, undefined, id);
      this.pump();
    };
    if (this.inputs) w.postMessage({ type: 'inputs', inputsVersion: this.inputs.version, profile: this.inputs.profile, catalog: this.inputs.catalog });
    return w;
  }

  /** Send a new catalog and profile to the worker (once per change, not per solve). */
  setInputs(profile: InstrumentProfile, catalog: CatalogReadResult): void {
    const version = (this.inputs?.version ?? 0) + 1;
    this.inputs = { version, profile, catalog };
    this.worker.postMessage({ type: 'inputs', inputsVersion: version, profile, catalog });
  }

  /** Ask for a solve of `plan`; returns the request id. Older pending requests are dropped. */
  request(plan: PlanFile, mode: SolveMode = 'allocate'): number {
    this.stats.requested++;
    if (this.pending) this.stats.dropped++;
    this.pending = { plan, mode };
    const id = this.nextId; // the id this request will get when it is sent
    this.pump();
    return id;
  }

  get busy(): boolean {
    return this.inFlight !== null || this.pending !== null;
  }

  private pump(): void {
    if (this.inFlight || !this.pending || !this.inputs) {
      this.cb.onBusy?.(this.busy);
      return;
    }
    const { plan, mode } = this.pending;
    this.pending = null;
    const id = this.nextId++;
    this.inFlight = { id, postedAt: performance.now(), mode };
    this.stats.sent++;
    this.worker.postMessage({ type: 'solve', requestId: id, inputsVersion: this.inputs.version, mode, plan });
    this.cb.onBusy?.(true);
  }

  private receive(msg: FromWorker): void {
    if (msg.type === 'progress') {
      this.cb.onProgress?.(msg.fraction, msg.message, msg.requestId);
      return;
    }
    const flight = this.inFlight;
    if (!flight || flight.id !== msg.requestId) return; // from a cancelled worker
    this.inFlight = null;
    let masks: MaskSolution[] | null = null;
    if (msg.type === 'result') {
      try {
        masks = restoreKeptMasks(msg.result.masks, msg.keptMasks, this.lastMasks);
      } catch (e) {
        this.lastMasks = null;
        this.cb.onError((e as Error).message, undefined, msg.requestId);
      }
    }
    if (msg.type === 'result' && masks) {
      this.lastMasks = masks;
      this.cb.onResult({
        requestId: msg.requestId, mode: msg.mode, result: { ...msg.result, masks }, computeMs: msg.computeMs,
        roundTripMs: performance.now() - flight.postedAt, superseded: this.pending !== null,
      });
    } else if (msg.type === 'error') {
      this.cb.onError(msg.message, msg.problems, msg.requestId);
    }
    this.pump();
  }

  /** Stop whatever runs now (the worker is ended and a fresh one started) and drop the pending request. */
  cancel(): void {
    this.worker.terminate();
    this.inFlight = null;
    this.pending = null;
    this.worker = this.start();
    this.cb.onBusy?.(false);
  }

  dispose(): void {
    this.worker.terminate();
    this.inFlight = null;
    this.pending = null;
  }
}
