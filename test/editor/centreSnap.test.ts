/**
 * Centre steps (src/editor/view/centreSnap.ts): a typed mask centre lands on the grid of offsets from the galaxy centre
 * (xi East, eta North, multiples of the step), never farther from where it was typed than half a grid diagonal; with
 * steps off it is taken exactly. Typed through the controller, it is one undoable edit.
 */
import { describe, expect, it } from 'vitest';
import { snapCentreDeg } from '../../src/editor/view/centreSnap';
import { skyToTangentArcsec, tangentCentre } from '../../src/core/sky/tangentPlane';
import { separationDeg } from '../../src/core/sky/separation';
import { galaxyModel } from '../../src/core/plan/validate';
import { nodeController } from './nodeController';
import { setMasksCommand } from '../../src/editor/store/commands';

const GALAXIES = [{ raDeg: 161.8125, decDeg: -21.405 }, { raDeg: 359.99, decDeg: 62.5 }, { raDeg: 0.01, decDeg: -80 }];

describe('centre steps', () => {
  it('offsets from the galaxy centre become multiples of the step; the move is at most half the grid diagonal', () => {
    let worst = 0;
    for (const g of GALAXIES) {
      const c = tangentCentre(g.raDeg, g.decDeg);
      for (const step of [0.1, 1, 5, 10]) {
        for (let k = 0; k < 40; k++) {
          // Points up to 20 arcmin from the galaxy, East/West across RA 0 for the galaxies near it.
          const ra = (g.raDeg + ((k * 0.0137) % 0.6) - 0.3 + 360) % 360, dec = g.decDeg + ((k * 0.0071) % 0.5) - 0.25;
          const s = snapCentreDeg(g, ra, dec, step);
          const t = skyToTangentArcsec(c, s.raDeg, s.decDeg)!;
          for (const v of [t.xiArcsec, t.etaArcsec]) expect(Math.abs(v / step - Math.round(v / step))).toBeLessThan(1e-6 / step);
          const movedArcsec = separationDeg(ra, dec, s.raDeg, s.decDeg) * 3600;
          worst = Math.max(worst, movedArcsec / step);
          expect(movedArcsec).toBeLessThanOrEqual((step * Math.SQRT2) / 2 + 1e-6);
        }
      }
    }
    expect(worst).toBeGreaterThan(0.2); // the points were not on the grid already
  });

  it('steps off: the typed centre is kept exactly', () => {
    expect(snapCentreDeg(GALAXIES[0], 161.9, -21.3, 0)).toEqual({ raDeg: 161.9, decDeg: -21.3 });
  });

  it('a typed centre through the controller lands on the steps, as one undoable edit', () => {
    const c = nodeController();
    c.openDemo(false);
    const g = galaxyModel(c.store!.doc.plan);
    c.run((d) => setMasksCommand(d, [{ id: 'm1', raDeg: g.raDeg, decDeg: g.decDeg, paDeg: 0, locked: true }], 'place'));
    const m = c.store!.doc.plan.masks![0];
    c.setCentreSnap(5);
    c.moveMaskTyped(m.id, g.raDeg + 0.05123, g.decDeg - 0.03377);
    const moved = c.store!.doc.plan.masks!.find((x) => x.id === m.id)!;
    const t = skyToTangentArcsec(tangentCentre(g.raDeg, g.decDeg), moved.raDeg!, moved.decDeg!)!;
    expect(Math.abs(t.xiArcsec / 5 - Math.round(t.xiArcsec / 5))).toBeLessThan(1e-7);
    expect(Math.abs(t.etaArcsec / 5 - Math.round(t.etaArcsec / 5))).toBeLessThan(1e-7);
    c.undo();
    expect(c.store!.doc.plan.masks!.find((x) => x.id === m.id)!.raDeg).toBe(m.raDeg);
    c.setCentreSnap(0);
    c.moveMaskTyped(m.id, 161.9, -21.3);
    expect(c.store!.doc.plan.masks!.find((x) => x.id === m.id)!.raDeg).toBe(161.9);
  });
});
