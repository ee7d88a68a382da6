/** fast-check arbitraries shared by the table-format tests: slit-list-like tables with awkward ids. */
import fc from 'fast-check';
import type { OutputTable } from '../../src/core/export/outputTable';

export const AWKWARD = ['a,b', 'say "hi"', "it's", '<b>&amp;</b>', 'line\nbreak', 'cr\r\nlf', 'tab\there', 'é-ñ-ü', 'Ωμέγα',
  '星团-7', '🌌🔭', '=HYPERLINK("x")', '+1', '-2', '@home', ' lead', ']]>', '\\u0041', '\\', '%20', 'x'.repeat(300)];

/** Text XML 1.0 can carry (no C0 controls other than tab/LF/CR, no U+FFFE/U+FFFF) and without NUL. */
export const xmlSafe = (s: string) => !/[\u0000-\u0008\u000b\u000c\u000e-\u001f\ufffe\uffff]/.test(s);
export const awkwardId = fc.oneof(
  fc.constantFrom(...AWKWARD),
  fc.string({ unit: 'binary', maxLength: 20 }).filter(xmlSafe),
  fc.string({ unit: fc.constantFrom('a', ',', '"', "'", '<', '&', '\n', 'é', '😀', ' ', '\t', '\\'), maxLength: 12 }),
);

export const tableArb = fc.record({
  ids: fc.array(fc.option(awkwardId, { nil: null }), { minLength: 0, maxLength: 25 }),
  seed: fc.array(fc.tuple(
    fc.oneof(fc.double(), fc.constant(null)),
    fc.option(fc.integer({ min: -2147483647, max: 2147483647 }), { nil: null }),
    fc.option(fc.boolean(), { nil: null }),
  ), { minLength: 25, maxLength: 25 }),
  name: awkwardId,
  unit: fc.constantFrom('deg', 'arcsec', 'km.s-1', 'mag', 'mas'), // VOUnit words (astropy W50 flags deprecated 'Angstrom')
  metaText: awkwardId,
  metaNumber: fc.double({ noNaN: true, noDefaultInfinity: true }),
}).map(({ ids, seed, name, unit, metaText, metaNumber }): OutputTable => ({
  name,
  columns: [
    { name: 'object_id', datatype: 'string', ucd: 'meta.id;meta.main', description: 'id of the target, as in the catalog' },
    { name: 'ra_deg', datatype: 'float64', unit, ucd: 'pos.eq.ra;meta.main' },
    { name: 'slit_index', datatype: 'int32' },
    { name: 'forced', datatype: 'bool', description: 'forced in by the user' },
  ],
  rows: ids.map((id, i) => [id, seed[i][0], seed[i][1], seed[i][2]]),
  meta: [
    { key: 'instrument', value: metaText, description: 'profile id' },
    { key: 'MASK1RA', value: metaNumber, unit: 'deg', description: 'centre of mask m1' },
    { key: 'mask_count', value: ids.length },
  ],
}));

