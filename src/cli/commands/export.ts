/**
 * `haloweave export DIR --format csv|ecsv|votable|fits|json --out FILE`: the slit list of an output folder
 * (DIR/slits.csv with the mask centre, PA and instrument of DIR/masks.csv on every row) in another table format.
 * The file is written atomically (temporary file, then rename).
 */
import { existsSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import type { CliIO } from '../io';
import { optionText, parseArgs, unknownOptions } from '../args';
import { writeFileAtomic } from '../atomicWrite';
import { parseMasksCsv, parseSlitsCsv } from '../../core/export/slitsCsv';
import { slitTable } from '../../core/export/slitTable';
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

const USAGE = 'usage: haloweave export DIR --format csv|ecsv|votable|fits|json --out FILE';

/** Read DIR/slits.csv and DIR/masks.csv into the slit-list table (throws InputError naming file, line and column). */
export function readOutputFolderTable(dir: string): OutputTable {
  const slitsPath = join(dir, 'slits.csv');
  const masksPath = join(dir, 'masks.csv');
  const slits = parseSlitsCsv(readFileSync(slitsPath, 'utf8'), slitsPath);
  const masks = parseMasksCsv(readFileSync(masksPath, 'utf8'), masksPath);
  return slitTable(slits, masks);
}

export async function run(argv: string[], io: CliIO): Promise<number> {
  const args = parseArgs(argv);
  const errors: string[] = [];
  const unknown = unknownOptions(args, ['format', 'out']);
  for (const u of unknown) errors.push(`unknown option --${u} (the options are --format and --out)`);
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
  if (errors.length > 0) {
    for (const e of errors) io.err(`haloweave export: ${e}`);
    io.err(USAGE);
    return 2;
  }
  const table = readOutputFolderTable(dir!);
  const content = EXPORT_FORMATS[format!.toLowerCase()](table);
  writeFileAtomic(out!, content);
  io.out(`wrote ${table.rows.length} slits of ${table.meta.find((m) => m.key === 'masks')?.value ?? 0} masks to ${out} (${format!.toLowerCase()})`);
  return 0;
}
