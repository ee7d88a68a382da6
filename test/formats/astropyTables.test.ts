/**
 * Cross-checks of the VOTable and FITS table readers and writers against astropy (outside reference:
 * Debian python3-astropy 5.2.1, run by /usr/bin/python3; the test fails with a clear message when it is missing).
 * 1. Files written by astropy (VOTable TABLEDATA, VOTable BINARY2, FITS BINTABLE) are read by Haloweave with the
 *    values and units astropy reports for them.
 * 2. Haloweave's VOTable and FITS output is read back by astropy with the same values and units; the VOTable parses
 *    with verify='exception' (no warnings) and the FITS file passes fits.open(...).verify('exception').
 */
import { describe, expect, it, beforeAll } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { astropyVersion, runPython, tempDir } from './astropy';
import { readVoTable, readVoTableFrom, voTableEncoding } from '../../src/core/catalog/votable';
import { fileTextSource } from '../../src/cli/readCatalogFile';
import { readFitsTable, readFitsTableFrom } from '../../src/core/catalog/fitsTable';
import { withFileByteSource } from '../../src/cli/fileByteSource';
import { writeVoTable } from '../../src/core/export/votableWriter';
import { writeFitsTable } from '../../src/core/export/fitsWriter';
import type { OutputTable } from '../../src/core/export/outputTable';
import type { Cell } from '../../src/core/catalog/types';
import type { RawTableWithMeta } from '../../src/core/catalog/tableMeta';
import fc from 'fast-check';
import { tableArb } from './arbitraries';
import { slitTable } from '../../src/core/export/slitTable';

interface PyColumn { name: string; unit: string | null; values: (string | number | boolean | null)[] }
interface PyWritten { name: string; values: (string | number | boolean | null)[]; [unitInFile: string]: unknown }

function rowsOf(t: RawTableWithMeta): { cells: Cell[][]; lines: number[] } {
  const cells: Cell[][] = [];
  const lines: number[] = [];
  t.forEachRow((c, line) => { cells.push(c); lines.push(line); });
  return { cells, lines };
}

