import { describe, expect, it } from 'vitest';
import { readEcsvTable, parseEcsvHeader } from '../../src/core/catalog/ecsvReader';
import { readCatalog } from '../../src/core/catalog/read';

const header = (extra = '', cols = '# - {name: id, datatype: string}\n# - {name: ra, unit: deg, datatype: float64}\n# - {name: dec, unit: deg, datatype: float64}\n# - {name: mag, datatype: float64}\n') =>
  `# %ECSV 1.0\n# ---\n# datatype:\n${cols}${extra}# schema: astropy-2.0\n`;

describe('ECSV reader', () => {
  it('reads block-style column entries, meta and a comma delimiter', () => {
    const text =
      '# %ECSV 1.0\n# ---\n# datatype:\n# - name: id\n#   datatype: string\n#   description: "object id: text"\n# - {name: ra, unit: hourangle, datatype: float64, meta: {ucd: pos.eq.ra}}\n' +
      '# - {name: dec, unit: deg, datatype: float64}\n# - {name: mag, datatype: float64}\n# delimiter: \',\'\n# meta: !!omap\n# - {observer: invented}\n# - {n: 3}\n' +
      'id,ra,dec,mag\n"a, b",12,-5,20\n';
    const t = readEcsvTable(text);
    expect(t.columns).toEqual([
      { name: 'id', datatype: 'string', description: 'object id: text' },
      { name: 'ra', datatype: 'float64', unit: 'hourangle', ucd: 'pos.eq.ra' },
      { name: 'dec', datatype: 'float64', unit: 'deg' },
      { name: 'mag', datatype: 'float64' },
    ]);
    expect(t.meta).toEqual([
      { key: 'observer', value: 'invented' },
      { key: 'n', value: 3 },
    ]);
    const r = readCatalog(text, 't.ecsv');
    expect(r.targets[0]).toMatchObject({ id: 'a, b', raDeg: 180, decDeg: -5, line: 15 });
  });

  it('reads the space delimiter with quoted text', () => {
    const r = readCatalog(header() + 'id ra dec mag\n"x y" 1.5 -2 20.5\n"#z" 2 3 21\n', 'a.ecsv');
    expect(r.targets.map((t) => [t.id, t.raDeg, t.line])).toEqual([
      ['x y', 1.5, 10],
      ['#z', 2, 11],
    ]);
  });

  it('reports a header problem with the line and how to fix it', () => {
    expect(() => parseEcsvHeader('# %ECSV 2.0\n# ---\n', 'a.ecsv')).toThrow('a.ecsv:1: ECSV version 2.0 is not supported (write ECSV 1.0)');
    expect(() => parseEcsvHeader('# %ECSV 1.0\n# datatype:\n', 'a.ecsv')).toThrow('a.ecsv:2: expected "# ---" after the ECSV signature');
    expect(() => parseEcsvHeader(header("# delimiter: ';'\n"), 'a.ecsv')).toThrow(/the ECSV delimiter ";" is not allowed/);
    expect(() => parseEcsvHeader('# %ECSV 1.0\n# ---\n# datatype: [\n', 'a.ecsv')).toThrow(/^a\.ecsv:\d+: the ECSV header is not valid YAML/);
    expect(() => readEcsvTable(header() + 'id ra decl mag\n', 'a.ecsv')).toThrow(
      'a.ecsv: line 9: the header row names the columns id, ra, decl, mag but the ECSV header declares id, ra, dec, mag',
    );
  });
});
