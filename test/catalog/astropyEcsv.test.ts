/**
 * ECSV cross-checks against astropy (Debian python3-astropy 5.2.1, astropy.io.ascii.ecsv, run by /usr/bin/python3):
 * files astropy writes are read by Haloweave with the same values and units; Haloweave's ECSV is read back by
 * astropy with the same values, units, datatypes and metadata.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { astropyVersion, runPython } from './astropyHelper';
import { readCatalog } from '../../src/core/catalog/read';
import { readEcsvTable } from '../../src/core/catalog/ecsvReader';
import { writeEcsv } from '../../src/core/export/ecsvWriter';
import { slitTable } from '../../src/core/export/slitTable';
import type { Slit } from '../../src/core/geometry/maskSolution';
import type { MaskRow } from '../../src/core/export/slitsCsv';
import type { Cell } from '../../src/core/catalog/types';

const dir = mkdtempSync(join(tmpdir(), 'haloweave-ecsv-'));

describe('astropy is there', () => {
  it('runs astropy 5.x (written against Debian python3-astropy 5.2.1)', () => {
    const v = astropyVersion();
    expect(v).toMatch(/^\d+\.\d+/);
    expect(Number(v.split('.')[0])).toBeGreaterThanOrEqual(5);
  });
});

/** A catalog astropy writes: ids with spaces, quotes, commas and non-ASCII letters; RA in deg and in hourangle; masked cells. */
const WRITE_CATALOG = String.raw`
import json, sys
import numpy as np
from astropy.table import Table, MaskedColumn
import astropy.units as u
delim = sys.argv[1] if len(sys.argv) > 1 else ' '
t = Table()
t['id'] = ['gc 1', 'gc"2', 'gc,3', 'ĝć-4', 'gc5']
t['ra'] = np.array([0.0001, 187.123456789012, 359.9999999, 10.5, 200.0]) * u.deg
t['ra'].description = 'ICRS right ascension'
t['dec'] = MaskedColumn([-89.9, -5.123456789, 0.0, 45.5, 89.99], unit=u.deg)
t['mag'] = MaskedColumn([20.1, 21.25, 22.333, 19.0, 23.0], mask=[False, False, False, True, False], unit=u.mag)
t['color'] = [0.81, 1.02, -0.1, 0.5, 1e-9]
t['ra_h'] = (t['ra'].to(u.hourangle).value) * u.hourangle
t['big'] = np.array([2**60 + 1, 1, 2, 3, 4], dtype=np.int64)
t['flag'] = [True, False, True, False, True]
t.meta['origin'] = 'invented test rows'
out = sys.stdin.read().strip()
kw = {} if delim == ' ' else {'delimiter': ','}
t.write(out, format='ascii.ecsv', overwrite=True, **kw)
print(json.dumps({
  'ra_deg_from_h': [float(x) for x in t['ra_h'].to(u.deg).value],
  'ra': [float(x) for x in t['ra']], 'dec': [float(x) for x in t['dec']], 'color': [float(x) for x in t['color']],
}))
`;

