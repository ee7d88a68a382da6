/** `haloweave check DIR`: re-check an output folder from its files alone; prints each violation, non-zero exit on any. */
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { CliIO } from '../io';
import { parseArgs, unknownOptions } from '../args';
import { InputError } from '../../core/result';
import { parseMasksCsv, parseSlitsCsv } from '../../core/export/slitsCsv';
import { parsePlanText } from '../../core/plan/validate';
import type { InstrumentProfile } from '../../core/profile/schema';
import { checkOutput, formatViolation } from '../../core/check/checkOutput';
import { loadProfile } from '../loadPlanInputs';

function readIn(dir: string, name: string): string {
  const p = join(dir, name);
  if (!existsSync(p)) throw new InputError([{ where: p, what: 'file not found', fix: 'give an output folder written by `haloweave plan`' }]);
  return readFileSync(p, 'utf8');
}

export async function run(argv: string[], io: CliIO): Promise<number> {
  const args = parseArgs(argv);
  const bad = unknownOptions(args, []);
  if (args.positionals.length !== 1 || bad.length) {
    io.err('usage: haloweave check DIR');
    return 2;
  }
  const dir = resolve(args.positionals[0]);
  const masks = parseMasksCsv(readIn(dir, 'masks.csv'), join(dir, 'masks.csv'));
  const slits = parseSlitsCsv(readIn(dir, 'slits.csv'), join(dir, 'slits.csv'));
  const planSource = join(dir, 'solved.plan.json');
  const plan = parsePlanText(readIn(dir, 'solved.plan.json'), planSource);
  // A masks.csv instrument is a profile id: the profile solved.plan.json names (id or file relative to the folder) when
  // its id matches, else the package profile of that id.
  const cache = new Map<string, InstrumentProfile | null>();
  const profileFor = (instrument: string): InstrumentProfile | null => {
    if (cache.has(instrument)) return cache.get(instrument)!;
    let found: InstrumentProfile | null = null;
    // The plan's own profile first (a file may reuse a package id with other numbers), then the package's.
    for (const ref of [plan.instrument, instrument]) {
      try {
        const p = loadProfile(ref, dir, `${planSource}: instrument`).profile;
        if (p.id === instrument || (ref === instrument && ref !== plan.instrument)) { found = p; break; }
      } catch {
        // try the next reference
      }
    }
    cache.set(instrument, found);
    return found;
  };
  const violations = checkOutput({
    masks, slits, profileFor, linesRestA: plan.goals.linesA, vsysKms: plan.galaxy.vsysKms,
    slitsSource: join(args.positionals[0], 'slits.csv'), masksSource: join(args.positionals[0], 'masks.csv'),
  });
  for (const v of violations) io.err(`haloweave check: ${formatViolation(v)}`);
  if (violations.length) {
    io.err(`haloweave check: ${violations.length} violation${violations.length > 1 ? 's' : ''} in ${args.positionals[0]}`);
    return 1;
  }
  io.out(`haloweave check: ${args.positionals[0]} passes: ${slits.length} rows on ${masks.length} masks (footprint, gap, lengths, wavelength, objects once, sky positions, alignment boxes)`);
  return 0;
}
