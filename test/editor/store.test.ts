// Undo/redo exactness of the editor's document store: any sequence of commands, undone, gives back the
// starting document exactly (deep equality that also tells a missing key from one set to undefined).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { parsePlan } from '../../src/core/plan/validate';
import { parseProfileText } from '../../src/core/profile/load';
import { DocumentStore } from '../../src/editor/store/store';
import {
  moveMaskCommand, rotateMaskCommand, setGalaxyFieldCommand, setGoalCommand, setMaskLockedCommand,
  setMasksCommand, setOverridesCommand, setProfileCommand, type Command,
} from '../../src/editor/store/commands';
import type { EditorDoc } from '../../src/editor/store/document';

const profileA = parseProfileText(readFileSync('instrument-profiles/quad8-square.json', 'utf8'), 'quad8');
const profileB = parseProfileText(readFileSync('instrument-profiles/ridge10-narrow.json', 'utf8'), 'ridge10');

function startDoc(): EditorDoc {
  const plan = parsePlan({
    format: 'haloweave.plan/1',
    galaxy: { id: 'gal-a', ra: '12:30:00', dec: -5.5, reArcsec: 45, axisRatio: 0.8, paDeg: 30, distanceMpc: 18, vsysKms: 1250, sersicN: 4, muE: 21.5 },
    instrument: profileA.id,
    catalog: 'cat.csv',
    goals: { masks: 4, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498.0, 8542.1, 8662.1] },
    masks: [
      { id: 'm1', raDeg: 187.5, decDeg: -5.5, paDeg: 10, locked: false },
      { id: 'm2', raDeg: 187.6, decDeg: -5.4, paDeg: 350 },
      { id: 'm3' },
    ],
  });
  return { plan, profile: profileA };
}

const ids = ['t1', 't2', 't3', 't4'];
type Op = (doc: EditorDoc) => Command;
const opArb: fc.Arbitrary<Op> = fc.oneof(
  fc.tuple(fc.constantFrom('m1', 'm2', 'm3'), fc.double({ min: 0, max: 359.9, noNaN: true }), fc.double({ min: -80, max: 80, noNaN: true }))
    .map(([m, ra, dec]) => (d: EditorDoc) => moveMaskCommand(d, m, ra, dec)),
  fc.tuple(fc.constantFrom('m1', 'm2', 'm3'), fc.double({ min: -720, max: 720, noNaN: true }))
    .map(([m, pa]) => (d: EditorDoc) => rotateMaskCommand(d, m, pa)),
  fc.tuple(fc.constantFrom('m1', 'm2', 'm3'), fc.boolean()).map(([m, l]) => (d: EditorDoc) => setMaskLockedCommand(d, m, l)),
  fc.tuple(fc.subarray(ids, { minLength: 1 }), fc.option(fc.double({ min: 0, max: 10, noNaN: true }), { nil: null }))
    .map(([t, w]) => (d: EditorDoc) => setOverridesCommand(d, t, { weight: w })),
  fc.tuple(fc.subarray(ids, { minLength: 1 }), fc.constantFrom<'in' | 'out' | null>('in', 'out', null))
    .map(([t, f]) => (d: EditorDoc) => setOverridesCommand(d, t, { force: f })),
  fc.double({ min: 1, max: 100, noNaN: true }).map((re) => (d: EditorDoc) => setGalaxyFieldCommand(d, 'reArcsec', re)),
  fc.integer({ min: 1, max: 8 }).map((n) => (d: EditorDoc) => setGoalCommand(d, 'masks', n)),
  fc.boolean().map((b) => (d: EditorDoc) => setProfileCommand(d, b ? profileB : profileA)),
  fc.constant((d: EditorDoc) => setMasksCommand(d, [{ id: 'm1', raDeg: 1, decDeg: 2, paDeg: 3, locked: true }])),
);

