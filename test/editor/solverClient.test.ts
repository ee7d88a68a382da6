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

describe('kept masks between results', () => {
  it('the client restores the masks a result leaves out, from the previous result, through a structured clone', async () => {
    const { elideKeptMasks } = await import('../../src/editor/worker/keptMasks');
    const mk = (id: string, n: number) => ({ mask: { id }, slits: Array.from({ length: n }, (_, i) => ({ slitId: `${id}-${i}` })) }) as never;
    const a = mk('m1', 3), b = mk('m2', 2), c = mk('m3', 4), b2 = mk('m2', 5);
    const workers: FakeWorker[] = [];
    const results: SolveOutcome[] = [];
    const errors: string[] = [];
    const client = new SolverClient({ onResult: (o) => results.push(o), onError: (m) => errors.push(m) }, () => {
      const w = new FakeWorker();
      workers.push(w);
      return w as unknown as Worker;
    });
    client.setInputs({} as never, {} as never);
    // The worker side: what it posted last decides what it leaves out.
    let lastPosted: never[] | null = null;
    const answerWith = (masks: never[]) => {
      const w = workers[workers.length - 1];
      const req = w.solves().at(-1)!;
      const e = elideKeptMasks(masks, lastPosted);
      lastPosted = masks;
      w.onmessage!({ data: structuredClone({ type: 'result', requestId: req.requestId, mode: req.mode, computeMs: 1, keptMasks: e.kept, result: { plan: req.plan, galaxy: null, masks: e.masks, coverage: null, warnings: [], extra: {} } }) } as MessageEvent);
      return e;
    };
    client.request(plan('first'), 'preview');
    expect(answerWith([a, b, c]).kept).toStrictEqual([]);
    client.request(plan('drag'), 'preview');
    const e = answerWith([a, b2, c]);
    expect(e.kept).toStrictEqual([0, 2]);
    expect(e.masks[0]).toBeNull();
    const got = results[1].result.masks as unknown as { mask: { id: string }; slits: unknown[] }[];
    expect(got.map((m) => [m.mask.id, m.slits.length])).toStrictEqual([['m1', 3], ['m2', 5], ['m3', 4]]);
    // Unchanged masks are the client's own objects of the previous result, not copies.
    expect(got[0]).toBe(results[0].result.masks[0]);
    expect(got[1]).not.toBe(results[0].result.masks[1]);
    // After a cancel the fresh worker starts from nothing: a result that refers to old masks is an error, not a guess,
    // and the client goes on (the next request is sent).
    client.cancel();
    client.request(plan('after'), 'preview');
    answerWith([a, b2, c]);
    expect(errors).toHaveLength(1);
    expect(errors[0]).toMatch(/previous result/);
    expect(results).toHaveLength(2);
    client.request(plan('again'), 'preview');
    expect(workers[1].solves().map((q) => (q.plan as { galaxy: { id: string } }).galaxy.id)).toStrictEqual(['after', 'again']);
  });
});
