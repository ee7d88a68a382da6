// The catalog raster marks a target on a tracer slit with a ring and a star in an alignment box with a square, so the
// two differ by shape (in greyscale too), not only by colour.
import { describe, expect, it } from 'vitest';
import { rasterCatalog, rgbaWord } from '../../src/editor/view/rasterCatalog';
import { KIND_ALIGNMENT, KIND_TRACER, type CatalogGeometry } from '../../src/editor/view/catalogGeometry';
import { ROLE_STYLE } from '../../src/editor/view/palette';
import type { Camera } from '../../src/editor/view/camera';

const W = 80, H = 40;
const cam = { widthPx: W, heightPx: H, pxPerArcsec: 0.6, centreXiArcsec: 0, centreEtaArcsec: 0 } as Camera;

/** One tracer on a slit at screen (20, 20) and one alignment star in a box at (60, 20). */
function geometry(): CatalogGeometry {
  // Screen x = W/2 - xi * s: xi = +33.3" is 20 px left of the centre, -33.3" 20 px right.
  const xi = 20 / cam.pxPerArcsec;
  return {
    count: 2, xiArcsec: Float64Array.from([xi, -xi]), etaArcsec: Float64Array.from([0, 0]),
    radiusPx: Float32Array.from([2, 2]), kind: Uint8Array.from([KIND_TRACER, KIND_ALIGNMENT]), shade: Uint8Array.from([3, 0]), ids: ['t', 'a'],
  };
}

describe('catalog raster marks', () => {
  const px = new Uint32Array(W * H);
  rasterCatalog(px, W, H, 1, geometry(), cam, new Set(), Uint8Array.from([1, 2]));
  const at = (x: number, y: number) => px[y * W + x];
  const tracer = rgbaWord(ROLE_STYLE.tracer.colour), align = rgbaWord(ROLE_STYLE.alignment.colour);

  it('a target on a tracer slit: a ring (the corners of its bounding square stay empty)', () => {
    const ring = [...Array(W * H).keys()].filter((k) => px[k] === tracer).map((k) => ({ x: (k % W) - 20, y: Math.floor(k / W) - 20 }));
    expect(ring.length).toBeGreaterThan(8);
    const r = Math.max(...ring.map((p) => Math.abs(p.x)));
    // On a circle of radius r no pixel sits at (r, r): the diagonal reaches only r / sqrt(2) in each axis.
    expect(ring.some((p) => Math.abs(p.x) === r && Math.abs(p.y) === r)).toBe(false);
    expect(ring.every((p) => Math.abs(Math.hypot(p.x, p.y) - r) < 1.5)).toBe(true);
  });

  it('a star in an alignment box: a square outline (corners drawn, edges straight)', () => {
    const sq = [...Array(W * H).keys()].filter((k) => px[k] === align).map((k) => ({ x: (k % W) - 60, y: Math.floor(k / W) - 20 }));
    const r = Math.max(...sq.map((p) => Math.abs(p.x)));
    expect(r).toBeGreaterThan(3);
    for (const [sx, sy] of [[1, 1], [1, -1], [-1, 1], [-1, -1]]) expect(at(60 + sx * r, 20 + sy * r), `corner ${sx},${sy}`).toBe(align);
    // Every edge pixel of the outer square is drawn.
    for (let d = -r; d <= r; d++) {
      expect(at(60 + d, 20 - r)).toBe(align);
      expect(at(60 + r, 20 + d)).toBe(align);
    }
  });
});
