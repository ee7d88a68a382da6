import { describe, expect, it } from 'vitest';
import { unitGrid, unitGridNear } from '../../src/core/solver/unitGrid';
import { unitVectors } from '../../src/core/solver/maskTargets';
import { makeRng } from '../../src/core/numeric/random';

describe('the spatial index of sky points', () => {
  it('a cone query returns, in increasing order, every point within the radius (brute-force angular distances), near the poles and across RA 0/360 too', () => {
    const rng = makeRng('unit-grid');
    for (const [ra0, dec0] of [[0.1, 10], [359.9, -30], [120, 89.8], [250, -89.5], [45, 0]]) {
      const ra: number[] = [], dec: number[] = [];
      for (let i = 0; i < 4000; i++) { ra.push((ra0 + rng.uniform(-3, 3) + 360) % 360); dec.push(Math.max(-90, Math.min(90, dec0 + rng.uniform(-1.5, 1.5)))); }
      const u = unitVectors(ra, dec);
      const indices = Int32Array.from({ length: 2000 }, (_v, k) => 2 * k + 1);
      const radiusRad = (0.3 * Math.PI) / 180;
      const grid = unitGrid(u, indices, radiusRad);
      const c = unitVectors([ra0], [dec0]);
      const got = unitGridNear(grid, c.x[0], c.y[0], c.z[0], radiusRad);
      // Angle between unit vectors by the haversine-safe atan2 of |a x b| and a . b (common practice).
      const within: number[] = [];
      indices.forEach((i, k) => {
        const cx = u.y[i] * c.z[0] - u.z[i] * c.y[0], cy = u.z[i] * c.x[0] - u.x[i] * c.z[0], cz = u.x[i] * c.y[0] - u.y[i] * c.x[0];
        const angle = Math.atan2(Math.hypot(cx, cy, cz), u.x[i] * c.x[0] + u.y[i] * c.y[0] + u.z[i] * c.z[0]);
        if (angle <= radiusRad) within.push(k);
      });
      expect(within.length).toBeGreaterThan(0);
      const set = new Set(got);
      for (const k of within) expect(set.has(k)).toBe(true);
      for (let j = 1; j < got.length; j++) expect(got[j]).toBeGreaterThan(got[j - 1]);
      // The query touches the points near the centre only: the cells meeting the cone's cube cover at most 3 x 3 cells
      // of width r on the sphere, 9 r^2 against the cone's pi r^2, so a few times the points in the cone.
      expect(got.length).toBeLessThan(6 * within.length);
    }
  });
});
