// The catalog raster marks a target on a tracer slit with a ring and a star in an alignment box with a square, so the
// two differ by shape (in greyscale too), not only by colour.
import { describe, expect, it } from 'vitest';
import { rasterCatalog, rgbaWord } from '../../src/editor/view/rasterCatalog';
import { KIND_ALIGNMENT, KIND_TRACER, type CatalogGeometry } from '../../src/editor/view/catalogGeometry';
import { ROLE_STYLE } from '../../src/editor/view/palette';
import type { Camera } from '../../src/editor/view/camera';
import { rowsNear } from '../../src/editor/view/catalogIndex';

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

describe('catalog raster over a large catalog (grid index)', () => {
  it('draws exactly the rows inside its area and its marker margin, for views zoomed in, out and off to a side', () => {
    let seed = 12345;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    const n = 20000;
    const g: CatalogGeometry = {
      count: n, xiArcsec: new Float64Array(n), etaArcsec: new Float64Array(n), radiusPx: new Float32Array(n).fill(1.5),
      kind: new Uint8Array(n), shade: new Uint8Array(n), ids: Array.from({ length: n }, (_, i) => `r${i}`),
    };
    for (let i = 0; i < n; i++) { g.xiArcsec[i] = (rnd() - 0.5) * 4000 * rnd(); g.etaArcsec[i] = (rnd() - 0.5) * 3000; }
    g.xiArcsec[7] = NaN; // a row with no position is never drawn
    const w = 300, h = 200;
    for (const view of [
      { pxPerArcsec: 0.05, centreXiArcsec: 0, centreEtaArcsec: 0 },
      { pxPerArcsec: 0.6, centreXiArcsec: 300, centreEtaArcsec: -200 },
      { pxPerArcsec: 3, centreXiArcsec: -1500, centreEtaArcsec: 1400 },
      { pxPerArcsec: 1, centreXiArcsec: 9000, centreEtaArcsec: 0 },
    ]) {
      const c = { ...view, widthPx: w, heightPx: h } as Camera;
      const drawn = rasterCatalog(new Uint32Array(w * h), w, h, 1, g, c, new Set(), null);
      // Screen position of a row: x = w/2 - (xi - centre xi) * scale, y = h/2 - (eta - centre eta) * scale (North up, East left).
      let expected = 0;
      for (let i = 0; i < n; i++) {
        const x = Math.round(w / 2 - (g.xiArcsec[i] - c.centreXiArcsec) * c.pxPerArcsec), y = Math.round(h / 2 - (g.etaArcsec[i] - c.centreEtaArcsec) * c.pxPerArcsec);
        if (x > -12 && y > -12 && x < w + 12 && y < h + 12) expected++;
      }
      expect(drawn, JSON.stringify(view)).toBe(expected);
    }
  });
});

describe('grid index of the catalog (rowsNear)', () => {
  it('gives every row inside a rectangle, in catalog order, the same on repeated calls', () => {
    let seed = 777;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    const n = 30000;
    const g: CatalogGeometry = {
      count: n, xiArcsec: new Float64Array(n), etaArcsec: new Float64Array(n), radiusPx: new Float32Array(n).fill(1.5),
      kind: new Uint8Array(n), shade: new Uint8Array(n), ids: Array.from({ length: n }, (_, i) => `r${i}`),
    };
    for (let i = 0; i < n; i++) { g.xiArcsec[i] = (rnd() - 0.5) * 5000; g.etaArcsec[i] = (rnd() - 0.5) * 5000 * rnd(); }
    for (const [xiLo, xiHi, etaLo, etaHi] of [[-300, 400, -100, 900], [-2600, 2600, -2600, 2600], [1000, 1200, -2000, -1500], [-100, -100, 0, 0], [9000, 9500, 0, 10]]) {
      for (let rep = 0; rep < 2; rep++) {
        const near = rowsNear(g, xiLo, xiHi, etaLo, etaHi);
        for (let k = 1; k < near.length; k++) expect(near[k]).toBeGreaterThan(near[k - 1]);
        const got = new Set(near);
        let inside = 0;
        for (let i = 0; i < n; i++) {
          if (g.xiArcsec[i] >= xiLo && g.xiArcsec[i] <= xiHi && g.etaArcsec[i] >= etaLo && g.etaArcsec[i] <= etaHi) { inside++; expect(got.has(i)).toBe(true); }
        }
        expect(near.length).toBeGreaterThanOrEqual(inside);
      }
    }
  });
});

describe('a catalog raster depends on the view alone', () => {
  it('draws a tracer as the disc of its radius rounded to 1/4 px, whatever size was drawn before', () => {
    // Radii 2.17 and 2.2 px round to the same 2.25 px; a disc is the pixels with x^2 + y^2 <= r^2 + 1/4, so at 2.17 the
    // pixel (1, 2) (x^2 + y^2 = 5) would be out and at 2.2 in. Both must draw the 2.25 px disc, in either order.
    const w = 20, h = 20; // the row at the view's middle: pixel (10, 10)
    const cam = { widthPx: w, heightPx: h, pxPerArcsec: 0.6, centreXiArcsec: 0, centreEtaArcsec: 0 } as Camera; // marker scale 1 at 0.6 px/arcsec
    const expected = new Set<string>();
    for (let y = -3; y <= 3; y++) for (let x = -3; x <= 3; x++) if (x * x + y * y <= 2.25 * 2.25 + 0.25) expected.add(`${x},${y}`);
    for (const rPx of [2.17, 2.2, 2.17]) {
      const g: CatalogGeometry = {
        count: 1, xiArcsec: Float64Array.from([0]), etaArcsec: Float64Array.from([0]), radiusPx: Float32Array.from([rPx]),
        kind: Uint8Array.from([KIND_TRACER]), shade: Uint8Array.from([2]), ids: ['t'],
      };
      const px = new Uint32Array(w * h);
      rasterCatalog(px, w, h, 1, g, cam, new Set(), null);
      const drawn = new Set([...px.keys()].filter((k) => px[k] !== 0).map((k) => `${(k % w) - 10},${Math.floor(k / w) - 10}`));
      expect(drawn, `radius ${rPx} px`).toStrictEqual(expected);
    }
  });
});