describe('editor document store', () => {
  it('undoing every command of a random sequence restores the start exactly; redoing restores the end exactly', () => {
    fc.assert(
      fc.property(fc.array(opArb, { minLength: 1, maxLength: 25 }), (ops) => {
        const start = structuredClone(startDoc());
        const store = new DocumentStore(startDoc(), {});
        const snapshots: EditorDoc[] = [structuredClone(store.doc)];
        for (const op of ops) {
          // A command that names a mask the list no longer has (after setMasks) is refused, not half-done.
          try {
            store.run(op);
          } catch (e) {
            expect(String(e)).toMatch(/no mask/);
            continue;
          }
          snapshots.push(structuredClone(store.doc));
        }
        const end = structuredClone(store.doc);
        // Step back one by one: each intermediate state is exactly the one recorded on the way.
        for (let i = snapshots.length - 2; i >= 0; i--) {
          store.undo();
          expect(store.doc).toStrictEqual(snapshots[i]);
        }
        expect(store.doc).toStrictEqual(start);
        expect(store.canUndo).toBe(false);
        expect(store.dirty).toBe(false);
        while (store.canRedo) store.redo();
        expect(store.doc).toStrictEqual(end);
      }),
      { numRuns: 300 },
    );
  });

  it('a new command after undo clears the redo list', () => {
    const store = new DocumentStore(startDoc(), {});
    store.run((d) => rotateMaskCommand(d, 'm1', 45));
    store.undo();
    expect(store.canRedo).toBe(true);
    store.run((d) => setMaskLockedCommand(d, 'm2', true));
    expect(store.canRedo).toBe(false);
    expect(store.doc.plan.masks![0].paDeg).toBe(10);
  });

  it('moving or rotating a mask locks it and wraps the PA into [0, 360)', () => {
    const store = new DocumentStore(startDoc(), {});
    store.run((d) => rotateMaskCommand(d, 'm1', -30));
    expect(store.doc.plan.masks![0]).toMatchObject({ paDeg: 330, locked: true });
    store.run((d) => moveMaskCommand(d, 'm3', 360.25, 1));
    expect(store.doc.plan.masks![2]).toMatchObject({ raDeg: 0.25, decDeg: 1, locked: true });
  });

  it('override edits add and remove entries and the key itself goes away on undo when it was absent', () => {
    const store = new DocumentStore(startDoc(), {});
    expect('targetOverrides' in store.doc.plan).toBe(false);
    store.run((d) => setOverridesCommand(d, ['t1', 't2'], { weight: 3 }));
    store.run((d) => setOverridesCommand(d, ['t2'], { force: 'out' }));
    expect(store.doc.plan.targetOverrides).toStrictEqual({ t1: { weight: 3 }, t2: { weight: 3, force: 'out' } });
    store.run((d) => setOverridesCommand(d, ['t1'], { weight: null }));
    expect(store.doc.plan.targetOverrides).toStrictEqual({ t2: { weight: 3, force: 'out' } });
    store.undo(); store.undo(); store.undo();
    expect('targetOverrides' in store.doc.plan).toBe(false);
  });

  it('dirty follows the save point, including undo back to it', () => {
    const store = new DocumentStore(startDoc(), {});
    store.run((d) => setGoalCommand(d, 'masks', 3));
    expect(store.dirty).toBe(true);
    store.markSaved();
    expect(store.dirty).toBe(false);
    store.run((d) => setGoalCommand(d, 'masks', 2));
    expect(store.dirty).toBe(true);
    store.undo();
    expect(store.dirty).toBe(false);
    store.undo();
    expect(store.dirty).toBe(true);
  });

  it('notifies subscribers once per change', () => {
    const store = new DocumentStore(startDoc(), { n: 0 });
    let calls = 0;
    const off = store.subscribe(() => calls++);
    store.run((d) => setMaskLockedCommand(d, 'm1', true));
    store.undo();
    store.undo(); // nothing to undo: no change, no call
    store.updateSession((s) => ({ n: s.n + 1 }));
    off();
    store.redo();
    expect(calls).toBe(3);
  });
});
