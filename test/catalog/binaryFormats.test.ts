/** readCatalog on VOTable and FITS content: detected without a file name, units from the metadata, 1-based row numbers. */
import { describe, expect, it } from 'vitest';
import { readCatalog } from '../../src/core/catalog/read';
import { writeVoTable } from '../../src/core/export/votableWriter';
import { writeFitsTable } from '../../src/core/export/fitsWriter';
import type { OutputTable } from '../../src/core/export/outputTable';

const catalog: OutputTable = {
  name: 'invented',
  columns: [
    { name: 'objid', datatype: 'string' },
    { name: 'RA_h', datatype: 'float64', unit: 'h', ucd: 'pos.eq.ra' },
    { name: 'DEJ2000', datatype: 'float64', unit: 'deg', ucd: 'pos.eq.dec' },
    { name: 'imag', datatype: 'float64', unit: 'mag' },
    { name: 'prio', datatype: 'int32' },
    { name: 'note', datatype: 'string' },
  ],
  rows: [
    ['g<1>', 12.5, -5.25, 21.5, 2, 'a & b'],
    ['g2', 25, -5.3, 21.6, 1, ''],
    ['g3', 12.6, 95, 21.7, 1, ''],
    ['g4', 12.7, -5.35, null, 1, ''],
    ['g<1>', 12.8, -5.4, 21.9, 0, 'dup'],
  ],
  meta: [],
};

for (const [format, bytes] of [
  ['votable', new TextEncoder().encode(writeVoTable(catalog))],
  ['fits', writeFitsTable(catalog)],
] as const) {
  describe(`a ${format} catalog`, () => {
    const r = readCatalog(bytes, `catalog.${format}`, { ra: 'RA_h', mag: 'imag' });
    it('is detected from its content and mapped', () => {
      expect(r.format).toBe(format);
      expect(r.mapping).toEqual({ id: 'objid', ra: 'RA_h', dec: 'DEJ2000', mag: 'imag', priority: 'prio' });
      expect(r.rowsRead).toBe(5);
    });
    it('converts RA from hours (unit in the metadata) and carries extra columns', () => {
      expect(r.targets).toEqual([{ id: 'g<1>', raDeg: 187.5, decDeg: -5.25, mag: 21.5, color: null, priority: 2, role: 'tracer', line: 1, extra: { note: 'a & b' } }]);
    });
    it('reports bad rows by their 1-based row number', () => {
      expect(r.rejects.map((x) => [x.line, x.column])).toEqual([
        [2, 'RA_h'],
        [3, 'DEJ2000'],
        [4, 'imag'],
        [5, 'prio'],
        [5, 'objid'],
      ]);
      expect(r.rejects[0].reason).toBe('RA 25 h is outside [0, 24) h');
      expect(r.rejects[2].reason).toBe('missing value');
    });
  });
}
