/** The `haloweave` command line: dispatches to one module per command. */
import { processIO, type CliIO, type Command } from './io';
import { InputError, formatProblem } from '../core/result';
import { isSystemError, systemErrorProblem } from './fsProblems';

interface CommandEntry {
  usage: string;
  summary: string;
  load: () => Promise<{ run: Command }>;
}

export const COMMANDS: Record<string, CommandEntry> = {
  plan: {
    usage: 'haloweave plan PLAN --out DIR',
    summary: 'solve a plan file: pointings, slits, starlight and sky slits, coverage; write the output folder',
    load: () => import('./commands/plan'),
  },
  check: {
    usage: 'haloweave check DIR',
    summary: 're-check an output folder against its instrument profile; non-zero exit on any violation',
    load: () => import('./commands/check'),
  },
  export: {
    usage: 'haloweave export DIR --format csv|ecsv|votable|fits|json --out FILE',
    summary: 'write the slit list of an output folder in another table format',
    load: () => import('./commands/export'),
  },
  sky: {
    usage: 'haloweave sky PLAN --from DATE --to DATE [--max-airmass X] [--step-min N] [--json [--curve]]',
    summary: "observability of the galaxy from the profile's site, one row a night",
    load: () => import('./commands/sky'),
  },
  draft: {
    usage: 'haloweave draft CATALOG --profile P --ra RA --dec DEC --re ARCSEC --axis-ratio Q --pa DEG --vsys KMS --out PLAN',
    summary: 'start a plan from a catalog, a profile and the galaxy: columns and units found, goals chosen and explained',
    load: () => import('./commands/draft'),
  },
  profile: {
    usage: 'haloweave profile PROFILE [--vsys KMS] [--lines A,B,...] [--velocity-range KMS] [--line-window A] [--svg FILE]',
    summary: 'check an instrument profile on its own (slits and boxes fit, lines on the detector) and draw it as SVG',
    load: () => import('./commands/profile'),
  },
  forecast: { usage: 'haloweave forecast DIR [--trials N] [--seed S] [--against DIR_B] [--from DATE --to DATE] [--json]', summary: 'what the planned masks will measure: velocity, dispersion, rotation and mass errors from mocks; hours and nights', load: () => import('./commands/forecast') },
  survey: {
    usage: 'haloweave survey SURVEY --out DIR [--jobs N] [--force] [--quiet]',
    summary: 'plan every galaxy of a survey in parallel and schedule their masks into the nights (docs/survey.md)',
    load: () => import('./commands/survey'),
  },
  demo: {
    usage: 'haloweave demo --out DIR',
    summary: 'write the invented example scenario and solve it',
    load: () => import('./commands/demo'),
  },
};

export function helpText(): string {
  const width = Math.max(...Object.values(COMMANDS).map((c) => c.usage.length));
  const lines = [
    'haloweave - plan slit-mask spectroscopy of galaxy halos',
    '',
    'Commands:',
    ...Object.values(COMMANDS).map((c) => `  ${c.usage.padEnd(width)}  ${c.summary}`),
    '',
    'Run `haloweave COMMAND --help` for the options of one command.',
  ];
  return lines.join('\n');
}

/** Run the CLI with argv (without node and script); returns the exit status. */
export async function main(argv: string[], io: CliIO = processIO): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    io.out(helpText());
    return name ? 0 : 1;
  }
  if (name === '--version') {
    // The launcher (bin/haloweave.js) says whether the prebuilt bundle or the sources run.
    const from = process.env.HALOWEAVE_RUNNING_FROM;
    io.out(`haloweave 0.1.0${from ? ` (${from})` : ''}`);
    return 0;
  }
  const entry = COMMANDS[name];
  if (!entry) {
    io.err(`haloweave: unknown command "${name}"; the commands are ${Object.keys(COMMANDS).join(', ')} (see haloweave --help)`);
    return 2;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    io.out(`usage: ${entry.usage}\n${entry.summary}`);
    return 0;
  }
  try {
    const mod = await entry.load();
    return await mod.run(rest, io);
  } catch (e) {
    if (e instanceof InputError) {
      for (const line of e.message.split('\n')) io.err(`haloweave ${name}: ${line}`);
      return 2;
    }
    // A file-system fault no command turned into a problem of its own: still one line, never a stack trace.
    if (isSystemError(e)) {
      io.err(`haloweave ${name}: ${formatProblem(systemErrorProblem(e, e.path ?? 'a file', `cannot ${e.syscall ?? 'use'} ${e.path ?? 'a file'}`))}`);
      return 2;
    }
    io.err(`haloweave ${name}: internal error: ${(e as Error).stack ?? e}`);
    return 70;
  }
}
