/**
 * `haloweave export DIR --format csv|ecsv|votable|fits|json --out FILE`: the slit list of an output folder
 * (DIR/slits.csv with the mask centre, PA and instrument of DIR/masks.csv on every row) in another table format.
 * The file is written atomically (temporary file, then rename).
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileOnPath, withFsProblems } from '../fsProblems';
import type { CliIO } from '../io';
import { optionText, parseArgs, unknownOptions } from '../args';
import { writeFileAtomic } from '../atomicWrite';
import { parseMasksCsv, parseSlitsCsv } from '../../core/export/slitsCsv';
import { slitTable } from '../../core/export/slitTable';
import { perInstrumentPath, slitTablesByInstrument } from '../../core/export/perInstrument';
import type { OutputTable } from '../../core/export/outputTable';
import { outputTableToCsv } from '../../core/export/csvText';
import { writeEcsv } from '../../core/export/ecsvWriter';
import { writeJsonTable } from '../../core/export/jsonWriter';
import { writeVoTable } from '../../core/export/votableWriter';
import { writeFitsTable } from '../../core/export/fitsWriter';

/** The export formats and their writers. */
export const EXPORT_FORMATS: Record<string, (t: OutputTable) => string | Uint8Array> = {
  csv: outputTableToCsv,
  ecsv: writeEcsv,
  votable: writeVoTable,
  fits: writeFitsTable,
  json: writeJsonTable,
};

const USAGE = 'usage: haloweave export DIR --format csv|ecsv|votable|fits|json --out FILE [--per-instrument]';

/** Read DIR/slits.csv and DIR/masks.csv into the slit-list table (throws InputError naming file, line and column). */
export function readOutputFolderTable(dir: string): OutputTable {
  const slitsPath = join(dir, 'slits.csv');
  const masksPath = join(dir, 'masks.csv');
  const slits = parseSlitsCsv(readFileSync(slitsPath, 'utf8'), slitsPath);
  const masks = parseMasksCsv(readFileSync(masksPath, 'utf8'), masksPath);
  return slitTable(slits, masks);
}

/** Same file on disk (also through links): same device and inode. */
function sameFile(a: string, b: string): boolean {
  try {
    const sa = statSync(a), sb = statSync(b);
    return sa.dev === sb.dev && sa.ino === sb.ino;
  } catch {
    return false;
  }
}

/**
 * Why `--out` cannot be written: a folder, or a file the output folder holds (an input of this export: it is never
 * overwritten) or the catalog or profile its plan names.
 */
export function outProblems(out: string, dir: string): string[] {
  if (existsSync(out) && statSync(out).isDirectory()) return [`--out ${out} is a folder; give the name of the file to write (e.g. ${join(out, 'slits.fits')})`];
  const file = fileOnPath(resolve(out));
  if (file !== null && file !== resolve(out)) return [`--out ${out}: ${file} is a file, so nothing can be written under it (choose a path whose parent folders are folders)`];
  if (!existsSync(out)) return [];
  const inputs = readdirSync(dir).map((e) => join(dir, e));
  try {
    const plan = JSON.parse(readFileSync(join(dir, 'solved.plan.json'), 'utf8')) as { catalog?: unknown; instrument?: unknown; instruments?: { profile?: unknown }[] };
    const profiles = Array.isArray(plan.instruments) ? plan.instruments.map((i) => i?.profile) : [];
    for (const ref of [plan.catalog, plan.instrument, ...profiles]) if (typeof ref === 'string' && ref !== '') inputs.push(resolve(dir, ref));
  } catch {
    // no readable plan: the folder's own files are the inputs
  }
  const hit = inputs.find((f) => sameFile(out, f));
  return hit ? [`--out ${out} is ${hit}, an input of this export; it is never overwritten (choose another file name, e.g. ${join(dir, 'slits.fits')})`] : [];
}

export async function run(argv: string[], io: CliIO): Promise<number> {
  const args = parseArgs(argv, ['per-instrument']);
  const errors: string[] = [];
  const unknown = unknownOptions(args, ['format', 'out', 'per-instrument']);
  for (const u of unknown) errors.push(`unknown option --${u} (the options are --format, --out and --per-instrument)`);
  const [dir, ...more] = args.positionals;
  if (!dir) errors.push('missing the output folder DIR (the folder written by haloweave plan PLAN --out DIR)');
  if (more.length > 0) errors.push(`unexpected argument${more.length > 1 ? 's' : ''} ${more.join(' ')}`);
  const format = optionText(args, 'format');
  if (format === undefined) errors.push('missing --format (one of csv, ecsv, votable, fits, json)');
  else if (!(format.toLowerCase() in EXPORT_FORMATS)) errors.push(`unknown format "${format}" (use one of csv, ecsv, votable, fits, json)`);
  const out = optionText(args, 'out');
  if (out === undefined) errors.push('missing --out FILE (the file to write)');
  if (dir) {
    if (!existsSync(dir)) errors.push(`the folder ${dir} does not exist (write it with haloweave plan PLAN --out ${dir})`);
    else if (!statSync(dir).isDirectory()) errors.push(`${dir} is not a folder (give the output folder of haloweave plan)`);
    else {
      for (const f of ['slits.csv', 'masks.csv']) {
        if (!existsSync(join(dir, f))) errors.push(`${join(dir, f)} not found (is ${dir} the output folder of haloweave plan?)`);
      }
    }
  }
  if (out !== undefined && dir && errors.length === 0) errors.push(...outProblems(out, dir));
  if (errors.length > 0) {
    for (const e of errors) io.err(`haloweave export: ${e}`);
    io.err(USAGE);
    return 2;
  }
  const table = readOutputFolderTable(dir!);
  const write = EXPORT_FORMATS[format!.toLowerCase()];
  if (args.options['per-instrument'] === true) {
    // One slit list per instrument: the rows of its masks, its own metadata (masks, slits, instrument).
    const slits = parseSlitsCsv(readFileSync(join(dir!, 'slits.csv'), 'utf8'), join(dir!, 'slits.csv'));
    const masks = parseMasksCsv(readFileSync(join(dir!, 'masks.csv'), 'utf8'), join(dir!, 'masks.csv'));
    const parts = slitTablesByInstrument(slits, masks);
    const clashes = parts.flatMap((p) => outProblems(perInstrumentPath(out!, p.instrument), dir!));
    if (clashes.length) {
      for (const e of clashes) io.err(`haloweave export: ${e}`);
      return 2;
    }
    for (const part of parts) {
      const file = perInstrumentPath(out!, part.instrument);
      withFsProblems(`--out ${file}`, 'cannot write the exported file', () => writeFileAtomic(file, write(part.table)));
      io.out(`wrote ${part.table.rows.length} slits of ${part.masks} masks of ${part.instrument} to ${file} (${format!.toLowerCase()})`);
    }
    return 0;
  }
  const content = write(table);
  withFsProblems(`--out ${out}`, 'cannot write the exported file', () => writeFileAtomic(out!, content));
  io.out(`wrote ${table.rows.length} slits of ${table.meta.find((m) => m.key === 'masks')?.value ?? 0} masks to ${out} (${format!.toLowerCase()})`);
  return 0;
}
