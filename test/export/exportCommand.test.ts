import { describe, expect, it } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/main';
import type { CliIO } from '../../src/cli/io';
import { masksToCsv, parseSlitsCsv, slitsToCsv, type MaskRow } from '../../src/core/export/slitsCsv';
import { readEcsvTable } from '../../src/core/catalog/ecsvReader';
import { readVoTable } from '../../src/core/catalog/votable';
import { readFitsTable } from '../../src/core/catalog/fitsTable';
import type { Slit } from '../../src/core/geometry/maskSolution';

const masks: MaskRow[] = [
  { maskId: 'm1', instrument: 'ridge10-narrow', raDeg: 187.5, decDeg: -5.25, paDeg: 30 },
  { maskId: 'm2', instrument: 'ridge10-narrow', raDeg: 187.6, decDeg: -5.15, paDeg: 120.5 },
];
const slits: Slit[] = [
  { maskId: 'm1', slitId: 's1', objectId: 'gc,"7"', role: 'tracer', raDeg: 187.51, decDeg: -5.26, xArcsec: 1.5, yArcsec: -20, lenBelowArcsec: 3, lenAboveArcsec: 4, widthArcsec: 1, tiltDeg: 0, priority: 2, mag: 21.3 },
  { maskId: 'm2', slitId: 'a1', objectId: '=star', role: 'alignment', raDeg: 187.61, decDeg: -5.14, xArcsec: 10, yArcsec: 50, lenBelowArcsec: 2, lenAboveArcsec: 2, widthArcsec: 4, tiltDeg: 0, priority: 1, mag: 17.2 },
  { maskId: 'm2', slitId: 'k1', objectId: '', role: 'sky', raDeg: 187.62, decDeg: -5.13, xArcsec: -3, yArcsec: 90, lenBelowArcsec: 3, lenAboveArcsec: 3, widthArcsec: 1, tiltDeg: 0, priority: 0.1, mag: null },
];

function capture(): CliIO & { outText: string[]; errText: string[] } {
  const outText: string[] = [];
  const errText: string[] = [];
  return { outText, errText, out: (t) => outText.push(t), err: (t) => errText.push(t) };
}

function outputFolder(): string {
  const dir = mkdtempSync(join(tmpdir(), 'haloweave-export-'));
  writeFileSync(join(dir, 'slits.csv'), slitsToCsv(slits));
  writeFileSync(join(dir, 'masks.csv'), masksToCsv(masks));
  return dir;
}

describe('haloweave export', () => {
  const dir = outputFolder();

  it('writes CSV with the slits.csv columns plus mask centre, PA and instrument', async () => {
    const io = capture();
    const out = join(dir, 'x', 'slits-export.csv');
    expect(await main(['export', dir, '--format', 'csv', '--out', out], io)).toBe(0);
    expect(io.outText.join('\n')).toContain('wrote 3 slits of 2 masks');
    const text = readFileSync(out, 'utf8');
    expect(text.split('\n')[0]).toBe(
      'mask_id,slit_id,object_id,role,ra_deg,dec_deg,x_arcsec,y_arcsec,len_below_arcsec,len_above_arcsec,width_arcsec,tilt_deg,priority,mag,mask_ra_deg,mask_dec_deg,mask_pa_deg,instrument',
    );
    expect(text.split('\n')[2]).toBe("m2,a1,'=star,alignment,187.61,-5.14,10,50,2,2,4,0,1,17.2,187.6,-5.15,120.5,ridge10-narrow");
    expect(parseSlitsCsv(text, out)).toEqual(slits);
    expect(readdirSync(join(dir, 'x'))).toEqual(['slits-export.csv']); // no temporary file left
  });

  it('writes ECSV with units, JSON, VOTable and FITS that the readers take back', async () => {
    for (const format of ['ecsv', 'json', 'votable', 'fits']) {
      const io = capture();
      expect(await main(['export', dir, '--format', format, '--out', join(dir, `out.${format}`)], io)).toBe(0);
    }
    const ecsv = readEcsvTable(readFileSync(join(dir, 'out.ecsv'), 'utf8'));
    expect(ecsv.columns.find((c) => c.name === 'ra_deg')).toMatchObject({ unit: 'deg', datatype: 'float64', ucd: 'pos.eq.ra;meta.main' });
    expect(ecsv.columns.find((c) => c.name === 'y_arcsec')?.unit).toBe('arcsec');
    const json = JSON.parse(readFileSync(join(dir, 'out.json'), 'utf8'));
    expect(json.rows[0]).toMatchObject({ object_id: 'gc,"7"', mask_pa_deg: 30, mag: 21.3 });
    expect(json.rows[2].mag).toBeNull();
    const vo = readVoTable(new Uint8Array(readFileSync(join(dir, 'out.votable'))));
    let n = 0;
    vo.forEachRow(() => n++);
    expect(n).toBe(3);
    const fits = readFitsTable(new Uint8Array(readFileSync(join(dir, 'out.fits'))));
    expect(fits.columns.map((c) => c.name)).toContain('mask_pa_deg');
  });

  it('gives one clear line per problem and a non-zero exit', async () => {
    const io = capture();
    expect(await main(['export', join(dir, 'missing'), '--format', 'xlsx'], io)).toBe(2);
    expect(io.errText).toEqual([
      'haloweave export: unknown format "xlsx" (use one of csv, ecsv, votable, fits, json)',
      'haloweave export: missing --out FILE (the file to write)',
      `haloweave export: the folder ${join(dir, 'missing')} does not exist (write it with haloweave plan PLAN --out ${join(dir, 'missing')})`,
      'usage: haloweave export DIR --format csv|ecsv|votable|fits|json --out FILE [--per-instrument]',
    ]);
    const empty = mkdtempSync(join(tmpdir(), 'haloweave-export-empty-'));
    const io2 = capture();
    expect(await main(['export', empty, '--format', 'csv', '--out', join(empty, 'o.csv')], io2)).toBe(2);
    expect(io2.errText[0]).toBe(`haloweave export: ${join(empty, 'slits.csv')} not found (is ${empty} the output folder of haloweave plan?)`);
    expect(existsSync(join(empty, 'o.csv'))).toBe(false);
  });

  it('names the file, line and column of a bad slits.csv cell and writes nothing', async () => {
    const bad = mkdtempSync(join(tmpdir(), 'haloweave-export-bad-'));
    writeFileSync(join(bad, 'slits.csv'), slitsToCsv(slits).replace('187.61', 'abc'));
    writeFileSync(join(bad, 'masks.csv'), masksToCsv(masks));
    const io = capture();
    const out = join(bad, 'o.ecsv');
    expect(await main(['export', bad, '--format', 'ecsv', '--out', out], io)).toBe(2);
    expect(io.errText).toEqual([`haloweave export: ${join(bad, 'slits.csv')}:3, column ra_deg: "abc" is not a number (write a decimal number such as 12.5)`]);
    expect(existsSync(out)).toBe(false);
  });

  it('refuses slits of a mask that masks.csv does not list', async () => {
    const bad = mkdtempSync(join(tmpdir(), 'haloweave-export-bad-'));
    mkdirSync(bad, { recursive: true });
    writeFileSync(join(bad, 'slits.csv'), slitsToCsv(slits));
    writeFileSync(join(bad, 'masks.csv'), masksToCsv(masks.slice(0, 1)));
    const io = capture();
    expect(await main(['export', bad, '--format', 'json', '--out', join(bad, 'o.json')], io)).toBe(2);
    expect(io.errText[0]).toMatch(/mask "m2" has slits but is not listed in masks\.csv/);
  });
});
