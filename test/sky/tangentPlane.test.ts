import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import proj4 from 'proj4';
import { skyToTangentArcsec, tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import { separationDeg } from '../../src/core/sky/separation';
import { ARCSEC_PER_RAD } from '../../src/core/sky/angles';
import { makeRng } from '../../src/core/numeric/random';

/** Seeded uniform numbers in [0, 1), the same on every run (the project's mulberry32 stream). */
const seededUniform = (seed: number): (() => number) => makeRng(seed).next;

const D2R = Math.PI / 180;


const wrap360 = (d: number) => ((d % 360) + 360) % 360;

/** Destination on the sphere from (ra, dec) at bearing paDeg (East of North) and distance distDeg, degrees. */
function offsetPoint(raDeg: number, decDeg: number, paDeg: number, distDeg: number): { ra: number; dec: number } {
  const d1 = decDeg * D2R, dist = distDeg * D2R, pa = paDeg * D2R;
  const dec = Math.asin(Math.sin(d1) * Math.cos(dist) + Math.cos(d1) * Math.sin(dist) * Math.cos(pa));
  const dra = Math.atan2(Math.sin(pa) * Math.sin(dist) * Math.cos(d1), Math.cos(dist) - Math.sin(d1) * Math.sin(dec));
  return { ra: wrap360(raDeg + dra / D2R), dec: dec / D2R };
}

/** Projection centres: random ones plus the hard cases (RA within 0.01 deg of 0/360, |Dec| from 85 to 89.9). */
function centres(rand: () => number): { ra0: number; dec0: number }[] {
  const list: { ra0: number; dec0: number }[] = [
    { ra0: 0, dec0: 0 },
    { ra0: 359.995, dec0: 10 },
    { ra0: 0.004, dec0: -30 },
    { ra0: 359.9999, dec0: 89.9 },
    { ra0: 0.0001, dec0: -89.9 },
    { ra0: 180, dec0: 89.9 },
    { ra0: 359.991, dec0: 86.5 },
    { ra0: 0.009, dec0: -87.2 },
    { ra0: 123.456, dec0: -89.9 },
  ];
  for (let k = 0; k < 40; k++) list.push({ ra0: rand() * 360, dec0: Math.asin(2 * rand() - 1) / D2R });
  for (let k = 0; k < 25; k++) list.push({ ra0: rand() < 0.5 ? rand() * 0.01 : 360 - rand() * 0.01, dec0: (rand() * 180 - 90) });
  for (let k = 0; k < 26; k++) list.push({ ra0: rand() * 360, dec0: (rand() < 0.5 ? 1 : -1) * (85 + rand() * 4.9) });
  return list;
}

describe('skyToTangentArcsec against proj4 gnom', () => {
  it('agrees to 1e-6 arcsec over 10 000 seeded random points (proj4 npm, sphere of radius 180/pi*3600)', () => {
    // proj4's `gnom` (general-purpose projection library) on a sphere of radius 180/pi*3600 "metres"
    // gives plane coordinates in arcsec. Its axes: x is the easting, positive towards increasing
    // longitude (= RA, i.e. East on the sky), y is the northing (towards the North pole). So x = xi and
    // y = eta directly, without a sign flip; checked here by the sign test below and by the agreement.
    const rand = seededUniform(20261202);
    let n = 0, worst = 0, nearWrap = 0, nearPole = 0;
    for (const { ra0, dec0 } of centres(rand)) {
      const gnom = proj4(`+proj=gnom +lat_0=${dec0} +lon_0=${ra0} +R=${ARCSEC_PER_RAD} +x_0=0 +y_0=0 +units=m +no_defs`);
      const c = tangentCentre(ra0, dec0);
      for (let k = 0; k < 100; k++) {
        // Distances up to 2 deg (most) and up to 45 deg (some), any bearing.
        const dist = k < 80 ? rand() * 2 : rand() * 45;
        const p = offsetPoint(ra0, dec0, rand() * 360, dist);
        const ours = skyToTangentArcsec(c, p.ra, p.dec);
        expect(ours).not.toBeNull();
        const [x, y] = gnom.forward([p.ra, p.dec]);
        const err = Math.max(Math.abs(ours!.xiArcsec - x), Math.abs(ours!.etaArcsec - y));
        worst = Math.max(worst, err);
        if (err > 1e-6) throw new Error(`centre (${ra0}, ${dec0}) point (${p.ra}, ${p.dec}): ours (${ours!.xiArcsec}, ${ours!.etaArcsec}) proj4 (${x}, ${y})`);
        if (Math.min(ra0, 360 - ra0) < 0.01 || Math.min(p.ra, 360 - p.ra) < 0.01) nearWrap++;
        if (Math.abs(dec0) > 85) nearPole++;
        n++;
      }
    }
    expect(n).toBeGreaterThanOrEqual(10_000);
    expect(nearWrap).toBeGreaterThan(1000);
    expect(nearPole).toBeGreaterThan(1000);
    // Measured worst difference: 4.1e-10 arcsec (at points ~45 deg out, where xi, eta reach ~2e5 arcsec:
    // double-precision rounding of the same closed form). proj4 reaches 1e-6 arcsec with a wide margin.
    expect(worst).toBeLessThan(1e-6);
  });

  it('uses proj4 axes as documented: a point East of the centre has x > 0, North has y > 0', () => {
    // proj4 2.22 needs +x_0/+y_0 with gnom: without them its false easting is undefined and x, y come out NaN.
    const gnom = proj4(`+proj=gnom +lat_0=20 +lon_0=100 +R=${ARCSEC_PER_RAD} +x_0=0 +y_0=0 +no_defs`);
    const [xE, yE] = gnom.forward([100.01, 20]);
    const [xN, yN] = gnom.forward([100, 20.01]);
    expect(xE).toBeGreaterThan(0);
    expect(Math.abs(yE)).toBeLessThan(xE);
    expect(yN).toBeGreaterThan(0);
    expect(Math.abs(xN)).toBeLessThan(1e-9);
    const c = tangentCentre(100, 20);
    expect(skyToTangentArcsec(c, 100.01, 20)!.xiArcsec).toBeGreaterThan(0);
    expect(skyToTangentArcsec(c, 100, 20.01)!.etaArcsec).toBeGreaterThan(0);
  });
});

describe('closed form of Calabretta & Greisen (2002), A&A 395, 1077: R = (180/pi) cot(theta)', () => {
  it('a point 1 deg from the centre projects to (180/pi) tan(1 deg) deg from the origin, at its bearing', () => {
    // Native latitude theta = 90 - 1 deg, so R = (180/pi) cot(89 deg) = (180/pi) tan(1 deg) deg.
    const expectedArcsec = (180 / Math.PI) * Math.tan(1 * D2R) * 3600;
    for (const [ra0, dec0] of [[0, 0], [359.995, 45], [0.005, -60], [200, 89.9], [17, -89.9], [90, 85.5]]) {
      const c = tangentCentre(ra0, dec0);
      for (const pa of [0, 30, 90, 135, 180, 250, 270, 359]) {
        const p = offsetPoint(ra0, dec0, pa, 1);
        const t = skyToTangentArcsec(c, p.ra, p.dec)!;
        expect(Math.abs(Math.hypot(t.xiArcsec, t.etaArcsec) - expectedArcsec)).toBeLessThan(1e-7);
        // Zenithal projection: the direction from the origin is the bearing (xi East, eta North).
        const bearing = wrap360(Math.atan2(t.xiArcsec, t.etaArcsec) / D2R);
        expect(Math.abs(((bearing - pa + 540) % 360) - 180)).toBeLessThan(1e-8);
      }
    }
  });

  it('the radius grows as tan of the distance at 10, 45 and 80 deg; 90 deg has no image', () => {
    const c = tangentCentre(10, 20);
    for (const dist of [10, 45, 80]) {
      const p = offsetPoint(10, 20, 60, dist);
      const t = skyToTangentArcsec(c, p.ra, p.dec)!;
      expect(Math.hypot(t.xiArcsec, t.etaArcsec) / (Math.tan(dist * D2R) * ARCSEC_PER_RAD)).toBeCloseTo(1, 11);
    }
    const far = offsetPoint(10, 20, 60, 90.5);
    expect(skyToTangentArcsec(c, far.ra, far.dec)).toBeNull();
    expect(skyToTangentArcsec(c, 190, -20)).toBeNull(); // antipode
  });
});

describe('forward/inverse round trip', () => {
  it('sky -> plane -> sky returns the same point to 1e-9 arcsec', () => {
    const rand = seededUniform(4242);
    let worstArcsec = 0;
    for (const { ra0, dec0 } of centres(rand)) {
      const c = tangentCentre(ra0, dec0);
      for (let k = 0; k < 50; k++) {
        const p = offsetPoint(ra0, dec0, rand() * 360, rand() * (k < 40 ? 1 : 30));
        const t = skyToTangentArcsec(c, p.ra, p.dec)!;
        const back = tangentToSkyDeg(c, t.xiArcsec, t.etaArcsec);
        expect(back.raDeg).toBeGreaterThanOrEqual(0);
        expect(back.raDeg).toBeLessThan(360);
        const errArcsec = separationDeg(p.ra, p.dec, back.raDeg, back.decDeg) * 3600;
        worstArcsec = Math.max(worstArcsec, errArcsec);
      }
    }
    // Measured worst: 2.0e-10 arcsec, for points up to 30 deg out (double-precision rounding).
    expect(worstArcsec).toBeLessThan(1e-9);
  });

  it('plane -> sky -> plane returns the same (xi, eta) to 1e-9 arcsec within 1 deg of the centre', () => {
    const rand = seededUniform(777);
    for (const { ra0, dec0 } of centres(rand)) {
      const c = tangentCentre(ra0, dec0);
      for (let k = 0; k < 50; k++) {
        const xi = (rand() * 2 - 1) * 3600, eta = (rand() * 2 - 1) * 3600;
        const s = tangentToSkyDeg(c, xi, eta);
        const t = skyToTangentArcsec(c, s.raDeg, s.decDeg)!;
        expect(Math.abs(t.xiArcsec - xi)).toBeLessThan(1e-9);
        expect(Math.abs(t.etaArcsec - eta)).toBeLessThan(1e-9);
      }
    }
  });

  it('the centre maps to the origin and back, also at RA 0/360 and Dec +-89.9', () => {
    for (const [ra0, dec0] of [[0, 0], [359.9999, 89.9], [0.00001, -89.9]]) {
      const c = tangentCentre(ra0, dec0);
      const t = skyToTangentArcsec(c, ra0, dec0)!;
      expect(Math.abs(t.xiArcsec)).toBeLessThan(1e-12);
      expect(Math.abs(t.etaArcsec)).toBeLessThan(1e-12);
      const s = tangentToSkyDeg(c, 0, 0);
      expect(separationDeg(s.raDeg, s.decDeg, ra0, dec0) * 3600).toBeLessThan(1e-10);
    }
  });
});

describe('against astropy.wcs (Debian python3-astropy 5.2.1, run by /usr/bin/python3)', () => {
  const PYTHON = '/usr/bin/python3';
  // astropy.wcs wraps wcslib. The WCS: CTYPE RA---TAN / DEC--TAN, CRVAL = centre, CDELT = 1/3600 deg,
  // CRPIX = (1, 1). FITS pixel coordinates are 1-based: the reference pixel CRPIX = 1 is the first pixel,
  // so with origin = 1 a point at the centre is at pixel (1, 1) and pixel - CRPIX is the intermediate
  // coordinate in arcsec; with origin = 0 (numpy's 0-based convention) the same point is at (0, 0) and
  // the pixel itself is the offset. Positive intermediate x is towards increasing RA (East) when
  // CDELT1 > 0, positive y towards North: x = xi, y = eta.
  const script = `
import json, sys
import numpy as np
import astropy
from astropy.wcs import WCS
req = json.load(sys.stdin)
out = {"version": astropy.__version__, "results": []}
for case in req:
    w = WCS(naxis=2)
    w.wcs.ctype = ["RA---TAN", "DEC--TAN"]
    w.wcs.crval = [case["ra0"], case["dec0"]]
    w.wcs.crpix = [1.0, 1.0]
    w.wcs.cdelt = [1.0 / 3600.0, 1.0 / 3600.0]
    w.wcs.set()
    pts = np.array(case["points"], dtype=float)
    p1 = w.wcs_world2pix(pts, 1)
    p0 = w.wcs_world2pix(pts, 0)
    back = w.wcs_pix2world(np.array(case["plane"], dtype=float) + 1.0, 1)
    out["results"].append({"pix1": p1.tolist(), "pix0": p0.tolist(), "sky": back.tolist()})
print(json.dumps(out))
`;

  it('agrees with wcslib through astropy to 1e-6 arcsec, both ways', () => {
    if (!existsSync(PYTHON)) throw new Error(`${PYTHON} not found: install Debian's python3 and python3-astropy (.ci/run does)`);
    const probe = (() => {
      try {
        return execFileSync(PYTHON, ['-c', 'import astropy.wcs, astropy; print(astropy.__version__)'], { encoding: 'utf8' }).trim();
      } catch (e) {
        throw new Error(`${PYTHON} cannot import astropy.wcs (install python3-astropy; .ci/run does): ${(e as Error).message}`);
      }
    })();
    // Written and measured against Debian's python3-astropy 5.2.1; another version still has to agree to 1e-6 arcsec.
    expect(probe).toMatch(/^\d+\.\d+/);

    const cases = [
      { ra0: 187.5, dec0: 12.4 },
      { ra0: 359.995, dec0: -40 },
      { ra0: 0.003, dec0: 89.9 },
      { ra0: 250, dec0: -89.9 },
      { ra0: 10, dec0: 86 },
    ].map(({ ra0, dec0 }) => {
      const points = [
        [ra0, dec0],
        ...[0, 45, 90, 180, 300].map((pa, i) => {
          const p = offsetPoint(ra0, dec0, pa, [0.01, 0.1, 0.3, 1, 3][i]);
          return [p.ra, p.dec];
        }),
      ];
      const plane = [[0, 0], [600, 0], [0, -600], [1234.5, 2345.6], [-3000, 1500]];
      return { ra0, dec0, points, plane };
    });
    const out = JSON.parse(execFileSync(PYTHON, ['-c', script], { input: JSON.stringify(cases), encoding: 'utf8' })) as {
      version: string;
      results: { pix1: number[][]; pix0: number[][]; sky: number[][] }[];
    };
    expect(out.version).toBe(probe);
    let worst = 0;
    cases.forEach((cs, i) => {
      const c = tangentCentre(cs.ra0, cs.dec0);
      const r = out.results[i];
      cs.points.forEach(([ra, dec], j) => {
        const t = skyToTangentArcsec(c, ra, dec)!;
        // 1-based pixels: xi = pixel - CRPIX.
        const xi1 = r.pix1[j][0] - 1, eta1 = r.pix1[j][1] - 1;
        // 0-based pixels: the same offsets without the 1.
        const xi0 = r.pix0[j][0], eta0 = r.pix0[j][1];
        for (const [a, b] of [[t.xiArcsec, xi1], [t.etaArcsec, eta1], [t.xiArcsec, xi0], [t.etaArcsec, eta0]]) {
          worst = Math.max(worst, Math.abs(a - b));
        }
      });
      cs.plane.forEach(([xi, eta], j) => {
        const s = tangentToSkyDeg(c, xi, eta);
        const [raA, decA] = r.sky[j];
        worst = Math.max(worst, separationDeg(s.raDeg, s.decDeg, raA, decA) * 3600);
      });
    });
    // Measured worst: 1.5e-10 arcsec.
    expect(worst).toBeLessThan(1e-6);
  });
});
