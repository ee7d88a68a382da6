// Latest request wins: while one solve runs, newer requests replace each other, so a drag never queues stale work.
import { describe, expect, it } from 'vitest';
import { SolverClient, type SolveOutcome } from '../../src/editor/worker/solverClient';
import type { ToWorker } from '../../src/editor/worker/protocol';

/** A stand-in worker that records what it is sent and answers only when told to. */
class FakeWorker {
  sent: ToWorker[] = [];
  onmessage: ((ev: MessageEvent) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  terminated = false;
  postMessage(msg: ToWorker) { this.sent.push(structuredClone(msg)); }
  terminate() { this.terminated = true; }
  /** Answer the solve with request id `id` (its plan's galaxy id marks which plan it was). */
  answer(id: number) {
    const req = this.sent.find((m) => m.type === 'solve' && m.requestId === id) as Extract<ToWorker, { type: 'solve' }>;
    this.onmessage!({ data: { type: 'result', requestId: id, mode: req.mode, computeMs: 1, result: { plan: req.plan, galaxy: null, masks: [], coverage: null, warnings: [], extra: {} } } } as MessageEvent);
  }
  solves() { return this.sent.filter((m) => m.type === 'solve') as Extract<ToWorker, { type: 'solve' }>[]; }
}

const plan = (tag: string) => ({ format: 'haloweave.plan/1', galaxy: { id: tag } }) as never;

describe('solver client', () => {
  it('sends at most one solve at a time and only the newest pending one after it', () => {
    const workers: FakeWorker[] = [];
    const results: SolveOutcome[] = [];
    const client = new SolverClient({ onResult: (o) => results.push(o), onError: () => {} }, () => {
      const w = new FakeWorker();
      workers.push(w);
      return w as unknown as Worker;
    });
    client.setInputs({} as never, {} as never);
    client.request(plan('a'));
    for (const t of ['b', 'c', 'd', 'e']) client.request(plan(t));
    const w = workers[0];
    expect(w.solves().map((s) => (s.plan as { galaxy: { id: string } }).galaxy.id)).toStrictEqual(['a']);
    w.answer(w.solves()[0].requestId);
    // a is delivered (marked superseded: newer work exists), and only e is sent next.
    expect(results[0].superseded).toBe(true);
    expect(w.solves().map((s) => (s.plan as { galaxy: { id: string } }).galaxy.id)).toStrictEqual(['a', 'e']);
    w.answer(w.solves()[1].requestId);
    expect(results.map((r) => (r.result.plan as { galaxy: { id: string } }).galaxy.id)).toStrictEqual(['a', 'e']);
    expect(results[1].superseded).toBe(false);
    expect(client.stats).toStrictEqual({ requested: 5, sent: 2, dropped: 3 });
    expect(client.busy).toBe(false);
  });

  it('cancel ends the worker, starts a fresh one with the same inputs, and ignores the old answer', () => {
    const workers: FakeWorker[] = [];
    const results: SolveOutcome[] = [];
    const client = new SolverClient({ onResult: (o) => results.push(o), onError: () => {} }, () => {
      const w = new FakeWorker();
      workers.push(w);
      return w as unknown as Worker;
    });
    client.setInputs({ id: 'p' } as never, { source: 'c' } as never);
    client.request(plan('slow'), 'plan');
    client.cancel();
    expect(workers[0].terminated).toBe(true);
    expect(workers[1].sent[0]).toMatchObject({ type: 'inputs', profile: { id: 'p' } });
    workers[0].answer(workers[0].solves()[0].requestId);
    expect(results).toHaveLength(0);
    client.request(plan('next'));
    workers[1].answer(workers[1].solves()[0].requestId);
    expect(results).toHaveLength(1);
  });
});
