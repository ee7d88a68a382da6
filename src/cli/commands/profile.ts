/**
 * `haloweave profile PROFILE [--vsys KMS] [--lines A,B,...] [--velocity-range KMS] [--line-window A] [--svg FILE]`:
 * check an instrument profile on its own (schema, then whether it can hold a slit and a box and whether the lines of a
 * galaxy at that velocity reach the detector) and draw it as SVG. Exit 0 when usable, 2 when impossible or invalid.
 */
import { resolve } from 'node:path';
import type { CliIO } from '../io';
import { optionText, parseArgs, unknownOptions } from '../args';
import { InputError, type Problem } from '../../core/result';
import { loadProfile } from '../loadPlanInputs';
import { inspectProfile } from '../../core/profile/inspect';
import { profileSvg } from '../../core/profile/profileSvg';
import { LINE_WINDOW_DEFAULTS, type LineSettings } from '../../core/profile/lineWindows';
import { writeFileAtomic } from '../atomicWrite';

const USAGE = 'usage: haloweave profile PROFILE [--vsys KMS] [--lines A,B,...] [--velocity-range KMS] [--line-window A] [--svg FILE]';

/** The calcium-triplet rest wavelengths (Angstrom, air), the default lines of a halo plan. */
export const CALCIUM_TRIPLET_A = [8498.0, 8542.1, 8662.1];

/** A number option, or a problem naming it; `check` says what a valid value is. */
export function numberOption(value: string | true | undefined, name: string, fallback: number, check: (v: number) => string | null, problems: Problem[]): number {
  if (value === undefined) return fallback;
  const v = typeof value === 'string' ? Number(value) : NaN;
  const bad = Number.isFinite(v) ? check(v) : 'must be a number';
  if (bad) {
    problems.push({ where: `--${name}`, what: `"${value === true ? '' : value}" ${bad}` });
    return fallback;
  }
  return v;
}

/** Line settings from the command's options (--vsys, --lines, --velocity-range, --line-window). */
export function lineSettingsFromOptions(options: Record<string, string | true>, vsysDefault: number, problems: Problem[]): LineSettings {
  const vsysKms = numberOption(options.vsys, 'vsys', vsysDefault, (v) => (v < -1000 || v > 30000 ? 'must be a velocity in km/s between -1000 and 30000' : null), problems);
  let linesA = CALCIUM_TRIPLET_A;
  if (options.lines !== undefined) {
    const parts = typeof options.lines === 'string' ? options.lines.split(',').map((t) => Number(t.trim())) : [];
    if (parts.length === 0 || parts.some((v) => !(v > 0))) problems.push({ where: '--lines', what: `"${options.lines}" is not a list of rest wavelengths`, fix: 'give Angstrom values separated by commas, e.g. 8498.0,8542.1,8662.1' });
    else linesA = parts;
  }
  const velocityHalfRangeKms = numberOption(options['velocity-range'], 'velocity-range', LINE_WINDOW_DEFAULTS.velocityHalfRangeKms, (v) => (v < 0 ? 'must not be negative (km/s)' : null), problems);
  const lineHalfWindowA = numberOption(options['line-window'], 'line-window', LINE_WINDOW_DEFAULTS.lineHalfWindowA, (v) => (v < 0 ? 'must not be negative (Angstrom)' : null), problems);
  return { vsysKms, linesA, velocityHalfRangeKms, lineHalfWindowA };
}

export async function run(argv: string[], io: CliIO): Promise<number> {
  const args = parseArgs(argv);
  const bad = unknownOptions(args, ['vsys', 'lines', 'velocity-range', 'line-window', 'svg']);
  if (args.positionals.length !== 1 || bad.length) {
    if (bad.length) io.err(`haloweave profile: unknown option${bad.length > 1 ? 's' : ''} ${bad.map((b) => `--${b}`).join(', ')}`);
    if (args.positionals.length !== 1) io.err('haloweave profile: give exactly one profile (an id from instrument-profiles/ or the path of a profile file)');
    io.err(USAGE);
    return 2;
  }
  const problems: Problem[] = [];
  const lines = lineSettingsFromOptions(args.options, 0, problems);
  const svgPath = optionText(args, 'svg');
  if (args.options.svg === true) problems.push({ where: '--svg', what: 'needs a file name', fix: 'e.g. --svg profile.svg' });
  if (problems.length) throw new InputError(problems);
  const { profile, path } = loadProfile(args.positionals[0], process.cwd(), args.positionals[0]);
  const insp = inspectProfile(profile, lines, path);
  const b = insp.boundsArcsec;
  io.out(`profile ${profile.id}: ${profile.label}`);
  io.out(`  file: ${path}`);
  io.out(`  field: x ${b.minX.toFixed(1)} to ${b.maxX.toFixed(1)} arcsec (dispersion), y ${b.minY.toFixed(1)} to ${b.maxY.toFixed(1)} arcsec (slits), ${insp.areaArcmin2.toFixed(2)} square arcmin, ${profile.footprint.length} corners`);
  io.out(`  slits: at least ${profile.slits.minLengthArcsec} x ${profile.slits.widthArcsec} arcsec, ${profile.slits.gapArcsec} arcsec apart, tilt up to ${profile.slits.maxTiltDeg} deg; alignment boxes ${profile.alignment.boxSizeArcsec} arcsec, at least ${profile.alignment.minCount} a mask, stars of mag ${profile.alignment.magRange[0]}-${profile.alignment.magRange[1]}`);
  io.out(`  detector: ${profile.detector.pixels} pixels of ${profile.detector.dispersionAPerPixel} A and ${profile.detector.xArcsecPerPixel} arcsec, a slit at x = 0 records ${insp.rangeAtCentreA[0].toFixed(1)}-${insp.rangeAtCentreA[1].toFixed(1)} A; usable pixels ${insp.usablePixels.map(([a, c]) => `${a}-${c}`).join(', ') || 'none'}`);
  const vNote = args.options.vsys === undefined ? ' (no --vsys given: rest frame)' : '';
  io.out(`  lines ${lines.linesA.join(', ')} A at ${lines.vsysKms} +- ${lines.velocityHalfRangeKms} km/s${vNote}, windows ${insp.windowsA.map(([a, c]) => `${a.toFixed(1)}-${c.toFixed(1)}`).join(', ')} A`);
  io.out(`  science slits possible at x ${insp.usableXArcsec.map(([a, c]) => `${a.toFixed(1)} to ${c.toFixed(1)}`).join(', ') || '(nowhere)'} arcsec: ${(100 * insp.usableXFraction).toFixed(0)} % of the field's x range`);
  for (const w of insp.warnings) io.err(`haloweave profile: warning: ${w}`);
  if (svgPath) {
    const target = resolve(svgPath);
    writeFileAtomic(target, profileSvg(profile, lines, insp));
    io.out(`wrote ${target}`);
  }
  if (insp.problems.length) throw new InputError(insp.problems);
  io.out(`profile ${profile.id} is usable for these lines`);
  return 0;
}