for (const delim of [' ', ','] as const) {
  describe(`ECSV written by astropy (delimiter ${JSON.stringify(delim)}) read by Haloweave`, () => {
    const path = join(dir, `astropy-${delim === ' ' ? 'space' : 'comma'}.ecsv`);
    const expected = JSON.parse(runPython(WRITE_CATALOG.replace("sys.argv[1] if len(sys.argv) > 1 else ' '", JSON.stringify(delim)), path));
    const bytes = readFileSync(path);

    it('keeps the column units, datatypes and descriptions', () => {
      const t = readEcsvTable(bytes.toString('utf8'));
      const byName = Object.fromEntries(t.columns.map((c) => [c.name, c]));
      expect(byName.ra).toEqual({ name: 'ra', datatype: 'float64', unit: 'deg', description: 'ICRS right ascension' });
      expect(byName.dec.unit).toBe('deg');
      expect(byName.mag.unit).toBe('mag');
      expect(byName.ra_h.unit).toBe('hourangle');
      expect(byName.big.datatype).toBe('int64');
      expect(byName.flag.datatype).toBe('bool');
      expect(t.meta).toContainEqual({ key: 'origin', value: 'invented test rows' });
    });

    it('reads the same values (ids, RA, Dec, colour, 64-bit integers) and reports the masked magnitude', () => {
      const r = readCatalog(bytes, path);
      expect(r.format).toBe('ecsv');
      expect(r.rowsRead).toBe(5);
      expect(r.targets.map((t) => t.id)).toEqual(['gc 1', 'gc"2', 'gc,3', 'gc5']);
      const used = [0, 1, 2, 4];
      expect(r.targets.map((t) => t.raDeg)).toEqual(used.map((i) => expected.ra[i]));
      expect(r.targets.map((t) => t.decDeg)).toEqual(used.map((i) => expected.dec[i]));
      expect(r.targets.map((t) => t.color)).toEqual(used.map((i) => expected.color[i]));
      expect(r.targets[0].extra.big).toBe('1152921504606846977'); // 2**60 + 1, every digit kept
      // astropy's header is 20-odd lines; the masked magnitude is on the 4th data row, the line after the header row + 4.
      const text = bytes.toString('utf8').split('\n');
      const headerRow = text.findIndex((l) => !l.startsWith('#')) + 1;
      expect(r.rejects).toEqual([{ line: headerRow + 4, column: 'mag', reason: 'missing value' }]);
    });

    it('converts RA given in hourangle to the same degrees as astropy', () => {
      const r = readCatalog(bytes, path, { ra: 'ra_h' });
      expect(r.mapping.ra).toBe('ra_h');
      r.targets.forEach((t, k) => {
        const i = [0, 1, 2, 4][k];
        // astropy's unit conversion h -> deg is a multiplication by 15; allow one ulp-level difference.
        expect(Math.abs(t.raDeg - expected.ra_deg_from_h[i])).toBeLessThanOrEqual(1e-12 * Math.max(1, expected.ra_deg_from_h[i]));
      });
    });
  });
}

const READ_BACK = String.raw`
import json, sys, math
import numpy as np
from astropy.table import Table
t = Table.read(sys.stdin.read().strip(), format='ascii.ecsv')
def val(col, i):
    v = col[i]
    if np.ma.is_masked(v): return None
    if isinstance(v, (np.floating, float)):
        f = float(v)
        return None if math.isnan(f) else f
    if isinstance(v, (np.bool_, bool)): return bool(v)
    if isinstance(v, (np.integer, int)): return int(v)
    return str(v)
out = {'meta': {k: v for k, v in t.meta.items()}, 'columns': []}
for name in t.colnames:
    c = t[name]
    out['columns'].append({'name': name, 'unit': None if c.unit is None else c.unit.to_string(), 'kind': c.dtype.kind,
        'description': c.description, 'ucd': (c.meta or {}).get('ucd'), 'values': [val(c, i) for i in range(len(t))]})
print(json.dumps(out))
`;

const mask: MaskRow = { maskId: 'm#1', instrument: 'ridge10-narrow', raDeg: 187.4999999999, decDeg: -5.2500000001, paDeg: 359.123456789 };
const slits: Slit[] = [
  { maskId: 'm#1', slitId: '=1', objectId: 'gc,"1"', role: 'tracer', raDeg: 187.51234567891234, decDeg: -5.261, xArcsec: -12.25, yArcsec: 100.125, lenBelowArcsec: 3, lenAboveArcsec: 6.5, widthArcsec: 1, tiltDeg: 0, priority: 3.75, mag: 21.04 },
  { maskId: 'm#1', slitId: 'a1', objectId: 'stär-ø', role: 'alignment', raDeg: 187.48, decDeg: -5.2, xArcsec: 30, yArcsec: -80, lenBelowArcsec: 2, lenAboveArcsec: 2, widthArcsec: 4, tiltDeg: 0, priority: 1, mag: 17.5 },
  { maskId: 'm#1', slitId: 'k1', objectId: '', role: 'sky', raDeg: 187.52, decDeg: -5.3, xArcsec: 1e-7, yArcsec: 150, lenBelowArcsec: 3, lenAboveArcsec: 3, widthArcsec: 1, tiltDeg: 0, priority: 0.5, mag: null },
  { maskId: '#m2', slitId: 's\n2', objectId: '@x', role: 'starlight', raDeg: 0.000001, decDeg: 89.999999, xArcsec: 5, yArcsec: -5, lenBelowArcsec: 4, lenAboveArcsec: 4, widthArcsec: 1, tiltDeg: 5, priority: 2, mag: null },
];

