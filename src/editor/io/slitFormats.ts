/** The slit list in every table format the core writes (ECSV, VOTable, FITS, JSON), as `haloweave export` does. */
import type { InstrumentProfile } from '../../core/profile/schema';
import { slitTable } from '../../core/export/slitTable';
import { writeEcsv } from '../../core/export/ecsvWriter';
import { writeVoTable } from '../../core/export/votableWriter';
import { writeFitsTable } from '../../core/export/fitsWriter';
import { writeJsonTable } from '../../core/export/jsonWriter';
import type { SolveResult } from '../worker/protocol';
import type { ExportFile } from './exports';

export const FORMAT_FILES = ['slits.ecsv', 'slits.vot', 'slits.fits', 'slits.json'] as const;

export function slitListFiles(result: SolveResult, profile: InstrumentProfile): ExportFile[] {
  const slits = result.masks.flatMap((m) => m.slits);
  const masks = result.masks.map((m) => ({ maskId: m.mask.id, instrument: profile.id, raDeg: m.mask.raDeg, decDeg: m.mask.decDeg, paDeg: m.mask.paDeg }));
  const table = slitTable(slits, masks);
  return [
    { name: 'slits.ecsv', content: writeEcsv(table), mime: 'text/plain' },
    { name: 'slits.vot', content: writeVoTable(table), mime: 'application/x-votable+xml' },
    { name: 'slits.fits', content: writeFitsTable(table), mime: 'application/fits' },
    { name: 'slits.json', content: writeJsonTable(table), mime: 'application/json' },
  ];
}
