/** Minimal command-line parsing: positionals plus `--name value` and `--flag` options. */

export interface ParsedArgs {
  positionals: string[];
  options: Record<string, string | true>;
}

/** Parse argv; `flags` names options that take no value. Unknown options are kept for the command to reject. */
export function parseArgs(argv: string[], flags: readonly string[] = []): ParsedArgs {
  const positionals: string[] = [];
  const options: Record<string, string | true> = {};
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a.startsWith('--')) {
      const eq = a.indexOf('=');
      if (eq > 0) options[a.slice(2, eq)] = a.slice(eq + 1);
      else {
        const name = a.slice(2);
        if (flags.includes(name) || i + 1 >= argv.length || argv[i + 1].startsWith('--')) options[name] = true;
        else options[name] = argv[++i];
      }
    } else positionals.push(a);
  }
  return { positionals, options };
}

/** The text value of an option, or an error line when it is missing or given without a value. */
export function optionText(args: ParsedArgs, name: string): string | undefined {
  const v = args.options[name];
  return typeof v === 'string' ? v : undefined;
}

/** Names of options not in `known`, for a clear "unknown option" error. */
export function unknownOptions(args: ParsedArgs, known: readonly string[]): string[] {
  return Object.keys(args.options).filter((k) => !known.includes(k));
}