// astropy writes a table with strings (one masked), float64 with units and a masked value, float32, int16/int32
// (masked) and int64 beyond 2^53, uint8 and bool, in three serialisations. It reports every value it wrote
// (masked as None, integers as text so that 64-bit values stay exact).
const WRITE_SCRIPT = String.raw`
import json, sys, warnings
import numpy as np
from astropy.table import Table, MaskedColumn
import astropy.units as u
d = json.load(sys.stdin)["dir"]
t = Table()
t["id"] = MaskedColumn(["gc-001", "a,b \"q\"", "<&>'", "x"], mask=[False, False, False, True])
t["ra"] = MaskedColumn(np.array([10.684708, 359.9999999, 0.0000001, 187.5]), unit=u.deg, mask=[False, False, True, False])
t["dec"] = MaskedColumn(np.array([41.26875, -89.5, 0.5, -5.101]), unit=u.deg)
t["mag"] = MaskedColumn(np.array([21.25, 22.5, 19.125, 23.0], dtype=np.float32), unit=u.mag)
t["n"] = MaskedColumn(np.array([1, -2, 3, 2147483647], dtype=np.int32), mask=[False, True, False, False])
t["small"] = MaskedColumn(np.array([-32768, 0, 7, 32767], dtype=np.int16))
t["big"] = MaskedColumn(np.array([2**53 + 1, -5, 0, -(2**62)], dtype=np.int64))
t["b8"] = MaskedColumn(np.array([0, 255, 7, 1], dtype=np.uint8))
t["flag"] = [True, False, True, False]
t["vel"] = MaskedColumn(np.array([1250.5, -3.25, 0.0, 1e-9]), unit=u.km / u.s)
from astropy.io.votable import from_table
# astropy refuses masked integers in binary streams without a null value (W31), so the int column gets
# <VALUES null="-999"/> in both VOTables: this also exercises the VALUES null path of the reader.
for fmt, name in (("tabledata", "td.xml"), ("binary2", "b2.xml")):
    vot = from_table(t)
    vot.get_first_table().get_field_by_id("n").values.null = -999
    vot.to_xml(d + "/" + name, tabledata_format=fmt)
t.write(d + "/t.fits", format="fits", overwrite=True)
# FITS only: a scaled column (TSCAL/TZERO) and unsigned integers, which FITS stores with TZERO = 32768,
# 2147483648 and 2^63 (FITS 4.0 section 7.3.2); VOTable has no unsigned 16/32/64-bit types.
from astropy.io import fits as _f
tu = Table()
tu["u16"] = np.array([0, 65535, 32768, 1], dtype=np.uint16)
tu["u32"] = np.array([0, 4294967295, 2147483648, 12], dtype=np.uint32)
tu.write(d + "/unsigned.fits", format="fits", overwrite=True)
stored = _f.Column(name="flux", format="I", array=np.array([0, 3, -2, 32767], dtype=np.int16))
u64 = _f.Column(name="u64", format="K", bzero=9223372036854775808, array=np.array([0, 18446744073709551615, 9223372036854775808, 5], dtype=np.uint64))
_f.BinTableHDU.from_columns([stored, u64]).writeto(d + "/scaled.fits", overwrite=True)
with _f.open(d + "/scaled.fits", mode="update") as h:  # scale the stored int16 values: flux = 100 + 0.5 * stored
    h[1].header["TSCAL1"] = 0.5
    h[1].header["TZERO1"] = 100.0
with _f.open(d + "/scaled.fits") as h:
    scaled_seen = [float(x) for x in h[1].data["flux"]] + [str(int(x)) for x in h[1].data["u64"]]
cols = []
for c in t.columns.values():
    vals = []
    for i in range(len(c)):
        if np.ma.is_masked(c[i]) or (hasattr(c, "mask") and bool(np.ma.getmaskarray(c)[i])):
            vals.append(None)
        else:
            v = c[i]
            if isinstance(v, (np.integer,)):
                vals.append(str(int(v)))
            elif isinstance(v, (np.bool_, bool)):
                vals.append(bool(v))
            elif isinstance(v, (np.floating,)):
                vals.append(float(v))
            else:
                vals.append(str(v))
    cols.append({"name": c.name, "values": vals})
# The unit text exactly as astropy wrote it into each file (VOUnit syntax in VOTable, FITS syntax in FITS).
import xml.etree.ElementTree as ET
from astropy.io import fits
for name in ("td.xml", "b2.xml"):
    fields = [e for e in ET.parse(d + "/" + name).iter() if e.tag.endswith("FIELD")]
    for c, f in zip(cols, fields):
        c["unit_" + name] = f.get("unit")
with fits.open(d + "/t.fits") as h:
    for i, c in enumerate(cols):
        c["unit_t.fits"] = h[1].header.get("TUNIT%d" % (i + 1))
cols.append({"name": "__scaled_seen_by_astropy", "values": scaled_seen})
print(json.dumps(cols))
`;

