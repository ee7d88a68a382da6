/**
 * The slit list in every table format the core writes (ECSV, VOTable, FITS, JSON), as `haloweave export` does; for a
 * plan with several spectrographs also one list per instrument in each format, as `haloweave export --per-instrument`
 * names them (slits-<profile id>.fits).
 */
import type { InstrumentProfile } from '../../core/profile/schema';
import { slitTable } from '../../core/export/slitTable';
import { writeEcsv } from '../../core/export/ecsvWriter';
import { writeVoTable } from '../../core/export/votableWriter';
import { writeFitsTable } from '../../core/export/fitsWriter';
import { writeJsonTable } from '../../core/export/jsonWriter';
import type { SolveResult } from '../worker/protocol';
import { maskRowsOf, type ExportFile } from './exports';
import type { OutputTable } from '../../core/export/outputTable';
import { perInstrumentPath, slitTablesByInstrument } from '../../core/export/perInstrument';

export const FORMAT_FILES = ['slits.ecsv', 'slits.vot', 'slits.fits', 'slits.json'] as const;

/** The four format files of one table, named from `name` (`slits` or `slits-<instrument>`). */
function formatFiles(table: OutputTable, name: (file: string) => string): ExportFile[] {
  return [
    { name: name('slits.ecsv'), content: writeEcsv(table), mime: 'text/plain' },
    { name: name('slits.vot'), content: writeVoTable(table), mime: 'application/x-votable+xml' },
    { name: name('slits.fits'), content: writeFitsTable(table), mime: 'application/fits' },
    { name: name('slits.json'), content: writeJsonTable(table), mime: 'application/json' },
  ];
}

/** Every mask's slits in each format (FORMAT_FILES). */
export function slitListFiles(result: SolveResult, profile: InstrumentProfile): ExportFile[] {
  return formatFiles(slitTable(result.masks.flatMap((m) => m.slits), maskRowsOf(result, profile)), (f) => f);
}

/** One slit list per instrument in each format (slits-<profile id>.ecsv ...); none for a plan of one spectrograph. */
export function perInstrumentSlitFiles(result: SolveResult, profile: InstrumentProfile): ExportFile[] {
  if (!result.plan.instruments?.length) return [];
  return slitTablesByInstrument(result.masks.flatMap((m) => m.slits), maskRowsOf(result, profile))
    .flatMap((part) => formatFiles(part.table, (f) => perInstrumentPath(f, part.instrument)));
}
