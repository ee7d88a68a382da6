/**
 * The slit list of an output folder as an OutputTable: every column of slits.csv in the contract's order, then the
 * mask centre (ICRS deg), mask PA (deg East of North) and instrument of each row's mask. Units `deg`/`arcsec`;
 * UCD1+ words per column (from the IVOA UCD1+ controlled vocabulary; see docs/formats.md).
 */
import { InputError } from '../result';
import type { Slit } from '../geometry/maskSolution';
import type { OutputColumn, OutputTable } from './outputTable';
import type { MaskRow } from './slitsCsv';

/** The columns of an exported slit list, in order. */
export const SLIT_TABLE_COLUMNS: readonly OutputColumn[] = [
  { name: 'mask_id', datatype: 'string', ucd: 'meta.id', description: 'mask identifier' },
  { name: 'slit_id', datatype: 'string', ucd: 'meta.id', description: 'slit or alignment-box identifier, unique within its mask' },
  { name: 'object_id', datatype: 'string', ucd: 'meta.id;meta.main', description: 'catalog id of the object (empty for starlight and sky slits)' },
  { name: 'role', datatype: 'string', ucd: 'meta.code.class', description: 'tracer, starlight, sky or alignment' },
  { name: 'ra_deg', datatype: 'float64', unit: 'deg', ucd: 'pos.eq.ra;meta.main', description: 'ICRS right ascension of the slit reference point' },
  { name: 'dec_deg', datatype: 'float64', unit: 'deg', ucd: 'pos.eq.dec;meta.main', description: 'ICRS declination of the slit reference point' },
  { name: 'x_arcsec', datatype: 'float64', unit: 'arcsec', ucd: 'pos.cartesian.x', description: 'mask frame x (along the dispersion) of the reference point' },
  { name: 'y_arcsec', datatype: 'float64', unit: 'arcsec', ucd: 'pos.cartesian.y', description: 'mask frame y (along the slits) of the reference point' },
  { name: 'len_below_arcsec', datatype: 'float64', unit: 'arcsec', ucd: 'instr.param', description: 'slit length below the reference point (towards -y)' },
  { name: 'len_above_arcsec', datatype: 'float64', unit: 'arcsec', ucd: 'instr.param', description: 'slit length above the reference point (towards +y)' },
  { name: 'width_arcsec', datatype: 'float64', unit: 'arcsec', ucd: 'instr.param', description: 'slit width along x' },
  { name: 'tilt_deg', datatype: 'float64', unit: 'deg', ucd: 'pos.posAng', description: 'slit tilt from the mask y axis' },
  { name: 'priority', datatype: 'float64', ucd: 'stat.weight', description: 'weight the allocation gave the object' },
  { name: 'mag', datatype: 'float64', unit: 'mag', ucd: 'phot.mag', description: "magnitude in the catalog's band (empty for starlight and sky slits)" },
  { name: 'mask_ra_deg', datatype: 'float64', unit: 'deg', ucd: 'pos.eq.ra', description: 'ICRS right ascension of the mask centre' },
  { name: 'mask_dec_deg', datatype: 'float64', unit: 'deg', ucd: 'pos.eq.dec', description: 'ICRS declination of the mask centre' },
  { name: 'mask_pa_deg', datatype: 'float64', unit: 'deg', ucd: 'pos.posAng', description: 'mask position angle, degrees East of North' },
  { name: 'instrument', datatype: 'string', ucd: 'meta.id;instr.setup', description: 'instrument profile id of the mask' },
];

/** Build the OutputTable of a slit list; every slit's mask must be among `masks` (else InputError naming it). */
export function slitTable(slits: readonly Slit[], masks: readonly MaskRow[], name = 'slits'): OutputTable {
  const byId = new Map(masks.map((m) => [m.maskId, m]));
  const missing = [...new Set(slits.map((s) => s.maskId).filter((id) => !byId.has(id)))];
  if (missing.length > 0) {
    throw new InputError(
      missing.map((id) => ({ where: 'slits.csv', what: `mask "${id}" has slits but is not listed in masks.csv`, fix: 'write masks.csv and slits.csv from the same run' })),
    );
  }
  const rows = slits.map((s) => {
    const m = byId.get(s.maskId)!;
    return [
      s.maskId, s.slitId, s.objectId, s.role, s.raDeg, s.decDeg, s.xArcsec, s.yArcsec, s.lenBelowArcsec, s.lenAboveArcsec,
      s.widthArcsec, s.tiltDeg, s.priority, s.mag, m.raDeg, m.decDeg, m.paDeg, m.instrument,
    ];
  });
  const instruments = [...new Set(masks.map((m) => m.instrument))];
  return {
    name,
    columns: SLIT_TABLE_COLUMNS.map((c) => ({ ...c })),
    rows,
    meta: [
      { key: 'creator', value: 'haloweave', description: 'program that wrote the table' },
      { key: 'frame', value: 'ICRS', description: 'celestial frame of every RA and Dec' },
      { key: 'masks', value: masks.length, description: 'number of masks' },
      { key: 'slits', value: slits.length, description: 'number of slits and alignment boxes' },
      { key: 'instrument', value: instruments.join(' '), description: 'instrument profile id(s) of the masks' },
    ],
  };
}