describe('astropy 5.2.1 (Debian python3-astropy) cross-checks of VOTable and FITS tables', () => {
  let dir: string;
  let expected: PyWritten[];
  let scaledSeen: PyWritten['values'];
  beforeAll(() => {
    dir = tempDir('astropy-tables');
    expected = runPython<PyWritten[]>(WRITE_SCRIPT, { dir });
    scaledSeen = expected.pop()!.values;
  });

  it("reads astropy's TSCAL/TZERO-scaled and unsigned 64-bit FITS columns exactly", () => {
    const table = readFitsTable(new Uint8Array(readFileSync(join(dir, 'scaled.fits'))));
    const { cells } = rowsOf(table);
    // flux = 100 + 0.5 * stored int16, as astropy itself reads it back; u64 stored with TZERO = 2^63
    expect(scaledSeen.slice(0, 4)).toEqual([100, 101.5, 99, 16483.5]);
    expect(cells.map((r) => r[0])).toEqual(scaledSeen.slice(0, 4));
    expect(cells.map((r) => String(r[1]))).toEqual(scaledSeen.slice(4));
    expect(cells.map((r) => r[1])).toEqual([0, '18446744073709551615', '9223372036854775808', 5]);
    expect(table.columns.map((c) => c.datatype)).toEqual(['float64', 'uint64']);
    const unsigned = readFitsTable(new Uint8Array(readFileSync(join(dir, 'unsigned.fits'))));
    expect(rowsOf(unsigned).cells).toEqual([[0, 0], [65535, 4294967295], [32768, 2147483648], [1, 12]]);
    expect(unsigned.columns.map((c) => c.datatype)).toEqual(['uint16', 'uint32']);
  });

  it('runs astropy 5.x (the reference this suite names)', () => {
    expect(astropyVersion()).toMatch(/^5\./);
  });

  for (const [file, label] of [['td.xml', 'VOTable TABLEDATA'], ['b2.xml', 'VOTable BINARY2'], ['t.fits', 'FITS BINTABLE']] as const) {
    it(`reads astropy's ${label} with astropy's values and units`, () => {
      const bytes = new Uint8Array(readFileSync(join(dir, file)));
      const table = file.endsWith('.xml') ? readVoTable(bytes) : readFitsTable(bytes);
      expect(table.columns.map((c) => c.name)).toEqual(expected.map((c) => c.name));
      expected.forEach((col, j) => {
        // astropy writes units in VOUnit syntax to VOTable ("km.s-1") and in FITS syntax to FITS ("km s-1")
        expect(table.columns[j].unit ?? null, `unit of ${col.name}`).toBe(col[`unit_${file}`] ?? null);
      });
      const { cells, lines } = rowsOf(table);
      expect(lines).toEqual([1, 2, 3, 4]);
      expected.forEach((col, j) => {
        // FITS has no null for float columns except NaN, and astropy writes masked strings as empty text: Haloweave
        // reads both as null, which is what astropy's mask means. Integers come from python as exact text.
        const have = cells.map((r, i) => (typeof col.values[i] === 'string' && typeof r[j] === 'number' ? String(r[j]) : r[j]));
        expect(have, `column ${col.name} of ${label}`).toEqual(col.values);
      });
      expect(table.columns.find((c) => c.name === 'big')?.datatype).toBe('int64');
      expect(table.columns.find((c) => c.name === 'mag')?.datatype).toBe('float32');
    });
  }

  it("reads astropy's FITS files the same from a file, a block of rows at a time (reads of 5 bytes and of 1 MB)", () => {
    for (const file of ['t.fits', 'scaled.fits', 'unsigned.fits']) {
      const whole = readFitsTable(new Uint8Array(readFileSync(join(dir, file))));
      for (const chunk of [5, 1 << 20]) {
        withFileByteSource(join(dir, file), (source) => {
          const streamed = readFitsTableFrom(source);
          expect(streamed.columns, file).toEqual(whole.columns);
          expect(streamed.meta, file).toEqual(whole.meta);
          expect(rowsOf(streamed), file).toEqual(rowsOf(whole));
        }, chunk);
      }
    }
  });

  it("reads astropy's VOTables (TABLEDATA, BINARY2) the same from a file in chunks (of 5 bytes and of 64 kB)", () => {
    for (const file of ['td.xml', 'b2.xml']) {
      const path = join(dir, file);
      const bytes = new Uint8Array(readFileSync(path));
      const whole = readVoTable(bytes);
      for (const chunk of [5, 1 << 16]) {
        const streamed = readVoTableFrom(fileTextSource(path, chunk, voTableEncoding(bytes), path, false));
        expect(streamed.columns, file).toEqual(whole.columns);
        expect(streamed.meta, file).toEqual(whole.meta);
        expect(rowsOf(streamed), file).toEqual(rowsOf(whole));
        expect(streamed.structuralRejects, file).toEqual(whole.structuralRejects);
      }
    }
  });

  // Haloweave's writers -> astropy readers
  const ours: OutputTable = {
    name: 'slit_list',
    columns: [
      { name: 'mask_id', datatype: 'string', ucd: 'meta.id' },
      { name: 'object_id', datatype: 'string', ucd: 'meta.id;meta.main', description: 'Catalog id of the target' },
      { name: 'ra_deg', datatype: 'float64', unit: 'deg', ucd: 'pos.eq.ra;meta.main' },
      { name: 'dec_deg', datatype: 'float64', unit: 'deg', ucd: 'pos.eq.dec;meta.main' },
      { name: 'len_above_arcsec', datatype: 'float64', unit: 'arcsec' },
      { name: 'slit_number', datatype: 'int32' },
      { name: 'forced', datatype: 'bool' },
    ],
    rows: [
      ['m1', 'gc,001', 187.70593, 12.39112, 3.25, 1, true],
      ['m1', 'q"u\'o<t>e&', 0.0000042, -89.9, 2, null, false],
      ['m2', '=SUM(A1)', 359.99999999, 0, null, -2147483647, true],
      ['m2', 'plain', 12.5, 45.125, 1e-7, 2147483647, null],
      ['m3', 'café-星团', 200.5, -0.5, 4, 0, false], // FITS: UTF-8 bytes, which astropy returns as bytes
    ],
    meta: [
      { key: 'instrument', value: 'ridge10-narrow' },
      { key: 'MASK1PA', value: 37.5, unit: 'deg', description: 'position angle of mask m1' },
      { key: 'mask_count', value: 2 },
      { key: 'PLANNOTE', value: 'a note longer than one FITS card can hold, so it goes on CONTINUE cards: ' + 'x'.repeat(60) },
      { key: 'PLANBY', value: 'Zoë' }, // FITS: escaped to printable ASCII as Zo\u00EB (HWESCAPE = T)
      { key: 'plan note', value: 'key with a space' }, // FITS: a COMMENT line; VOTable: a PARAM
    ],
  };

  const READ_SCRIPT = String.raw`
import json, sys, warnings
import numpy as np
from astropy.io import votable, fits
from astropy.table import Table
d = json.load(sys.stdin)["dir"]
out = {}
with warnings.catch_warnings():
    warnings.simplefilter("error")
    vt = votable.parse(d + "/ours.xml", verify="exception")
    with fits.open(d + "/ours.fits") as h:
        h.verify("exception")
        out["fits_header"] = {k: h[1].header[k] for k in ["MASK1PA", "instrument", "mask_count", "EXTNAME", "PLANNOTE", "PLANBY", "HWESCAPE"]}
        out["fits_comments"] = [str(c) for c in h[1].header["COMMENT"]]
        out["fits_comment_MASK1PA"] = h[1].header.comments["MASK1PA"]
def dump(t):
    cols = []
    for c in t.columns.values():
        vals = []
        m = np.ma.getmaskarray(c) if hasattr(c, "mask") else np.zeros(len(c), bool)
        for i in range(len(c)):
            v = c[i]
            if m[i]: vals.append(None)
            elif isinstance(v, np.bool_): vals.append(bool(v))
            elif isinstance(v, np.integer): vals.append(int(v))
            elif isinstance(v, np.floating): vals.append(None if np.isnan(v) else float(v))
            elif isinstance(v, bytes): vals.append(v.decode("utf-8"))
            else: vals.append(str(v))
        cols.append({"name": c.name, "unit": None if c.unit is None else c.unit.to_string(), "values": vals,
                     "ucd": getattr(c.meta, "get", lambda k: None)("ucd")})
    return cols
vtab = vt.get_first_table()
out["votable"] = dump(vtab.to_table())
out["votable_ucd"] = [f.ucd for f in vtab.fields]
def plain(v):
    v = v.item() if hasattr(v, "item") else v
    return v if isinstance(v, (int, float, str)) else str(v)
out["votable_params"] = [[p.name, plain(p.value), None if p.unit is None else p.unit.to_string()] for p in vtab.params]
out["fits"] = dump(Table.read(d + "/ours.fits"))
print(json.dumps(out))
`;

  it("writes VOTable and FITS that astropy reads without warnings, with the same values and units", () => {
    const d = tempDir('astropy-ours');
    writeFileSync(join(d, 'ours.xml'), writeVoTable(ours));
    writeFileSync(join(d, 'ours.fits'), writeFitsTable(ours));
    const got = runPython<{
      votable: PyColumn[]; fits: PyColumn[]; votable_ucd: (string | null)[]; votable_params: [string, string | number, string | null][];
      fits_header: Record<string, string | number | boolean>; fits_comment_MASK1PA: string; fits_comments: string[];
    }>(READ_SCRIPT, { dir: d });
    for (const [label, cols] of [['VOTable', got.votable], ['FITS', got.fits]] as const) {
      expect(cols.map((c) => c.name), label).toEqual(ours.columns.map((c) => c.name));
      ours.columns.forEach((col, j) => {
        expect(cols[j].unit, `${label} unit of ${col.name}`).toBe(col.unit ?? null);
        const want = ours.rows.map((r) => r[j]);
        const have = cols[j].values;
        if (label === 'FITS' && col.datatype === 'bool') {
          // FITS logical null is byte 0, which astropy shows as False (no mask for logical columns)
          expect(have, `${label} ${col.name}`).toEqual(want.map((v) => v ?? false));
        } else {
          expect(have, `${label} ${col.name}`).toEqual(want);
        }
      });
    }
    expect(got.votable_ucd).toEqual(ours.columns.map((c) => c.ucd ?? null));
    expect(got.votable_params).toEqual([['instrument', 'ridge10-narrow', null], ['MASK1PA', 37.5, 'deg'], ['mask_count', 2, null],
      ['PLANNOTE', ours.meta[3].value, null], ['PLANBY', 'Zoë', null], ['plan note', 'key with a space', null]]);
    expect(got.fits_header).toEqual({
      MASK1PA: 37.5, instrument: 'ridge10-narrow', mask_count: 2, EXTNAME: 'slit_list', PLANNOTE: ours.meta[3].value,
      PLANBY: 'Zo\\u00EB', HWESCAPE: true,
    });
    expect(got.fits_comments).toEqual(['meta: plan note = key with a space']);
    expect(got.fits_comment_MASK1PA).toBe('[deg] position angle of mask m1');
  });
});