describe('ECSV written by Haloweave read back by astropy', () => {
  const table = slitTable(slits, [mask, { ...mask, maskId: '#m2', paDeg: 0 }]);
  const path = join(dir, 'haloweave-slits.ecsv');
  writeFileSync(path, writeEcsv(table));
  const back = JSON.parse(runPython(READ_BACK, path));

  it('has the same columns, units, datatypes, descriptions and UCDs', () => {
    expect(back.columns.map((c: { name: string }) => c.name)).toEqual(table.columns.map((c) => c.name));
    table.columns.forEach((col, j) => {
      const b = back.columns[j];
      expect(b.unit ?? undefined).toBe(col.unit);
      expect(b.kind).toBe(col.datatype === 'string' ? 'U' : col.datatype === 'float64' ? 'f' : col.datatype === 'bool' ? 'b' : 'i');
      expect(b.description).toBe(col.description);
      expect(b.ucd).toBe(col.ucd);
    });
  });

  it('has the same values (empty text comes back masked, as ECSV defines)', () => {
    table.columns.forEach((col, j) => {
      const expectedValues = table.rows.map((r) => (r[j] === '' ? null : r[j]) as Cell);
      expect(back.columns[j].values).toEqual(expectedValues);
    });
  });

  it('carries the table metadata', () => {
    expect(back.meta.creator).toBe('haloweave');
    expect(back.meta.masks).toBe(2);
    expect(back.meta.frame).toBe('ICRS');
  });

  it('is read back by Haloweave with the same cells', () => {
    const t = readEcsvTable(readFileSync(path, 'utf8'));
    const rows: Cell[][] = [];
    t.forEachRow((cells) => rows.push(cells));
    expect(t.columns.map((c) => c.unit)).toEqual(table.columns.map((c) => c.unit));
    expect(t.columns.map((c) => c.ucd)).toEqual(table.columns.map((c) => c.ucd));
    rows.forEach((r, i) =>
      table.columns.forEach((col, j) => {
        const want = table.rows[i][j];
        if (col.datatype === 'float64') expect(r[j] === '' ? null : Number(r[j])).toEqual(want);
        else expect(r[j]).toBe(want ?? '');
      }),
    );
  });
});

describe('a hand-aligned, space-delimited ECSV is read as astropy reads it', () => {
  const text =
    '# %ECSV 1.0\n# ---\n# datatype:\n# - {name: id, datatype: string}\n# - {name: ra, unit: deg, datatype: float64}\n# - {name: dec, unit: deg, datatype: float64}\n# - {name: mag, datatype: float64}\n# schema: astropy-2.0\n' +
    'id          ra        dec     mag\n' +
    '"gc  one"   187.5     -5.25   21.0\n' +
    '  gc2       187.51    -5.26   21.1   \n' +
    '"say ""hi"""  187.52  -5.27   21.2\n';
  const path = join(dir, 'aligned.ecsv');
  writeFileSync(path, text);
  const astropy = JSON.parse(
    runPython(
      "import json,sys\nfrom astropy.table import Table\nt=Table.read(sys.stdin.read().strip(),format='ascii.ecsv')\nprint(json.dumps({'id':[str(x) for x in t['id']],'ra':[float(x) for x in t['ra']],'dec':[float(x) for x in t['dec']],'mag':[float(x) for x in t['mag']]}))",
      path,
    ),
  );

  it('gives the same ids and values as astropy', () => {
    const r = readCatalog(text, path);
    expect(r.rejects).toEqual([]);
    expect(r.targets.map((t) => t.id)).toEqual(astropy.id);
    expect(r.targets.map((t) => t.raDeg)).toEqual(astropy.ra);
    expect(r.targets.map((t) => t.decDeg)).toEqual(astropy.dec);
    expect(r.targets.map((t) => t.mag)).toEqual(astropy.mag);
    expect(r.targets.map((t) => t.line)).toEqual([10, 11, 12]);
  });
});
