/**
 * One slit list per spectrograph of a plan with several (plan key `instruments`): the rows of each instrument's masks
 * with that instrument's own metadata, and the file name that carries the instrument id (shared by `haloweave export
 * --per-instrument` and the editor's export menu).
 */
import type { Slit } from '../geometry/maskSolution';
import type { OutputTable } from './outputTable';
import type { MaskRow } from './slitsCsv';
import { slitTable } from './slitTable';

/** FILE with `-<instrument id>` before its extension (slits.fits -> slits-ridge10-narrow.fits): one slit list per instrument. */
export function perInstrumentPath(file: string, instrument: string): string {
  const safe = instrument.replace(/[^A-Za-z0-9._-]+/g, '_');
  const m = /^(.*?)(\.[A-Za-z0-9]+)?$/.exec(file)!;
  const slash = Math.max(file.lastIndexOf('/'), file.lastIndexOf('\\'));
  return m[2] && file.length - m[2].length > slash + 1 ? `${m[1]}-${safe}${m[2]}` : `${file}-${safe}`;
}

/** The slit table of each instrument's masks, instruments in the order masks.csv first names them. */
export function slitTablesByInstrument(slits: readonly Slit[], masks: readonly MaskRow[]): { instrument: string; masks: number; table: OutputTable }[] {
  const instruments = [...new Set(masks.map((m) => m.instrument))];
  return instruments.map((instrument) => {
    const own = masks.filter((m) => m.instrument === instrument);
    const ids = new Set(own.map((m) => m.maskId));
    return { instrument, masks: own.length, table: slitTable(slits.filter((s) => ids.has(s.maskId)), own) };
  });
}