describe('astropy 5.2.1 reads Haloweave tables with random awkward ids (fast-check sample)', () => {
  // 25 random tables (fixed seed) of the round-trip arbitrary: ids with quotes, commas, markup, tabs, line ends,
  // non-ASCII letters and emoji. astropy must read every id, real, int and bool as written.
  const SCRIPT = String.raw`
import json, sys, warnings
import numpy as np
from astropy.io import votable, fits
from astropy.table import Table
out = []
for path in json.load(sys.stdin)["paths"]:
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        t = votable.parse(path + ".xml", verify="exception").get_first_table().to_table()
        with fits.open(path + ".fits") as h:
            h.verify("exception")
    f = Table.read(path + ".fits")
    def col(tab, name):
        c = tab[name]
        m = np.ma.getmaskarray(c) if hasattr(c, "mask") else np.zeros(len(c), bool)
        vals = []
        for i in range(len(c)):
            v = c[i]
            if m[i]: vals.append(None)
            elif isinstance(v, bytes): vals.append(v.decode("utf-8"))
            elif isinstance(v, np.bool_): vals.append(bool(v))
            elif isinstance(v, np.integer): vals.append(int(v))
            elif isinstance(v, np.floating): vals.append(None if np.isnan(v) else (float(v) if np.isfinite(v) else str(v)))
            else: vals.append(str(v))
        return vals
    out.append({k: {"votable": col(t, k), "fits": col(f, k)} for k in ["object_id", "ra_deg", "slit_index", "forced"]})
print(json.dumps(out))
`;

  it('gives the same ids and values in VOTable and FITS', () => {
    const d = tempDir('astropy-random');
    const tables = fc.sample(tableArb, { seed: 20261202, numRuns: 25 });
    const paths = tables.map((t, i) => {
      const p = join(d, `t${i}`);
      writeFileSync(`${p}.xml`, writeVoTable(t));
      writeFileSync(`${p}.fits`, writeFitsTable(t));
      return p;
    });
    const got = runPython<Record<string, { votable: unknown[]; fits: unknown[] }>[]>(SCRIPT, { paths });
    const real = (x: Cell) => (typeof x === 'number' && !Number.isFinite(x) ? (Number.isNaN(x) ? null : x > 0 ? 'inf' : '-inf') : x);
    tables.forEach((t, i) => {
      const ids = t.rows.map((r) => (r[0] === '' ? null : r[0]));
      // astropy strips leading and trailing XML whitespace of char cells in TABLEDATA (our file has them, escaped)
      // and shows an empty TD of a char column as '' (unmasked): null and '' compare equal here
      const xmlTrim = (v: unknown) => (typeof v === 'string' ? v.replace(/^[ \t\r\n]+|[ \t\r\n]+$/g, '') : v ?? '');
      expect(got[i].object_id.votable.map(xmlTrim), `table ${i} VOTable ids`).toEqual(ids.map(xmlTrim));
      // FITS: astropy drops trailing blanks and masks empty text (Table.read mask_invalid), as Haloweave's reader does
      // (astropy keeps the trailing blanks when it returns a non-ASCII column as bytes; they are not significant in FITS)
      const fitsText = (s: unknown) => (typeof s === 'string' ? s.replace(/ +$/, '') || null : s);
      expect(got[i].object_id.fits.map(fitsText), `table ${i} FITS ids`).toEqual(ids.map(fitsText));
      expect(got[i].ra_deg.votable, `table ${i} VOTable ra`).toEqual(t.rows.map((r) => real(r[1])));
      expect(got[i].ra_deg.fits, `table ${i} FITS ra`).toEqual(t.rows.map((r) => real(r[1])));
      expect(got[i].slit_index.votable).toEqual(t.rows.map((r) => r[2]));
      expect(got[i].slit_index.fits).toEqual(t.rows.map((r) => r[2]));
      expect(got[i].forced.votable).toEqual(t.rows.map((r) => r[3]));
      expect(got[i].forced.fits).toEqual(t.rows.map((r) => r[3] ?? false)); // FITS logical null is shown as False
    });
  });
});

describe('astropy 5.2.1 reads the exported slit list (the export helper\'s slitTable) in both formats', () => {
  it('parses without warnings and gets every column, unit and UCD', () => {
    const masks = [{ maskId: 'm1', instrument: 'ridge10-narrow', raDeg: 187.5, decDeg: 12.25, paDeg: 37.5 }];
    const slit = (slitId: string, objectId: string, role: 'tracer' | 'starlight' | 'alignment', mag: number | null) => ({
      maskId: 'm1', slitId, objectId, role, raDeg: 187.51, decDeg: 12.26, xArcsec: -12.5, yArcsec: 40.25, lenBelowArcsec: 3,
      lenAboveArcsec: 4.5, widthArcsec: 1, tiltDeg: 0, priority: 2.5, mag,
    });
    const table = slitTable([slit('s1', 'gc,7 "é"', 'tracer', 21.3), slit('s2', '', 'starlight', null), slit('a1', 'star-3', 'alignment', 17.1)], masks);
    const d = tempDir('astropy-slits');
    writeFileSync(join(d, 'slits.xml'), writeVoTable(table));
    writeFileSync(join(d, 'slits.fits'), writeFitsTable(table));
    const got = runPython<{ vo: [string, string | null, string | null][]; fits: [string, string | null][]; ids: unknown[]; mags: unknown[] }>(String.raw`
import json, sys, warnings
import numpy as np
from astropy.io import votable, fits
from astropy.table import Table
d = json.load(sys.stdin)["dir"]
with warnings.catch_warnings():
    warnings.simplefilter("error")
    vt = votable.parse(d + "/slits.xml", verify="exception").get_first_table()
    with fits.open(d + "/slits.fits") as h:
        h.verify("exception")
t = vt.to_table()
f = Table.read(d + "/slits.fits")
print(json.dumps({
  "vo": [[x.name, None if x.unit is None else x.unit.to_string(), x.ucd] for x in vt.fields],
  "fits": [[c.name, None if c.unit is None else c.unit.to_string()] for c in f.columns.values()],
  "ids": [str(v) for v in t["object_id"]],
  "mags": [None if np.ma.is_masked(v) else float(v) for v in f["mag"]],
}))
`, { dir: d });
    expect(got.vo).toEqual(table.columns.map((c) => [c.name, c.unit ?? null, c.ucd ?? null]));
    expect(got.fits).toEqual(table.columns.map((c) => [c.name, c.unit ?? null]));
    expect(got.ids).toEqual(['gc,7 "é"', '', 'star-3']);
    expect(got.mags).toEqual([21.3, null, 17.1]);
  });
});
